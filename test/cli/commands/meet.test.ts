import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CliIo } from '../../../src/cli/io.ts';
import { runCli } from '../../../src/cli/main.ts';

function recordingIo(): CliIo & { outText: string[]; errText: string[] } {
  const outText: string[] = [];
  const errText: string[] = [];
  return {
    outText,
    errText,
    out: (t) => outText.push(t),
    err: (t) => errText.push(t),
    env: {},
    isTty: false,
    now: () => Date.parse('2026-12-01T12:00:00Z'),
  };
}

// A small invented workspace: Lisbon, Halifax and Auckland, two rooms.
const YAML = `zone: Europe/Lisbon
people:
  - {id: ana, name: Ana, email: ana@example.org, zone: Europe/Lisbon, holidays: PT, feeds: [feeds/ana.ics]}
  - {id: bo, name: Bo, zone: America/Halifax, holidays: CA-NS}
  - {id: cy, name: Cy, zone: Pacific/Auckland, holidays: NZ}
rooms:
  - {id: small, name: Small, capacity: 3, features: [whiteboard]}
  - {id: big, name: Big, capacity: 8, features: [screen]}
groups:
  - {id: trio, members: [ana, bo, cy]}
`;
const ICS = [
  'BEGIN:VCALENDAR',
  'VERSION:2.0',
  'PRODID:-//slotwright test//EN',
  'BEGIN:VEVENT',
  'UID:a1@example.org',
  'DTSTAMP:20261120T000000Z',
  'DTSTART:20261207T090000Z',
  'DTEND:20261207T120000Z',
  'SUMMARY:Busy',
  'END:VEVENT',
  'END:VCALENDAR',
  '',
].join('\r\n');

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'slotwright-meet-'));
  mkdirSync(join(dir, 'feeds'));
  writeFileSync(join(dir, 'workspace.yaml'), YAML);
  writeFileSync(join(dir, 'feeds', 'ana.ics'), ICS);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const base = () => [
  'meet',
  '--workspace',
  dir,
  '--now',
  '2026-12-01T12:00:00Z',
  '--from',
  '2026-12-07',
  '--to',
  '2026-12-08',
];

