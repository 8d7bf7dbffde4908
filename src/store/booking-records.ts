import type { BookingState } from './schema.ts';

/** How an attendee takes part. */
export type AttendeeRole = 'required' | 'optional';

/** An attendee of a booking. */
export interface BookingAttendee {
  readonly id: string;
  readonly role: AttendeeRole;
}

/** A booking or hold as the rest of the code sees it; instants are epoch milliseconds. */
export interface BookingRecord {
  readonly id: string;
  readonly idemKey: string;
  readonly requestId: string | null;
  readonly optionId: string | null;
  readonly seriesId: string | null;
  readonly organizer: string;
  readonly title: string;
  readonly start: number;
  readonly end: number;
  readonly room: string | null;
  readonly state: BookingState;
  readonly holdExpiresAt: number | null;
  /** RFC 5545 SEQUENCE of the invite last sent for it. */
  readonly sequence: number;
  readonly cancelReason: string | null;
  readonly attendees: readonly BookingAttendee[];
  readonly createdAt: number;
  readonly updatedAt: number;
}

/** What to hold or book. */
export interface ReserveInput {
  /** Same key, same booking: request id + option id, or the tuple a script books. */
  readonly idemKey: string;
  /** Id for a new row (the caller makes it, so the store stays free of randomness). */
  readonly newId: string;
  readonly requestId?: string;
  readonly optionId?: string;
  readonly seriesId?: string;
  readonly organizer: string;
  readonly title: string;
  readonly start: number;
  readonly end: number;
  readonly room?: string;
  readonly attendees: readonly BookingAttendee[];
  /** `held` places a hold that lapses at `holdExpiresAt`; `booked` confirms. */
  readonly state: 'held' | 'booked';
  readonly holdExpiresAt?: number;
  readonly now: number;
  /**
   * Checked inside the write transaction after the store's own overlap check: returns the ids of
   * attendees or the room whose outside busy time (feeds) overlaps. Empty means free.
   */
  readonly recheck?: (
    ids: readonly string[],
    interval: { start: number; end: number },
  ) => Promise<readonly string[]>;
}

/** Result of reserve: the booking, or who is in the way. */
export type ReserveOutcome =
  | { readonly ok: true; readonly booking: BookingRecord; readonly created: boolean }
  | {
      readonly ok: false;
      readonly reason: 'conflict';
      /** Ids of the attendees and room that are taken, sorted. */
      readonly with: readonly string[];
    };

/** Result of cancel. */
export type CancelOutcome =
  | { readonly ok: true; readonly booking: BookingRecord; readonly changed: boolean }
  | { readonly ok: false; readonly reason: 'not_found' };
