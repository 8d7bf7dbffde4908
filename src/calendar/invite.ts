import {
  ICalAttendeeRole,
  ICalAttendeeStatus,
  ICalCalendar,
  ICalCalendarMethod,
  type ICalEventData,
  ICalEventRepeatingFreq,
  ICalEventStatus,
  ICalWeekday,
} from 'ical-generator';
import { Temporal } from 'temporal-polyfill';
import { SlotwrightError } from '../errors.ts';
import { vtimezoneFor } from './invite-vtimezone.ts';

/** Our PRODID (RFC 5545 section 3.7.3); ical-generator writes the leading '-'. */
export const PRODID = '//slotwright//bookings//EN';

/** Someone on an invite. */
export interface InviteParty {
  readonly name: string;
  readonly email: string;
}

/** An attendee, with whether they must come. */
export interface InviteAttendee extends InviteParty {
  readonly role: 'required' | 'optional';
}

/** What an invite for one booking says. */
export interface InviteInput {
  /** Booking id; the UID is `<bookingId>@<domain>` so every message about it names the same event. */
  readonly bookingId: string;
  /** Domain for UIDs, e.g. `slotwright.saltline.example`. */
  readonly domain: string;
  readonly title: string;
  /** Epoch ms, UTC. */
  readonly start: number;
  readonly end: number;
  readonly organizer: InviteParty;
  readonly attendees: readonly InviteAttendee[];
  /** Room name, written as LOCATION. @default undefined */
  readonly location?: string;
  /** RFC 5545 SEQUENCE: 0 for the first REQUEST, one more for each later revision. */
  readonly sequence: number;
  /** DTSTAMP: when this message was made (epoch ms). */
  readonly stamp: number;
  /** Plain text for DESCRIPTION. @default undefined */
  readonly description?: string;
}

/** Two-letter RFC 5545 weekday codes. */
export type WeekdayCode = 'MO' | 'TU' | 'WE' | 'TH' | 'FR' | 'SA' | 'SU';

/** A weekly series invite: the first session's local wall time in a zone, repeated on weekdays. */
export interface SeriesInviteInput extends Omit<InviteInput, 'bookingId'> {
  /** Series id; the UID is `<seriesId>@<domain>`. */
  readonly seriesId: string;
  /** IANA zone the sessions keep their wall-clock time in (across daylight-saving changes). */
  readonly zone: string;
  /** Days of the week the series meets on. */
  readonly byDay: readonly WeekdayCode[];
  /** Number of weeks between sessions. @default 1 */
  readonly interval?: number;
  /** Last instant a session may start (UNTIL), or a session count; one is required. */
  readonly until?: number;
  readonly count?: number;
}

const WEEKDAY: Readonly<Record<WeekdayCode, ICalWeekday>> = {
  MO: ICalWeekday.MO,
  TU: ICalWeekday.TU,
  WE: ICalWeekday.WE,
  TH: ICalWeekday.TH,
  FR: ICalWeekday.FR,
  SA: ICalWeekday.SA,
  SU: ICalWeekday.SU,
};

function checkInput(input: Omit<InviteInput, 'bookingId'>): void {
  if (!(input.end > input.start))
    throw new SlotwrightError('bad_argument', 'an invite must end after it starts');
  if (!Number.isInteger(input.sequence) || input.sequence < 0)
    throw new SlotwrightError(
      'bad_argument',
      `SEQUENCE must be a whole number of 0 or more, got ${input.sequence}`,
    );
  if (!/^[A-Za-z0-9.-]+$/.test(input.domain))
    throw new SlotwrightError('bad_argument', `the invite domain '${input.domain}' is not a host name`);
  for (const p of [input.organizer, ...input.attendees])
    if (!/^[^@\s]+@[^@\s]+$/.test(p.email))
      throw new SlotwrightError('bad_argument', `'${p.email}' (${p.name}) is not an email address`);
}