describe('slotwright meet', () => {
  it('ranks options in the Lisbon and Halifax overlap (13:00-17:00 UTC, ana busy until 12:00) with exact JSON', async () => {
    const io = recordingIo();
    const code = await runCli(
      [...base(), '--with', 'ana,bo', '--length', '1h', '--options', '2', '--json'],
      io,
    );
    expect(code).toBe(0);
    expect(io.errText).toEqual([]);
    // 14:00Z is 10:00 in Halifax: out of both first hours (no early penalty), and it splits a free
    // stretch for both; 13:00Z would be bo's first hour (-6). The window holds one free stretch, so the
    // second option comes from it too without overlapping the first.
    expect(JSON.parse(io.outText.join('\n'))).toEqual({
      options: [
        {
          start: '2026-12-07T14:00:00.000Z',
          end: '2026-12-07T15:00:00.000Z',
          room: null,
          score: 97.71,
          breakdown: [
            { why: '0.6 days after the window opens', points: -0.29 },
            { why: 'splits a long free stretch for ana, bo', points: -2 },
          ],
        },
        {
          start: '2026-12-07T15:00:00.000Z',
          end: '2026-12-07T16:00:00.000Z',
          room: null,
          score: 97.69,
          breakdown: [
            { why: '0.6 days after the window opens', points: -0.31 },
            { why: 'splits a long free stretch for ana, bo', points: -2 },
          ],
        },
      ],
      blockers: [],
      relaxations: [],
      warnings: [],
    });
  });

  it('exits 3 with blockers and relaxations when the three offices share no working hour', async () => {
    const io = recordingIo();
    const code = await runCli([...base(), '--with', 'trio', '--length', '1h', '--json'], io);
    expect(code).toBe(3);
    const out = JSON.parse(io.outText.join('\n')) as {
      options: unknown[];
      blockers: { who: string; kind: string; detail: string }[];
      relaxations: { change: string; opens: number }[];
    };
    expect(out.options).toEqual([]);
    expect(out.blockers).toHaveLength(2);
    for (const b of out.blockers) {
      expect(b.kind).toBe('person');
      expect(b.detail).toMatch(
        /^(ana|bo|cy)'s working hours \(09:00-17:00 (Europe\/Lisbon|America\/Halifax|Pacific\/Auckland)\)$/,
      );
    }
    expect(out.relaxations.length).toBeGreaterThan(0);
    expect(out.relaxations[0]!.change).toMatch(/^make /);
  });

  it('chooses a room only when seats or needs are asked, and names room needs that nothing meets', async () => {
    const io = recordingIo();
    expect(
      await runCli(
        [...base(), '--with', 'ana,bo', '--length', '1h', '--seats', '5', '--options', '1', '--json'],
        io,
      ),
    ).toBe(0);
    const out = JSON.parse(io.outText.join('\n')) as { options: { room: string; breakdown: unknown[] }[] };
    expect(out.options[0]!.room).toBe('big');
    expect(out.options[0]!.breakdown).toContainEqual({
      why: 'big has 3 more seats than needed',
      points: -0.75,
    });
    const none = recordingIo();
    expect(
      await runCli(
        [...base(), '--with', 'ana,bo', '--length', '1h', '--seats', '5', '--needs', 'whiteboard', '--json'],
        none,
      ),
    ).toBe(3);
    expect(JSON.parse(none.outText.join('\n')).blockers).toEqual([
      { who: 'rooms', kind: 'room', detail: 'a room with at least 5 seats' },
      { who: 'rooms', kind: 'room', detail: 'a room with whiteboard' },
    ]);
  });

  it('prints plain text with times in the workspace zone', async () => {
    const io = recordingIo();
    expect(await runCli([...base(), '--with', 'ana,bo', '--length', '1h', '--options', '1'], io)).toBe(0);
    expect(io.outText).toEqual([
      '1. Mon 2026-12-07 14:00-15:00 Europe/Lisbon  score 97.71',
      '     -0.29 0.6 days after the window opens',
      '     -2 splits a long free stretch for ana, bo',
    ]);
  });

  it.each([
    [
      ['--with', 'ana,zed', '--length', '1h'],
      "slotwright meet: --with: 'zed' is neither a person nor a group of this workspace",
    ],
    [
      ['--with', 'ana', '--length', 'soon'],
      "slotwright meet: --length 'soon' is not a length; use forms like 45m, 1h30m or 90 (minutes)",
    ],
    [
      ['--with', 'ana', '--length', '1h', '--to', '2026-12-06'],
      'slotwright meet: --to must come after --from',
    ],
    [
      ['--with', 'ana', '--length', '1h', '--to', '2026-12-09T10:00'],
      "slotwright meet: --to '2026-12-09T10:00' is neither a date (YYYY-MM-DD) nor an instant with an offset (2026-12-07T14:00Z)",
    ],
    [['--length', '1h'], 'slotwright meet: --with is required (people or groups, comma-separated)'],
    [
      ['--with', 'ana', '--length', '1h', '--seats', 'two'],
      "slotwright meet: --seats takes a whole number of at least 1, got 'two'",
    ],
  ])('exits 2 on bad arguments %j', async (extra, message) => {
    const io = recordingIo();
    expect(await runCli([...base(), ...extra], io)).toBe(2);
    expect(io.errText).toEqual([message]);
  });

  it('exits 1 when the workspace cannot be read', async () => {
    const io = recordingIo();
    expect(
      await runCli(['meet', '--workspace', join(dir, 'missing'), '--with', 'ana', '--length', '1h'], io),
    ).toBe(1);
    expect(io.errText[0]).toContain('no workspace.yaml (or workspace.json) in this folder');
  });
});
