import { Kysely, PostgresDialect, sql } from 'kysely';
import type { RunCoordinator } from 'node-cron';
import type pg from 'pg';

/** How a coordinated run ended on this replica. */
export type RunOnceOutcome =
  /** This replica ran the work and recorded it. */
  | 'ran'
  /** Another replica is running it right now. */
  | 'busy'
  /** It already ran for this key (on any replica); nothing was done. */
  | 'done';

/** Makes a scheduled job's work happen once per key (job name + ISO week) across replicas. */
export interface RunOnceCoordinator {
  /**
   * Runs `work` unless it is running elsewhere or already done for `key`; the key is recorded as done
   * only when `work` resolves, so a failed run can be tried again.
   */
  runOnce(job: string, key: string, work: () => Promise<void>): Promise<RunOnceOutcome>;
}

/**
 * The coordinator for one process (SQLite, the console, tests): there is no other replica, so work
 * always runs. Kept deliberately without memory so a retry after a failure is never blocked.
 */
export class SingleProcessCoordinator implements RunOnceCoordinator {
  /** Runs the work. */
  async runOnce(_job: string, _key: string, work: () => Promise<void>): Promise<RunOnceOutcome> {
    await work();
    return 'ran';
  }
}

/** The table the PostgreSQL coordinator keeps its "done" records in. */
export interface JobRunTables {
  slotwright_job_run: { job: string; run_key: string; replica: string; done_ms: number };
}

/** 32-bit FNV-1a of a string as a signed int4, one half of a two-key advisory lock. */
export function advisoryKey(text: string): number {
  let h = 0x811c9dc5;
  for (const byte of new TextEncoder().encode(text)) {
    h ^= byte;
    h = Math.imul(h, 0x01000193);
  }
  return h | 0;
}

/** Options of PgRunOnceCoordinator. */
export interface PgRunOnceOptions {
  /** Name of this replica in the done records (for operators). @default 'replica' */
  readonly replica?: string;
  /** Clock for the done records, in epoch ms. @default Date.now */
  readonly clock?: () => number;
}

/**
 * Runs a job's work once per key across replicas sharing one PostgreSQL. In one transaction it takes
 * `pg_try_advisory_xact_lock(job, key)` (another replica holding it gives 'busy' at once, never a
 * wait), checks the done record (a replica that wakes late gives 'done'), runs the work and writes the
 * record; the lock ends with the transaction. A crash between the work and the commit leaves no
 * record, so the next attempt runs the work again: at least once, exactly once when nothing crashes.
 */
export class PgRunOnceCoordinator implements RunOnceCoordinator {
  readonly #db: Kysely<JobRunTables>;
  readonly #replica: string;
  readonly #clock: () => number;
  #ready: Promise<void> | undefined;

  /** Runs on a pg pool the caller owns and ends (the composition root shares the store's pool). */
  constructor(pool: pg.Pool, options: PgRunOnceOptions = {}) {
    this.#db = new Kysely<JobRunTables>({ dialect: new PostgresDialect({ pool }) });
    this.#replica = options.replica ?? 'replica';
    this.#clock = options.clock ?? Date.now;
  }

