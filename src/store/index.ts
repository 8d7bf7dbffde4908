// Public surface of src/store: named exports only, no `export *`.
export type {
  AttendeeRole,
  BookingAttendee,
  BookingRecord,
  CancelOutcome,
  ReserveInput,
  ReserveOutcome,
} from './booking-records.ts';
export {
  DEFAULT_SQLITE_FILE,
  migrateStore,
  type OpenStoreOptions,
  openStore,
  openStoreFromEnv,
  parseStoreLocation,
  type StoreHandle,
  type StoreLocation,
  writeTransaction,
} from './open-store.ts';
export type { BookingState, StoreDialect, StoreSchema } from './schema.ts';
export { SecretBox } from './secret-box.ts';
export { SqlBookingStore } from './sql-booking-store.ts';
export { type SavedFeedState, SqlFeedStateStore } from './sql-feed-state-store.ts';
export {
  type AuditEntry,
  hashToken,
  SqlLedgerStore,
  type SubscriptionOwner,
} from './sql-ledger-store.ts';
export { type SavedRule, SqlRuleStore } from './sql-rule-store.ts';
export { openSqlStore, type SqlStore, sqlStoreOn } from './sql-store.ts';
export {
  type CachedBusy,
  type FeedFetchState,
  type OwnedOutcome,
  SqlWorkspaceStore,
  type StoredFeed,
  type StoredGroup,
  type StoredPerson,
  type StoredRoom,
} from './sql-workspace-store.ts';
