import type { Kysely, Selectable } from 'kysely';
import { SlotwrightError } from '../errors.ts';
import type {
  BookingAttendee,
  BookingRecord,
  CancelOutcome,
  ReserveInput,
  ReserveOutcome,
} from './booking-records.ts';
import { type StoreHandle, writeTransaction } from './open-store.ts';
import type { BookingTable, StoreSchema } from './schema.ts';

type Db = Kysely<StoreSchema>;

// Person and room ids live in separate namespaces in the workspace; the prefix keeps them apart here.
const personKey = (id: string) => `p:${id}`;
const roomKey = (id: string) => `r:${id}`;
const idOfKey = (key: string) => key.slice(2);

function resourcesOf(attendees: readonly BookingAttendee[], room: string | null | undefined): string[] {
  const keys = attendees.map((a) => personKey(a.id));
  if (room !== undefined && room !== null) keys.push(roomKey(room));
  return keys;
}

function toRecord(row: Selectable<BookingTable>, attendees: readonly BookingAttendee[]): BookingRecord {
  return {
    id: row.id,
    idemKey: row.idem_key,
    requestId: row.request_id,
    optionId: row.option_id,
    seriesId: row.series_id,
    organizer: row.organizer,
    title: row.title,
    start: Number(row.start_ms),
    end: Number(row.end_ms),
    room: row.room,
    state: row.state,
    holdExpiresAt: row.hold_expires_ms === null ? null : Number(row.hold_expires_ms),
    sequence: Number(row.sequence),
    cancelReason: row.cancel_reason,
    attendees,
    createdAt: Number(row.created_ms),
    updatedAt: Number(row.updated_ms),
  };
}

/** PostgreSQL SQLSTATE for an exclusion-constraint violation. */
const EXCLUSION_VIOLATION = '23P01';
/** PostgreSQL SQLSTATE for a unique violation. */
const UNIQUE_VIOLATION = '23505';

function sqlState(error: unknown): string | undefined {
  const code = (error as { code?: unknown } | null)?.code;
  return typeof code === 'string' ? code : undefined;
}

/** Thrown inside the transaction to roll it back and report who is in the way. */
class ConflictSignal extends Error {
  constructor(readonly ids: readonly string[]) {
    super('conflict');
  }
}

/**
 * Bookings and holds in SQL. Every live booking or hold has one occupancy row per attendee and room;
 * a new one is refused when any of them overlaps a live row. PostgreSQL also enforces that with an
 * exclusion constraint, so replicas racing each other still cannot double-book.
 */
export class SqlBookingStore {
  readonly #handle: StoreHandle;

  /** Wraps an open store. */
  constructor(handle: StoreHandle) {
    this.#handle = handle;
  }

