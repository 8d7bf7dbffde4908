import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import { findOptions } from '../../src/scheduling/find-options.ts';
import { resolveAttendees } from '../../src/scheduling/prepare.ts';
import type { SchedulingContext, SchedulingPerson } from '../../src/scheduling/types.ts';
import { DEFAULT_WORKING_HOURS } from '../../src/time/working-hours.ts';

const DAY = 86_400_000;
const iso = (ms: number) => new Date(ms).toISOString();

function person(id: string, zone: string, extra: Partial<SchedulingPerson> = {}): SchedulingPerson {
  return { id, zone, workingHours: DEFAULT_WORKING_HOURS, busy: [], rules: [], ...extra };
}

function context(people: SchedulingPerson[], extra: Partial<SchedulingContext> = {}): SchedulingContext {
  return {
    zone: 'Europe/Lisbon',
    gridMinutes: 60,
    tentative: 'penalty',
    now: 0,
    people,
    rooms: [],
    groups: [],
    ...extra,
  };
}

describe('working hours across a daylight-saving change', () => {
  it('keeps 09:00-17:00 local in Halifax on both sides of 2026-11-01 (ADT -03:00 to AST -04:00, IANA rules, from memory)', () => {
    // an 8-hour meeting fits only from 09:00 to 17:00 local, so each working day has one start
    const ctx = context([person('maren', 'America/Halifax')]);
    const r = findOptions(ctx, {
      with: ['maren'],
      lengthMinutes: 480,
      window: { start: Date.parse('2026-10-30T00:00:00Z'), end: Date.parse('2026-11-04T00:00:00Z') },
      options: 5,
    });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.options.map((o) => iso(o.start)).sort()).toEqual([
      '2026-10-30T12:00:00.000Z', // Friday, 09:00 ADT
      '2026-11-02T13:00:00.000Z', // Monday, 09:00 AST
      '2026-11-03T13:00:00.000Z',
    ]);
  });
});

describe('public holidays (date-holidays data, dates from memory)', () => {
  it.each([
    ['PT', 'Europe/Lisbon', '2026-12-08'],
    ['NZ', 'Pacific/Auckland', '2026-02-06'],
    ['CA-NS', 'America/Halifax', '2026-07-01'],
  ])('%s (%s): no option on %s, and on that day alone the holiday is the blocker', (region, zone, date) => {
    const p = person('x', zone, { holidayRegion: region });
    // the day before, the day, the day after, in local time
    const from = Date.parse(`${date}T12:00:00Z`) - 2 * DAY;
    const ctx = context([p]);
    const r = findOptions(ctx, {
      with: ['x'],
      lengthMinutes: 60,
      window: { start: from, end: from + 4 * DAY },
      options: 50,
    });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const days = new Set(
      r.value.options.map((o) => new Date(o.start).toLocaleDateString('en-CA', { timeZone: zone })),
    );
    expect(days.has(date)).toBe(false);
    expect(r.value.options.length).toBeGreaterThan(0);
    const local = Temporal.PlainDateTime.from(`${date}T12:00`).toZonedDateTime(zone).epochMilliseconds;
    const only = findOptions(ctx, {
      with: ['x'],
      lengthMinutes: 60,
      window: { start: local - 3 * 3_600_000, end: local + 4 * 3_600_000 },
    });
    expect(only.ok && only.value.options).toEqual([]);
    expect(only.ok && only.value.blockers.map((b) => b.detail)).toEqual([
      expect.stringMatching(new RegExp(`^x's public holidays \\(${region}: ${date} `)),
    ]);
  });
});

