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
    Temporal.Now.instant().toZonedDateTimeISO(zone);
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
