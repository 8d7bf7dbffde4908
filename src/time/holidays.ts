import Holidays from 'date-holidays';
import type { Interval } from './interval.ts';
import { nextDate, type ZoneClock, zoneClock } from './working-hours.ts';

/** One public holiday of a region as an interval of instants in a zone. */
export interface PublicHoliday {
  /** Local date `YYYY-MM-DD`. */
  readonly date: string;
  /** Name as the holiday data gives it (in the region's first language). */
  readonly name: string;
  /** From the local start of the holiday to the next local midnight, in the zone asked for. */
  readonly interval: Interval;
}

// date-holidays builds its rule set on construction (milliseconds each), so one instance per region.
const cache = new Map<string, Holidays | null>();
// The public days of one region and year never change, and reading them costs about a millisecond.
const yearCache = new Map<string, readonly { date: string; minutes: number; name: string }[]>();

function publicDays(
  region: string,
  hd: Holidays,
  year: number,
): readonly { date: string; minutes: number; name: string }[] {
  const key = `${region}/${year}`;
  let days = yearCache.get(key);
  if (days === undefined) {
    days = hd
      .getHolidays(year)
      .filter((h) => h.type === 'public')
      // h.date is "YYYY-MM-DD hh:mm:ss" in the region's own local time
      .map((h) => ({
        date: h.date.slice(0, 10),
        minutes: Number(h.date.slice(11, 13)) * 60 + Number(h.date.slice(14, 16)),
        name: h.name,
      }));
    yearCache.set(key, days);
  }
  return days;
}

function split(region: string): [string, string | undefined] {
  const [country, state, ...rest] = region.split('-');
  if (country === undefined || rest.length > 0) return ['', undefined];
  return [country.toUpperCase(), state?.toUpperCase()];
}

function instanceFor(region: string): Holidays | null {
  if (cache.has(region)) return cache.get(region) ?? null;
  const [country, state] = split(region);
  let hd: Holidays | null = null;
  const probe = new Holidays();
  const countries = probe.getCountries() ?? {};
  if (country in countries) {
    if (state === undefined) hd = new Holidays(country);
    else if (state in (probe.getStates(country) ?? {})) hd = new Holidays(country, state);
  }
  cache.set(region, hd);
  return hd;
}

/**
 * True when the date-holidays data knows the region: a country code ("PT", "NZ") or a country and
 * state code joined by a dash ("CA-NS").
 */
export function isKnownHolidayRegion(region: string): boolean {
  return instanceFor(region) !== null;
}

/**
 * The public holidays (type 'public' in date-holidays, substitute days included, bank and observance
 * days left out) of a region that overlap a window, as local days in `zone`. Throws a RangeError for
 * an unknown region; check it first with isKnownHolidayRegion.
 */
export function publicHolidays(
  region: string,
  zone: string,
  window: Interval,
  clock: ZoneClock = zoneClock(zone, window),
): PublicHoliday[] {
  const hd = instanceFor(region);
  if (hd === null) throw new RangeError(`unknown holiday region '${region}'`);
  if (window.end <= window.start) return [];
  const firstYear = Number(clock.dateOf(window.start).slice(0, 4));
  const lastYear = Number(clock.dateOf(window.end).slice(0, 4));
  const out: PublicHoliday[] = [];
  for (let year = firstYear; year <= lastYear; year++) {
    for (const h of publicDays(region, hd, year)) {
      // read on the person's own wall clock: the day off is their local day
      const start = clock.toInstant(h.date, h.minutes);
      const end = clock.toInstant(nextDate(h.date), 0);
      if (end > window.start && start < window.end)
        out.push({ date: h.date, name: h.name, interval: { start, end } });
    }
  }
  return out;
}
