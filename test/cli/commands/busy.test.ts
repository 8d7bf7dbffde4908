import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CliIo } from '../../../src/cli/io.ts';
import { runCli } from '../../../src/cli/main.ts';

function recordingIo(env: Record<string, string> = {}): CliIo & { stdout: string[]; stderr: string[] } {
  const stdout: string[] = [];
  const stderr: string[] = [];
  return {
    stdout,
    stderr,
    out: (t) => stdout.push(t),
    err: (t) => stderr.push(t),
    env,
    isTty: false,
    now: () => Date.UTC(2026, 11, 1, 12),
  };
}

const FEED = [
  'BEGIN:VCALENDAR',
  'VERSION:2.0',
  'PRODID:-//slotwright//test//EN',
  'BEGIN:VEVENT',
  'UID:standup',
  'DTSTART;TZID=America/Halifax:20261207T090000',
  'DTEND;TZID=America/Halifax:20261207T093000',
  'RRULE:FREQ=DAILY;COUNT=3',
  'SUMMARY:Tide table stand-up',
  'END:VEVENT',
  'BEGIN:VEVENT',
  'UID:maybe',
  'DTSTART:20261208T170000Z',
  'DTEND:20261208T180000Z',
  'STATUS:TENTATIVE',
  'END:VEVENT',
  'BEGIN:VEVENT',
  'UID:odd',
  'DTSTART;TZID=Harbour Time:20261209T100000',
  'DURATION:PT1H',
  'END:VEVENT',
  'END:VCALENDAR',
].join('\r\n');

let dir = '';
let file = '';
let server: Server;
let base = '';
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'slotwright-busy-'));
  file = join(dir, 'maren.ics');
  writeFileSync(file, FEED);
  server = createServer((req, res) => {
    if (req.url === '/secret-token/maren.ics')
      res.writeHead(200, { 'content-type': 'text/calendar' }).end(FEED);
    else res.writeHead(404).end();
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  rmSync(dir, { recursive: true, force: true });
  server.closeAllConnections();
  await new Promise<void>((r) => server.close(() => r()));
});

const EXPECTED = {
  busy: [
    { start: '2026-12-07T13:00:00Z', end: '2026-12-07T13:30:00Z', kind: 'busy' },
    { start: '2026-12-08T13:00:00Z', end: '2026-12-08T13:30:00Z', kind: 'busy' },
    { start: '2026-12-08T17:00:00Z', end: '2026-12-08T18:00:00Z', kind: 'tentative' },
    { start: '2026-12-09T13:00:00Z', end: '2026-12-09T13:30:00Z', kind: 'busy' },
    { start: '2026-12-09T14:00:00Z', end: '2026-12-09T15:00:00Z', kind: 'busy' },
  ],
  warnings: ["unknown time zone 'Harbour Time': its times are read in America/Halifax"],
};

