import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { type OpenedService, openService } from '../../src/main.ts';

// Rui (invented) has a late call on Monday 2026-12-07, 21:00-22:00 UTC (Lisbon is UTC+0 in December,
// IANA tz database), and is busy on Tuesday from 11:00. With 13 hours of rest his Tuesday starts at 11:00.
const ics = (start: string, end: string) =>
  [
    'BEGIN:VCALENDAR',
    'VERSION:2.0',
    'PRODID:-//slotwright tests//EN',
    'BEGIN:VEVENT',
    `UID:${start}@saltline.example`,
    'DTSTAMP:20261201T000000Z',
    `DTSTART:${start}`,
    `DTEND:${end}`,
    'SUMMARY:Call',
    'END:VEVENT',
    'END:VCALENDAR',
    '',
  ].join('\r\n');

const NOW = Date.parse('2026-12-01T18:00:00Z');

function workspace(rest: string, extraRuiFeed: boolean): string {
  const dir = mkdtempSync(join(tmpdir(), 'slotwright-rest-'));
  mkdirSync(join(dir, 'feeds'));
  writeFileSync(join(dir, 'feeds', 'rui-late.ics'), ics('20261207T210000Z', '20261207T220000Z'));
  writeFileSync(join(dir, 'feeds', 'rui-tue.ics'), ics('20261208T110000Z', '20261208T170000Z'));
  writeFileSync(
    join(dir, 'workspace.yaml'),
    `name: Saltline Survey Cooperative (rest test)
zone: Europe/Lisbon
grid: 15
workingHours: {mon: ["09:00-17:00"], tue: ["09:00-17:00"], wed: ["09:00-17:00"], thu: ["09:00-17:00"], fri: ["09:00-17:00"]}
admins: [ines]
people:
  - {id: ines, name: Ines Carvalhal, zone: Europe/Lisbon}
  - {id: rui, name: Rui Teixo, zone: Europe/Lisbon, feeds: [feeds/rui-late.ics${extraRuiFeed ? ', feeds/rui-tue.ics' : ''}]}
series:
  - {id: ines-rui, name: Ines and Rui one-to-one, attendees: [ines, rui], minutes: 30, days: [tue], hours: ["09:00-12:00"]}
weekPlan: {step: 15}
${rest}`,
  );
  return dir;
}

let opened: OpenedService | undefined;
afterEach(async () => {
  await opened?.close();
  opened = undefined;
});

const tuesday = { from: '2026-12-08', to: '2026-12-08' };

describe('rest between days set in workspace.yaml reaches meet and the week plan', () => {
  it('meet: without rest Tuesday 09:00-11:00 is open; 13 hours of rest after the late call closes it', async () => {
    opened = await openService(workspace('', true), { now: () => NOW, database: ':memory:', pool: false });
    const s = opened.service;
    const q = {
      lengthMinutes: 30,
      required: [{ kind: 'name' as const, id: 'rui' }],
      optional: [],
      window: tuesday,
      features: [],
    };
    const free = await s.meet(s.person('ines')!, q, NOW);
    if (!free.ok) throw new Error(JSON.stringify(free.issues));
    expect(free.value.options.length).toBeGreaterThan(0);
    for (const o of free.value.options) expect(o.end).toBeLessThanOrEqual(Date.parse('2026-12-08T11:00:00Z'));
    await opened.close();

    opened = await openService(workspace('rest: {hours: 13}\n', true), {
      now: () => NOW,
      database: ':memory:',
      pool: false,
    });
    const s2 = opened.service;
    const rested = await s2.meet(s2.person('ines')!, q, NOW);
    if (!rested.ok) throw new Error(JSON.stringify(rested.issues));
    expect(rested.value.options).toEqual([]);
  });

  it("a person's own rest wins over the workspace's: 10 hours for Rui (Monday 22:00 + 10 h = Tuesday 08:00) leaves Tuesday 09:00-11:00 open", async () => {
    const dir = workspace('rest: {hours: 13}\n', true);
    const yaml = join(dir, 'workspace.yaml');
    const { readFileSync } = await import('node:fs');
    writeFileSync(
      yaml,
      readFileSync(yaml, 'utf8').replace(
        'feeds: [feeds/rui-late.ics',
        'rest: {hours: 10}, feeds: [feeds/rui-late.ics',
      ),
    );
    opened = await openService(dir, { now: () => NOW, database: ':memory:', pool: false });
    const s = opened.service;
    const r = await s.meet(
      s.person('ines')!,
      {
        lengthMinutes: 30,
        required: [{ kind: 'name', id: 'rui' }],
        optional: [],
        window: tuesday,
        features: [],
      },
      NOW,
    );
    if (!r.ok) throw new Error(JSON.stringify(r.issues));
    expect(r.value.options.length).toBeGreaterThan(0);
  });

  it('week plan: the Tuesday one-to-one moves from 09:00 to 11:00 or later under 13 hours of rest', async () => {
    opened = await openService(workspace('', false), { now: () => NOW, database: ':memory:', pool: false });
    const plain = await opened.service.week(opened.service.person('ines')!, '2026-W50', NOW);
    if (!plain.ok) throw new Error(JSON.stringify(plain.issues));
    expect(plain.value.sessions).toHaveLength(1);
    await opened.close();

    opened = await openService(workspace('rest: {hours: 13}\n', false), {
      now: () => NOW,
      database: ':memory:',
      pool: false,
    });
    const rested = await opened.service.week(opened.service.person('ines')!, '2026-W50', NOW);
    if (!rested.ok) throw new Error(JSON.stringify(rested.issues));
    expect(rested.value.sessions).toHaveLength(1);
    // Monday 22:00 UTC + 13 h = Tuesday 11:00 UTC.
    expect(rested.value.sessions[0]!.start).toBeGreaterThanOrEqual(Date.parse('2026-12-08T11:00:00Z'));
    expect(plain.value.sessions[0]!.start).toBeLessThan(Date.parse('2026-12-08T11:00:00Z'));
  });
});