  /** Creates the done-record table when it is missing (safe to run on every replica at once). */
  ensureTable(): Promise<void> {
    this.#ready ??= (async () => {
      // A transaction-scoped lock serialises concurrent CREATE TABLE IF NOT EXISTS, which can otherwise
      // fail on the catalog's unique index when two replicas start together.
      await this.#db.transaction().execute(async (trx) => {
        await sql`select pg_advisory_xact_lock(${advisoryKey('slotwright_job_run')}, 0)`.execute(trx);
        await trx.schema
          .createTable('slotwright_job_run')
          .ifNotExists()
          .addColumn('job', 'text', (c) => c.notNull())
          .addColumn('run_key', 'text', (c) => c.notNull())
          .addColumn('replica', 'text', (c) => c.notNull())
          .addColumn('done_ms', 'bigint', (c) => c.notNull())
          .addPrimaryKeyConstraint('slotwright_job_run_pk', ['job', 'run_key'])
          .execute();
      });
    })();
    return this.#ready;
  }

  /** Runs the work once per (job, key) across replicas. */
  async runOnce(job: string, key: string, work: () => Promise<void>): Promise<RunOnceOutcome> {
    await this.ensureTable();
    return this.#db.transaction().execute(async (trx) => {
      const lock = await sql<{ locked: boolean }>`
        select pg_try_advisory_xact_lock(${advisoryKey(job)}, ${advisoryKey(key)}) as locked`.execute(trx);
      if (lock.rows[0]?.locked !== true) return 'busy';
      const done = await trx
        .selectFrom('slotwright_job_run')
        .select('replica')
        .where('job', '=', job)
        .where('run_key', '=', key)
        .executeTakeFirst();
      if (done !== undefined) return 'done';
      await work();
      await trx
        .insertInto('slotwright_job_run')
        .values({ job, run_key: key, replica: this.#replica, done_ms: this.#clock() })
        .execute();
      return 'ran';
    });
  }

  /** Who recorded a key as done, or undefined. */
  async doneBy(job: string, key: string): Promise<string | undefined> {
    await this.ensureTable();
    const row = await this.#db
      .selectFrom('slotwright_job_run')
      .select('replica')
      .where('job', '=', job)
      .where('run_key', '=', key)
      .executeTakeFirst();
    return row?.replica;
  }
}

/** The table the cron-slot coordinator records elected slots in. */
export interface CronSlotTables {
  slotwright_cron_slot: { slot_key: string; replica: string; at_ms: number };
}

/**
 * node-cron's `RunCoordinator` on PostgreSQL, for jobs that run often (the hold sweeper): node-cron asks
 * once per fire with a key made of the task name and the slot's instant; the first replica to insert
 * that key runs it, every other replica is told no. Slots older than a day are pruned as it goes.
 */
export class PgCronRunCoordinator implements RunCoordinator {
  readonly #db: Kysely<CronSlotTables>;
  readonly #replica: string;
  readonly #clock: () => number;
  #ready: Promise<void> | undefined;

  /** Runs on a pg pool the caller owns and ends. */
  constructor(pool: pg.Pool, options: PgRunOnceOptions = {}) {
    this.#db = new Kysely<CronSlotTables>({ dialect: new PostgresDialect({ pool }) });
    this.#replica = options.replica ?? 'replica';
    this.#clock = options.clock ?? Date.now;
  }

  /** Creates the slot table when it is missing. */
  ensureTable(): Promise<void> {
    this.#ready ??= this.#db.transaction().execute(async (trx) => {
      await sql`select pg_advisory_xact_lock(${advisoryKey('slotwright_cron_slot')}, 0)`.execute(trx);
      await trx.schema
        .createTable('slotwright_cron_slot')
        .ifNotExists()
        .addColumn('slot_key', 'text', (c) => c.primaryKey())
        .addColumn('replica', 'text', (c) => c.notNull())
        .addColumn('at_ms', 'bigint', (c) => c.notNull())
        .execute();
    });
    return this.#ready;
  }

  /** True for exactly one replica per slot key. */
  async shouldRun(key: string, _ttlMs: number): Promise<boolean> {
    await this.ensureTable();
    const now = this.#clock();
    await this.#db
      .deleteFrom('slotwright_cron_slot')
      .where('at_ms', '<', now - 86_400_000)
      .execute();
    const row = await this.#db
      .insertInto('slotwright_cron_slot')
      .values({ slot_key: key, replica: this.#replica, at_ms: now })
      .onConflict((oc) => oc.column('slot_key').doNothing())
      .returning('slot_key')
      .executeTakeFirst();
    return row !== undefined;
  }
}
