import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { DEFAULT_SQLITE_FILE, openStoreFromEnv, parseStoreLocation } from '../../src/store/index.ts';
import { migrateTogether } from './migrate-together.ts';

describe('parseStoreLocation', () => {
  it.each([
    [undefined, { dialect: 'sqlite', file: '/srv/sw/data/slotwright.sqlite' }],
    ['', { dialect: 'sqlite', file: '/srv/sw/data/slotwright.sqlite' }],
    ['postgres://sw@db.internal:5432/sw', { dialect: 'postgres', url: 'postgres://sw@db.internal:5432/sw' }],
    ['postgresql://sw@db/sw', { dialect: 'postgres', url: 'postgresql://sw@db/sw' }],
    ['state/sw.sqlite', { dialect: 'sqlite', file: '/srv/sw/state/sw.sqlite' }],
    ['/var/lib/sw.sqlite', { dialect: 'sqlite', file: '/var/lib/sw.sqlite' }],
    ['file:state/sw.sqlite', { dialect: 'sqlite', file: '/srv/sw/state/sw.sqlite' }],
    ['file:///var/lib/sw.sqlite', { dialect: 'sqlite', file: '/var/lib/sw.sqlite' }],
    [':memory:', { dialect: 'sqlite', file: ':memory:' }],
  ])('%j', (value, expected) => {
    expect(parseStoreLocation(value, '/srv/sw')).toEqual(expected);
  });

  it('refuses other URL schemes instead of treating them as file names', () => {
    expect(() => parseStoreLocation('mysql://db/sw', '/srv/sw')).toThrow(
      "SLOTWRIGHT_DATABASE_URL 'mysql://...' is not supported; use a postgres:// URL or a SQLite file path",
    );
  });
});

describe('openStoreFromEnv', () => {
  it('creates data/slotwright.sqlite and its folder on first run, migrated', async () => {
    const cwd = mkdtempSync(join(tmpdir(), 'sw-open-'));
    try {
      const handle = await openStoreFromEnv({}, cwd);
      try {
        expect(existsSync(join(cwd, DEFAULT_SQLITE_FILE))).toBe(true);
        const tables = await handle.db.introspection.getTables();
        expect(
          tables
            .map((t) => t.name)
            .filter((n) => !n.startsWith('kysely_'))
            .sort(),
        ).toEqual([
          'audit',
          'booking',
          'booking_attendee',
          'busy_cache',
          'delivery',
          'fairness',
          'feed',
          'feed_state',
          'group_',
          'occupancy',
          'person',
          'request',
          'room',
          'rule',
          'series',
          'subscription_token',
          'week_plan',
        ]);
      } finally {
        await handle.close();
      }
      // Opening again runs no migration twice and keeps the file.
      const again = await openStoreFromEnv({ SLOTWRIGHT_DATABASE_URL: '' }, cwd);
      await again.close();
    } finally {
      rmSync(cwd, { recursive: true, force: true });
    }
  });

  it('says which file it could not open', async () => {
    const cwd = mkdtempSync(join(tmpdir(), 'sw-open-'));
    try {
      // A folder where the file should be cannot be opened as a database.
      await expect(openStoreFromEnv({ SLOTWRIGHT_DATABASE_URL: cwd }, cwd)).rejects.toThrow(
        `cannot open the SQLite store at ${cwd}`,
      );
    } finally {
      rmSync(cwd, { recursive: true, force: true });
    }
  });
});

describe('migrating from several processes at once', () => {
  it('four processes opening one new SQLite file all succeed', async () => {
    const cwd = mkdtempSync(join(tmpdir(), 'sw-open-'));
    try {
      const out = await migrateTogether(4, { dialect: 'sqlite', file: join(cwd, 'shared.sqlite') });
      expect(out).toEqual(['ok', 'ok', 'ok', 'ok']);
    } finally {
      rmSync(cwd, { recursive: true, force: true });
    }
  }, 120_000);
});
