import fc from 'fast-check';
import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import { SlotwrightError } from '../../src/errors.ts';
import { REST_CAUTION, restBreaches, restEffect } from '../../src/rules/rest.ts';
import type { Interval } from '../../src/time/interval.ts';

const at = (iso: string): number => Temporal.Instant.from(iso).epochMilliseconds;
const local = (dateTime: string, zone: string): number =>
  Temporal.PlainDateTime.from(dateTime).toZonedDateTime(zone).epochMilliseconds;
const overlaps = (a: Interval, list: readonly Interval[]): boolean =>
  list.some((b) => a.start < b.end && a.end > b.start);

// 11 hours: the daily rest of the EU working-time directive 2003/88/EC, article 3.
const EU_DAILY_REST_HOURS = 11;

describe('restEffect', () => {
  it('a late meeting in Lisbon forbids an early one the next Lisbon morning for that person', () => {
    // A call with Auckland that ends 22:00 in Lisbon on Monday 2026-12-07 (WET, UTC+0 in December).
    const late = {
      start: local('2026-12-07T21:00', 'Europe/Lisbon'),
      end: local('2026-12-07T22:00', 'Europe/Lisbon'),
    };
    const effect = restEffect([late], {
      zone: 'Europe/Lisbon',
      hours: EU_DAILY_REST_HOURS,
      from: at('2026-12-07T00:00Z'),
      to: at('2026-12-12T00:00Z'),
    });
    expect(effect.strength).toBe('hard');
    expect(effect.avoid).toEqual([{ start: at('2026-12-08T00:00Z'), end: at('2026-12-08T09:00Z') }]);
    const early = {
      start: local('2026-12-08T08:00', 'Europe/Lisbon'),
      end: local('2026-12-08T08:30', 'Europe/Lisbon'),
    };
    const nine = {
      start: local('2026-12-08T09:00', 'Europe/Lisbon'),
      end: local('2026-12-08T09:30', 'Europe/Lisbon'),
    };
    expect(overlaps(early, effect.avoid)).toBe(true);
    expect(overlaps(nine, effect.avoid)).toBe(false);
    // The same evening meeting on the same day is not a next-day question and stays allowed.
    const sameEvening = {
      start: local('2026-12-07T22:00', 'Europe/Lisbon'),
      end: local('2026-12-07T22:30', 'Europe/Lisbon'),
    };
    expect(overlaps(sameEvening, effect.avoid)).toBe(false);
  });

  it('the same instants read in another zone give that person their own days', () => {
    // 21:00-22:00 UTC on 2026-12-07 is 10:00-11:00 on 2026-12-08 in Auckland (NZDT, UTC+13 from memory;
    // the offset is checked through Temporal below). For an Auckland person it is a morning meeting, so
    // the rest it casts is on the evening before, not the next morning.
    expect(Temporal.Instant.from('2026-12-07T21:00Z').toZonedDateTimeISO('Pacific/Auckland').offset).toBe(
      '+13:00',
    );
    const call = { start: at('2026-12-07T21:00Z'), end: at('2026-12-07T22:00Z') };
    const effect = restEffect([call], {
      zone: 'Pacific/Auckland',
      hours: EU_DAILY_REST_HOURS,
      from: at('2026-12-06T00:00Z'),
      to: at('2026-12-10T00:00Z'),
    });
    // Before 10:00 Tuesday Auckland: nothing on Monday Auckland may end after 23:00 Monday Auckland.
    // After 11:00 Tuesday Auckland: Wednesday Auckland may not start before 22:00 Tuesday, i.e. nothing
    // is forbidden on Wednesday.
    expect(effect.avoid).toEqual([
      {
        start: local('2026-12-07T23:00', 'Pacific/Auckland'),
        end: local('2026-12-08T00:00', 'Pacific/Auckland'),
      },
    ]);
  });

  it('counts real elapsed hours across the Lisbon fall-back night (2026-10-25)', () => {
    // IANA rules (from memory, checked through Temporal): Lisbon leaves WEST (UTC+1) for WET (UTC+0) at
    // 02:00 local on the last Sunday of October, 2026-10-25, so that night has 25 hours.
    expect(Temporal.ZonedDateTime.from('2026-10-24T12:00[Europe/Lisbon]').offset).toBe('+01:00');
    expect(Temporal.ZonedDateTime.from('2026-10-25T12:00[Europe/Lisbon]').offset).toBe('+00:00');
    const late = {
      start: local('2026-10-24T21:00', 'Europe/Lisbon'),
      end: local('2026-10-24T22:00', 'Europe/Lisbon'),
    };
    const effect = restEffect([late], {
      zone: 'Europe/Lisbon',
      hours: EU_DAILY_REST_HOURS,
      from: at('2026-10-24T00:00Z'),
      to: at('2026-10-27T00:00Z'),
    });
    // 22:00 WEST is 21:00Z; 11 hours later is 08:00Z, which is 08:00 WET (not 09:00 as wall-clock
    // arithmetic would say).
    expect(effect.avoid).toEqual([
      { start: local('2026-10-25T00:00', 'Europe/Lisbon'), end: at('2026-10-25T08:00Z') },
    ]);
    expect(Temporal.Instant.from('2026-10-25T08:00Z').toZonedDateTimeISO('Europe/Lisbon').hour).toBe(8);
  });

  it('covers the other direction: an early meeting tomorrow forbids a late one today', () => {
    const early = {
      start: local('2026-12-09T07:00', 'America/Halifax'),
      end: local('2026-12-09T08:00', 'America/Halifax'),
    };
    const effect = restEffect([early], {
      zone: 'America/Halifax',
      hours: 10,
      from: at('2026-12-08T00:00Z'),
      to: at('2026-12-11T00:00Z'),
    });
    // 07:00 minus 10 h = 21:00 the evening before, up to local midnight.
    expect(effect.avoid).toEqual([
      {
        start: local('2026-12-08T21:00', 'America/Halifax'),
        end: local('2026-12-09T00:00', 'America/Halifax'),
      },
      // ...and the usual next-morning rest after that meeting, which ends at 08:00: 10 h later is 18:00,
      // already in the same day, so nothing on the next day is forbidden.
    ]);
  });

  it('ignores long blocks such as all-day leave, which do not open or close a working day', () => {
    const leave = {
      start: local('2026-12-10T00:00', 'Europe/Lisbon'),
      end: local('2026-12-11T00:00', 'Europe/Lisbon'),
    };
    const effect = restEffect([leave], {
      zone: 'Europe/Lisbon',
      hours: 11,
      from: at('2026-12-09T00:00Z'),
      to: at('2026-12-13T00:00Z'),
    });
    expect(effect.avoid).toEqual([]);
  });

  it('clips to the window and can be a preference', () => {
    const late = { start: at('2026-12-07T21:00Z'), end: at('2026-12-07T22:00Z') };
    const effect = restEffect([late], {
      zone: 'Europe/Lisbon',
      hours: 11,
      from: at('2026-12-08T06:00Z'),
      to: at('2026-12-08T07:00Z'),
      strength: 'preference',
      ruleId: 'rest-ines',
    });
    expect(effect).toMatchObject({ ruleId: 'rest-ines', strength: 'preference' });
    expect(effect.avoid).toEqual([{ start: at('2026-12-08T06:00Z'), end: at('2026-12-08T07:00Z') }]);
    expect(effect.text).toContain('11 hours of rest');
  });

  it('refuses hours it cannot honour, saying how to fix them', () => {
    const opts = { zone: 'Europe/Lisbon', from: 0, to: 1 };
    expect(() => restEffect([], { ...opts, hours: 0 })).toThrow(SlotwrightError);
    expect(() => restEffect([], { ...opts, hours: 30 })).toThrow(/at most 24 hours, got 30/);
  });

  it('carries the caution about law and policy', () => {
    expect(REST_CAUTION).toContain('2003/88/EC');
    expect(REST_CAUTION).toMatch(/not legal advice/);
  });

  it('property: a same-day candidate hits the avoid-intervals exactly when it would create a breach', () => {
    const zone = 'Europe/Lisbon';
    const base = local('2026-12-07T00:00', zone);
    const hour = 3_600_000;
    // Meetings on a 15-minute grid across five December days (no DST change in the range).
    const meeting = fc
      .record({
        day: fc.integer({ min: 0, max: 4 }),
        q: fc.integer({ min: 0, max: 88 }),
        len: fc.integer({ min: 1, max: 8 }),
      })
      .map(({ day, q, len }) => ({
        start: base + day * 24 * hour + q * 900_000,
        end: base + day * 24 * hour + (q + len) * 900_000,
      }));
    fc.assert(
      fc.property(
        fc.array(meeting, { maxLength: 6 }),
        meeting,
        fc.integer({ min: 6, max: 13 }),
        (busy, cand, hours) => {
          fc.pre(restBreaches(busy, { zone, hours }).length === 0);
          fc.pre(!overlaps(cand, busy));
          const effect = restEffect(busy, { zone, hours, from: base - 24 * hour, to: base + 7 * 24 * hour });
          const breachesAfter = restBreaches([...busy, cand], { zone, hours }).length;
          expect(overlaps(cand, effect.avoid)).toBe(breachesAfter > 0);
        },
      ),
      { numRuns: 400, seed: 20261201 },
    );
  });
});

describe('restBreaches', () => {
  it('lists consecutive days with too little rest, with the minutes left', () => {
    const zone = 'Europe/Lisbon';
    const meetings = [
      { start: local('2026-12-07T20:00', zone), end: local('2026-12-07T21:30', zone) },
      { start: local('2026-12-08T07:30', zone), end: local('2026-12-08T08:00', zone) },
      { start: local('2026-12-09T09:00', zone), end: local('2026-12-09T10:00', zone) },
    ];
    expect(restBreaches(meetings, { zone, hours: 11 })).toEqual([
      { date: '2026-12-07', lastEnd: meetings[0]!.end, nextStart: meetings[1]!.start, restMinutes: 600 },
    ]);
  });
});
