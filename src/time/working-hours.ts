import { Temporal } from 'temporal-polyfill';
import type { Interval } from './interval.ts';
import { mergeIntervals } from './interval.ts';

/** Weekday keys as written in a workspace, Monday first (index + 1 = ISO weekday). */
export const WEEKDAY_KEYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;

/** A weekday key: 'mon' .. 'sun'. */
export type WeekdayKey = (typeof WEEKDAY_KEYS)[number];

/** One local range of a day, in minutes since local midnight; `end` may be 1440 (24:00). */
export interface DailyRange {
  readonly start: number;
  readonly end: number;
}

/** Weekly working hours in local time; a missing or empty day means no working hours that day. */
export type WeeklyHours = Readonly<Partial<Record<WeekdayKey, readonly DailyRange[]>>>;

/** Monday to Friday, 09:00-17:00: the default when a workspace names no hours (common practice). */
export const DEFAULT_WORKING_HOURS: WeeklyHours = {
  mon: [{ start: 540, end: 1020 }],
  tue: [{ start: 540, end: 1020 }],
  wed: [{ start: 540, end: 1020 }],
  thu: [{ start: 540, end: 1020 }],
  fri: [{ start: 540, end: 1020 }],
};

const RANGE = /^(\d{2}):(\d{2})-(\d{2}):(\d{2})$/;

/**
 * Parses "HH:MM-HH:MM" (24-hour clock, end after start, end may be 24:00). A range past midnight is
 * refused rather than guessed: write it as two ranges on two days.
 */
export function parseDailyRange(
  text: string,
): { readonly ok: true; readonly range: DailyRange } | { readonly ok: false; readonly message: string } {
  const m = RANGE.exec(text.trim());
  if (m === null)
    return { ok: false, message: `expected "HH:MM-HH:MM" such as "09:00-17:00", got '${text}'` };
  const [h1, m1, h2, m2] = [m[1], m[2], m[3], m[4]].map(Number) as [number, number, number, number];
  if (h1 > 23 || m1 > 59 || h2 > 24 || m2 > 59 || (h2 === 24 && m2 !== 0))
    return { ok: false, message: `'${text}' is not a time of day (hours 00-23, minutes 00-59, or 24:00)` };
  const start = h1 * 60 + m1;
  const end = h2 * 60 + m2;
  if (end <= start)
    return {
      ok: false,
      message: `'${text}' ends before it starts; a range past midnight goes on two days ("22:00-24:00" and "00:00-02:00")`,
    };
  return { ok: true, range: { start, end } };
}

function hhmm(minutes: number): string {
  return `${String(Math.floor(minutes / 60)).padStart(2, '0')}:${String(minutes % 60).padStart(2, '0')}`;
}

/** Writes a daily range back as "HH:MM-HH:MM". */
export function formatDailyRange(range: DailyRange): string {
  return `${hhmm(range.start)}-${hhmm(range.end)}`;
}

/**
 * A short description of weekly hours for explanations: "09:00-17:00" when every working day has the
 * same ranges, else one entry per day ("mon 09:00-12:00, tue 10:00-17:00").
 */
export function describeWeeklyHours(hours: WeeklyHours): string {
  const days = WEEKDAY_KEYS.filter((d) => (hours[d]?.length ?? 0) > 0);
  if (days.length === 0) return 'no working hours';
  const text = (d: WeekdayKey) => (hours[d] ?? []).map(formatDailyRange).join(', ');
  const first = text(days[0]!);
  if (days.every((d) => text(d) === first)) return first;
  return days.map((d) => `${d} ${text(d)}`).join('; ');
}

const DAY_MS = 86_400_000;

/**
 * Wall-clock arithmetic for one zone over one stretch of time, with the zone's UTC offsets and
 * transitions read from Temporal once (a handful of calls) instead of once per local date: per-date
 * Temporal calls dominate model building otherwise. Agrees with zonedToInstant / instantToZoned inside
 * the stretch it was made for (and two days either side).
 */
