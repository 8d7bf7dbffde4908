import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { busyByOwner, type FeedSpec, type FeedsDeps, refreshFeeds } from '../../src/app/feeds.ts';
import { InMemoryFeedStateStore } from '../../src/calendar/feed-state.ts';

const ICS = [
  'BEGIN:VCALENDAR',
  'VERSION:2.0',
  'PRODID:-//slotwright//test//EN',
  'BEGIN:VEVENT',
  'UID:a',
  'DTSTART:20261208T100000Z',
  'DTEND:20261208T110000Z',
  'SUMMARY:Hull sonar review',
  'END:VEVENT',
  'END:VCALENDAR',
].join('\r\n');
const ROOM_ICS = ICS.replace('20261208T100000Z', '20261208T140000Z').replace(
  '20261208T110000Z',
  '20261208T150000Z',
);

let mode: 'ok' | 'fail' = 'ok';
let requests: { inm: string | undefined }[] = [];
let server: Server;
let base = '';
let dir = '';
beforeAll(async () => {
  server = createServer((req, res) => {
    requests.push({ inm: req.headers['if-none-match'] as string | undefined });
    if (mode === 'fail') return void res.writeHead(500).end();
    if (req.headers['if-none-match'] === '"e1"') return void res.writeHead(304).end();
    res.writeHead(200, { etag: '"e1"' }).end(ICS);
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  dir = mkdtempSync(join(tmpdir(), 'slotwright-feeds-'));
  writeFileSync(join(dir, 'room.ics'), ROOM_ICS);
});
afterAll(async () => {
  rmSync(dir, { recursive: true, force: true });
  server.closeAllConnections();
  await new Promise<void>((r) => server.close(() => r()));
});

const HOUR = 3_600_000;
const WEEK = { start: Date.UTC(2026, 11, 7), end: Date.UTC(2026, 11, 14) };

describe('feed refresh and busy time per owner', () => {
  it('keeps the last good copy when a fetch fails, reports staleness with age, and reuses it on 304', async () => {
    let now = Date.UTC(2026, 11, 1, 8);
    const deps: FeedsDeps = {
      states: new InMemoryFeedStateStore(),
      clock: () => now,
      fetchOptions: { allowHosts: ['127.0.0.1'], timeoutMs: 2000 },
    };
    const feeds: FeedSpec[] = [
      {
        id: 'maren:0',
        ownerId: 'maren',
        source: `${base}/private-token-77/maren.ics`,
        zone: 'America/Halifax',
      },
      {
        id: 'room-chart-room:0',
        ownerId: 'chart-room',
        source: join(dir, 'room.ics'),
        zone: 'America/Halifax',
      },
    ];
    requests = [];
    mode = 'ok';
    expect((await refreshFeeds(feeds, deps)).map((f) => f.stale)).toEqual([false, false]);
    const first = await busyByOwner(feeds, WEEK, deps);
    expect(first.get('maren')?.busy).toEqual([
      { start: Date.UTC(2026, 11, 8, 10), end: Date.UTC(2026, 11, 8, 11), kind: 'busy' },
    ]);
    expect(first.get('chart-room')?.busy).toEqual([
      { start: Date.UTC(2026, 11, 8, 14), end: Date.UTC(2026, 11, 8, 15), kind: 'busy' },
    ]);

    now += 2 * HOUR;
    mode = 'fail';
    const failed = await busyByOwner(feeds, WEEK, deps, { refresh: true });
    const maren = failed.get('maren')!;
    expect(maren.busy).toEqual(first.get('maren')?.busy);
    expect(maren.feeds).toEqual([
      {
        feedId: 'maren:0',
        stale: true,
        ageMs: 2 * HOUR,
        error: expect.stringMatching(/^http:\/\/127\.0\.0\.1:\d+\/… answered HTTP 500$/),
      },
    ]);
    expect(JSON.stringify(maren)).not.toContain('private-token-77');

    now += HOUR;
    mode = 'ok';
    const back = await refreshFeeds(feeds, deps);
    expect(back[0]).toEqual({ feedId: 'maren:0', stale: false, ageMs: 0, error: undefined });
    // the first fetch went without validators, the later ones sent the ETag and the last got a 304
    expect(requests.map((r) => r.inm)).toEqual([undefined, '"e1"', '"e1"']);
    expect((await busyByOwner(feeds, WEEK, deps)).get('maren')?.busy).toEqual(first.get('maren')?.busy);
  });

  it('marks a copy stale when it is older than the limit and flags a window beyond the horizon', async () => {
    let now = Date.UTC(2026, 11, 1, 8);
    const deps: FeedsDeps = { states: new InMemoryFeedStateStore(), clock: () => now, horizonDays: 30 };
    const feeds: FeedSpec[] = [{ id: 'r', ownerId: 'room', source: join(dir, 'room.ics'), zone: 'UTC' }];
    await refreshFeeds(feeds, deps);
    now += 7 * HOUR;
    const out = (await busyByOwner(feeds, { start: WEEK.start, end: Date.UTC(2027, 1, 1) }, deps)).get(
      'room',
    )!;
    expect(out.feeds[0]).toMatchObject({ stale: true, ageMs: 7 * HOUR });
    expect(out.warnings).toEqual(['feed r covers only part of the requested time']);
  });

  it('records an unreadable file without throwing', async () => {
    const deps: FeedsDeps = { states: new InMemoryFeedStateStore(), clock: () => 0 };
    const [f] = await refreshFeeds(
      [{ id: 'x', ownerId: 'x', source: join(dir, 'missing.ics'), zone: 'UTC' }],
      deps,
    );
    expect(f).toMatchObject({ feedId: 'x', stale: true, ageMs: undefined });
    expect(f?.error).toMatch(/ENOENT/);
  });
});
