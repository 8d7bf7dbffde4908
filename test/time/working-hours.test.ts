import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import {
  DEFAULT_WORKING_HOURS,
  describeWeeklyHours,
  parseDailyRange,
  workingIntervals,
  zoneClock,
} from '../../src/time/working-hours.ts';
import { addDays, instantToZoned, zonedToInstant } from '../../src/time/zoned.ts';

const iso = (ms: number) => new Date(ms).toISOString();

describe('parseDailyRange', () => {
  it.each([
    ['09:00-17:00', { start: 540, end: 1020 }],
    ['00:00-24:00', { start: 0, end: 1440 }],
    [' 13:30-14:15 ', { start: 810, end: 855 }],
  ])('reads %s', (text, range) => {
    expect(parseDailyRange(text)).toEqual({ ok: true, range });
  });

  it.each([
    ['9-17', 'expected "HH:MM-HH:MM"'],
    ['09:00-25:00', 'is not a time of day'],
    ['24:30-24:45', 'is not a time of day'],
    ['17:00-09:00', 'ends before it starts'],
    ['10:00-10:00', 'ends before it starts'],
  ])('refuses %s', (text, fragment) => {
    const r = parseDailyRange(text);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toContain(fragment);
  });
});

describe('workingIntervals', () => {
  it('gives Monday to Friday 09:00-17:00 Lisbon in UTC in winter (WET = UTC+0)', () => {
    const from = Date.parse('2026-12-07T00:00:00Z'); // a Monday
    const out = workingIntervals(DEFAULT_WORKING_HOURS, 'Europe/Lisbon', {
      start: from,
      end: from + 7 * 86_400_000,
    });
    expect(out.map((i) => [iso(i.start), iso(i.end)])).toEqual([
      ['2026-12-07T09:00:00.000Z', '2026-12-07T17:00:00.000Z'],
      ['2026-12-08T09:00:00.000Z', '2026-12-08T17:00:00.000Z'],
      ['2026-12-09T09:00:00.000Z', '2026-12-09T17:00:00.000Z'],
      ['2026-12-10T09:00:00.000Z', '2026-12-10T17:00:00.000Z'],
      ['2026-12-11T09:00:00.000Z', '2026-12-11T17:00:00.000Z'],
    ]);
  });

  it('keeps local hours across the end of daylight time in Halifax on 2026-11-01', () => {
    // IANA rules for America/Halifax (from memory, checked with Temporal below): ADT (UTC-3) ends on the
    // first Sunday of November, 2026-11-01 02:00 local, then AST (UTC-4).
    const before = Temporal.ZonedDateTime.from('2026-10-30T09:00[America/Halifax]');
    const after = Temporal.ZonedDateTime.from('2026-11-02T09:00[America/Halifax]');
    expect(before.offset).toBe('-03:00');
    expect(after.offset).toBe('-04:00');
    const from = Date.parse('2026-10-30T00:00:00Z');
    const out = workingIntervals(DEFAULT_WORKING_HOURS, 'America/Halifax', {
      start: from,
      end: from + 4 * 86_400_000,
    });
    expect(out.map((i) => [iso(i.start), iso(i.end)])).toEqual([
      ['2026-10-30T12:00:00.000Z', '2026-10-30T20:00:00.000Z'], // Friday, ADT
      ['2026-11-02T13:00:00.000Z', '2026-11-02T21:00:00.000Z'], // Monday, AST: same local 09:00-17:00
    ]);
  });

  it('clips to the window and merges ranges that touch', () => {
    const from = Date.parse('2026-12-07T10:00:00Z');
    const out = workingIntervals(
      {
        mon: [
          { start: 540, end: 720 },
          { start: 720, end: 780 },
        ],
      },
      'UTC',
      { start: from, end: Date.parse('2026-12-07T12:30:00Z') },
    );
    expect(out.map((i) => [iso(i.start), iso(i.end)])).toEqual([
      ['2026-12-07T10:00:00.000Z', '2026-12-07T12:30:00.000Z'],
    ]);
  });

  it('handles a zone ahead of UTC whose local Monday starts on Sunday in UTC (Auckland, NZDT = UTC+13)', () => {
    const from = Date.parse('2026-12-06T00:00:00Z');
    const out = workingIntervals({ mon: [{ start: 540, end: 1020 }] }, 'Pacific/Auckland', {
      start: from,
      end: from + 2 * 86_400_000,
    });
    expect(out.map((i) => [iso(i.start), iso(i.end)])).toEqual([
      ['2026-12-06T20:00:00.000Z', '2026-12-07T04:00:00.000Z'],
    ]);
  });
});

describe('describeWeeklyHours', () => {
  it('writes one range when all days agree and per day otherwise', () => {
    expect(describeWeeklyHours(DEFAULT_WORKING_HOURS)).toBe('09:00-17:00');
    expect(describeWeeklyHours({ mon: [{ start: 540, end: 720 }], tue: [{ start: 600, end: 1020 }] })).toBe(
      'mon 09:00-12:00; tue 10:00-17:00',
    );
  });
});

describe('zoneClock agrees with Temporal', () => {
  // Compared with zonedToInstant / instantToZoned (Temporal, IANA rules) around the 2026 changes:
  // Halifax 2026-03-08 and 2026-11-01, Lisbon 2026-03-29 and 2026-10-25, Auckland 2026-04-05 and 2026-09-27.
  const cases: [string, string][] = [
    ['America/Halifax', '2026-03-08'],
    ['America/Halifax', '2026-11-01'],
    ['Europe/Lisbon', '2026-03-29'],
    ['Europe/Lisbon', '2026-10-25'],
    ['Pacific/Auckland', '2026-04-05'],
    ['Pacific/Auckland', '2026-09-27'],
    ['Asia/Kathmandu', '2026-06-01'],
  ];
  it.each(cases)('%s around %s, every 15 minutes of four days, including gaps and repeats', (zone, day) => {
    const mid = Date.parse(`${day}T12:00:00Z`);
    const clock = zoneClock(zone, { start: mid - 2 * 86_400_000, end: mid + 2 * 86_400_000 });
    for (let d = -1; d <= 1; d++) {
      const date = addDays(day, d);
      const civilDay = Date.parse(`${date}T00:00:00Z`) / 86_400_000;
      for (let m = 0; m < 1440; m += 15) {
        expect(clock.toInstant(date, m)).toBe(zonedToInstant(date, m, zone));
        expect(clock.toInstantDay(civilDay, m)).toBe(zonedToInstant(date, m, zone));
      }
    }
    for (let t = mid - 2 * 86_400_000; t < mid + 2 * 86_400_000; t += 15 * 60_000) {
      const r = instantToZoned(t, zone);
      expect(clock.dateOf(t)).toBe(r.date);
      expect(clock.dayOf(t)).toBe(Date.parse(`${r.date}T00:00:00Z`) / 86_400_000);
      expect(clock.offsetAt(t)).toBe(r.offsetMinutes * 60_000);
    }
  });
});
