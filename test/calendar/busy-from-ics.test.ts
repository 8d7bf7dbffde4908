import { describe, expect, it } from 'vitest';
import { busyFromIcs, busyLinesOnly } from '../../src/calendar/busy-from-ics.ts';
import { SlotwrightError } from '../../src/errors.ts';

const WEEK = { start: Date.UTC(2026, 11, 7), end: Date.UTC(2026, 11, 14) };
const iso = (ms: number) => new Date(ms).toISOString().replace('.000Z', 'Z');
const cal = (...parts: string[]) =>
  ['BEGIN:VCALENDAR', 'VERSION:2.0', 'PRODID:-//slotwright//test//EN', ...parts, 'END:VCALENDAR'].join(
    '\r\n',
  );
const rows = (r: ReturnType<typeof busyFromIcs>) => r.busy.map((b) => [iso(b.start), iso(b.end), b.kind]);

describe('busyFromIcs', () => {
  it('expands a daily series with EXDATE, a moved instance and a cancelled instance', () => {
    const ics = cal(
      'BEGIN:VEVENT',
      'UID:s1',
      'DTSTART;TZID=America/Halifax:20261207T090000',
      'DTEND;TZID=America/Halifax:20261207T100000',
      'RRULE:FREQ=DAILY;COUNT=5',
      'EXDATE;TZID=America/Halifax:20261208T090000',
      'SUMMARY:Survey stand-up',
      'END:VEVENT',
      'BEGIN:VEVENT',
      'UID:s1',
      'RECURRENCE-ID;TZID=America/Halifax:20261209T090000',
      'DTSTART;TZID=America/Halifax:20261209T110000',
      'DTEND;TZID=America/Halifax:20261209T113000',
      'END:VEVENT',
      'BEGIN:VEVENT',
      'UID:s1',
      // RECURRENCE-ID written in UTC for a series written in local time still matches (common practice)
      'RECURRENCE-ID:20261210T130000Z',
      'DTSTART;TZID=America/Halifax:20261210T090000',
      'STATUS:CANCELLED',
      'END:VEVENT',
    );
    const r = busyFromIcs(ics, { window: WEEK, zone: 'America/Halifax' });
    // Halifax is UTC-4 in December (IANA tzdata: AST)
    expect(rows(r)).toEqual([
      ['2026-12-07T13:00:00Z', '2026-12-07T14:00:00Z', 'busy'],
      ['2026-12-09T15:00:00Z', '2026-12-09T15:30:00Z', 'busy'],
      ['2026-12-11T13:00:00Z', '2026-12-11T14:00:00Z', 'busy'],
    ]);
    expect(r.warnings).toEqual([]);
    expect(r.skipped).toBe(0);
  });

  it('reads all-day dates in the owner zone, tentative time cut around busy time', () => {
    const ics = cal(
      'BEGIN:VEVENT',
      'UID:leave',
      'DTSTART;VALUE=DATE:20261208',
      'DTEND;VALUE=DATE:20261210',
      'STATUS:TENTATIVE',
      'END:VEVENT',
      'BEGIN:VEVENT',
      'UID:m',
      'DTSTART:20261208T100000Z',
      'DTEND:20261208T110000Z',
      'END:VEVENT',
    );
    const r = busyFromIcs(ics, { window: WEEK, zone: 'Europe/Lisbon' });
    // Lisbon is UTC+0 in December (IANA tzdata: WET)
    expect(rows(r)).toEqual([
      ['2026-12-08T00:00:00Z', '2026-12-08T10:00:00Z', 'tentative'],
      ['2026-12-08T10:00:00Z', '2026-12-08T11:00:00Z', 'busy'],
      ['2026-12-08T11:00:00Z', '2026-12-10T00:00:00Z', 'tentative'],
    ]);
  });

  it('treats transparent, cancelled and declined events as free', () => {
    const ics = cal(
      'BEGIN:VEVENT',
      'UID:t',
      'DTSTART:20261208T100000Z',
      'DTEND:20261208T110000Z',
      'TRANSP:TRANSPARENT',
      'END:VEVENT',
      'BEGIN:VEVENT',
      'UID:c',
      'DTSTART:20261208T120000Z',
      'DTEND:20261208T130000Z',
      'STATUS:CANCELLED',
      'END:VEVENT',
      'BEGIN:VEVENT',
      'UID:d',
      'DTSTART:20261208T140000Z',
      'DTEND:20261208T150000Z',
      'ATTENDEE;PARTSTAT=DECLINED:mailto:Maren@Saltline.example',
      'ATTENDEE;PARTSTAT=ACCEPTED:mailto:teo@saltline.example',
      'END:VEVENT',
    );
    const declinedByOwner = busyFromIcs(ics, {
      window: WEEK,
      zone: 'UTC',
      ownerEmail: 'maren@saltline.example',
    });
    expect(rows(declinedByOwner)).toEqual([]);
    const other = busyFromIcs(ics, { window: WEEK, zone: 'UTC', ownerEmail: 'teo@saltline.example' });
    expect(rows(other)).toEqual([['2026-12-08T14:00:00Z', '2026-12-08T15:00:00Z', 'busy']]);
  });

  it('keeps the good events of a damaged feed and names the broken component and line', () => {
    const ics = cal(
      'BEGIN:VEVENT',
      'UID:ok',
      'DTSTART:20261208T100000Z',
      'DTEND:20261208T110000Z',
      'END:VEVENT',
      'BEGIN:VEVENT',
      'UID:broken',
      'DTSTART:20261209T100000Z',
      'this line has no colon',
      'END:VEVENT',
    );
    const r = busyFromIcs(ics, { window: WEEK, zone: 'UTC' });
    expect(rows(r)).toEqual([['2026-12-08T10:00:00Z', '2026-12-08T11:00:00Z', 'busy']]);
    expect(r.skipped).toBe(1);
    expect(r.warnings).toHaveLength(1);
    expect(r.warnings[0]).toMatch(/^VEVENT at line 9 could not be read \(line 12\)/);
  });

  it('bounds expansion of a rule ical.js would loop on, with a warning', () => {
    const ics = cal(
      'BEGIN:VEVENT',
      'UID:loop',
      'DTSTART:20240105T090000Z',
      'DURATION:PT1M',
      'RRULE:FREQ=DAILY;INTERVAL=2;BYDAY=FR;BYMONTHDAY=-2,-1;COUNT=5',
      'END:VEVENT',
    );
    const t0 = performance.now();
    const r = busyFromIcs(ics, { window: WEEK, zone: 'UTC', expansionTimeBudgetMs: 300 });
    expect(performance.now() - t0).toBeLessThan(5000);
    expect(r.warnings).toEqual([
      'VEVENT at line 4: the recurrence rule takes too long to expand; instances after the last one found are left out',
    ]);
  });

  it('caps the instances of an endless series that started long ago, with a warning', () => {
    const ics = cal(
      'BEGIN:VEVENT',
      'UID:minutely',
      'DTSTART:20200101T000000Z',
      'DURATION:PT1M',
      'RRULE:FREQ=MINUTELY;INTERVAL=7;COUNT=1000000000',
      'END:VEVENT',
    );
    const r = busyFromIcs(ics, { window: WEEK, zone: 'UTC', maxInstancesPerSeries: 2000 });
    expect(r.busy).toEqual([]);
    expect(r.warnings).toEqual([
      'VEVENT at line 4: stopped expanding the series after 2000 instances; later ones are left out',
    ]);
  });

  it('removes the instances on an EXDATE given as a DATE from a DATE-TIME series', () => {
    const ics = cal(
      'BEGIN:VEVENT',
      'UID:daily-date-exdate',
      'DTSTART;TZID=Pacific/Auckland:20261208T083000',
      'DTEND;TZID=Pacific/Auckland:20261208T090000',
      'RRULE:FREQ=DAILY;COUNT=4',
      // a whole local day excluded, as producers write it for a DATE-TIME series (common practice)
      'EXDATE;VALUE=DATE:20261209',
      'END:VEVENT',
    );
    const r = busyFromIcs(ics, { window: WEEK, zone: 'Europe/Lisbon' });
    // Auckland is UTC+13 in December (IANA tzdata: NZDT): 08:30 local is 19:30 UTC the day before,
    // so the instance removed is the one of 9 December local time, 8 December in UTC
    expect(rows(r)).toEqual([
      ['2026-12-07T19:30:00Z', '2026-12-07T20:00:00Z', 'busy'],
      ['2026-12-09T19:30:00Z', '2026-12-09T20:00:00Z', 'busy'],
      ['2026-12-10T19:30:00Z', '2026-12-10T20:00:00Z', 'busy'],
    ]);
    expect(r.warnings).toEqual([]);
  });

  it('applies a RANGE=THISANDFUTURE change to that instance and all later ones', () => {
    const FOUR_WEEKS = { start: Date.UTC(2026, 11, 7), end: Date.UTC(2027, 0, 4) };
    const series = (uid: string) => [
      'BEGIN:VEVENT',
      `UID:${uid}`,
      'DTSTART;TZID=Europe/Lisbon:20261207T090000',
      'DTEND;TZID=Europe/Lisbon:20261207T100000',
      'RRULE:FREQ=WEEKLY;COUNT=4',
      'END:VEVENT',
    ];
    const ics = cal(
      ...series('moved-on'),
      // from 14 December on: two hours later and half an hour long (RFC 5545 section 3.8.4.4: the
      // start shift and the new duration carry over to every later instance)
      'BEGIN:VEVENT',
      'UID:moved-on',
      'RECURRENCE-ID;RANGE=THISANDFUTURE;TZID=Europe/Lisbon:20261214T090000',
      'DTSTART;TZID=Europe/Lisbon:20261214T110000',
      'DTEND;TZID=Europe/Lisbon:20261214T113000',
      'END:VEVENT',
      // a single changed instance later on still wins over the range (it names that instance)
      'BEGIN:VEVENT',
      'UID:moved-on',
      'RECURRENCE-ID;TZID=Europe/Lisbon:20261221T090000',
      'DTSTART;TZID=Europe/Lisbon:20261221T150000',
      'DTEND;TZID=Europe/Lisbon:20261221T160000',
      'END:VEVENT',
    );
    const r = busyFromIcs(ics, { window: FOUR_WEEKS, zone: 'Europe/Lisbon' });
    // Lisbon is UTC+0 in December (IANA tzdata: WET)
    expect(rows(r)).toEqual([
      ['2026-12-07T09:00:00Z', '2026-12-07T10:00:00Z', 'busy'],
      ['2026-12-14T11:00:00Z', '2026-12-14T11:30:00Z', 'busy'],
      ['2026-12-21T15:00:00Z', '2026-12-21T16:00:00Z', 'busy'],
      ['2026-12-28T11:00:00Z', '2026-12-28T11:30:00Z', 'busy'],
    ]);
    expect(r.warnings).toEqual([]);

    const cancelled = cal(
      ...series('ends'),
      'BEGIN:VEVENT',
      'UID:ends',
      'RECURRENCE-ID;RANGE=THISANDFUTURE;TZID=Europe/Lisbon:20261221T090000',
      'DTSTART;TZID=Europe/Lisbon:20261221T090000',
      'STATUS:CANCELLED',
      'END:VEVENT',
    );
    expect(rows(busyFromIcs(cancelled, { window: FOUR_WEEKS, zone: 'Europe/Lisbon' }))).toEqual([
      ['2026-12-07T09:00:00Z', '2026-12-07T10:00:00Z', 'busy'],
      ['2026-12-14T09:00:00Z', '2026-12-14T10:00:00Z', 'busy'],
    ]);
  });

  it('rejects text that is not iCalendar', () => {
    expect(() => busyFromIcs('<html>nope</html>', { window: WEEK, zone: 'UTC' })).toThrow(SlotwrightError);
  });

  it('hands ical.js only the lines that bear on busy time, folded continuations included', () => {
    const ics = cal(
      'BEGIN:VEVENT',
      'UID:cut',
      'SUMMARY:Tide gauge review',
      'DESCRIPTION:Bring the survey',
      '  notes from the north shore', // a folded continuation of DESCRIPTION (RFC 5545 section 3.1)
      '\tand the south shore',
      'LOCATION;LANGUAGE=en:Harbour room',
      'X-SALTLINE-COLOUR:teal',
      'DTSTART;TZID=Europe/Lisbon:20261208T100000',
      'DURATION:PT1H',
      'ATTENDEE;PARTSTAT=DECLINED;CN="Teo":mailto:teo@saltline.example',
      'STATUS:TENTATIVE',
      'TRANSP:OPAQUE', // the default (busy), so it goes as well
      'BEGIN:VALARM',
      'ACTION:DISPLAY',
      'TRIGGER:-PT15M',
      'END:VALARM',
      'END:VEVENT',
    );
    const withOwner = busyLinesOnly(ics, true);
    expect(withOwner.split('\r\n')).toEqual([
      'BEGIN:VCALENDAR',
      'VERSION:2.0',
      'BEGIN:VEVENT',
      'UID:cut',
      'DTSTART;TZID=Europe/Lisbon:20261208T100000',
      'DURATION:PT1H',
      'ATTENDEE;PARTSTAT=DECLINED;CN="Teo":mailto:teo@saltline.example',
      'STATUS:TENTATIVE',
      'BEGIN:VALARM',
      'END:VALARM',
      'END:VEVENT',
      'END:VCALENDAR',
    ]);
    expect(busyLinesOnly(ics, false)).not.toContain('ATTENDEE');
    // bare LF line breaks, which many producers write, are cut the same way
    expect(busyLinesOnly(ics.replace(/\r\n/g, '\n'), true)).toBe(withOwner.replace(/\r\n/g, '\n'));
    // the cut changes nothing in what is read, and the declined line still counts for its owner
    expect(rows(busyFromIcs(ics, { window: WEEK, zone: 'UTC' }))).toEqual([
      ['2026-12-08T10:00:00Z', '2026-12-08T11:00:00Z', 'tentative'],
    ]);
    // STATUS:CONFIRMED is the default too, and a folded line that only starts like it is kept whole
    expect(
      busyLinesOnly(cal('BEGIN:VEVENT', 'STATUS:CONFIRMED', 'STATUS:CONFIRMED', ' X', 'END:VEVENT'), false),
    ).toBe(
      cal('BEGIN:VEVENT', 'STATUS:CONFIRMED', ' X', 'END:VEVENT').replace(
        'PRODID:-//slotwright//test//EN\r\n',
        '',
      ),
    );
    expect(rows(busyFromIcs(ics, { window: WEEK, zone: 'UTC', ownerEmail: 'teo@saltline.example' }))).toEqual(
      [],
    );
  });

  it('names lines of the original text when a feed with cut lines is damaged', () => {
    const ics = cal(
      'BEGIN:VEVENT',
      'UID:ok',
      'SUMMARY:Buoy check',
      'DESCRIPTION:long',
      ' folded text',
      'DTSTART:20261208T100000Z',
      'DTEND:20261208T110000Z',
      'END:VEVENT',
      'BEGIN:VEVENT',
      'UID:broken',
      'SUMMARY:Another',
      'DTSTART:20261209T100000Z',
      'this line has no colon',
      'END:VEVENT',
    );
    const r = busyFromIcs(ics, { window: WEEK, zone: 'UTC' });
    expect(rows(r)).toEqual([['2026-12-08T10:00:00Z', '2026-12-08T11:00:00Z', 'busy']]);
    expect(r.warnings).toHaveLength(1);
    expect(r.warnings[0]).toMatch(/^VEVENT at line 12 could not be read \(line 16\)/);
  });

  it('reads a broken line it would cut as no error: titles are never parsed', () => {
    const ics = cal(
      'BEGIN:VEVENT',
      'UID:title-only-broken',
      'SUMMARY;X-NOTE="unclosed:Tide',
      'DTSTART:20261208T100000Z',
      'DTEND:20261208T110000Z',
      'END:VEVENT',
    );
    const r = busyFromIcs(ics, { window: WEEK, zone: 'UTC' });
    expect(rows(r)).toEqual([['2026-12-08T10:00:00Z', '2026-12-08T11:00:00Z', 'busy']]);
    expect(r.warnings).toEqual([]);
  });

  it('expands a weekly series begun years before the window from near the window', () => {
    const ics = cal(
      'BEGIN:VEVENT',
      'UID:old-weekly',
      'DTSTART;TZID=Pacific/Auckland:20190107T090000',
      'DTEND;TZID=Pacific/Auckland:20190107T093000',
      'RRULE:FREQ=WEEKLY;INTERVAL=2;BYDAY=MO,TH;WKST=SU',
      'END:VEVENT',
    );
    const r = busyFromIcs(ics, { window: WEEK, zone: 'UTC', maxInstancesPerSeries: 40 });
    // 2019-01-07 is a Monday; 2026-12-14 is the Monday 2,898 days = 207 fortnights on (counted with
    // Python's datetime), so the week of Sunday 13 to Saturday 19 December is one of the series'
    // weeks and the week before is not. Auckland is UTC+13 in December (IANA tzdata: NZDT), so
    // Monday 14 December 09:00 local is 20:00 UTC on the 13th, inside the window; Thursday 17th is
    // after it. Only instances near the window are expanded, so the cap of 40 is not reached.
    expect(rows(r)).toEqual([['2026-12-13T20:00:00Z', '2026-12-13T20:30:00Z', 'busy']]);
    expect(r.warnings).toEqual([]);
  });
});
