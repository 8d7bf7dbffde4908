// Reading of one VEVENT straight from the jCal arrays that ical.js's parser writes (RFC 7265 shape:
// [name, params, type, value...]). Only the plain shapes are read here: a date ("2026-12-07") or a
// date-time ("2026-12-07T09:00:00", "...Z") with valid fields, a DURATION of type duration. Anything
// else is left to the ical.js object path, which reads the same values the same way; this only saves
// building ical.js objects for the many simple events of a big feed. Series (RRULE or RDATE) are
// still expanded by ical.js; only their length and busy kind are read here.
import type { Interval } from '../time/interval.ts';
import type { LocalDateTime } from '../time/zoned.ts';

const DAY_MS = 86_400_000;

/** A date or date-time value read from jCal, before any zone is applied. */
export interface JcalTime {
  readonly local: LocalDateTime;
  /** The wall-clock fields read as if they were UTC (epoch ms). */
  readonly pseudo: number;
  readonly isDate: boolean;
  /** Written with a trailing Z. */
  readonly utc: boolean;
  /** The TZID parameter, when one is given as text. */
  readonly tzid: string | undefined;
}

/** What a VEVENT contributes to busy time (apart from its recurrence), read from jCal. */
export interface JcalEvent {
  /** First DTSTART, if any. */
  readonly start: JcalTime | undefined;
  /** First RECURRENCE-ID, if any. */
  readonly rid: JcalTime | undefined;
  /** The RANGE parameter of that RECURRENCE-ID. */
  readonly ridRange: unknown;
  /** First DTEND, if any. */
  readonly end: JcalTime | undefined;
  /** Text of the first DURATION, read only when there is no DTEND. */
  readonly duration: string | undefined;
  readonly uid: string;
  readonly status: string;
  readonly transp: string;
  /** The ATTENDEE properties as jCal arrays. */
  readonly attendees: readonly (readonly unknown[])[];
}

// Two digits at i of s, or -1.
function two(s: string, i: number): number {
  const a = s.charCodeAt(i) - 48;
  const b = s.charCodeAt(i + 1) - 48;
  return a >= 0 && a <= 9 && b >= 0 && b <= 9 ? a * 10 + b : -1;
}

function four(s: string, i: number): number {
  const hi = two(s, i);
  const lo = two(s, i + 2);
  return hi < 0 || lo < 0 ? -1 : hi * 100 + lo;
}

const MONTH_DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

// Proleptic Gregorian calendar, as RFC 5545 dates are (section 3.3.4).
function daysInMonth(year: number, month: number): number {
  if (month !== 2) return MONTH_DAYS[month - 1]!;
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0 ? 29 : 28;
}

/**
 * The wall-clock fields of a jCal date or date-time text read as UTC, as a prefix match of
 * `YYYY-MM-DD` with an optional `THH:MM:SS` (a broken time part counts as midnight), or undefined.
 */
export function jcalPseudo(value: unknown): number | undefined {
  if (typeof value !== 'string' || value.length < 10) return undefined;
  const y = four(value, 0);
  const mo = two(value, 5);
  const d = two(value, 8);
  if (y < 0 || mo < 0 || d < 0 || value.charCodeAt(4) !== 45 || value.charCodeAt(7) !== 45) return undefined;
  let h = 0;
  let mi = 0;
  let s = 0;
  if (value.length >= 19 && value.charCodeAt(10) === 84) {
    const hh = two(value, 11);
    const mm = two(value, 14);
    const ss = two(value, 17);
    if (hh >= 0 && mm >= 0 && ss >= 0 && value.charCodeAt(13) === 58 && value.charCodeAt(16) === 58) {
      h = hh;
      mi = mm;
      s = ss;
    }
  }
  return Date.UTC(y, mo - 1, d, h, mi, s);
}

