import { mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import Database from 'better-sqlite3';
import { Kysely, Migrator, PostgresDialect, SqliteDialect, sql, type Transaction } from 'kysely';
import pg from 'pg';
import { SlotwrightError } from '../errors.ts';
import { StoreMigrationProvider } from './migrations.ts';
import type { StoreDialect, StoreSchema } from './schema.ts';

/** Where the store lives when SLOTWRIGHT_DATABASE_URL is not set, relative to the working folder. */
export const DEFAULT_SQLITE_FILE = 'data/slotwright.sqlite';

/** A parsed store location. */
export type StoreLocation =
  | { readonly dialect: 'postgres'; readonly url: string }
  | { readonly dialect: 'sqlite'; readonly file: string };

/**
 * Reads a SLOTWRIGHT_DATABASE_URL value: `postgres://` or `postgresql://` picks PostgreSQL; a `file:` URL,
 * a path, or `:memory:` picks SQLite; nothing picks the default SQLite file under `data/`.
 */
export function parseStoreLocation(value: string | undefined, cwd: string): StoreLocation {
  const v = value?.trim();
  if (v === undefined || v === '') return { dialect: 'sqlite', file: resolve(cwd, DEFAULT_SQLITE_FILE) };
  if (/^postgres(ql)?:\/\//i.test(v)) return { dialect: 'postgres', url: v };
  if (v === ':memory:') return { dialect: 'sqlite', file: v };
  if (v.startsWith('file://')) return { dialect: 'sqlite', file: fileURLToPath(v) };
  if (v.startsWith('file:')) return { dialect: 'sqlite', file: resolve(cwd, v.slice('file:'.length)) };
  if (/^[a-z][a-z0-9+.-]*:\/\//i.test(v))
    throw new SlotwrightError(
      'config_invalid',
      `SLOTWRIGHT_DATABASE_URL '${v.split('://')[0]}://...' is not supported; use a postgres:// URL or a SQLite file path`,
    );
  return { dialect: 'sqlite', file: resolve(cwd, v) };
}

/** Options of openStore. */
export interface OpenStoreOptions {
  /** Run the migrations before returning. @default true */
  readonly migrate?: boolean;
  /** PostgreSQL schemas to search, first one gets the tables (tests use one schema per file). @default undefined (server default) */
  readonly searchPath?: readonly string[];
  /** Largest number of PostgreSQL connections. @default 10 */
  readonly poolSize?: number;
  /** How long a SQLite writer waits for the file lock, in milliseconds. @default 10000 */
  readonly sqliteBusyTimeoutMs?: number;
}

/** An open store: the typed query builder, which engine it is, and how to close it. */
export interface StoreHandle {
  readonly db: Kysely<StoreSchema>;
  readonly dialect: StoreDialect;
  close(): Promise<void>;
}

const INT8_OID = 20;

/** Opens (and by default migrates) the store at a location. */
export async function openStore(
  location: StoreLocation,
  options: OpenStoreOptions = {},
): Promise<StoreHandle> {
  const opts = {
    migrate: true,
    poolSize: 10,
    sqliteBusyTimeoutMs: 10_000,
    ...options,
  } satisfies OpenStoreOptions;
  let db: Kysely<StoreSchema>;
  if (location.dialect === 'postgres') {
    const pool = new pg.Pool({
      connectionString: location.url,
      max: opts.poolSize,
      ...(opts.searchPath === undefined ? {} : { options: `-c search_path=${opts.searchPath.join(',')}` }),
      // Epoch milliseconds are bigint columns; they fit a double exactly, so read them as numbers.
      types: {
        getTypeParser: ((oid: number, format?: 'text' | 'binary') =>
          oid === INT8_OID
            ? (v: string) => Number(v)
            : pg.types.getTypeParser(oid, format ?? 'text')) as never,
      },
    });
    db = new Kysely<StoreSchema>({ dialect: new PostgresDialect({ pool }) });
  } else {
    let database: Database.Database;
    try {
      if (location.file !== ':memory:') mkdirSync(dirname(location.file), { recursive: true });
      database = new Database(location.file);
      if (location.file !== ':memory:') database.pragma('journal_mode = WAL');
      database.pragma(`busy_timeout = ${Math.floor(opts.sqliteBusyTimeoutMs)}`);
      database.pragma('foreign_keys = ON');
    } catch (error) {
      throw new SlotwrightError('store_unavailable', `cannot open the SQLite store at ${location.file}`, {
        cause: error,
      });
    }
    db = new Kysely<StoreSchema>({ dialect: new SqliteDialect({ database }) });
  }
  const handle: StoreHandle = { db, dialect: location.dialect, close: () => db.destroy() };
  if (opts.migrate) {
    try {
      await migrateStore(handle);
    } catch (error) {
      await db.destroy().catch(() => undefined);
      throw error;
    }
  }
  return handle;
}

/** Brings the schema up to date; safe to run from several processes at once. */
export async function migrateStore(handle: StoreHandle): Promise<void> {
  const run = async (db: Kysely<StoreSchema>, schema?: string) => {
    const migrator = new Migrator({
      db: db as unknown as Kysely<unknown>,
      provider: new StoreMigrationProvider(handle.dialect),
      // Without a schema Kysely looks for its bookkeeping tables in every schema of the database,
      // so a second store in the same database (another schema) would skip creating its own.
      ...(schema === undefined ? {} : { migrationTableSchema: schema }),
    });
    const { error, results } = await migrator.migrateToLatest();
    if (error !== undefined) {
      const failed = results?.find((r) => r.status === 'Error')?.migrationName ?? 'unknown';
      throw new SlotwrightError('store_unavailable', `store migration ${failed} failed`, { cause: error });
    }
  };
  // PostgreSQL: Kysely takes an advisory lock. SQLite: its lock is only in-process, so take the
  // file's write lock for the whole run; a second process then waits and finds nothing left to do.
  if (handle.dialect === 'postgres') {
    const current = await sql<{ schema: string | null }>`select current_schema() as schema`.execute(
      handle.db,
    );
    const schema = current.rows[0]?.schema;
    if (schema === null || schema === undefined)
      throw new SlotwrightError(
        'store_unavailable',
        'PostgreSQL has no current schema to create tables in; check the search_path of the database user',
      );
    return run(handle.db, schema);
  }
  await writeTransaction(handle, run);
}

/**
 * Runs `fn` in a write transaction. On SQLite it starts with BEGIN IMMEDIATE, so the write lock is
 * taken before the overlap check reads anything and two writers cannot both pass the check.
 */
export async function writeTransaction<T>(
  handle: StoreHandle,
  fn: (tx: Kysely<StoreSchema> | Transaction<StoreSchema>) => Promise<T>,
): Promise<T> {
  if (handle.dialect === 'postgres') return handle.db.transaction().execute(fn);
  return handle.db.connection().execute(async (conn) => {
    await sql`begin immediate`.execute(conn);
    try {
      const out = await fn(conn);
      await sql`commit`.execute(conn);
      return out;
    } catch (error) {
      await sql`rollback`.execute(conn).catch(() => undefined);
      throw error;
    }
  });
}

/**
 * Opens the store named by SLOTWRIGHT_DATABASE_URL in `env`, or the default SQLite file
 * `data/slotwright.sqlite` under `cwd` (the folder is created on first run).
 */
export async function openStoreFromEnv(
  env: Readonly<Record<string, string | undefined>>,
  cwd: string,
  options: OpenStoreOptions = {},
): Promise<StoreHandle> {
  return openStore(parseStoreLocation(env.SLOTWRIGHT_DATABASE_URL, cwd), options);
}