  /** Holds or books an option; the same idempotency key returns the same booking. */
  async reserve(input: ReserveInput): Promise<ReserveOutcome> {
    if (!(input.end > input.start))
      throw new SlotwrightError('bad_argument', 'a booking must end after it starts');
    if (input.attendees.length === 0 && input.room === undefined)
      throw new SlotwrightError('bad_argument', 'a booking needs at least one attendee or a room');
    if (input.state === 'held' && input.holdExpiresAt === undefined)
      throw new SlotwrightError('bad_argument', 'a hold needs an expiry time');
    try {
      return await writeTransaction(this.#handle, (tx) => this.#reserveIn(tx, input));
    } catch (error) {
      const state = sqlState(error);
      if (!(error instanceof ConflictSignal) && state !== EXCLUSION_VIOLATION && state !== UNIQUE_VIOLATION)
        throw error;
      // On PostgreSQL a concurrent call with the same key may commit between our key lookup and our
      // overlap check; what collided with us is then our own booking, so hand that back.
      const existing = await this.#liveByKey(this.#handle.db, input.idemKey);
      if (existing !== undefined) {
        // A hold of ours committed first and we came to book: confirm it now that it is visible.
        if (existing.state === 'held' && input.state === 'booked')
          return writeTransaction(this.#handle, (tx) => this.#reserveIn(tx, input));
        return { ok: true, booking: existing, created: false };
      }
      if (error instanceof ConflictSignal) return { ok: false, reason: 'conflict', with: error.ids };
      if (state === EXCLUSION_VIOLATION) {
        // Another replica committed first; its rows are visible now, so name who collided.
        const ids = await this.#overlapping(this.#handle.db, input, null);
        return { ok: false, reason: 'conflict', with: ids.length > 0 ? ids : unionIds(input) };
      }
      throw error;
    }
  }

  async #reserveIn(tx: Db, input: ReserveInput): Promise<ReserveOutcome> {
    await releaseExpired(tx, input.now);
    if (input.state === 'booked' && input.requestId !== undefined)
      await releaseSiblingHolds(tx, input.requestId, input.idemKey, input.now);
    const existing = await this.#liveByKey(tx, input.idemKey);
    if (existing !== undefined) {
      if (existing.state === 'booked' || input.state === 'held')
        return { ok: true, booking: existing, created: false };
      // Confirming our own hold: others may have changed their feeds since, so check again.
      await this.#assertFree(tx, input, existing.id);
      await tx
        .updateTable('booking')
        .set({ state: 'booked', hold_expires_ms: null, updated_ms: input.now })
        .where('id', '=', existing.id)
        .execute();
      await tx
        .updateTable('occupancy')
        .set({ state: 'booked' })
        .where('booking_id', '=', existing.id)
        .execute();
      const booking = await this.#byId(tx, existing.id);
      return { ok: true, booking: booking!, created: false };
    }
    await this.#assertFree(tx, input, null);
    await tx
      .insertInto('booking')
      .values({
        id: input.newId,
        idem_key: input.idemKey,
        request_id: input.requestId ?? null,
        option_id: input.optionId ?? null,
        series_id: input.seriesId ?? null,
        organizer: input.organizer,
        title: input.title,
        start_ms: input.start,
        end_ms: input.end,
        room: input.room ?? null,
        state: input.state,
        hold_expires_ms: input.state === 'held' ? (input.holdExpiresAt ?? null) : null,
        sequence: 0,
        cancel_reason: null,
        created_ms: input.now,
        updated_ms: input.now,
      })
      .execute();
    if (input.attendees.length > 0)
      await tx
        .insertInto('booking_attendee')
        .values(input.attendees.map((a) => ({ booking_id: input.newId, person_id: a.id, role: a.role })))
        .execute();
    await tx
      .insertInto('occupancy')
      .values(
        resourcesOf(input.attendees, input.room).map((resource) => ({
          booking_id: input.newId,
          resource,
          start_ms: input.start,
          end_ms: input.end,
          state: input.state,
        })),
      )
      .execute();
    const booking = await this.#byId(tx, input.newId);
    return { ok: true, booking: booking!, created: true };
  }

  async #assertFree(tx: Db, input: ReserveInput, self: string | null): Promise<void> {
    const taken = new Set(await this.#overlapping(tx, input, self));
    if (input.recheck !== undefined) {
      const ids = [...input.attendees.map((a) => a.id), ...(input.room === undefined ? [] : [input.room])];
      for (const id of await input.recheck(ids, { start: input.start, end: input.end })) taken.add(id);
    }
    if (taken.size > 0) throw new ConflictSignal([...taken].sort());
  }

  async #overlapping(db: Db, input: ReserveInput, self: string | null): Promise<string[]> {
    let q = db
      .selectFrom('occupancy')
      .select('resource')
      .distinct()
      .where('resource', 'in', resourcesOf(input.attendees, input.room))
      .where('state', 'in', ['held', 'booked'])
      .where('start_ms', '<', input.end)
      .where('end_ms', '>', input.start);
    if (self !== null) q = q.where('booking_id', '<>', self);
    const rows = await q.execute();
    return rows.map((r) => idOfKey(r.resource)).sort();
  }

