import fc from 'fast-check';
import ICAL from 'ical.js';
import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import { generateFeed } from '../../bench/feeds.ts';
import { busyFromIcs } from '../../src/calendar/busy-from-ics.ts';
import { jcalTime } from '../../src/calendar/jcal-event.ts';
import { normalizeBusy } from '../../src/time/busy-set.ts';
import type { BusyInterval } from '../../src/time/interval.ts';

// Simple events (no RRULE or RDATE) are read straight from ical.js's jCal arrays instead of through
// ical.js objects. These checks compare the pipeline's busy time with an independent computation:
// ical.js's public ICAL.Event API for reading and expanding, and Temporal for zones, with RFC 5545
// section 3.3.5's rule for local times in a gap (the offset before the gap) or an overlap (the
// first occurrence), which is Temporal's 'compatible' disambiguation (Temporal proposal text).

const DAY = 86_400_000;
type IcalTime = InstanceType<typeof ICAL.Time>;

// The zone comes from `source`: instances and computed ends are ical.js copies, which drop the TZID.
function instantOf(t: IcalTime, ownerZone: string, source: IcalTime = t): number {
  const tzid = (source as { timezone?: unknown }).timezone;
  const utc = source.zone === ICAL.Timezone.utcTimezone;
  const zone = t.isDate || (!utc && typeof tzid !== 'string') ? ownerZone : utc ? 'UTC' : String(tzid);
  return Temporal.PlainDateTime.from({
    year: t.year,
    month: t.month,
    day: t.day,
    hour: t.hour,
    minute: t.minute,
    second: t.second,
  }).toZonedDateTime(zone, { disambiguation: 'compatible' }).epochMilliseconds;
}

/** Busy time the plain ICAL.Event way: every VEVENT wrapped, series expanded by event.iterator(). */
function reference(text: string, window: { start: number; end: number }, ownerZone: string): BusyInterval[] {
  const root = new ICAL.Component(ICAL.parse(text) as never);
  const vevents = root.getAllSubcomponents('vevent').map((c) => {
    // detached, as the pipeline reads them: TZIDs stay names, resolved here through Temporal
    const comp = new ICAL.Component(c.toJSON() as never);
    return new ICAL.Event(comp);
  });
  const moved = new Set<string>();
  for (const e of vevents)
    if (e.isRecurrenceException()) moved.add(`${e.uid}|${instantOf(e.recurrenceId, ownerZone)}`);
  const raw: BusyInterval[] = [];
  for (const e of vevents) {
    const status = String(e.component.getFirstPropertyValue('status') ?? '').toUpperCase();
    if (status === 'CANCELLED') continue;
    const kind = status === 'TENTATIVE' ? 'tentative' : 'busy';
    // RFC 5545 section 3.3.6: the time part of a DURATION is exact; a DATE start with neither DTEND
    // nor DURATION lasts one (local) day (section 3.6.1).
    const start0 = instantOf(e.startDate, ownerZone);
    const lengthMs = e.component.hasProperty('dtend')
      ? instantOf(e.endDate, ownerZone) - start0
      : e.component.hasProperty('duration')
        ? e.duration.toSeconds() * 1000
        : instantOf(e.endDate, ownerZone, e.startDate) - start0;
    // the pipeline leaves out an event that ends before it starts (with a warning)
    if (lengthMs < 0) continue;
    const starts: number[] = [];
    if (e.isRecurring() && !e.isRecurrenceException()) {
      const it = e.iterator();
      for (let t = it.next(); t; t = it.next()) {
        const at = instantOf(t, ownerZone, e.startDate);
        if (at > window.end) break;
        if (!moved.has(`${e.uid}|${at}`)) starts.push(at);
      }
    } else starts.push(start0);
    for (const s of starts)
      if (s + lengthMs > window.start && s < window.end) raw.push({ start: s, end: s + lengthMs, kind });
  }
  return normalizeBusy(raw, window);
}

