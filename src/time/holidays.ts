import Holidays from 'date-holidays';
import type { Interval } from './interval.ts';
import { addDays, instantToZoned, zonedToInstant } from './zoned.ts';

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
export function publicHolidays(region: string, zone: string, window: Interval): PublicHoliday[] {
  const hd = instanceFor(region);
  if (hd === null) throw new RangeError(`unknown holiday region '${region}'`);
  if (window.end <= window.start) return [];
  const firstYear = Number(instantToZoned(window.start, zone).date.slice(0, 4));
  const lastYear = Number(instantToZoned(window.end, zone).date.slice(0, 4));
  const out: PublicHoliday[] = [];
  for (let year = firstYear; year <= lastYear; year++) {
    for (const h of hd.getHolidays(year)) {
      if (h.type !== 'public') continue;
      // h.date is "YYYY-MM-DD hh:mm:ss" in the region's own local time; read it on the person's wall clock
      const date = h.date.slice(0, 10);
      const minutes = Number(h.date.slice(11, 13)) * 60 + Number(h.date.slice(14, 16));
      const start = zonedToInstant(date, minutes, zone);
      const end = zonedToInstant(addDays(date, 1), 0, zone);
      if (end > window.start && start < window.end)
        out.push({ date, name: h.name, interval: { start, end } });
    }
  }
  return out;
}
