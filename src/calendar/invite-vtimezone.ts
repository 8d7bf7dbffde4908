import { Temporal } from 'temporal-polyfill';

function offsetText(ns: number): string {
  const minutes = Math.round(ns / 60_000_000_000);
  const sign = minutes < 0 ? '-' : '+';
  const m = Math.abs(minutes);
  return `${sign}${String(Math.floor(m / 60)).padStart(2, '0')}${String(m % 60).padStart(2, '0')}`;
}

function localStamp(instant: Temporal.Instant, offsetNs: number): string {
  const wall = Temporal.Instant.fromEpochNanoseconds(instant.epochNanoseconds + BigInt(offsetNs))
    .toZonedDateTimeISO('UTC')
    .toPlainDateTime();
  const p = (n: number, w = 2) => String(n).padStart(w, '0');
  return `${p(wall.year, 4)}${p(wall.month)}${p(wall.day)}T${p(wall.hour)}${p(wall.minute)}${p(wall.second)}`;
}

/**
 * A VTIMEZONE component for an IANA zone, written from the zone rules the runtime carries
 * (through Temporal), with one observance per UTC-offset change between `from` and `to` plus the
 * one in effect at `from`. Each observance's DTSTART is the local time of the onset in the offset
 * that was in effect before it (RFC 5545 section 3.6.5).
 */
export function vtimezoneFor(zone: string, from: number, to: number): string {
  const lines = ['BEGIN:VTIMEZONE', `TZID:${zone}`];
  const start = Temporal.Instant.fromEpochMilliseconds(from).toZonedDateTimeISO(zone);
  const onsets: { at: Temporal.Instant; before: number; after: number }[] = [];
  const prev = start.getTimeZoneTransition('previous');
  if (prev !== null) {
    onsets.push({
      at: prev.toInstant(),
      before: prev.subtract({ nanoseconds: 1 }).offsetNanoseconds,
      after: prev.offsetNanoseconds,
    });
  }
  let cursor: Temporal.ZonedDateTime | null = start.getTimeZoneTransition('next');
  while (cursor !== null && cursor.epochMilliseconds <= to) {
    onsets.push({
      at: cursor.toInstant(),
      before: cursor.subtract({ nanoseconds: 1 }).offsetNanoseconds,
      after: cursor.offsetNanoseconds,
    });
    cursor = cursor.getTimeZoneTransition('next');
  }
  if (onsets.length === 0) {
    // A zone without changes (or none known): one standard observance from the epoch.
    const o = offsetText(start.offsetNanoseconds);
    lines.push(
      'BEGIN:STANDARD',
      'DTSTART:19700101T000000',
      `TZOFFSETFROM:${o}`,
      `TZOFFSETTO:${o}`,
      'END:STANDARD',
    );
  }
  for (const o of onsets) {
    const kind = o.after > o.before ? 'DAYLIGHT' : 'STANDARD';
    lines.push(
      `BEGIN:${kind}`,
      `DTSTART:${localStamp(o.at, o.before)}`,
      `TZOFFSETFROM:${offsetText(o.before)}`,
      `TZOFFSETTO:${offsetText(o.after)}`,
      `END:${kind}`,
    );
  }
  lines.push('END:VTIMEZONE');
  return lines.join('\r\n');
}