export interface ZoneClock {
  readonly zone: string;
  /** UTC offset in ms at an instant (local = UTC + offset). */
  offsetAt(instant: number): number;
  /** Instant of a local date and minutes since local midnight; gaps move forward, repeats take the first (RFC 5545 3.3.5). */
  toInstant(date: string, minutes: number): number;
  /** Local date `YYYY-MM-DD` of an instant. */
  dateOf(instant: number): string;
  /** Local civil day of an instant, as days since 1970-01-01. */
  dayOf(instant: number): number;
  /** Instant of a local civil day (days since 1970-01-01) and minutes since its midnight. */
  toInstantDay(day: number, minutes: number): number;
}

function civil(date: string): number {
  return Date.UTC(Number(date.slice(0, 4)), Number(date.slice(5, 7)) - 1, Number(date.slice(8, 10)));
}

function isoDate(utcMidnight: number): string {
  return new Date(utcMidnight).toISOString().slice(0, 10);
}

/** A ZoneClock valid over `span` (plus two days either side). */
export function zoneClock(zone: string, span: Interval): ZoneClock {
  const lo = span.start - 2 * DAY_MS;
  const hi = span.end + 2 * DAY_MS;
  let z = Temporal.Instant.fromEpochMilliseconds(lo).toZonedDateTimeISO(zone);
  const from: number[] = [Number.NEGATIVE_INFINITY];
  const offset: number[] = [z.offsetNanoseconds / 1e6];
  for (;;) {
    const next = z.getTimeZoneTransition('next');
    if (next === null || next.epochMilliseconds > hi) break;
    from.push(next.epochMilliseconds);
    offset.push(next.offsetNanoseconds / 1e6);
    z = next;
  }
  const offsetAt = (t: number): number => {
    let i = from.length - 1;
    while (i > 0 && from[i]! > t) i--;
    return offset[i]!;
  };
  return {
    zone,
    offsetAt,
    toInstant(date, minutes) {
      return this.toInstantDay(civil(date) / DAY_MS, minutes);
    },
    toInstantDay(day, minutes) {
      const wall = day * DAY_MS + minutes * 60_000;
      const before = offsetAt(wall - DAY_MS);
      const after = offsetAt(wall + DAY_MS);
      const c1 = wall - before;
      const c2 = wall - after;
      const ok1 = offsetAt(c1) === before;
      const ok2 = offsetAt(c2) === after;
      if (ok1 && ok2) return Math.min(c1, c2);
      if (ok1) return c1;
      if (ok2) return c2;
      return c1; // in a gap: the earlier offset lands after the gap, as 'compatible' disambiguation does
    },
    dateOf(t) {
      return isoDate(Math.floor((t + offsetAt(t)) / DAY_MS) * DAY_MS);
    },
    dayOf(t) {
      return Math.floor((t + offsetAt(t)) / DAY_MS);
    },
  };
}

/** The date `days` after `date`, without Temporal (plain civil-day arithmetic). */
export function nextDate(date: string, days = 1): string {
  return isoDate(civil(date) + days * DAY_MS);
}

/** ISO weekday (1 = Monday .. 7 = Sunday) of a civil date. */
export function isoWeekday(date: string): number {
  const d = new Date(civil(date)).getUTCDay();
  return d === 0 ? 7 : d;
}

/**
 * The UTC intervals of weekly local hours that overlap a window, clipped to it. Each local date is
 * turned into instants in the zone on its own, so a daylight-saving change moves the UTC times and
 * keeps the local ones (09:00 stays 09:00 on the wall clock on both sides of the change).
 */
export function workingIntervals(
  hours: WeeklyHours,
  zone: string,
  window: Interval,
  clock: ZoneClock = zoneClock(zone, window),
): Interval[] {
  if (window.end <= window.start) return [];
  // one day of slack each side: the window edges can fall on another local date than in UTC
  const last = clock.dayOf(window.end) + 1;
  const out: Interval[] = [];
  for (let day = clock.dayOf(window.start) - 1; day <= last; day++) {
    // 1970-01-01 was a Thursday (ISO weekday 4)
    const key = WEEKDAY_KEYS[(((day + 3) % 7) + 7) % 7]!;
    for (const r of hours[key] ?? []) {
      const start = Math.max(window.start, clock.toInstantDay(day, r.start));
      const end = Math.min(window.end, clock.toInstantDay(day, r.end));
      if (end > start) out.push({ start, end });
    }
  }
  return mergeIntervals(out);
}
