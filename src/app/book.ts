import { type InviteParty, inviteCancel, inviteRequest } from '../calendar/index.ts';
import type { Issue } from '../errors.ts';
import type { BookingAttendee, BookingRecord } from '../store/index.ts';
import type { BusyInterval, Interval } from '../time/index.ts';
import type { AuditLog, BookingStore } from './ports.ts';

/** Fresh busy time (from feeds) of people and rooms by id over an interval; the app wires the feeds. */
export type BusyOf = (
  ids: readonly string[],
  interval: Interval,
) => Promise<ReadonlyMap<string, readonly BusyInterval[]>>;

/** An expected failure of booking: `conflict` names who is taken; `unauthorized` who may act instead. */
export interface BookingIssue extends Issue {
  readonly code: 'conflict' | 'unauthorized' | 'not_found';
  /** For `conflict`: ids of the people and room that are taken, sorted. */
  readonly with?: readonly string[];
}

/** Result of a booking use case. */
export type BookingResult<T> =
  | { readonly ok: true; readonly value: T }
  | { readonly ok: false; readonly issues: readonly BookingIssue[] };

/** A booking (or hold) with the invite text made for it, when one could be made. */
export interface BookedValue {
  readonly booking: BookingRecord;
  /** False when the same option (or tuple) had been booked before and that booking came back. */
  readonly created: boolean;
  /** An iTIP message (RFC 5546) to send the attendees; absent for holds and when invites are off. */
  readonly invite?: string;
  /** What could not be put on the invite (people without an email address). */
  readonly warnings: readonly string[];
}

/** One offered option of a request, as the organizer picked it. */
export interface OptionChoice {
  readonly requestId: string;
  readonly optionId: string;
  /** The person who made the request. */
  readonly organizer: string;
  readonly title: string;
  readonly start: number;
  readonly end: number;
  readonly room?: string;
  readonly attendees: readonly BookingAttendee[];
}

/** A booking made without a request (CLI and scripts). */
export interface DirectChoice {
  readonly title?: string;
  readonly start: number;
  readonly end: number;
  readonly room?: string;
  readonly attendees: readonly BookingAttendee[];
}

/** How invites are addressed. */
export interface InviteSettings {
  /** Domain of UIDs (`<booking id>@<domain>`). */
  readonly domain: string;
  /** Name and email of a person, or undefined when the workspace has no email for them. */
  readonly person: (id: string) => InviteParty | undefined;
  /** Display name of a room (used as LOCATION). */
  readonly roomName: (id: string) => string | undefined;
}

/** What the booking use cases need from outside. */
export interface BookingDeps {
  readonly store: BookingStore;
  readonly audit: AuditLog;
  readonly busyOf: BusyOf;
  /** Current instant in epoch ms; passed in so tests control time. */
  readonly now: () => number;
  /** New booking ids. */
  readonly newId: () => string;
  /** Workspace admins (may book and cancel for anyone). */
  readonly admins: readonly string[];
}

/** Options of the booking use cases. */
export interface BookingOptions {
  /** Minutes a hold lasts before the sweeper releases it. @default 10 */
  readonly holdMinutes?: number;
  /** Whether tentative busy time blocks a booking (`hard`) or only lowers a score (`penalty`). @default 'penalty' */
  readonly tentative?: 'penalty' | 'hard';
  /** Invite addressing; no invites are made when absent. @default undefined */
  readonly invites?: InviteSettings;
  /** Title of direct bookings without one. @default 'Meeting' */
  readonly defaultTitle?: string;
}

/** The actor used for the local CLI when no `--as` is given: it already holds the store's file. */
export const LOCAL_OPERATOR = 'local-operator';

const DEFAULTS = { holdMinutes: 10, tentative: 'penalty', defaultTitle: 'Meeting' } satisfies BookingOptions;

/** Idempotency key of a request's option. */
export function optionKey(requestId: string, optionId: string): string {
  return `option:${requestId}/${optionId}`;
}

/** Idempotency key of a direct booking: same attendees, times and room, same booking. */
export function directKey(choice: DirectChoice): string {
  const who = [...new Set(choice.attendees.map((a) => a.id))].sort().join(',');
  return `direct:${who}|${choice.start}|${choice.end}|${choice.room ?? ''}`;
}

