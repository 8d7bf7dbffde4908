import { describe, expect, it } from 'vitest';
import { busyFromIcs } from '../../src/calendar/busy-from-ics.ts';
import { instantToZoned } from '../../src/time/zoned.ts';

const iso = (ms: number) => new Date(ms).toISOString().replace('.000Z', 'Z');
const cal = (...parts: string[]) =>
  ['BEGIN:VCALENDAR', 'VERSION:2.0', 'PRODID:-//slotwright//test//EN', ...parts, 'END:VCALENDAR'].join(
    '\r\n',
  );
const event = (uid: string, ...lines: string[]) => ['BEGIN:VEVENT', `UID:${uid}`, ...lines, 'END:VEVENT'];
const YEAR_2007 = { start: Date.UTC(2007, 0, 1), end: Date.UTC(2008, 0, 1) };

// United States Eastern rules since 2007 (second Sunday of March, first Sunday of November), as an
// embedded VTIMEZONE under a name no zone database knows, so ical.js's zone rules are used.
const EASTERN_SINCE_2007 = [
  'BEGIN:VTIMEZONE',
  'TZID:Example Eastern',
  'BEGIN:STANDARD',
  'DTSTART:20001105T020000',
  'RRULE:FREQ=YEARLY;BYMONTH=11;BYDAY=1SU',
  'TZOFFSETFROM:-0400',
  'TZOFFSETTO:-0500',
  'END:STANDARD',
  'BEGIN:DAYLIGHT',
  'DTSTART:20010311T020000',
  'RRULE:FREQ=YEARLY;BYMONTH=3;BYDAY=2SU',
  'TZOFFSETFROM:-0500',
  'TZOFFSETTO:-0400',
  'END:DAYLIGHT',
  'END:VTIMEZONE',
];

describe('RFC 5545 section 3.3.5 through the whole pipeline', () => {
  // RFC 5545 section 3.3.5: 20071104T013000 in America/New_York is 1:30 EDT (05:30Z);
  // 20070311T023000 is 3:30 EDT (07:30Z).
  for (const tzid of ['America/New_York', 'Example Eastern']) {
    it(`resolves a fall-back overlap and a spring-forward gap (${tzid})`, () => {
      const ics = cal(
        ...(tzid === 'Example Eastern' ? EASTERN_SINCE_2007 : []),
        ...event('overlap', `DTSTART;TZID=${tzid}:20071104T013000`, 'DURATION:PT10M'),
        ...event('gap', `DTSTART;TZID=${tzid}:20070311T023000`, 'DURATION:PT10M'),
      );
      const r = busyFromIcs(ics, { window: YEAR_2007, zone: 'UTC' });
      expect(r.warnings).toEqual([]);
      expect(r.busy.map((b) => [iso(b.start), iso(b.end)])).toEqual([
        ['2007-03-11T07:30:00Z', '2007-03-11T07:40:00Z'],
        ['2007-11-04T05:30:00Z', '2007-11-04T05:40:00Z'],
      ]);
    });
  }
});

describe('a daily 09:00 series keeps 09:00 local across the 2026 changes', () => {
  // IANA rules for 2026 (from memory; zoned.test.ts checks them against Node's zone data).
  const cases = [
    ['America/Halifax', '20260301', '2026-03-01', '2026-03-15'],
    ['America/Halifax', '20261025', '2026-10-25', '2026-11-08'],
    ['Europe/Lisbon', '20260322', '2026-03-22', '2026-04-05'],
    ['Europe/Lisbon', '20261018', '2026-10-18', '2026-11-01'],
    ['Pacific/Auckland', '20260329', '2026-03-29', '2026-04-12'],
    ['Pacific/Auckland', '20260920', '2026-09-20', '2026-10-04'],
  ] as const;
  for (const [zone, first, from, to] of cases) {
    it(`${zone} from ${from}`, () => {
      const ics = cal(
        ...event('daily', `DTSTART;TZID=${zone}:${first}T090000`, 'DURATION:PT30M', 'RRULE:FREQ=DAILY'),
      );
      const window = {
        start: Date.parse(`${from}T00:00:00Z`) - 86_400_000,
        end: Date.parse(`${to}T00:00:00Z`),
      };
      const r = busyFromIcs(ics, { window, zone });
      const local = r.busy.map((b) => instantToZoned(b.start, zone));
      expect(local.length).toBeGreaterThanOrEqual(13);
      expect(new Set(local.map((l) => l.minutes))).toEqual(new Set([540]));
      // one instance per local day, with two different UTC offsets over the fortnight
      expect(new Set(local.map((l) => l.date)).size).toBe(local.length);
      expect(new Set(local.map((l) => l.offsetMinutes)).size).toBe(2);
      expect(r.busy.every((b) => b.end - b.start === 30 * 60_000)).toBe(true);
    });
  }
});

