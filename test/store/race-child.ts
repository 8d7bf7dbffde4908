// A child process for the store's cross-process tests. It reads a JSON job from argv[2]:
//   race: wait for "go" on stdin, run every attempt at once, print one JSON line of outcomes;
//   hang: open a write transaction, insert a booking and its rows, say "inside", then wait forever
//         (the parent kills it with SIGKILL to prove a half-done booking leaves nothing behind).
import { createInterface } from 'node:readline';
import { openStore, SqlBookingStore, type StoreLocation, writeTransaction } from '../../src/store/index.ts';

interface Attempt {
  readonly key: string;
  readonly person: string;
  readonly room: string;
  readonly start: number;
  readonly end: number;
}

interface Job {
  readonly mode: 'race' | 'hang';
  readonly location: StoreLocation;
  readonly searchPath?: readonly string[];
  readonly attempts: readonly Attempt[];
}

const job = JSON.parse(process.argv[2]!) as Job;
const handle = await openStore(job.location, {
  migrate: false,
  poolSize: 4,
  ...(job.searchPath === undefined ? {} : { searchPath: job.searchPath }),
});
const store = new SqlBookingStore(handle);
await handle.db.selectFrom('booking').select('id').limit(1).execute();

if (job.mode === 'hang') {
  const a = job.attempts[0]!;
  await writeTransaction(handle, async (tx) => {
    await tx
      .insertInto('booking')
      .values({
        id: a.key,
        idem_key: a.key,
        request_id: null,
        option_id: null,
        series_id: null,
        organizer: a.person,
        title: 'half-done',
        start_ms: a.start,
        end_ms: a.end,
        room: a.room,
        state: 'booked',
        hold_expires_ms: null,
        sequence: 0,
        cancel_reason: null,
        created_ms: 0,
        updated_ms: 0,
      })
      .execute();
    await tx
      .insertInto('booking_attendee')
      .values({ booking_id: a.key, person_id: a.person, role: 'required' })
      .execute();
    await tx
      .insertInto('occupancy')
      .values({
        booking_id: a.key,
        resource: `r:${a.room}`,
        start_ms: a.start,
        end_ms: a.end,
        state: 'booked',
      })
      .execute();
    process.stdout.write('inside\n');
    await new Promise(() => undefined);
  });
} else {
  process.stdout.write('ready\n');
  const rl = createInterface({ input: process.stdin });
  for await (const line of rl) if (line.trim() === 'go') break;
  rl.close();
  const outcomes = await Promise.all(
    job.attempts.map(async (a) => {
      const r = await store.reserve({
        idemKey: a.key,
        newId: a.key,
        organizer: a.person,
        title: 'race',
        start: a.start,
        end: a.end,
        room: a.room,
        attendees: [{ id: a.person, role: 'required' }],
        state: 'booked',
        now: 0,
      });
      return r.ok ? { key: a.key, ok: true } : { key: a.key, ok: false, with: r.with };
    }),
  );
  process.stdout.write(`${JSON.stringify(outcomes)}\n`);
  await handle.close();
}
