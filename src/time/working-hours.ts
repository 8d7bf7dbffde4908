import type { Interval } from './interval.ts';
import { mergeIntervals } from './interval.ts';
import { addDays, instantToZoned, weekdayOf, zonedToInstant } from './zoned.ts';

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

/**
 * The UTC intervals of weekly local hours that overlap a window, clipped to it. Each local date is
 * turned into instants in the zone on its own, so a daylight-saving change moves the UTC times and
 * keeps the local ones (09:00 stays 09:00 on the wall clock on both sides of the change).
 */
export function workingIntervals(hours: WeeklyHours, zone: string, window: Interval): Interval[] {
  if (window.end <= window.start) return [];
  // one day of slack each side: the window edges can fall on another local date than in UTC
  let date = addDays(instantToZoned(window.start, zone).date, -1);
  const last = addDays(instantToZoned(window.end, zone).date, 1);
  const out: Interval[] = [];
  while (date <= last) {
    const key = WEEKDAY_KEYS[weekdayOf(date) - 1]!;
    for (const r of hours[key] ?? []) {
      const start = Math.max(window.start, zonedToInstant(date, r.start, zone));
      const end = Math.min(window.end, zonedToInstant(date, r.end, zone));
      if (end > start) out.push({ start, end });
    }
    date = addDays(date, 1);
  }
  return mergeIntervals(out);
}
