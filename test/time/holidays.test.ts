import { describe, expect, it } from 'vitest';
import { isKnownHolidayRegion, publicHolidays } from '../../src/time/holidays.ts';

const YEAR_2026 = { start: Date.parse('2025-12-31T12:00:00Z'), end: Date.parse('2027-01-01T12:00:00Z') };
const dates = (region: string, zone: string) => publicHolidays(region, zone, YEAR_2026).map((h) => h.date);

describe('publicHolidays (date-holidays data)', () => {
  it('has Portugal 2026-12-08 (Imaculada Conceição) and Restoration of Independence 2026-12-01 (from memory)', () => {
    expect(dates('PT', 'Europe/Lisbon')).toEqual(
      expect.arrayContaining(['2026-12-01', '2026-12-08', '2026-12-25']),
    );
  });

  it('has New Zealand Waitangi Day 2026-02-06 (from memory)', () => {
    expect(dates('NZ', 'Pacific/Auckland')).toContain('2026-02-06');
  });

  it('has Canada Day 2026-07-01 for Nova Scotia and leaves out Victoria Day, not a Nova Scotia holiday (from memory)', () => {
    const ns = dates('CA-NS', 'America/Halifax');
    expect(ns).toContain('2026-07-01');
    expect(ns).not.toContain('2026-05-18');
  });

  it('gives the local day in the zone asked for as instants', () => {
    const [h] = publicHolidays('PT', 'Europe/Lisbon', {
      start: Date.parse('2026-12-08T00:00:00Z'),
      end: Date.parse('2026-12-08T01:00:00Z'),
    });
    expect(h).toMatchObject({ date: '2026-12-08' });
    expect(new Date(h!.interval.start).toISOString()).toBe('2026-12-08T00:00:00.000Z');
    expect(new Date(h!.interval.end).toISOString()).toBe('2026-12-09T00:00:00.000Z');
    const nz = publicHolidays('NZ', 'Pacific/Auckland', YEAR_2026).find((x) => x.date === '2026-02-06')!;
    // NZDT is UTC+13 in February (IANA rules, from memory)
    expect(new Date(nz.interval.start).toISOString()).toBe('2026-02-05T11:00:00.000Z');
  });

  it('keeps only public days (no observances)', () => {
    // Christmas Eve is not a public holiday in Portugal (from memory)
    expect(dates('PT', 'Europe/Lisbon')).not.toContain('2026-12-24');
  });
});

describe('isKnownHolidayRegion', () => {
  it.each([
    ['PT', true],
    ['NZ', true],
    ['CA-NS', true],
    ['ca-ns', true],
    ['XX', false],
    ['CA-ZZ', false],
    ['CA-NS-X', false],
    ['', false],
  ])('%s -> %s', (region, known) => {
    expect(isKnownHolidayRegion(region)).toBe(known);
  });
});