/** A plain date or date-time property value, or undefined when it has any other shape. */
export function jcalTime(prop: readonly unknown[]): JcalTime | undefined {
  const type = prop[2];
  const value = prop[3];
  if (typeof value !== 'string') return undefined;
  const params = prop[1] as Record<string, unknown>;
  const tzid = params.tzid;
  if (tzid !== undefined && typeof tzid !== 'string') return undefined;
  let isDate: boolean;
  let utc = false;
  if (type === 'date') {
    if (value.length !== 10) return undefined;
    isDate = true;
  } else if (type === 'date-time') {
    if (value.length === 20 && value.charCodeAt(19) === 90) utc = true;
    else if (value.length !== 19) return undefined;
    if (value.charCodeAt(10) !== 84 || value.charCodeAt(13) !== 58 || value.charCodeAt(16) !== 58)
      return undefined;
    isDate = false;
  } else return undefined;
  if (value.charCodeAt(4) !== 45 || value.charCodeAt(7) !== 45) return undefined;
  const year = four(value, 0);
  const month = two(value, 5);
  const day = two(value, 8);
  const hour = isDate ? 0 : two(value, 11);
  const minute = isDate ? 0 : two(value, 14);
  const second = isDate ? 0 : two(value, 17);
  if (year < 1000 || month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return undefined;
  if (hour < 0 || hour > 23 || minute < 0 || minute > 59 || second < 0 || second > 59) return undefined;
  return {
    local: { year, month, day, hour, minute, second },
    pseudo: Date.UTC(year, month - 1, day, hour, minute, second),
    isDate,
    utc,
    tzid,
  };
}

/** The result of a look at one VEVENT's jCal. */
export type VeventScan =
  /** Surely no busy time in the window (a single event far outside it). */
  | { readonly kind: 'outside' }
  /** A non-recurring event in the plain shapes, read here. */
  | { readonly kind: 'simple'; readonly event: JcalEvent }
  /** A series (RRULE or RDATE, no RECURRENCE-ID) whose other values are plain: ical.js expands it. */
  | { readonly kind: 'recurring'; readonly event: JcalEvent }
  /** Anything else: read through ical.js objects. */
  | { readonly kind: 'full' };

const OUTSIDE = { kind: 'outside' } as const;
const NO_ATTENDEES: readonly (readonly unknown[])[] = [];
const FULL = { kind: 'full' } as const;
const PT_HMS = /^PT(?:(\d+)H)?(?:(\d+)M)?(?:(\d+)S)?$/;
// Local times differ from UTC by at most about 14 hours; two days of slack keeps every candidate.
const SLACK_MS = 2 * DAY_MS;

/**
 * Looks at a VEVENT's properties once. `durationSeconds` turns a DURATION text into seconds (the
 * caller uses ical.js) or throws. `window` is the read window (UTC epoch ms).
 */
export function scanVevent(
  props: readonly (readonly unknown[])[],
  window: Interval,
  durationSeconds: (text: string) => number,
): VeventScan {
  // Last of each, for the outside test; first of each, for reading.
  let lastStart: unknown;
  let lastEnd: unknown;
  let lastDuration: string | undefined;
  let hasStart = false;
  let hasEnd = false;
  let startProp: readonly unknown[] | undefined;
  let endProp: readonly unknown[] | undefined;
  let durationProp: readonly unknown[] | undefined;
  let ridProp: readonly unknown[] | undefined;
  let uid: unknown;
  let status: unknown;
  let transp: unknown;
  let attendees: (readonly unknown[])[] | undefined;
  let recurring = false;
  for (const prop of props) {
    switch (prop[0]) {
      case 'rrule':
      case 'rdate':
        recurring = true;
        break;
      case 'recurrence-id':
        ridProp ??= prop;
        break;
      case 'dtstart':
        hasStart = true;
        lastStart = prop[3];
        startProp ??= prop;
        break;
      case 'dtend':
        hasEnd = true;
        lastEnd = prop[3];
        endProp ??= prop;
        break;
      case 'duration':
        lastDuration = typeof prop[3] === 'string' ? prop[3] : '';
        durationProp ??= prop;
        break;
      case 'uid':
        if (uid === undefined) uid = prop[3] ?? null;
        break;
      case 'status':
        if (status === undefined) status = prop[3] ?? null;
        break;
      case 'transp':
        if (transp === undefined) transp = prop[3] ?? null;
        break;
      case 'attendee':
        if (attendees === undefined) attendees = [prop];
        else attendees.push(prop);
        break;
    }
  }
  if (recurring && (ridProp !== undefined || startProp === undefined)) return FULL;
  if (
    !recurring &&
    ridProp === undefined &&
    hasStart &&
    outside(lastStart, hasEnd, lastEnd, lastDuration, window, durationSeconds)
  )
    return OUTSIDE;
  const first = startProp ?? ridProp;
  if (first === undefined) return FULL;
  const start = jcalTime(first);
  if (start === undefined) return FULL;
  let rid: JcalTime | undefined;
  if (ridProp !== undefined) {
    rid = ridProp === first ? start : jcalTime(ridProp);
    if (rid === undefined) return FULL;
  }
  let end: JcalTime | undefined;
  if (endProp !== undefined) {
    end = jcalTime(endProp);
    if (end === undefined) return FULL;
  }
  let duration: string | undefined;
  if (end === undefined && durationProp !== undefined) {
    if (durationProp[2] !== 'duration' || typeof durationProp[3] !== 'string') return FULL;
    duration = durationProp[3];
  }
  return {
    kind: recurring ? 'recurring' : 'simple',
    event: {
      start: startProp === undefined ? undefined : start,
      rid,
      ridRange: ridProp === undefined ? undefined : (ridProp[1] as Record<string, unknown>).range,
      end,
      duration,
      uid: String(uid ?? ''),
      status: String(status ?? ''),
      transp: String(transp ?? ''),
      attendees: attendees ?? NO_ATTENDEES,
    },
  };
}

// A single event far outside the window can be passed over from its raw jCal values, before any
// objects are built for it; anything unusual is kept.
function outside(
  startValue: unknown,
  hasEnd: boolean,
  endValue: unknown,
  duration: string | undefined,
  window: Interval,
  durationSeconds: (text: string) => number,
): boolean {
  const start = jcalPseudo(startValue);
  if (start === undefined) return false;
  if (start > window.end + SLACK_MS) return true;
  if (start + DAY_MS >= window.start - SLACK_MS) return false;
  let end = hasEnd ? jcalPseudo(endValue) : undefined;
  if (end === undefined && duration !== undefined) {
    const simple = PT_HMS.exec(duration);
    if (simple !== null)
      end = start + ((+(simple[1] ?? 0) * 60 + +(simple[2] ?? 0)) * 60 + +(simple[3] ?? 0)) * 1000;
    else {
      try {
        end = start + durationSeconds(duration) * 1000;
      } catch {
        return false;
      }
    }
  }
  return Math.max(end ?? start, start + DAY_MS) < window.start - SLACK_MS;
}
