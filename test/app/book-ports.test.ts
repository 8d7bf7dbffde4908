import { describe, expect, expectTypeOf, it } from 'vitest';
import type {
  AuditLog,
  BookingStore,
  DeliveryLog,
  FairnessLedger,
  FeedStateStore,
  RuleStore,
  SubscriptionTokens,
} from '../../src/app/ports.ts';
import { SqlBookingStore, SqlFeedStateStore, SqlLedgerStore, SqlRuleStore } from '../../src/store/index.ts';

// The SQL stores live in src/store and must not import src/app, so they meet the ports by shape.
// The type checks run in `tsc --noEmit` (npm run typecheck); the runtime checks catch a method
// that exists only in a type.
const methodsOf = (cls: { prototype: object }) =>
  Object.getOwnPropertyNames(cls.prototype).filter(
    (n) => typeof (cls.prototype as Record<string, unknown>)[n] === 'function',
  );

describe('SQL stores implement the app ports', () => {
  it('SqlBookingStore is a BookingStore', () => {
    expectTypeOf<SqlBookingStore>().toExtend<BookingStore>();
    expect(methodsOf(SqlBookingStore)).toEqual(
      expect.arrayContaining(['reserve', 'cancel', 'get', 'releaseExpiredHolds', 'listFor']),
    );
  });

  it('SqlLedgerStore is an AuditLog, DeliveryLog, FairnessLedger and SubscriptionTokens', () => {
    expectTypeOf<SqlLedgerStore>().toExtend<AuditLog>();
    expectTypeOf<SqlLedgerStore>().toExtend<DeliveryLog>();
    expectTypeOf<SqlLedgerStore>().toExtend<FairnessLedger>();
    expectTypeOf<SqlLedgerStore>().toExtend<SubscriptionTokens>();
    expect(methodsOf(SqlLedgerStore)).toEqual(
      expect.arrayContaining(['audit', 'claim', 'addOffHours', 'offHours', 'lookupSubscriptionToken']),
    );
  });

  it('SqlRuleStore is a RuleStore', () => {
    expectTypeOf<SqlRuleStore>().toExtend<RuleStore>();
    expect(methodsOf(SqlRuleStore)).toEqual(expect.arrayContaining(['list', 'add', 'remove']));
  });

  it('SqlFeedStateStore is a FeedStateStore', () => {
    expectTypeOf<SqlFeedStateStore>().toExtend<FeedStateStore>();
    expect(methodsOf(SqlFeedStateStore)).toEqual(expect.arrayContaining(['load', 'save']));
  });
});