  async #liveByKey(db: Db, key: string): Promise<BookingRecord | undefined> {
    const row = await db
      .selectFrom('booking')
      .select('id')
      .where('idem_key', '=', key)
      .where('state', '<>', 'cancelled')
      .executeTakeFirst();
    return row === undefined ? undefined : this.#byId(db, row.id);
  }

  async #byId(db: Db, id: string): Promise<BookingRecord | undefined> {
    const row = await db.selectFrom('booking').selectAll().where('id', '=', id).executeTakeFirst();
    if (row === undefined) return undefined;
    const attendees = await db
      .selectFrom('booking_attendee')
      .select(['person_id', 'role'])
      .where('booking_id', '=', id)
      .orderBy('person_id')
      .execute();
    return toRecord(
      row,
      attendees.map((a) => ({ id: a.person_id, role: a.role })),
    );
  }

  /** One booking by id, in any state. */
  async get(id: string): Promise<BookingRecord | undefined> {
    return this.#byId(this.#handle.db, id);
  }

  /** The live booking with this idempotency key, if any. */
  async getByKey(key: string): Promise<BookingRecord | undefined> {
    return this.#liveByKey(this.#handle.db, key);
  }

  /**
   * Cancels a booking or releases a hold: state becomes cancelled, SEQUENCE goes up by one (so the
   * CANCEL message supersedes the REQUEST), and its occupancy no longer blocks anyone.
   */
  async cancel(
    id: string,
    options: { readonly now: number; readonly reason?: string },
  ): Promise<CancelOutcome> {
    return writeTransaction(this.#handle, async (tx) => {
      const before = await this.#byId(tx, id);
      if (before === undefined) return { ok: false, reason: 'not_found' } as const;
      if (before.state === 'cancelled') return { ok: true, booking: before, changed: false } as const;
      await tx
        .updateTable('booking')
        .set({
          state: 'cancelled',
          sequence: before.sequence + 1,
          cancel_reason: options.reason ?? 'cancelled',
          hold_expires_ms: null,
          updated_ms: options.now,
        })
        .where('id', '=', id)
        .execute();
      await tx.updateTable('occupancy').set({ state: 'cancelled' }).where('booking_id', '=', id).execute();
      const after = await this.#byId(tx, id);
      return { ok: true, booking: after!, changed: true } as const;
    });
  }

  /** Releases every hold whose expiry is at or before `now`; returns how many were released. */
  async releaseExpiredHolds(now: number): Promise<number> {
    return writeTransaction(this.#handle, (tx) => releaseExpired(tx, now));
  }

  /** Live and past bookings of one person or room overlapping a window, by start time. */
  async listFor(
    who: { readonly kind: 'person' | 'room'; readonly id: string },
    window: { readonly start: number; readonly end: number },
    states: readonly ('held' | 'booked' | 'cancelled')[] = ['booked'],
  ): Promise<BookingRecord[]> {
    const key = who.kind === 'person' ? personKey(who.id) : roomKey(who.id);
    const rows = await this.#handle.db
      .selectFrom('occupancy')
      .select('booking_id')
      .distinct()
      .where('resource', '=', key)
      .where('start_ms', '<', window.end)
      .where('end_ms', '>', window.start)
      .execute();
    const out: BookingRecord[] = [];
    for (const r of rows) {
      const b = await this.#byId(this.#handle.db, r.booking_id);
      if (b !== undefined && states.includes(b.state)) out.push(b);
    }
    return out.sort((a, b) => a.start - b.start || a.id.localeCompare(b.id));
  }

  /** Live occupancy rows (held or booked) of all resources, for independent overlap audits. */
  async liveOccupancy(): Promise<{ resource: string; bookingId: string; start: number; end: number }[]> {
    const rows = await this.#handle.db
      .selectFrom('occupancy')
      .select(['resource', 'booking_id', 'start_ms', 'end_ms'])
      .where('state', 'in', ['held', 'booked'])
      .orderBy('resource')
      .orderBy('start_ms')
      .execute();
    return rows.map((r) => ({
      resource: idOfKey(r.resource),
      bookingId: r.booking_id,
      start: Number(r.start_ms),
      end: Number(r.end_ms),
    }));
  }
}

function unionIds(input: ReserveInput): string[] {
  return resourcesOf(input.attendees, input.room).map(idOfKey).sort();
}

async function releaseExpired(tx: Db, now: number): Promise<number> {
  const expired = await tx
    .selectFrom('booking')
    .select('id')
    .where('state', '=', 'held')
    .where('hold_expires_ms', '<=', now)
    .execute();
  if (expired.length === 0) return 0;
  const ids = expired.map((r) => r.id);
  await tx
    .updateTable('booking')
    .set({ state: 'cancelled', cancel_reason: 'hold_expired', hold_expires_ms: null, updated_ms: now })
    .where('id', 'in', ids)
    .execute();
  await tx.updateTable('occupancy').set({ state: 'cancelled' }).where('booking_id', 'in', ids).execute();
  return ids.length;
}

/** Booking one option of a request lets go of the holds on its other options. */
async function releaseSiblingHolds(tx: Db, requestId: string, keep: string, now: number): Promise<void> {
  const held = await tx
    .selectFrom('booking')
    .select('id')
    .where('request_id', '=', requestId)
    .where('state', '=', 'held')
    .where('idem_key', '<>', keep)
    .execute();
  if (held.length === 0) return;
  const ids = held.map((r) => r.id);
  await tx
    .updateTable('booking')
    .set({
      state: 'cancelled',
      cancel_reason: 'another option booked',
      hold_expires_ms: null,
      updated_ms: now,
    })
    .where('id', 'in', ids)
    .execute();
  await tx.updateTable('occupancy').set({ state: 'cancelled' }).where('booking_id', 'in', ids).execute();
}