describe('TZID resolution', () => {
  const WEEK = { start: Date.UTC(2026, 11, 7), end: Date.UTC(2026, 11, 14) };
  it('maps a Windows zone name through CLDR', () => {
    const ics = cal(...event('w', 'DTSTART;TZID=New Zealand Standard Time:20261208T090000', 'DURATION:PT1H'));
    const r = busyFromIcs(ics, { window: WEEK, zone: 'Europe/Lisbon' });
    // Auckland is UTC+13 in December (IANA tzdata: NZDT)
    expect(r.busy.map((b) => iso(b.start))).toEqual(['2026-12-07T20:00:00Z']);
    expect(r.warnings).toEqual([]);
  });
  it('reads a vendor-prefixed IANA name', () => {
    const ics = cal(
      ...event('p', 'DTSTART;TZID=/example.org/20050126_1/Europe/Lisbon:20261208T090000', 'DURATION:PT1H'),
    );
    const r = busyFromIcs(ics, { window: WEEK, zone: 'America/Halifax' });
    expect(r.busy.map((b) => iso(b.start))).toEqual(['2026-12-08T09:00:00Z']);
  });
  it('falls back to the owner zone with a warning for an unknown TZID', () => {
    const ics = cal(...event('u', 'DTSTART;TZID=Harbour Time:20261208T090000', 'DURATION:PT1H'));
    const r = busyFromIcs(ics, { window: WEEK, zone: 'America/Halifax' });
    expect(r.busy.map((b) => iso(b.start))).toEqual(['2026-12-08T13:00:00Z']);
    expect(r.warnings).toEqual(["unknown time zone 'Harbour Time': its times are read in America/Halifax"]);
  });
  it('reads floating times and DATE values in the owner zone', () => {
    const ics = cal(
      ...event('f', 'DTSTART:20261208T090000', 'DTEND:20261208T100000'),
      ...event('d', 'DTSTART;VALUE=DATE:20261210'),
    );
    const r = busyFromIcs(ics, { window: WEEK, zone: 'Pacific/Auckland' });
    expect(r.busy.map((b) => [iso(b.start), iso(b.end)])).toEqual([
      ['2026-12-07T20:00:00Z', '2026-12-07T21:00:00Z'],
      ['2026-12-09T11:00:00Z', '2026-12-10T11:00:00Z'],
    ]);
  });
  it('gives a nominal one-day DURATION its local length and an exact DTEND its exact length', () => {
    // RFC 5545 section 3.8.5.3: DTEND gives every instance the same exact duration, DURATION the
    // same nominal one. Halifax springs forward on 2026-03-08 (IANA tzdata, from memory), so the
    // local day from 12:00 on 03-07 to 12:00 on 03-08 is 23 hours long.
    const march = { start: Date.UTC(2026, 2, 1), end: Date.UTC(2026, 2, 20) };
    const hours = (r: ReturnType<typeof busyFromIcs>) => r.busy.map((b) => (b.end - b.start) / 3_600_000);
    const nominal = cal(
      ...event(
        'n',
        'DTSTART;TZID=America/Halifax:20260306T120000',
        'DURATION:P1D',
        'RRULE:FREQ=WEEKLY;COUNT=2',
      ),
    );
    // the 03-06 instance spans no change (24 h), the 03-13 one neither; a 03-07 start spans it
    expect(hours(busyFromIcs(nominal, { window: march, zone: 'UTC' }))).toEqual([24, 24]);
    const acrossChange = cal(...event('n2', 'DTSTART;TZID=America/Halifax:20260307T120000', 'DURATION:P1D'));
    expect(hours(busyFromIcs(acrossChange, { window: march, zone: 'UTC' }))).toEqual([23]);
    // an exact 24-hour DTEND length from a series start before the change stays 24 h on 03-07
    const exact = cal(
      ...event(
        'e',
        'DTSTART;TZID=America/Halifax:20260306T120000',
        'DTEND;TZID=America/Halifax:20260307T120000',
        'RRULE:FREQ=DAILY;COUNT=2',
      ),
    );
    const e = busyFromIcs(exact, { window: march, zone: 'UTC' });
    // the two instances overlap and merge: 03-06 12:00 AST to 03-07 12:00 AST + 24 h exact
    expect(e.busy.map((b) => [iso(b.start), iso(b.end)])).toEqual([
      ['2026-03-06T16:00:00Z', '2026-03-08T16:00:00Z'],
    ]);
  });
});
