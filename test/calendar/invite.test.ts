import ICAL from 'ical.js';
import ical, { type VEvent } from 'node-ical';
import { RRule } from 'rrule';
import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import {
  type InviteInput,
  inviteCancel,
  inviteRequest,
  inviteSeries,
  type SeriesInviteInput,
} from '../../src/calendar/invite.ts';
import { vtimezoneFor } from '../../src/calendar/invite-vtimezone.ts';

const booking: InviteInput = {
  bookingId: 'bk-7f3a',
  domain: 'slotwright.saltline.example',
  title: 'Survey sync',
  start: Date.UTC(2026, 11, 7, 14, 0),
  end: Date.UTC(2026, 11, 7, 14, 45),
  organizer: { name: 'Ines Carvalhal', email: 'ines@saltline.example' },
  attendees: [
    { name: 'Rui Teixo', email: 'rui@saltline.example', role: 'required' },
    { name: 'Aroha Kerei', email: 'aroha@saltline.example', role: 'optional' },
  ],
  location: 'Tejo',
  sequence: 0,
  stamp: Date.UTC(2026, 11, 1, 18, 0),
};

function icalJs(text: string) {
  const cal = new ICAL.Component(ICAL.parse(text));
  const vevent = cal.getFirstSubcomponent('vevent')!;
  return { cal, vevent };
}

function nodeIcalEvent(text: string): VEvent & { method?: string } {
  const parsed = ical.sync.parseICS(text);
  const events = Object.values(parsed).filter((c) => c?.type === 'VEVENT');
  expect(events).toHaveLength(1);
  return events[0] as VEvent & { method?: string };
}

describe('REQUEST invite for one booking (RFC 5546 section 3.2.2)', () => {
  const text = inviteRequest(booking);

  it('parses with ical.js: METHOD, UID, SEQUENCE, DTSTAMP, times, ORGANIZER and ATTENDEE parameters', () => {
    const { cal, vevent } = icalJs(text);
    expect(cal.getFirstPropertyValue('method')).toBe('REQUEST');
    expect(cal.getFirstPropertyValue('version')).toBe('2.0');
    expect(vevent.getFirstPropertyValue('uid')).toBe('bk-7f3a@slotwright.saltline.example');
    expect(vevent.getFirstPropertyValue('sequence')).toBe(0);
    // RFC 5545 section 3.8.7.2: DTSTAMP is in UTC.
    expect(String(vevent.getFirstPropertyValue('dtstamp'))).toBe('2026-12-01T18:00:00Z');
    const ev = new ICAL.Event(vevent);
    expect(ev.startDate.toJSDate().getTime()).toBe(booking.start);
    expect(ev.endDate.toJSDate().getTime()).toBe(booking.end);
    // RFC 5546 section 3.2.2 lists ORGANIZER as required in a REQUEST.
    const org = vevent.getFirstProperty('organizer')!;
    expect(String(org.getFirstValue()).toLowerCase()).toBe('mailto:ines@saltline.example');
    expect(org.getParameter('cn')).toBe('Ines Carvalhal');
    const attendees = vevent.getAllProperties('attendee').map((p) => ({
      who: String(p.getFirstValue()).toLowerCase(),
      role: p.getParameter('role'),
      partstat: p.getParameter('partstat'),
      rsvp: p.getParameter('rsvp'),
    }));
    expect(attendees).toEqual([
      { who: 'mailto:rui@saltline.example', role: 'REQ-PARTICIPANT', partstat: 'NEEDS-ACTION', rsvp: 'TRUE' },
      {
        who: 'mailto:aroha@saltline.example',
        role: 'OPT-PARTICIPANT',
        partstat: 'NEEDS-ACTION',
        rsvp: 'TRUE',
      },
    ]);
    expect(vevent.getFirstPropertyValue('status')).toBe('CONFIRMED');
    expect(vevent.getFirstPropertyValue('location')).toBe('Tejo');
  });

  it('parses with node-ical to the same UID, times, method and organizer', () => {
    const ev = nodeIcalEvent(text);
    expect(ev.uid).toBe('bk-7f3a@slotwright.saltline.example');
    expect(ev.method).toBe('REQUEST');
    expect(Number(ev.sequence)).toBe(0);
    expect(ev.start.getTime()).toBe(booking.start);
    expect(ev.end?.getTime()).toBe(booking.end);
    expect(String((ev.organizer as { val: string }).val).toLowerCase()).toBe('mailto:ines@saltline.example');
    const att = (Array.isArray(ev.attendee) ? ev.attendee : [ev.attendee]) as {
      params: Record<string, unknown>;
    }[];
    expect(att.map((a) => a.params.ROLE)).toEqual(['REQ-PARTICIPANT', 'OPT-PARTICIPANT']);
  });

  it('folds long lines at 75 octets with CRLF endings (RFC 5545 section 3.1)', () => {
    expect(text.includes('\r\n')).toBe(true);
    for (const line of text.split('\r\n')) expect(Buffer.byteLength(line, 'utf8')).toBeLessThanOrEqual(75);
  });

  it('refuses what a calendar client could not use, with a reason', () => {
    expect(() => inviteRequest({ ...booking, end: booking.start })).toThrow(/end after it starts/);
    expect(() =>
      inviteRequest({ ...booking, organizer: { name: 'Ines', email: 'ines-at-saltline' } }),
    ).toThrow(/not an email address/);
    expect(() => inviteRequest({ ...booking, sequence: -1 })).toThrow(/SEQUENCE/);
  });
});

