import { mkdtempSync, rmSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ICAL from 'ical.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CliIo } from '../../../src/cli/io.ts';
import { runCli } from '../../../src/cli/main.ts';
import { type OpenedService, openService } from '../../../src/main.ts';

// The invented demo workspace; Monday 2026-12-07 14:00-14:45 UTC is free for Maren and Ines there.
const DEMO = join(import.meta.dirname, '..', '..', '..', 'fixtures', 'demo');
const NOW = Date.UTC(2026, 11, 1, 18, 0);

let dir: string;
let env: Record<string, string>;
let opened: OpenedService;
let server: Server;
let base: string;

async function run(...args: string[]) {
  const outs: string[] = [];
  const errs: string[] = [];
  const io: CliIo = { out: (t) => outs.push(t), err: (t) => errs.push(t), env, isTty: false, now: () => NOW };
  const code = await runCli(args, io);
  return { code, out: outs.join('\n'), err: errs.join('\n') };
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'slotwright-subscription-'));
  env = { SLOTWRIGHT_DATABASE_URL: join(dir, 'store.sqlite') };
  const booked = await run(
    'book',
    ...[
      '--workspace',
      DEMO,
      '--with',
      'maren,ines',
      '--start',
      '2026-12-07T14:00:00Z',
      '--length',
      '45m',
      '--json',
    ],
  );
  expect(booked.code).toBe(0);
  opened = await openService(DEMO, { now: () => NOW, database: env.SLOTWRIGHT_DATABASE_URL!, pool: false });
  server = createServer(opened.feeds);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(async () => {
  await new Promise<void>((resolve) => server.close(() => resolve()));
  await opened.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('slotwright subscription', () => {
  it("issues an address whose feed holds the person's booking, as a METHOD:PUBLISH calendar", async () => {
    const r = await run('subscription', '--workspace', DEMO, '--person', 'ines', '--base', base, '--json');
    expect(r.code).toBe(0);
    const { url, owner } = JSON.parse(r.out) as { url: string; owner: unknown };
    expect(owner).toEqual({ kind: 'person', id: 'ines' });
    // 32 random bytes in base64url are 43 characters (RFC 4648 section 5, no padding).
    expect(url).toMatch(new RegExp(`^${base}/feeds/[A-Za-z0-9_-]{43}\\.ics$`));
    const res = await fetch(url);
    expect(res.status).toBe(200);
    const cal = new ICAL.Component(ICAL.parse(await res.text()));
    // RFC 5546 section 1.4: PUBLISH is the method of a calendar published without replies.
    expect(cal.getFirstPropertyValue('method')).toBe('PUBLISH');
    const events = cal.getAllSubcomponents('vevent').map((e) => new ICAL.Event(e));
    expect(events.map((e) => e.startDate.toJSDate().toISOString())).toEqual(['2026-12-07T14:00:00.000Z']);
    expect(events.map((e) => e.endDate.toJSDate().toISOString())).toEqual(['2026-12-07T14:45:00.000Z']);
  });

  it('a room without bookings gets an empty feed; unknown tokens get 404', async () => {
    const room = await run('subscription', '--workspace', DEMO, '--room', 'tejo', '--base', base);
    expect(room.code).toBe(0);
    const empty = await fetch(room.out.trim());
    expect(empty.status).toBe(200);
    expect(new ICAL.Component(ICAL.parse(await empty.text())).getAllSubcomponents('vevent')).toHaveLength(0);
    const made = (await fetch(`${base}/feeds/${'A'.repeat(43)}.ics`)).status;
    expect(made).toBe(404);
  });

  it('refuses bad arguments and unknown owners with the reason', async () => {
    const both = await run('subscription', '--workspace', DEMO, '--person', 'ines', '--room', 'tejo');
    expect(both.code).toBe(2);
    expect(both.err).toContain('exactly one of --person or --room');
    const badBase = await run('subscription', '--workspace', DEMO, '--room', 'tejo', '--base', 'ftp://x');
    expect(badBase.code).toBe(2);
    const nobody = await run('subscription', '--workspace', DEMO, '--person', 'nobody');
    expect(nobody.code).toBe(1);
    expect(nobody.err).toContain("the workspace has no person 'nobody'");
  });
});
