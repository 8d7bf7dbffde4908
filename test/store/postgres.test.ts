import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import { openStore, SqlBookingStore } from '../../src/store/index.ts';
import { storeContract } from './contract.ts';
import { postgresFactory } from './factories.ts';
import { migrateTogether } from './migrate-together.ts';

const url = process.env.SLOTWRIGHT_TEST_DATABASE_URL;

if (url === undefined || url === '') {
  console.warn('store contract on PostgreSQL skipped: set SLOTWRIGHT_TEST_DATABASE_URL to run it');
  describe.skipIf(true)('store contract (PostgreSQL): SLOTWRIGHT_TEST_DATABASE_URL is not set', () => {
    it('runs when SLOTWRIGHT_TEST_DATABASE_URL names a server', () => undefined);
  });
} else {
  storeContract('PostgreSQL', postgresFactory(url));
}

describe.skipIf(url === undefined || url === '')('PostgreSQL exclusion constraint', () => {
  it('the database itself refuses two live overlapping rows of one resource (SQLSTATE 23P01)', async () => {
    const sut = await postgresFactory(url!)();
    try {
      const db = sut.handle.db;
      const booking = (id: string) => ({
        id,
        idem_key: id,
        request_id: null,
        option_id: null,
        series_id: null,
        organizer: 'ines',
        title: 't',
        start_ms: 0,
        end_ms: 100,
        room: 'tejo',
        state: 'booked' as const,
        hold_expires_ms: null,
        sequence: 0,
        cancel_reason: null,
        created_ms: 0,
        updated_ms: 0,
      });
      await db
        .insertInto('booking')
        .values([booking('x1'), booking('x2')])
        .execute();
      await db
        .insertInto('occupancy')
        .values({ booking_id: 'x1', resource: 'r:tejo', start_ms: 0, end_ms: 100, state: 'booked' })
        .execute();
      // PostgreSQL error codes appendix: 23P01 is exclusion_violation.
      await expect(
        db
          .insertInto('occupancy')
          .values({ booking_id: 'x2', resource: 'r:tejo', start_ms: 99, end_ms: 200, state: 'booked' })
          .execute(),
      ).rejects.toMatchObject({ code: '23P01' });
      // Touching ranges and cancelled rows are allowed.
      await db
        .insertInto('occupancy')
        .values([
          { booking_id: 'x2', resource: 'r:tejo', start_ms: 100, end_ms: 200, state: 'booked' },
          { booking_id: 'x2', resource: 'r:tejo', start_ms: 50, end_ms: 60, state: 'cancelled' },
        ])
        .execute();
      const n = await db.selectFrom('occupancy').select(db.fn.countAll().as('n')).executeTakeFirstOrThrow();
      expect(Number(n.n)).toBe(3);
    } finally {
      await sut.cleanup();
    }
  });
});

describe.skipIf(url === undefined || url === '')('PostgreSQL race between check and insert', () => {
  it('a rival committing after our check is caught by the constraint and reported as a conflict naming who', async () => {
    const sut = await postgresFactory(url!)();
    const rival = await openStore(sut.location, {
      migrate: false,
      ...(sut.searchPath ? { searchPath: sut.searchPath } : {}),
    });
    try {
      const bookings = new SqlBookingStore(sut.handle);
      const rivalBookings = new SqlBookingStore(rival);
      const base = { title: 't', start: 1_000_000, end: 2_000_000, state: 'booked' as const, now: 0 };
      const r = await bookings.reserve({
        ...base,
        idemKey: 'mine',
        newId: 'mine',
        organizer: 'bea',
        room: 'tejo',
        attendees: [{ id: 'bea', role: 'required' }],
        // Runs after our own overlap check passed and before our insert: the rival wins the race.
        recheck: async () => {
          const won = await rivalBookings.reserve({
            ...base,
            idemKey: 'rival',
            newId: 'rival',
            organizer: 'lena',
            room: 'tejo',
            attendees: [{ id: 'lena', role: 'required' }],
          });
          expect(won.ok).toBe(true);
          return [];
        },
      });
      expect(r).toEqual({ ok: false, reason: 'conflict', with: ['tejo'] });
      expect(await bookings.get('mine')).toBeUndefined();
    } finally {
      await rival.close();
      await sut.cleanup();
    }
  });
});

describe.skipIf(url === undefined || url === '')('PostgreSQL migrations from several processes', () => {
  it('four replicas migrating one new schema at once all succeed', async () => {
    const sut = await postgresFactory(url!)();
    try {
      // The factory migrated its own schema; point the children at a second, empty one.
      const schema = `${sut.searchPath![0]}_m`;
      await sql.raw(`create schema ${schema}`).execute(sut.handle.db);
      try {
        const out = await migrateTogether(4, sut.location, [schema, 'public']);
        expect(out).toEqual(['ok', 'ok', 'ok', 'ok']);
      } finally {
        await sql.raw(`drop schema ${schema} cascade`).execute(sut.handle.db);
      }
    } finally {
      await sut.cleanup();
    }
  }, 120_000);
});