describe('slotwright busy', () => {
  it('prints exactly one JSON object with --json', async () => {
    const io = recordingIo();
    const code = await runCli(
      ['busy', file, '--from', '2026-12-07', '--to', '2026-12-14', '--zone', 'America/Halifax', '--json'],
      io,
    );
    expect(code).toBe(0);
    expect(io.stdout).toHaveLength(1);
    expect(JSON.parse(io.stdout[0]!)).toEqual(EXPECTED);
    expect(io.stdout[0]).toBe(JSON.stringify(EXPECTED));
  });
  it('clips to instants given with offsets', async () => {
    const io = recordingIo();
    const code = await runCli(
      [
        'busy',
        file,
        '--from',
        '2026-12-07T09:15:00-04:00',
        '--to',
        '2026-12-08T00:00:00Z',
        '--zone',
        'UTC',
        '--json',
      ],
      io,
    );
    expect(code).toBe(0);
    expect(JSON.parse(io.stdout[0]!).busy).toEqual([
      { start: '2026-12-07T13:15:00Z', end: '2026-12-07T13:30:00Z', kind: 'busy' },
    ]);
  });
  it('prints a table in the zone without --json and warnings on stderr', async () => {
    const io = recordingIo();
    const code = await runCli(
      ['busy', file, '--from', '2026-12-07', '--to', '2026-12-08', '--zone', 'America/Halifax'],
      io,
    );
    expect(code).toBe(0);
    expect(io.stdout).toEqual(['busy time in America/Halifax:', '  2026-12-07 Mon 09:00 - 09:30  busy']);
  });
  it('reads pasted text and an allowed loopback URL', async () => {
    const pasted = recordingIo();
    expect(
      await runCli(
        ['busy', FEED, '--from', '2026-12-07', '--to', '2026-12-14', '--zone', 'America/Halifax', '--json'],
        pasted,
      ),
    ).toBe(0);
    expect(JSON.parse(pasted.stdout[0]!)).toEqual(EXPECTED);
    const url = recordingIo({ SLOTWRIGHT_FEED_ALLOW: '127.0.0.1' });
    expect(
      await runCli(
        [
          'busy',
          `${base}/secret-token/maren.ics`,
          '--from',
          '2026-12-07',
          '--to',
          '2026-12-14',
          '--zone',
          'America/Halifax',
          '--json',
        ],
        url,
      ),
    ).toBe(0);
    expect(JSON.parse(url.stdout[0]!)).toEqual(EXPECTED);
  });
  it('exits 1 with a JSON error when the input cannot be read', async () => {
    const io = recordingIo();
    const code = await runCli(
      ['busy', join(dir, 'nope.ics'), '--from', '2026-12-07', '--to', '2026-12-08', '--json'],
      io,
    );
    expect(code).toBe(1);
    expect(io.stdout).toEqual([JSON.stringify({ error: `no such file: ${join(dir, 'nope.ics')}` })]);
  });
  it('exits 1 for a refused URL and keeps its secret path out of the message', async () => {
    const io = recordingIo();
    const code = await runCli(
      [
        'busy',
        `${base}/secret-token/maren.ics`,
        '--from',
        '2026-12-07',
        '--to',
        '2026-12-08',
        '--zone',
        'UTC',
        '--json',
      ],
      io,
    );
    expect(code).toBe(1);
    const out = JSON.parse(io.stdout[0]!) as { error: string };
    expect(out.error).toMatch(/^refused to fetch http:\/\/127\.0\.0\.1:\d+\/…: only https is allowed/);
    expect(out.error).not.toContain('secret-token');
  });
  it('exits 1 for text that is not iCalendar', async () => {
    const bad = join(dir, 'page.html');
    writeFileSync(bad, '<html>login</html>');
    const io = recordingIo();
    expect(
      await runCli(
        ['busy', bad, '--from', '2026-12-07', '--to', '2026-12-08', '--zone', 'UTC', '--json'],
        io,
      ),
    ).toBe(1);
    expect(JSON.parse(io.stdout[0]!).error).toMatch(/^not an iCalendar feed/);
  });
  it('exits 2 on bad arguments', async () => {
    const cases: string[][] = [
      ['busy', file, '--to', '2026-12-08'],
      ['busy', file, '--from', '07/12/2026', '--to', '2026-12-08'],
      ['busy', file, '--from', '2026-12-08', '--to', '2026-12-07', '--zone', 'UTC'],
      ['busy', file, '--from', '2026-12-07', '--to', '2026-12-08', '--zone', 'Atlantis/Harbour'],
      ['busy', file, '--from', '2026-12-07', '--to', '2026-12-08', '--owner', 'maren'],
      ['busy', '--from', '2026-12-07', '--to', '2026-12-08'],
      ['busy', file, '--from', '2026-12-07', '--to', '2026-12-08', '--colour'],
    ];
    for (const argv of cases) {
      const io = recordingIo();
      expect(await runCli(argv, io)).toBe(2);
      expect(io.stderr).toHaveLength(1);
    }
  });
});
