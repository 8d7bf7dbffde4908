import { Temporal } from 'temporal-polyfill';

/** A wall-clock reading of an instant in one zone. */
export interface ZonedReading {
  /** Calendar date `YYYY-MM-DD` in the zone. */
  readonly date: string;
  /** ISO weekday, 1 = Monday .. 7 = Sunday. */
  readonly weekday: number;
  /** Minutes since local midnight (0..1439). */
  readonly minutes: number;
  /** Offset from UTC in minutes at that instant (e.g. -240 for UTC-4). */
  readonly offsetMinutes: number;
}

/** True when `zone` is an IANA time-zone name the runtime knows. */
export function isValidZone(zone: string): boolean {
  try {
    Temporal.Instant.fromEpochMilliseconds(0).toZonedDateTimeISO(zone);
    return true;
  } catch {
    return false;
  }
}

/**
 * The instant of a local date and time in a zone. Local times in a daylight-saving gap move forward
 * by the gap and repeated local times take the first occurrence, as RFC 5545 section 3.3.5 asks
 * (Temporal's 'compatible' disambiguation does exactly this).
 */
export function zonedToInstant(date: string, minutesOfDay: number, zone: string): number {
  const d = Temporal.PlainDate.from(date);
  const dayOffset = Math.floor(minutesOfDay / 1440);
  const m = minutesOfDay - dayOffset * 1440;
  const dt = d.add({ days: dayOffset }).toPlainDateTime({ hour: Math.floor(m / 60), minute: m % 60 });
  return dt.toZonedDateTime(zone, { disambiguation: 'compatible' }).epochMilliseconds;
}

/** Reads an instant on the wall clock of a zone. */
export function instantToZoned(epochMs: number, zone: string): ZonedReading {
  const z = Temporal.Instant.fromEpochMilliseconds(epochMs).toZonedDateTimeISO(zone);
  return {
    date: z.toPlainDate().toString(),
    weekday: z.dayOfWeek,
    minutes: z.hour * 60 + z.minute,
    offsetMinutes: Math.round(z.offsetNanoseconds / 60_000_000_000),
  };
}

/** The date `days` after `date` (both `YYYY-MM-DD`). */
export function addDays(date: string, days: number): string {
  return Temporal.PlainDate.from(date).add({ days }).toString();
}

/** ISO weekday (1 = Monday .. 7 = Sunday) of a date. */
export function weekdayOf(date: string): number {
  return Temporal.PlainDate.from(date).dayOfWeek;
}

/** Wall-clock fields of a local date-time (month 1..12), as calendar files carry them. */
export interface LocalDateTime {
  readonly year: number;
  readonly month: number;
  readonly day: number;
  readonly hour: number;
  readonly minute: number;
  readonly second: number;
}

// Offsets at the start and end of a local day, per zone; a day whose two offsets agree has no
// transition inside it (zones never change twice in one day: common practice), so every local time
// of that day converts with one subtraction instead of a full Temporal conversion.
// Keyed by zone, then by a number made of the date (no string building per lookup).
const dayOffsetCache = new Map<string, Map<number, number | null>>();
let dayOffsetEntries = 0;

function dayOffset(zone: string, year: number, month: number, day: number): number | null {
  let perZone = dayOffsetCache.get(zone);
  if (perZone === undefined) {
    perZone = new Map();
    dayOffsetCache.set(zone, perZone);
  }
  const key = (year * 16 + month) * 32 + day;
  const hit = perZone.get(key);
  if (hit !== undefined) return hit;
  const start = new Temporal.PlainDateTime(year, month, day).toZonedDateTime(zone, {
    disambiguation: 'compatible',
  });
  const next = start.add({ days: 1 });
  const o0 = start.offsetNanoseconds;
  const o1 = next.offsetNanoseconds;
  // A day starting inside a gap (midnight transitions) is not uniform either.
  const local0 = Date.UTC(year, month - 1, day);
  const uniform = o0 === o1 && start.epochMilliseconds === local0 - o0 / 1e6;
  const value = uniform ? o0 / 1e6 : null;
  if (++dayOffsetEntries > 50_000) {
    for (const m of dayOffsetCache.values()) m.clear();
    dayOffsetEntries = 1;
  }
  perZone.set(key, value);
  return value;
}

/**
 * The instant of a local date-time in an IANA zone, in epoch milliseconds. Nonexistent local times
 * (in a spring-forward gap) use the offset before the gap and repeated ones take the first
 * occurrence, as RFC 5545 section 3.3.5 asks; this is Temporal's 'compatible' disambiguation.
 */
export function localToInstant(local: LocalDateTime, zone: string): number {
  const pseudo = Date.UTC(local.year, local.month - 1, local.day, local.hour, local.minute, local.second);
  if (zone === 'UTC' || zone === 'Etc/UTC') return pseudo;
  const offset = dayOffset(zone, local.year, local.month, local.day);
  if (offset !== null) return pseudo - offset;
  return new Temporal.PlainDateTime(
    local.year,
    local.month,
    local.day,
    local.hour,
    local.minute,
    local.second,
  ).toZonedDateTime(zone, { disambiguation: 'compatible' }).epochMilliseconds;
}

/** The wall-clock fields of an instant in an IANA zone. */
export function instantToLocal(epochMs: number, zone: string): LocalDateTime {
  const z = Temporal.Instant.fromEpochMilliseconds(epochMs).toZonedDateTimeISO(zone);
  return { year: z.year, month: z.month, day: z.day, hour: z.hour, minute: z.minute, second: z.second };
}

/** Adds whole days to a local date-time's date part (calendar arithmetic, no zone involved). */
export function addLocalDays(local: LocalDateTime, days: number): LocalDateTime {
  if (days === 0) return local;
  const d = new Date(Date.UTC(local.year, local.month - 1, local.day + days));
  return { ...local, year: d.getUTCFullYear(), month: d.getUTCMonth() + 1, day: d.getUTCDate() };
}

/** The canonical IANA name Temporal uses for a zone identifier, or undefined when it is unknown. */
export function canonicalZone(zone: string): string | undefined {
  if (zone === '' || zone.length > 64) return undefined;
  try {
    return Temporal.Instant.fromEpochMilliseconds(0).toZonedDateTimeISO(zone).timeZoneId;
  } catch {
    return undefined;
  }
}
