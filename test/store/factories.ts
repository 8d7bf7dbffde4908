import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import { openStore, type StoreHandle, type StoreLocation } from '../../src/store/index.ts';

/** What a contract run needs: a migrated store, how a child process reaches it, and a cleanup. */
export interface StoreUnderTest {
  readonly handle: StoreHandle;
  readonly location: StoreLocation;
  readonly searchPath: readonly string[] | undefined;
  cleanup(): Promise<void>;
}

/** A fresh migrated store handed to each contract group. */
export type StoreFactory = () => Promise<StoreUnderTest>;

/** SQLite in a fresh temporary file (a file, not :memory:, so child processes can share it). */
export const sqliteFactory: StoreFactory = async () => {
  const dir = mkdtempSync(join(tmpdir(), 'sw-store-'));
  const location: StoreLocation = { dialect: 'sqlite', file: join(dir, 'slotwright.sqlite') };
  const handle = await openStore(location);
  return {
    handle,
    location,
    searchPath: undefined,
    cleanup: async () => {
      await handle.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
};

/**
 * PostgreSQL in a schema of its own (sw_<random>), dropped afterwards, so parallel test files do not
 * collide. btree_gist goes into public once, under an advisory lock: if it landed in a test schema,
 * dropping that schema would drop every other file's exclusion constraint with it.
 */
export function postgresFactory(url: string): StoreFactory {
  return async () => {
    const schema = `sw_${randomBytes(6).toString('hex')}`;
    const admin = new pg.Client({ connectionString: url });
    await admin.connect();
    try {
      await admin.query('begin');
      await admin.query('select pg_advisory_xact_lock(5313177)');
      await admin.query('create extension if not exists btree_gist with schema public');
      await admin.query('commit');
      await admin.query(`create schema ${schema}`);
    } finally {
      await admin.end();
    }
    const searchPath = [schema, 'public'];
    const location: StoreLocation = { dialect: 'postgres', url };
    const handle = await openStore(location, { searchPath });
    return {
      handle,
      location,
      searchPath,
      cleanup: async () => {
        await handle.close();
        const c = new pg.Client({ connectionString: url });
        await c.connect();
        try {
          await c.query(`drop schema ${schema} cascade`);
        } finally {
          await c.end();
        }
      },
    };
  };
}