function eventData(
  input: Omit<InviteInput, 'bookingId'>,
  uid: string,
  status: ICalEventStatus,
): ICalEventData {
  return {
    id: uid,
    sequence: input.sequence,
    stamp: new Date(input.stamp),
    start: new Date(input.start),
    end: new Date(input.end),
    summary: input.title,
    status,
    organizer: { name: input.organizer.name, email: input.organizer.email },
    attendees: input.attendees.map((a) => ({
      name: a.name,
      email: a.email,
      rsvp: status !== ICalEventStatus.CANCELLED,
      status: ICalAttendeeStatus.NEEDSACTION,
      role: a.role === 'required' ? ICalAttendeeRole.REQ : ICalAttendeeRole.OPT,
    })),
    ...(input.location === undefined ? {} : { location: input.location }),
    ...(input.description === undefined ? {} : { description: input.description }),
  };
}

/** The UID of a booking's event. */
export function inviteUid(id: string, domain: string): string {
  return `${id}@${domain}`;
}

/**
 * A METHOD:REQUEST message for one booking: ORGANIZER, one ATTENDEE per person with RSVP and
 * PARTSTAT=NEEDS-ACTION, a stable UID, DTSTAMP and SEQUENCE (RFC 5546 section 3.2.2).
 */
export function inviteRequest(input: InviteInput): string {
  checkInput(input);
  const cal = new ICalCalendar({ prodId: PRODID, method: ICalCalendarMethod.REQUEST });
  cal.createEvent(eventData(input, inviteUid(input.bookingId, input.domain), ICalEventStatus.CONFIRMED));
  return cal.toString();
}

/**
 * A METHOD:CANCEL message: same UID as the REQUEST, STATUS:CANCELLED, and the SEQUENCE the caller
 * passes, which must be above every earlier one (RFC 5546 section 3.2.5).
 */
export function inviteCancel(input: InviteInput): string {
  checkInput(input);
  if (input.sequence < 1)
    throw new SlotwrightError('bad_argument', 'a CANCEL must carry a SEQUENCE above the REQUEST it cancels');
  const cal = new ICalCalendar({ prodId: PRODID, method: ICalCalendarMethod.CANCEL });
  cal.createEvent(eventData(input, inviteUid(input.bookingId, input.domain), ICalEventStatus.CANCELLED));
  return cal.toString();
}

/**
 * A METHOD:REQUEST for a weekly series (RRULE FREQ=WEEKLY with BYDAY). Times are written with
 * TZID and a VTIMEZONE so the sessions keep their local time when daylight saving changes.
 */
export function inviteSeries(input: SeriesInviteInput): string {
  checkInput(input);
  if (input.byDay.length === 0)
    throw new SlotwrightError('bad_argument', 'a series needs at least one weekday');
  if ((input.until === undefined) === (input.count === undefined))
    throw new SlotwrightError('bad_argument', 'a series needs exactly one of an end date (until) or a count');
  const last = input.until ?? input.start + (input.count ?? 1) * 7 * (input.interval ?? 1) * 86_400_000;
  const cal = new ICalCalendar({
    prodId: PRODID,
    method: ICalCalendarMethod.REQUEST,
    // No calendar-wide zone: DTSTAMP must stay in UTC (RFC 5545 section 3.8.7.2); the generator still
    // writes a VTIMEZONE for each zone the events use.
    timezone: { name: null, generator: (tz) => vtimezoneFor(tz, input.start, last) },
  });
  const data = eventData(input, inviteUid(input.seriesId, input.domain), ICalEventStatus.CONFIRMED);
  const zoned = (ms: number) => Temporal.Instant.fromEpochMilliseconds(ms).toZonedDateTimeISO(input.zone);
  cal.createEvent({
    ...data,
    timezone: input.zone,
    start: zoned(input.start),
    end: zoned(input.end),
    repeating: {
      freq: ICalEventRepeatingFreq.WEEKLY,
      byDay: input.byDay.map((d) => WEEKDAY[d]),
      ...(input.interval === undefined || input.interval === 1 ? {} : { interval: input.interval }),
      ...(input.until === undefined ? {} : { until: new Date(input.until) }),
      ...(input.count === undefined ? {} : { count: input.count }),
    },
  });
  return cal.toString();
}
