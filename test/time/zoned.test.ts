import { describe, expect, it } from 'vitest';
import {
  addLocalDays,
  canonicalZone,
  instantToLocal,
  instantToZoned,
  localToInstant,
  zonedToInstant,
} from '../../src/time/zoned.ts';

const iso = (ms: number) => new Date(ms).toISOString().replace('.000Z', 'Z');
const at = (y: number, mo: number, d: number, h: number, mi = 0) => ({
  year: y,
  month: mo,
  day: d,
  hour: h,
  minute: mi,
  second: 0,
});

describe('localToInstant and RFC 5545 section 3.3.5', () => {
  // RFC 5545 section 3.3.5: "TZID=America/New_York:20071104T013000 indicates November 4, 2007 at
  // 1:30 A.M. EDT (UTC-04:00)" (first occurrence of a repeated time) and
  // "TZID=America/New_York:20070311T023000 indicates March 11, 2007 at 3:30 A.M. EDT (UTC-04:00)"
  // (a nonexistent time uses the offset before the gap).
  it('takes the first occurrence of a repeated local time', () => {
    expect(iso(localToInstant(at(2007, 11, 4, 1, 30), 'America/New_York'))).toBe('2007-11-04T05:30:00Z');
  });
  it('reads a local time in a gap with the offset before the gap', () => {
    expect(iso(localToInstant(at(2007, 3, 11, 2, 30), 'America/New_York'))).toBe('2007-03-11T07:30:00Z');
  });
  it('agrees with the older zonedToInstant helper', () => {
    expect(localToInstant(at(2007, 3, 11, 2, 30), 'America/New_York')).toBe(
      zonedToInstant('2007-03-11', 150, 'America/New_York'),
    );
  });
  it('converts times around a transition with the per-day cache and without it alike', () => {
    // Every quarter hour of the two 2026 Halifax change days and their neighbours (IANA tzdata,
    // from memory: 2026-03-08 and 2026-11-01 at 02:00 local).
    for (const [m, d] of [
      [3, 7],
      [3, 8],
      [3, 9],
      [10, 31],
      [11, 1],
      [11, 2],
    ] as const) {
      for (let q = 0; q < 96; q++) {
        const local = at(2026, m, d, Math.floor(q / 4), (q % 4) * 15);
        expect(localToInstant(local, 'America/Halifax')).toBe(
          zonedToInstant(
            `2026-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`,
            q * 15,
            'America/Halifax',
          ),
        );
      }
    }
  });
});

describe('2026 zone changes of the demo offices', () => {
  // IANA rules for 2026, from memory, checked here against the zone data Node ships.
  const changes = [
    ['America/Halifax', '2026-03-08', -240, -180],
    ['America/Halifax', '2026-11-01', -180, -240],
    ['Europe/Lisbon', '2026-03-29', 0, 60],
    ['Europe/Lisbon', '2026-10-25', 60, 0],
    ['Pacific/Auckland', '2026-04-05', 780, 720],
    ['Pacific/Auckland', '2026-09-27', 720, 780],
  ] as const;
  for (const [zone, date, before, after] of changes) {
    it(`${zone} changes from UTC${before / 60} to UTC${after / 60} on ${date}`, () => {
      const [y, m, d] = date.split('-').map(Number) as [number, number, number];
      const dayBefore = addLocalDays(at(y, m, d, 12), -1);
      const dayAfter = addLocalDays(at(y, m, d, 12), 1);
      expect(instantToZoned(localToInstant(dayBefore, zone), zone).offsetMinutes).toBe(before);
      expect(instantToZoned(localToInstant(dayAfter, zone), zone).offsetMinutes).toBe(after);
      // and the change happens on that local date: noon of the day itself already has the new offset
      expect(instantToZoned(localToInstant(at(y, m, d, 12), zone), zone).offsetMinutes).toBe(after);
    });
  }
});

describe('helpers', () => {
  it('reads an instant back into local fields', () => {
    expect(instantToLocal(Date.UTC(2026, 11, 7, 13, 0), 'America/Halifax')).toEqual(at(2026, 12, 7, 9));
  });
  it('adds days across month and year ends', () => {
    expect(addLocalDays(at(2026, 12, 31, 9), 1)).toEqual(at(2027, 1, 1, 9));
    expect(addLocalDays(at(2028, 2, 28, 9), 1)).toEqual(at(2028, 2, 29, 9));
  });
  it('knows IANA names and refuses others', () => {
    expect(canonicalZone('Europe/Lisbon')).toBe('Europe/Lisbon');
    expect(canonicalZone('Mars/Olympus_Mons')).toBeUndefined();
    expect(canonicalZone('')).toBeUndefined();
  });
});