describe('simple events read from jCal', () => {
  it('give the benchmark feed the busy time the ICAL.Event API gives it', () => {
    const text = generateFeed();
    const window = { start: Date.UTC(2026, 11, 7), end: Date.UTC(2026, 11, 7) + 56 * DAY };
    const report = busyFromIcs(text, { window, zone: 'Europe/Lisbon', expansionTimeBudgetMs: 60_000 });
    const expected = reference(text, window, 'Europe/Lisbon');
    expect(expected.length).toBeGreaterThan(300);
    expect(report.busy).toEqual(expected);
    expect(report.warnings).toEqual([]);
  });

  const ZONES = ['Europe/Lisbon', 'America/Halifax', 'Pacific/Auckland', 'Asia/Kolkata'] as const;
  // Local times around the 2026 changes (IANA tzdata): Lisbon springs forward 29 March 01:00 ->
  // 02:00 and falls back 25 October 02:00 -> 01:00; Halifax 8 March 02:00 -> 03:00 and 1 November
  // 02:00 -> 01:00; Auckland falls back 5 April 03:00 -> 02:00 and springs forward 27 September
  // 02:00 -> 03:00.
  const AROUND = [
    '20260329T013000',
    '20261025T013000',
    '20260308T023000',
    '20261101T013000',
    '20260405T023000',
    '20260927T023000',
    '20260610T090000',
  ];
  const eventArb = fc.record({
    zone: fc.constantFrom<string | 'UTC' | 'floating' | 'date'>(...ZONES, 'UTC', 'floating', 'date'),
    local: fc.constantFrom(...AROUND),
    dayShift: fc.integer({ min: 0, max: 3 }),
    length: fc.oneof(
      fc.record({ duration: fc.constantFrom('PT45M', 'PT2H', 'PT1H30M', 'PT0S') }),
      fc.record({ endMinutes: fc.integer({ min: 0, max: 600 }) }),
      fc.constant({}),
    ),
    status: fc.constantFrom('', 'CONFIRMED', 'TENTATIVE', 'CANCELLED'),
  });

  it('agree with the ICAL.Event API and Temporal on random single events around DST changes', () => {
    fc.assert(
      fc.property(
        fc.array(eventArb, { minLength: 1, maxLength: 8 }),
        fc.constantFrom(...ZONES),
        (evs, owner) => {
          const lines = ['BEGIN:VCALENDAR', 'VERSION:2.0', 'PRODID:-//slotwright//test//EN'];
          evs.forEach((e, i) => {
            const d = Temporal.PlainDateTime.from(e.local).add({ days: e.dayShift });
            const stamp = d.toString().replace(/[-:]/g, '').slice(0, 15);
            const zoneParam =
              e.zone === 'UTC' || e.zone === 'floating' || e.zone === 'date' ? '' : `;TZID=${e.zone}`;
            const suffix = e.zone === 'UTC' ? 'Z' : '';
            lines.push('BEGIN:VEVENT', `UID:e${i}`, 'DTSTAMP:20260101T000000Z');
            if (e.zone === 'date') lines.push(`DTSTART;VALUE=DATE:${stamp.slice(0, 8)}`);
            else lines.push(`DTSTART${zoneParam}:${stamp}${suffix}`);
            if ('duration' in e.length && e.zone !== 'date') lines.push(`DURATION:${e.length.duration}`);
            if ('endMinutes' in e.length && e.zone !== 'date') {
              const end = d.add({ minutes: e.length.endMinutes });
              lines.push(`DTEND${zoneParam}:${end.toString().replace(/[-:]/g, '').slice(0, 15)}${suffix}`);
            }
            if (e.status !== '') lines.push(`STATUS:${e.status}`);
            lines.push('END:VEVENT');
          });
          lines.push('END:VCALENDAR');
          const text = lines.join('\r\n');
          const window = { start: Date.UTC(2026, 0, 1), end: Date.UTC(2027, 0, 1) };
          const report = busyFromIcs(text, { window, zone: owner });
          expect(report.busy).toEqual(reference(text, window, owner));
        },
      ),
      { numRuns: 300, seed: 5545 },
    );
  });
});

describe('jcalTime', () => {
  it('takes 29 February only in leap years of the Gregorian calendar', () => {
    // Gregorian leap years: divisible by 4, except centuries not divisible by 400 (common practice;
    // RFC 5545 section 3.3.4 dates are Gregorian). Checked against JavaScript's own Date as well.
    for (const year of [1900, 2000, 2024, 2026, 2100, 2400]) {
      const leap = new Date(Date.UTC(year, 1, 29)).getUTCMonth() === 1;
      const read = jcalTime(['dtstart', {}, 'date', `${year}-02-29`]);
      expect({ year, read: read !== undefined }).toEqual({ year, read: leap });
    }
    expect(jcalTime(['dtstart', {}, 'date', '2026-04-31'])).toBeUndefined();
    expect(jcalTime(['dtstart', {}, 'date-time', '2026-12-31T23:59:59Z'])?.utc).toBe(true);
  });
});