describe('CANCEL after REQUEST (RFC 5546 section 3.2.5)', () => {
  const request = inviteRequest(booking);
  const cancel = inviteCancel({ ...booking, sequence: 1, stamp: booking.stamp + 3_600_000 });

  it('keeps the UID, raises SEQUENCE, says METHOD:CANCEL and STATUS:CANCELLED (ical.js)', () => {
    const a = icalJs(request);
    const b = icalJs(cancel);
    expect(b.cal.getFirstPropertyValue('method')).toBe('CANCEL');
    expect(b.vevent.getFirstPropertyValue('uid')).toBe(a.vevent.getFirstPropertyValue('uid'));
    expect(Number(b.vevent.getFirstPropertyValue('sequence'))).toBe(
      Number(a.vevent.getFirstPropertyValue('sequence')) + 1,
    );
    expect(b.vevent.getFirstPropertyValue('status')).toBe('CANCELLED');
    expect(b.vevent.getFirstProperty('organizer')).not.toBeNull();
    expect(b.vevent.getAllProperties('attendee')).toHaveLength(2);
  });

  it('reads the same with node-ical', () => {
    const ev = nodeIcalEvent(cancel);
    expect(ev.method).toBe('CANCEL');
    expect(ev.uid).toBe('bk-7f3a@slotwright.saltline.example');
    expect(Number(ev.sequence)).toBe(1);
    expect(ev.status).toBe('CANCELLED');
  });

  it('refuses a CANCEL whose SEQUENCE could not supersede the REQUEST', () => {
    expect(() => inviteCancel(booking)).toThrow(/SEQUENCE above/);
  });
});