describe('blockers and relaxations', () => {
  const halifax = person('maren', 'America/Halifax');
  const lisbon = person('ines', 'Europe/Lisbon');
  const auckland = person('aroha', 'Pacific/Auckland');
  const window = { start: Date.parse('2026-12-07T00:00:00Z'), end: Date.parse('2026-12-12T00:00:00Z') };

  it('names the working hours that leave no common hour and ranks making someone optional first', () => {
    const ctx = context([halifax, lisbon, auckland], {
      gridMinutes: 15,
      groups: [{ id: 'leads', members: ['maren', 'ines', 'aroha'] }],
    });
    const r = findOptions(ctx, { with: ['leads'], lengthMinutes: 60, window });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.options).toEqual([]);
    expect(r.value.blockers).toHaveLength(2);
    for (const b of r.value.blockers)
      expect(b.detail).toMatch(/^(maren|ines|aroha)'s working hours \(09:00-17:00 /);
    const changes = r.value.relaxations.map((x) => x.change);
    expect(changes.some((c) => c.startsWith('make '))).toBe(true);
    // opens counts are starts; sorted from most to fewest
    const opens = r.value.relaxations.map((x) => x.opens);
    expect(opens).toEqual([...opens].sort((a, b) => b - a));
  });

  it('offers a shorter standard length and a wider window when they open starts', () => {
    const busy = [
      {
        start: Date.parse('2026-12-07T10:00:00Z'),
        end: Date.parse('2026-12-07T17:00:00Z'),
        kind: 'busy' as const,
      },
    ];
    const ctx = context([person('ines', 'Europe/Lisbon', { busy })], {
      gridMinutes: 15,
      knownUntil: window.end + 30 * DAY,
    });
    const r = findOptions(ctx, {
      with: ['ines'],
      lengthMinutes: 90,
      window: { start: Date.parse('2026-12-07T09:00:00Z'), end: Date.parse('2026-12-07T17:00:00Z') },
    });
    expect(r.ok && r.value.blockers).toEqual([{ who: 'ines', kind: 'person', detail: "ines's calendar" }]);
    expect(r.ok && r.value.relaxations).toEqual([
      // 27 starts of 90 minutes (09:00 .. 15:30, every 15) on each of Dec 8, 9, 10, 11 and 14
      { change: 'widen the window by 7 days (to 2026-12-14)', opens: 135 },
      // 09:00-10:00 is free on Dec 7: 4, 3, 2 and 1 starts
      { change: 'shorten to 15 minutes', opens: 4 },
      { change: 'shorten to 30 minutes', opens: 3 },
      { change: 'shorten to 45 minutes', opens: 2 },
      { change: 'shorten to 60 minutes', opens: 1 },
    ]);
  });

  it('names room needs when no room has them, and offers dropping the need', () => {
    const ctx = context([lisbon], {
      rooms: [
        { id: 'sounding', capacity: 3, features: ['whiteboard'], zone: 'Europe/Lisbon', busy: [], rules: [] },
      ],
    });
    const r = findOptions(ctx, { with: ['ines'], lengthMinutes: 60, window, needs: ['screen'] });
    expect(r.ok && r.value.blockers).toEqual([{ who: 'rooms', kind: 'room', detail: 'a room with screen' }]);
    expect(r.ok && r.value.relaxations.map((x) => x.change)).toEqual(['drop the need for screen']);
  });

  it('counts tentative time as busy when the workspace says so, and offers accepting it', () => {
    const busy = [{ start: window.start, end: window.end, kind: 'tentative' as const }];
    const p = person('ines', 'Europe/Lisbon', { busy });
    const soft = findOptions(context([p]), { with: ['ines'], lengthMinutes: 60, window });
    expect(soft.ok && soft.value.options.length).toBe(5);
    expect(soft.ok && soft.value.options[0]!.breakdown).toContainEqual({
      why: 'overlaps tentative time of ines',
      points: -8,
    });
    const hard = findOptions(context([p], { tentative: 'hard' }), {
      with: ['ines'],
      lengthMinutes: 60,
      window,
    });
    expect(hard.ok && hard.value.options).toEqual([]);
    expect(hard.ok && hard.value.relaxations.map((x) => x.change)).toContain('accept tentative conflicts');
  });
});

describe('resolveAttendees', () => {
  const ctx = context([person('ana', 'UTC'), person('bo', 'UTC')], {
    groups: [{ id: 'pair', members: ['ana', 'bo'] }],
    rooms: [{ id: 'tejo', capacity: 4, features: [], zone: 'UTC', busy: [], rules: [] }],
  });
  const window = { start: 0, end: DAY };

  it('expands groups, drops duplicates and keeps required people out of the optional list', () => {
    const r = resolveAttendees(ctx, { with: ['pair', 'ana'], optional: ['bo'], lengthMinutes: 30, window });
    expect(r.ok && r.value.required.map((p) => p.id)).toEqual(['ana', 'bo']);
    expect(r.ok && r.value.optional).toEqual([]);
  });

  it('refuses unknown ids and rooms named as attendees, saying which', () => {
    const r = resolveAttendees(ctx, { with: ['ana', 'zed'], optional: ['tejo'], lengthMinutes: 30, window });
    expect(r).toEqual({
      ok: false,
      issues: [
        {
          code: 'unknown_attendee',
          path: ['with', 1],
          message: "'zed' is neither a person nor a group of this workspace",
        },
        {
          code: 'room_as_attendee',
          path: ['optional', 0],
          message: "'tejo' is a room; ask for a room with seats or needs instead of naming it as an attendee",
        },
      ],
    });
  });

  it('refuses lengths, buffers and seats that are not whole positive numbers', () => {
    const r = findOptions(ctx, { with: ['ana'], lengthMinutes: 0, window, seats: 0, bufferMinutes: -5 });
    expect(r.ok ? [] : r.issues.map((i) => i.code)).toEqual(['bad_length', 'bad_buffer', 'bad_seats']);
  });
});