/**
 * Holding, booking and cancelling. Bookings never collide: the store re-checks holds and bookings,
 * and asks `busyOf` for fresh feed busy time, inside one write transaction.
 */
export class BookingService {
  readonly #deps: BookingDeps;
  readonly #opts: Required<Omit<BookingOptions, 'invites'>> & Pick<BookingOptions, 'invites'>;

  /** Wires the use cases. */
  constructor(deps: BookingDeps, options: BookingOptions = {}) {
    this.#deps = deps;
    this.#opts = { ...DEFAULTS, ...options };
    if (!(this.#opts.holdMinutes > 0)) throw new RangeError('holdMinutes must be above 0');
  }

  #isAdmin(actor: string): boolean {
    return actor === LOCAL_OPERATOR || this.#deps.admins.includes(actor);
  }

  async #refuse(
    actor: string,
    action: string,
    subject: string,
    issue: BookingIssue,
  ): Promise<BookingResult<never>> {
    await this.#deps.audit.audit({
      actor,
      action,
      subject,
      outcome: `refused:${issue.code}`,
      ...(issue.with === undefined ? {} : { detail: { with: issue.with } }),
      at: this.#deps.now(),
    });
    return { ok: false, issues: [issue] };
  }

  #recheck() {
    const blocks = (b: BusyInterval) => b.kind === 'busy' || this.#opts.tentative === 'hard';
    return async (ids: readonly string[], iv: Interval): Promise<readonly string[]> => {
      const busy = await this.#deps.busyOf(ids, iv);
      return ids.filter((id) =>
        (busy.get(id) ?? []).some((b) => blocks(b) && b.start < iv.end && b.end > iv.start),
      );
    };
  }

  async #reserve(
    actor: string,
    action: 'hold' | 'book',
    subject: string,
    fields: {
      idemKey: string;
      organizer: string;
      title: string;
      start: number;
      end: number;
      room?: string;
      attendees: readonly BookingAttendee[];
      requestId?: string;
      optionId?: string;
    },
  ): Promise<BookingResult<BookedValue>> {
    const now = this.#deps.now();
    const out = await this.#deps.store.reserve({
      ...fields,
      newId: this.#deps.newId(),
      state: action === 'hold' ? 'held' : 'booked',
      ...(action === 'hold' ? { holdExpiresAt: now + this.#opts.holdMinutes * 60_000 } : {}),
      now,
      recheck: this.#recheck(),
    });
    if (!out.ok)
      return this.#refuse(actor, action, subject, {
        code: 'conflict',
        path: ['with'],
        message: `taken at that time: ${out.with.join(', ')}`,
        with: out.with,
      });
    await this.#deps.audit.audit({
      actor,
      action,
      subject: out.booking.id,
      outcome: out.created ? 'ok' : 'ok:repeat',
      at: now,
    });
    const warnings: string[] = [];
    const invite =
      out.booking.state === 'booked' ? this.#invite(out.booking, 'request', now, warnings) : undefined;
    return {
      ok: true,
      value: {
        booking: out.booking,
        created: out.created,
        ...(invite === undefined ? {} : { invite }),
        warnings,
      },
    };
  }

  #invite(b: BookingRecord, kind: 'request' | 'cancel', now: number, warnings: string[]): string | undefined {
    const inv = this.#opts.invites;
    if (inv === undefined) return undefined;
    const organizer = inv.person(b.organizer);
    if (organizer === undefined) {
      warnings.push(`no invite: the organizer ${b.organizer} has no email address in the workspace`);
      return undefined;
    }
    const attendees = [];
    for (const a of b.attendees) {
      if (a.id === b.organizer) continue;
      const p = inv.person(a.id);
      if (p === undefined)
        warnings.push(`${a.id} has no email address in the workspace and is not on the invite`);
      else attendees.push({ ...p, role: a.role });
    }
    const room = b.room === null ? undefined : (inv.roomName(b.room) ?? b.room);
    const input = {
      bookingId: b.id,
      domain: inv.domain,
      title: b.title,
      start: b.start,
      end: b.end,
      organizer,
      attendees,
      sequence: b.sequence,
      stamp: now,
      ...(room === undefined ? {} : { location: room }),
    };
    return kind === 'request' ? inviteRequest(input) : inviteCancel(input);
  }

  #mayActFor(actor: string, organizer: string): boolean {
    return actor === organizer || this.#isAdmin(actor);
  }

  #unauthorized(actor: string, what: string): BookingIssue {
    return {
      code: 'unauthorized',
      path: ['actor'],
      message: `${actor} may not ${what}: only the organizer or a workspace admin may`,
    };
  }

  /** Holds a request's option for the configured minutes. */
  async hold(actor: string, choice: OptionChoice): Promise<BookingResult<BookedValue>> {
    const subject = optionKey(choice.requestId, choice.optionId);
    if (!this.#mayActFor(actor, choice.organizer))
      return this.#refuse(actor, 'hold', subject, this.#unauthorized(actor, 'hold this option'));
    return this.#reserve(actor, 'hold', subject, { ...fieldsOf(choice), idemKey: subject });
  }

  /** Books a request's option (confirming its hold, if there is one); booking twice returns the same booking. */
  async book(actor: string, choice: OptionChoice): Promise<BookingResult<BookedValue>> {
    const subject = optionKey(choice.requestId, choice.optionId);
    if (!this.#mayActFor(actor, choice.organizer))
      return this.#refuse(actor, 'book', subject, this.#unauthorized(actor, 'book this option'));
    return this.#reserve(actor, 'book', subject, { ...fieldsOf(choice), idemKey: subject });
  }

  /**
   * Books a time directly. The actor organizes it; a person who is not an admin may only book
   * meetings they attend, so nobody fills someone else's calendar on their own.
   */
  async bookDirect(actor: string, choice: DirectChoice): Promise<BookingResult<BookedValue>> {
    const key = directKey(choice);
    if (!this.#isAdmin(actor) && !choice.attendees.some((a) => a.id === actor))
      return this.#refuse(actor, 'book', key, {
        code: 'unauthorized',
        path: ['actor'],
        message: `${actor} may only book meetings they attend; a workspace admin may book for others`,
      });
    return this.#reserve(actor, 'book', key, {
      idemKey: key,
      organizer: actor,
      title: choice.title ?? this.#opts.defaultTitle,
      start: choice.start,
      end: choice.end,
      ...(choice.room === undefined ? {} : { room: choice.room }),
      attendees: choice.attendees,
    });
  }

  /** Cancels a booking or releases a hold; the invite is a METHOD:CANCEL with SEQUENCE one higher. */
  async cancel(actor: string, bookingId: string): Promise<BookingResult<BookedValue>> {
    const before = await this.#deps.store.get(bookingId);
    if (before === undefined)
      return this.#refuse(actor, 'cancel', bookingId, {
        code: 'not_found',
        path: ['booking'],
        message: `no booking ${bookingId}`,
      });
    if (!this.#mayActFor(actor, before.organizer))
      return this.#refuse(actor, 'cancel', bookingId, this.#unauthorized(actor, 'cancel this booking'));
    const now = this.#deps.now();
    const out = await this.#deps.store.cancel(bookingId, { now, reason: `cancelled by ${actor}` });
    if (!out.ok)
      return this.#refuse(actor, 'cancel', bookingId, {
        code: 'not_found',
        path: ['booking'],
        message: `no booking ${bookingId}`,
      });
    await this.#deps.audit.audit({
      actor,
      action: 'cancel',
      subject: bookingId,
      outcome: out.changed ? 'ok' : 'ok:repeat',
      at: now,
    });
    const warnings: string[] = [];
    // Only a booking that was sent as a REQUEST needs a CANCEL; a released hold was never sent.
    const invite =
      out.changed && before.state === 'booked'
        ? this.#invite(out.booking, 'cancel', now, warnings)
        : undefined;
    return {
      ok: true,
      value: { booking: out.booking, created: false, ...(invite === undefined ? {} : { invite }), warnings },
    };
  }
}

function fieldsOf(choice: OptionChoice) {
  return {
    requestId: choice.requestId,
    optionId: choice.optionId,
    organizer: choice.organizer,
    title: choice.title,
    start: choice.start,
    end: choice.end,
    ...(choice.room === undefined ? {} : { room: choice.room }),
    attendees: choice.attendees,
  };
}