describe('rest between days in the meet use case the CLI calls', () => {
  it('keeps Tuesday before 11:00 free of options after the late call under 13 hours of rest', async () => {
    const { meet } = await import('../../src/app/meet.ts');
    const { loadWorkspace } = await import('../../src/config/load-workspace.ts');
    const window = { start: Date.parse('2026-12-08T00:00:00Z'), end: Date.parse('2026-12-09T00:00:00Z') };
    const ask = { with: ['ines', 'rui'], lengthMinutes: 30, window, options: 50 };
    for (const [rest, earliest] of [
      ['', Date.parse('2026-12-08T09:00:00Z')],
      ['rest: {hours: 13}\n', Date.parse('2026-12-08T11:00:00Z')],
    ] as const) {
      const ws = loadWorkspace(workspace(rest, false), { now: NOW });
      if (!ws.ok) throw new Error(JSON.stringify(ws.issues));
      const r = await meet(ws.value, ask, { now: NOW });
      if (!r.ok) throw new Error(JSON.stringify(r.issues));
      // Working hours 09:00-17:00 Lisbon (UTC+0); 13 h after Monday 22:00 UTC is Tuesday 11:00 UTC.
      expect(Math.min(...r.value.options.map((o) => o.start))).toBe(earliest);
    }
  });
});

describe('rest between days in the week verb of the CLI', () => {
  it('places the Tuesday one-to-one at 11:00 or later under 13 hours of rest, before 11:00 without', async () => {
    const { runCli } = await import('../../src/cli/main.ts');
    const plan = async (rest: string) => {
      const out: string[] = [];
      const io = { out: (t: string) => out.push(t), err: () => {}, env: {}, isTty: false, now: () => NOW };
      const args = ['week', '--workspace', workspace(rest, false), '--week', '2026-W50', '--seed', '1'];
      const code = await runCli(
        [...args, '--seconds', '1', '--now', new Date(NOW).toISOString(), '--json'],
        io,
      );
      expect(code).toBe(0);
      return JSON.parse(out.join('\n')) as { sessions: { start: string }[] };
    };
    const plain = await plan('');
    const rested = await plan('rest: {hours: 13}\n');
    expect(plain.sessions).toHaveLength(1);
    expect(rested.sessions).toHaveLength(1);
    // Monday 22:00 UTC + 13 h = Tuesday 11:00 UTC.
    expect(Date.parse(plain.sessions[0]!.start)).toBeLessThan(Date.parse('2026-12-08T11:00:00Z'));
    expect(Date.parse(rested.sessions[0]!.start)).toBeGreaterThanOrEqual(Date.parse('2026-12-08T11:00:00Z'));
  });
});
