import { type OpenStoreOptions, openStore, type StoreHandle, type StoreLocation } from './open-store.ts';
import type { SecretBox } from './secret-box.ts';
import { SqlBookingStore } from './sql-booking-store.ts';
import { SqlFeedStateStore } from './sql-feed-state-store.ts';
import { SqlLedgerStore } from './sql-ledger-store.ts';
import { SqlRuleStore } from './sql-rule-store.ts';
import { SqlWorkspaceStore } from './sql-workspace-store.ts';

/** Every part of the SQL store over one connection pool. */
export interface SqlStore {
  readonly handle: StoreHandle;
  readonly bookings: SqlBookingStore;
  readonly ledger: SqlLedgerStore;
  readonly rules: SqlRuleStore;
  readonly feedStates: SqlFeedStateStore;
  readonly workspace: SqlWorkspaceStore;
  close(): Promise<void>;
}

/** Builds the store parts over an open handle. */
export function sqlStoreOn(handle: StoreHandle, box: SecretBox): SqlStore {
  return {
    handle,
    bookings: new SqlBookingStore(handle),
    ledger: new SqlLedgerStore(handle),
    rules: new SqlRuleStore(handle),
    feedStates: new SqlFeedStateStore(handle),
    workspace: new SqlWorkspaceStore(handle, box),
    close: () => handle.close(),
  };
}

/** Opens, migrates and wraps the store at a location. */
export async function openSqlStore(
  location: StoreLocation,
  box: SecretBox,
  options: OpenStoreOptions = {},
): Promise<SqlStore> {
  return sqlStoreOn(await openStore(location, options), box);
}
