import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CliIo } from '../../../src/cli/io.ts';
import { runCli } from '../../../src/cli/main.ts';

// An invented workspace in the demo's spirit; rui's feed has one busy hour on 2026-12-08.
const WORKSPACE = `name: Saltline test
zone: Europe/Lisbon
admins: [ines]
people:
  - {id: ines, name: Ines Carvalhal, email: ines@saltline.example, zone: Europe/Lisbon}
  - {id: rui, name: Rui Teixo, email: rui@saltline.example, zone: Europe/Lisbon, feeds: [feeds/rui.ics]}
  - {id: maren, name: Maren Holloway, zone: America/Halifax}
rooms:
  - {id: tejo, name: Tejo, capacity: 10, zone: Europe/Lisbon}
groups:
  - {id: pair, members: [ines, maren]}
`;
const RUI_ICS = [
  'BEGIN:VCALENDAR',
  'VERSION:2.0',
  'PRODID:-//saltline test//EN',
  'BEGIN:VEVENT',
  'UID:rui-1@saltline.example',
  'DTSTAMP:20261201T000000Z',
  'DTSTART:20261208T100000Z',
  'DTEND:20261208T110000Z',
  'SUMMARY:Boat check',
  'END:VEVENT',
  'END:VCALENDAR',
  '',
].join('\r\n');

let dir: string;
let ws: string;
let env: Record<string, string>;

function recorder(): CliIo & { outs: string[]; errs: string[] } {
  const outs: string[] = [];
  const errs: string[] = [];
  return {
    outs,
    errs,
    out: (t) => outs.push(t),
    err: (t) => errs.push(t),
    env,
    isTty: false,
    now: () => Date.UTC(2026, 11, 1, 18, 0),
  };
}

async function run(...args: string[]) {
  const io = recorder();
  const code = await runCli(args, io);
  return { code, out: io.outs.join('\n'), err: io.errs.join('\n') };
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'sw-cli-book-'));
  ws = join(dir, 'ws');
  mkdirSync(join(ws, 'feeds'), { recursive: true });
  writeFileSync(join(ws, 'workspace.yaml'), WORKSPACE);
  writeFileSync(join(ws, 'feeds', 'rui.ics'), RUI_ICS);
  env = { SLOTWRIGHT_DATABASE_URL: join(dir, 'store', 'sw.sqlite') };
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('slotwright book', () => {
  let first = '';
  it('books and prints the booking as JSON (exit 0)', async () => {
    const r = await run(
      'book',
      '--workspace',
      ws,
      '--with',
      'ines,rui',
      '--start',
      '2026-12-07T14:00Z',
      '--length',
      '45m',
      '--room',
      'tejo',
      '--json',
    );
    expect(r.code).toBe(0);
    const parsed = JSON.parse(r.out) as { booking: { id: string } };
    first = parsed.booking.id;
    expect(parsed).toEqual({
      booking: {
        id: first,
        start: '2026-12-07T14:00:00.000Z',
        end: '2026-12-07T14:45:00.000Z',
        room: 'tejo',
      },
    });
  });

  it('the same tuple again returns the same booking', async () => {
    const r = await run(
      'book',
      '--workspace',
      ws,
      '--with',
      'rui,ines',
      '--start',
      '2026-12-07T15:00+01:00',
      '--length',
      '45',
      '--room',
      'tejo',
      '--json',
    );
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out).booking.id).toBe(first);
    // Halifax keeps Atlantic Standard Time, UTC-4, in December (IANA tz database, America/Halifax).
    const zoned = await run(
      'book',
      '--workspace',
      ws,
      '--with',
      'ines,rui',
      '--start',
      '2026-12-07T10:00[America/Halifax]',
      '--length',
      '0h45m',
      '--room',
      'tejo',
      '--json',
    );
    expect(JSON.parse(zoned.out).booking.id).toBe(first);
  });

  it('refuses the taken room with exit 3, naming it', async () => {
    const r = await run(
      'book',
      '--workspace',
      ws,
      '--with',
      'maren',
      '--start',
      '2026-12-07T14:30Z',
      '--length',
      '1h',
      '--room',
      'tejo',
      '--json',
    );
    expect(r).toMatchObject({ code: 3, out: '{"error":"conflict","with":["tejo"]}' });
  });

  it("refuses a time that is busy in a person's feed (exit 3)", async () => {
    const r = await run(
      'book',
      '--workspace',
      ws,
      '--with',
      'pair,rui',
      '--start',
      '2026-12-08T10:30:00Z',
      '--length',
      '1h',
      '--json',
    );
    expect(r).toMatchObject({ code: 3, out: '{"error":"conflict","with":["rui"]}' });
  });

  it('a person who does not attend and is not an admin is refused (exit 1)', async () => {
    const r = await run(
      'book',
      '--workspace',
      ws,
      '--with',
      'maren',
      '--start',
      '2026-12-09T10:00Z',
      '--length',
      '30m',
      '--as',
      'rui',
      '--json',
    );
    expect(r.code).toBe(1);
    expect(JSON.parse(r.out).error).toBe('unauthorized');
  });

  it.each([
    [['--with', 'ines', '--start', '2026-12-07T14:00', '--length', '30m'], /not an instant; add Z/],
    [['--with', 'ines', '--start', '2026-12-07T14:00Z', '--length', 'long'], /'long' is not a length/],
    [['--with', 'nobody', '--start', '2026-12-07T14:00Z', '--length', '30m'], /no person or group 'nobody'/],
    [
      ['--with', 'ines', '--start', '2026-12-07T14:00Z', '--length', '30m', '--room', 'attic'],
      /no room 'attic'/,
    ],
    [['--with', 'ines', '--start', '2026-12-07T14:00Z'], /--length is required/],
  ])('bad arguments exit 2 with a reason: %j', async (args, reason) => {
    const r = await run('book', '--workspace', ws, ...args);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(reason);
  });

  it('an unreadable workspace exits 1', async () => {
    const r = await run(
      'book',
      '--workspace',
      join(dir, 'nowhere'),
      '--with',
      'ines',
      '--start',
      '2026-12-07T14:00Z',
      '--length',
      '30m',
    );
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/no workspace\.yaml/);
  });

  it('cancel: only the organizer or an admin; then the time is free again', async () => {
    const refused = await run('cancel', first, '--workspace', ws, '--as', 'rui', '--json');
    expect(refused.code).toBe(1);
    expect(JSON.parse(refused.out).error).toBe('unauthorized');
    const ok = await run('cancel', first, '--workspace', ws, '--as', 'ines', '--json');
    expect(ok.code).toBe(0);
    expect(JSON.parse(ok.out)).toEqual({ booking: { id: first, state: 'cancelled', sequence: 1 } });
    const missing = await run('cancel', 'bk-none', '--workspace', ws, '--json');
    expect(missing.code).toBe(1);
    const again = await run(
      'book',
      '--workspace',
      ws,
      '--with',
      'maren',
      '--start',
      '2026-12-07T14:30Z',
      '--length',
      '1h',
      '--room',
      'tejo',
      '--json',
    );
    expect(again.code).toBe(0);
  });
});
