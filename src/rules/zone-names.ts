import { Temporal } from 'temporal-polyfill';

/**
 * City names people say ("5pm Lisbon time") mapped to IANA zones. The cities are those the IANA tz
 * database itself names its zones after (plus a few second cities of the same zone), so the table
 * follows IANA zone names rather than any product's list.
 */
export const CITY_ZONES: Readonly<Record<string, string>> = {
  lisbon: 'Europe/Lisbon',
  porto: 'Europe/Lisbon',
  halifax: 'America/Halifax',
  auckland: 'Pacific/Auckland',
  wellington: 'Pacific/Auckland',
  london: 'Europe/London',
  dublin: 'Europe/Dublin',
  paris: 'Europe/Paris',
  berlin: 'Europe/Berlin',
  madrid: 'Europe/Madrid',
  rome: 'Europe/Rome',
  amsterdam: 'Europe/Amsterdam',
  athens: 'Europe/Athens',
  'new york': 'America/New_York',
  toronto: 'America/Toronto',
  chicago: 'America/Chicago',
  denver: 'America/Denver',
  'los angeles': 'America/Los_Angeles',
  vancouver: 'America/Vancouver',
  'sao paulo': 'America/Sao_Paulo',
  "st john's": 'America/St_Johns',
  tokyo: 'Asia/Tokyo',
  singapore: 'Asia/Singapore',
  dubai: 'Asia/Dubai',
  kolkata: 'Asia/Kolkata',
  sydney: 'Australia/Sydney',
  johannesburg: 'Africa/Johannesburg',
  utc: 'UTC',
  gmt: 'UTC',
};

/** The canonical IANA name for a zone name in any letter case, or undefined when it is not a zone. */
export function canonicalZone(name: string): string | undefined {
  try {
    // A fixed instant: we only ask the zone database for the name, never the clock.
    return Temporal.Instant.fromEpochMilliseconds(0).toZonedDateTimeISO(name).timeZoneId;
  } catch {
    return undefined;
  }
}