describe('weekly series invite with RRULE and BYDAY', () => {
  // Mondays and Thursdays 10:00 in Lisbon, from 2027-03-15, 6 sessions: spans the EU change to
  // summer time on Sunday 2027-03-28 at 01:00 UTC (last Sunday of March, Directive 2000/84/EC).
  const { bookingId: _unused, ...rest } = booking;
  const series: SeriesInviteInput = {
    ...rest,
    seriesId: 'series-survey',
    start: Date.UTC(2027, 2, 15, 10, 0),
    end: Date.UTC(2027, 2, 15, 11, 0),
    zone: 'Europe/Lisbon',
    byDay: ['MO', 'TH'],
    count: 6,
  };
  const text = inviteSeries(series);
  // Lisbon is UTC+0 in winter and UTC+1 in summer (IANA tz database, Europe/Lisbon).
  const expected = [
    '2027-03-15T10:00:00.000Z',
    '2027-03-18T10:00:00.000Z',
    '2027-03-22T10:00:00.000Z',
    '2027-03-25T10:00:00.000Z',
    '2027-03-29T09:00:00.000Z',
    '2027-04-01T09:00:00.000Z',
  ];

  it('writes FREQ=WEEKLY with BYDAY and local times with TZID', () => {
    const { vevent } = icalJs(text);
    const rrule = vevent.getFirstPropertyValue('rrule') as InstanceType<typeof ICAL.Recur>;
    expect(rrule.freq).toBe('WEEKLY');
    expect(rrule.count).toBe(6);
    expect(rrule.parts.BYDAY).toEqual(['MO', 'TH']);
    expect(vevent.getFirstProperty('dtstart')!.getParameter('tzid')).toBe('Europe/Lisbon');
  });

  it('expands in ical.js, using the VTIMEZONE it carries, to sessions that keep 10:00 local time', () => {
    const { cal, vevent } = icalJs(text);
    for (const tz of cal.getAllSubcomponents('vtimezone')) ICAL.TimezoneService.register(tz);
    try {
      const it = new ICAL.Event(vevent).iterator();
      const got: string[] = [];
      for (let t = it.next(); t !== null && t !== undefined; t = it.next())
        got.push(t.toJSDate().toISOString());
      expect(got).toEqual(expected);
    } finally {
      ICAL.TimezoneService.remove('Europe/Lisbon');
    }
  });

  it('expands the same way in node-ical and agrees with the rrule library', () => {
    const ev = nodeIcalEvent(text);
    expect(ev.rrule).toBeDefined();
    const fromNodeIcal = ev.rrule!.all().map((d: Date) => d.toISOString());
    expect(fromNodeIcal).toEqual(expected);
    // rrule expands the wall-clock dates (floating, no zone); Temporal places them in Lisbon.
    const ref = new RRule({
      freq: RRule.WEEKLY,
      byweekday: [RRule.MO, RRule.TH],
      count: 6,
      dtstart: new Date(Date.UTC(2027, 2, 15, 10, 0)),
    });
    const placed = ref
      .all()
      .map((d) =>
        Temporal.PlainDateTime.from(d.toISOString().slice(0, 19))
          .toZonedDateTime('Europe/Lisbon')
          .toInstant()
          .toString({ fractionalSecondDigits: 3 }),
      );
    expect(placed).toEqual(expected);
  });

  it('needs weekdays and exactly one of until or count', () => {
    expect(() => inviteSeries({ ...series, byDay: [] })).toThrow(/weekday/);
    expect(() => inviteSeries({ ...series, until: series.start + 1e9 })).toThrow(/exactly one/);
  });
});

describe('VTIMEZONE from the zone rules', () => {
  it('Lisbon 2026-2027: summer time ends 2026-10-25 01:00 UTC and starts 2027-03-28 01:00 UTC', () => {
    // EU rule (Directive 2000/84/EC): changes at 01:00 UTC on the last Sundays of March and October.
    const text = vtimezoneFor('Europe/Lisbon', Date.UTC(2026, 11, 1), Date.UTC(2027, 5, 1));
    expect(text.split('\r\n')).toEqual([
      'BEGIN:VTIMEZONE',
      'TZID:Europe/Lisbon',
      'BEGIN:STANDARD',
      'DTSTART:20261025T020000',
      'TZOFFSETFROM:+0100',
      'TZOFFSETTO:+0000',
      'END:STANDARD',
      'BEGIN:DAYLIGHT',
      'DTSTART:20270328T010000',
      'TZOFFSETFROM:+0000',
      'TZOFFSETTO:+0100',
      'END:DAYLIGHT',
      'END:VTIMEZONE',
    ]);
  });

  it('Auckland: daylight time in the southern summer', () => {
    // New Zealand daylight time ends on the first Sunday of April at 03:00 NZDT and starts on the
    // last Sunday of September at 02:00 NZST (from memory; the IANA Pacific/Auckland rules agree).
    const text = vtimezoneFor('Pacific/Auckland', Date.UTC(2027, 0, 1), Date.UTC(2027, 11, 1));
    const lines = text.split('\r\n');
    expect(lines).toContain('DTSTART:20270404T030000');
    expect(lines).toContain('DTSTART:20270926T020000');
    expect(lines.filter((l) => l.startsWith('TZOFFSETTO:'))).toEqual([
      'TZOFFSETTO:+1300',
      'TZOFFSETTO:+1200',
      'TZOFFSETTO:+1300',
    ]);
  });

  it('a zone without changes gets one standard observance', () => {
    expect(vtimezoneFor('UTC', 0, 1e12)).toContain('TZOFFSETTO:+0000');
  });
});
