import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadWorkspace, parseWorkspace } from '../../src/config/load-workspace.ts';

const NOW = Date.parse('2026-12-01T12:00:00Z');
const where = { file: '/ws/workspace.yaml', dir: '/ws' };
const DEMO = join(import.meta.dirname, '..', '..', 'fixtures', 'demo');

const GOOD = `zone: Europe/Lisbon
people:
  - id: ana
    name: Ana
    email: ana@example.org
    feeds: [feeds/ana.ics]
  - {id: bo, name: Bo, zone: America/Halifax, holidays: CA-NS}
rooms:
  - {id: small, name: Small, capacity: 4, features: [screen]}
groups:
  - {id: pair, members: [ana, bo]}
`;

function messages(text: string): string[] {
  const r = parseWorkspace(text, where, { now: NOW });
  if (r.ok) throw new Error('expected the workspace to be refused');
  return r.issues.map((i) => i.message);
}

describe('parseWorkspace', () => {
  it('fills defaults: grid 5, horizon 14, Mon-Fri 09:00-17:00, tentative as a penalty, the workspace zone', () => {
    const r = parseWorkspace(GOOD, where, { now: NOW });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const ws = r.value;
    expect([ws.grid, ws.horizon, ws.tentative]).toEqual([5, 14, 'penalty']);
    expect(ws.workingHours.mon).toEqual([{ start: 540, end: 1020 }]);
    expect(ws.workingHours.sat).toBeUndefined();
    expect(ws.people[0]).toMatchObject({ id: 'ana', zone: 'Europe/Lisbon', rules: [] });
    expect(ws.people[0]!.feeds).toEqual([{ kind: 'file', ref: 'feeds/ana.ics', path: '/ws/feeds/ana.ics' }]);
    expect(ws.people[1]).toMatchObject({ zone: 'America/Halifax', holidays: 'CA-NS' });
    expect(ws.rooms[0]).toMatchObject({ zone: 'Europe/Lisbon', capacity: 4, features: ['screen'] });
    expect(ws.groups).toEqual([{ id: 'pair', members: ['ana', 'bo'] }]);
    expect(ws.warnings).toEqual([]);
  });

  it('loads the same workspace written as JSON (JSON is YAML 1.2)', () => {
    const json = JSON.stringify({
      zone: 'Europe/Lisbon',
      workingHours: { mon: ['08:00-12:00', '13:00-16:00'] },
      people: [{ id: 'ana', name: 'Ana', feeds: ['https://cal.example.org/ana.ics'] }],
    });
    const r = parseWorkspace(json, where, { now: NOW });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.people[0]!.workingHours).toEqual({
      mon: [
        { start: 480, end: 720 },
        { start: 780, end: 960 },
      ],
    });
    expect(r.value.people[0]!.feeds).toEqual([
      { kind: 'url', ref: 'https://cal.example.org/ana.ics', url: 'https://cal.example.org/ana.ics' },
    ]);
  });

  it('warns about unknown top-level keys with their line', () => {
    const r = parseWorkspace(`${GOOD}colour: blue\n`, where, { now: NOW });
    expect(r.ok && r.value.warnings).toEqual([
      "workspace.yaml:12: unknown top-level key 'colour' was ignored",
    ]);
  });

  // each bad workspace: the exact message (file:line: key path: what was expected)
  it.each([
    [
      'a bad zone',
      GOOD.replace('zone: America/Halifax', 'zone: America/Halifx'),
      [
        'workspace.yaml:7: people[1].zone: expected an IANA time zone such as "Europe/Lisbon" or "America/Halifax", got \'America/Halifx\'',
      ],
    ],
    [
      'a missing workspace zone',
      GOOD.replace('zone: Europe/Lisbon\n', ''),
      ['workspace.yaml:1: zone: is required (expected string, received undefined)'],
    ],
    [
      'a bad hour range',
      `${GOOD}workingHours: {mon: ["09:00-17:00"], tue: ["17:00-09:00"]}\n`,
      [
        'workspace.yaml:12: workingHours.tue[0]: \'17:00-09:00\' ends before it starts; a range past midnight goes on two days ("22:00-24:00" and "00:00-02:00")',
      ],
    ],
    [
      'an hour range that is not one',
      GOOD.replace('    feeds: [feeds/ana.ics]\n', '    workingHours:\n      wed: ["9-5"]\n'),
      [
        'workspace.yaml:7: people[0].workingHours.wed[0]: expected "HH:MM-HH:MM" such as "09:00-17:00", got \'9-5\'',
      ],
    ],
    [
      'a misspelt weekday',
      GOOD.replace('    feeds: [feeds/ana.ics]\n', '    workingHours: {mo: ["09:00-12:00"]}\n'),
      ["workspace.yaml:6: people[0].workingHours.mo: unknown key 'mo' (check the spelling)"],
    ],
    [
      'a duplicate id',
      GOOD.replace('{id: bo,', '{id: ana,'),
      [
        "workspace.yaml:7: people[1].id: id 'ana' is already used by person 1 (people[0]); people, rooms and groups each need their own id",
        // bo is gone, so the group's member is unknown too
        "workspace.yaml:11: groups[0].members[1]: group 'pair' names 'bo', who is not under people:; add them or fix the id",
      ],
    ],
    [
      'a room id that a person has',
      GOOD.replace('{id: small,', '{id: bo,'),
      [
        "workspace.yaml:9: rooms[0].id: id 'bo' is already used by person 2 (people[1]); people, rooms and groups each need their own id",
      ],
    ],
    [
      'an unknown group member',
      GOOD.replace('members: [ana, bo]', 'members: [ana, cy]'),
      [
        "workspace.yaml:11: groups[0].members[1]: group 'pair' names 'cy', who is not under people:; add them or fix the id",
      ],
    ],
    [
      'an unknown admin',
      `${GOOD}admins: [zed]\n`,
      ["workspace.yaml:12: admins[0]: admin 'zed' is not under people:; add them or fix the id"],
    ],
    [
      'an id with capitals',
      GOOD.replace('id: ana', 'id: Ana'),
      [
        'workspace.yaml:3: people[0].id: expected an id of lower-case letters, digits and dashes, for example "ana" or "chart-room"',
        "workspace.yaml:11: groups[0].members[0]: group 'pair' names 'ana', who is not under people:; add them or fix the id",
      ],
    ],
    [
      'a feed outside the folder',
      GOOD.replace('feeds/ana.ics', '../secret.ics'),
      [
        "workspace.yaml:6: people[0].feeds[0]: a feed path must stay inside the workspace folder (relative, without '..'), got '../secret.ics'",
      ],
    ],
    [
      'a plain http feed',
      GOOD.replace('feeds/ana.ics', 'http://cal.example.org/a.ics'),
      [
        "workspace.yaml:6: people[0].feeds[0]: a feed is a path inside the workspace folder or an https:// URL, got 'http://cal.example.org/a.ics'",
      ],
    ],
    [
      'an unknown holiday region',
      GOOD.replace('holidays: CA-NS', 'holidays: XX'),
      [
        'workspace.yaml:7: people[1].holidays: expected a holiday region of the date-holidays data: a country code such as "PT" or "NZ", or country-state such as "CA-NS"; got \'XX\'',
      ],
    ],
    [
      'a room without capacity',
      GOOD.replace('capacity: 4, ', ''),
      ['workspace.yaml:9: rooms[0].capacity: is required (expected number, received undefined)'],
    ],
    [
      'a grid that does not divide an hour',
      `${GOOD}grid: 7\n`,
      [
        'workspace.yaml:12: grid: expected minutes that divide an hour: 1, 2, 3, 4, 5, 6, 10, 12, 15, 20, 30, 60',
      ],
    ],
    [
      'an unknown key on a person',
      GOOD.replace('    name: Ana\n', '    name: Ana\n    phone: 1\n'),
      ["workspace.yaml:5: people[0].phone: unknown key 'phone' (check the spelling)"],
    ],
    [
      'a tentative mode that is not one',
      `${GOOD}tentative: maybe\n`,
      ['workspace.yaml:12: tentative: Invalid option: expected one of "penalty"|"hard"'],
    ],
  ])('refuses %s', (_what, text, expected) => {
    expect(messages(text)).toEqual(expected);
  });

  it('reports YAML syntax errors with their line', () => {
    const out = messages('zone: Europe/Lisbon\nzone: UTC\n');
    expect(out).toHaveLength(1);
    expect(out[0]).toBe('workspace.yaml:2: Map keys must be unique');
  });

  it('refuses a document that is not a mapping', () => {
    expect(messages('- a\n- b\n')).toEqual([
      'workspace.yaml:1: expected a mapping of keys such as zone:, people:',
    ]);
  });
});

describe('loadWorkspace', () => {
  const tmp = mkdtempSync(join(tmpdir(), 'slotwright-ws-'));
  afterAll(() => rmSync(tmp, { recursive: true, force: true }));

  it('loads the demo workspace: 14 people, 5 rooms, 6 groups', () => {
    const r = loadWorkspace(DEMO, { now: NOW });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect([r.value.people.length, r.value.rooms.length, r.value.groups.length]).toEqual([14, 5, 6]);
    expect(r.value.people.find((p) => p.id === 'maren')).toMatchObject({
      zone: 'America/Halifax',
      holidays: 'CA-NS',
    });
  });

  it('falls back to workspace.json and says so when neither file is there', () => {
    writeFileSync(join(tmp, 'workspace.json'), '{"zone": "UTC", "people": [{"id": "ana", "name": "Ana"}]}');
    const r = loadWorkspace(tmp, { now: NOW });
    expect(r.ok && r.value.file).toBe(join(tmp, 'workspace.json'));
    const missing = loadWorkspace(join(tmp, 'nope'), { now: NOW });
    expect(missing.ok).toBe(false);
    if (!missing.ok) expect(missing.issues[0]!.message).toContain('no workspace.yaml (or workspace.json)');
  });
});
