import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startHoldSweeper } from '../../src/jobs/hold-sweeper.ts';
import { openSqlStore, SecretBox, type SqlStore } from '../../src/store/index.ts';

const M = 60_000;
const T0 = Date.UTC(2026, 11, 7, 9, 0);
let dir: string;
let store: SqlStore;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'sw-sweep-'));
  store = await openSqlStore(
    { dialect: 'sqlite', file: join(dir, 's.sqlite') },
    new SecretBox(Buffer.alloc(32, 2).toString('base64')),
  );
});
afterAll(async () => {
  await store.close();
  rmSync(dir, { recursive: true, force: true });
});

async function hold(key: string, expires: number) {
  const r = await store.bookings.reserve({
    idemKey: key,
    newId: key,
    organizer: 'bea',
    title: 'hold',
    start: T0 + 60 * M,
    end: T0 + 90 * M,
    attendees: [{ id: key, role: 'required' }],
    state: 'held',
    holdExpiresAt: expires,
    now: T0,
  });
  expect(r.ok).toBe(true);
}

describe('hold sweeper', () => {
  it('releases exactly the holds that expired by the (fake) clock', async () => {
    await hold('a', T0 + 10 * M);
    await hold('b', T0 + 20 * M);
    let now = T0 + 5 * M;
    const swept: number[] = [];
    const sweeper = startHoldSweeper(store.bookings, () => now, { onSwept: (n) => swept.push(n) });
    try {
      expect(await sweeper.sweepNow()).toBe(0);
      now = T0 + 10 * M;
      expect(await sweeper.sweepNow()).toBe(1);
      expect((await store.bookings.get('a'))?.state).toBe('cancelled');
      expect((await store.bookings.get('b'))?.state).toBe('held');
      now = T0 + 60 * M;
      expect(await sweeper.sweepNow()).toBe(1);
      expect(swept).toEqual([0, 1, 1]);
    } finally {
      await sweeper.stop();
    }
  });

  it('runs on its node-cron schedule and reports failures instead of crashing', async () => {
    await hold('c', T0 + 1);
    const swept: number[] = [];
    const errors: string[] = [];
    const sweeper = startHoldSweeper(store.bookings, () => T0 + 2, {
      schedule: '* * * * * *',
      onSwept: (n) => swept.push(n),
    });
    const failing = startHoldSweeper(
      { releaseExpiredHolds: async () => Promise.reject(new Error('database is locked')) },
      () => T0,
      { schedule: '* * * * * *', onError: (e) => errors.push(`${e.code}: ${e.message}`) },
    );
    try {
      const deadline = Date.now() + 5_000;
      while ((swept.length === 0 || errors.length === 0) && Date.now() < deadline)
        await new Promise((r) => setTimeout(r, 100));
      expect(swept[0]).toBe(1);
      expect(errors[0]).toBe('internal: database is locked');
      expect((await store.bookings.get('c'))?.state).toBe('cancelled');
    } finally {
      await sweeper.stop();
      await failing.stop();
    }
  });

  it('refuses a schedule that is not a cron expression', () => {
    expect(() => startHoldSweeper(store.bookings, () => T0, { schedule: 'every minute' })).toThrow(
      /not a cron expression/,
    );
  });
});
