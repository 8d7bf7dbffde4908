import {
  type ColumnDefinitionBuilder,
  type CreateTableBuilder,
  type Kysely,
  type Migration,
  type MigrationProvider,
  sql,
} from 'kysely';
import type { StoreDialect } from './schema.ts';

// Migrations take Kysely<unknown> on purpose: they must keep working as the schema type moves on.
type Db = Kysely<unknown>;

function autoId<T extends string>(t: CreateTableBuilder<T, never>, dialect: StoreDialect) {
  return dialect === 'postgres'
    ? t.addColumn('id', 'bigserial', (c) => c.primaryKey())
    : t.addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement());
}

const notNull = (c: ColumnDefinitionBuilder) => c.notNull();

function initial(dialect: StoreDialect): Migration {
  return {
    async up(db: Db) {
      await db.schema
        .createTable('person')
        .addColumn('id', 'text', (c) => c.primaryKey())
        .addColumn('name', 'text', notNull)
        .addColumn('email', 'text')
        .addColumn('zone', 'text', notNull)
        .addColumn('data', 'text', notNull)
        .execute();
      await db.schema
        .createTable('room')
        .addColumn('id', 'text', (c) => c.primaryKey())
        .addColumn('name', 'text', notNull)
        .addColumn('capacity', 'integer')
        .addColumn('zone', 'text')
        .addColumn('data', 'text', notNull)
        .execute();
      await db.schema
        .createTable('group_')
        .addColumn('id', 'text', (c) => c.primaryKey())
        .addColumn('members', 'text', notNull)
        .execute();
      await db.schema
        .createTable('rule')
        .addColumn('id', 'text', (c) => c.primaryKey())
        .addColumn('owner', 'text', notNull)
        .addColumn('sentence', 'text', notNull)
        .addColumn('structure', 'text', notNull)
        .addColumn('created_ms', 'bigint', notNull)
        .execute();
      await db.schema.createIndex('rule_owner').on('rule').column('owner').execute();
      await db.schema
        .createTable('feed')
        .addColumn('id', 'text', (c) => c.primaryKey())
        .addColumn('owner', 'text', notNull)
        .addColumn('url_encrypted', 'text', notNull)
        .addColumn('etag', 'text')
        .addColumn('last_modified', 'text')
        .addColumn('last_body', 'text')
        .addColumn('last_busy', 'text')
        .addColumn('last_ok_ms', 'bigint')
        .addColumn('last_err_ms', 'bigint')
        .addColumn('last_error', 'text')
        .execute();
      await db.schema.createIndex('feed_owner').on('feed').column('owner').execute();
      await autoId(db.schema.createTable('busy_cache'), dialect)
        .addColumn('resource', 'text', notNull)
        .addColumn('feed_id', 'text')
        .addColumn('start_ms', 'bigint', notNull)
        .addColumn('end_ms', 'bigint', notNull)
        .addColumn('kind', 'text', notNull)
        .execute();
      await db.schema
        .createIndex('busy_cache_resource')
        .on('busy_cache')
        .columns(['resource', 'start_ms'])
        .execute();
      await db.schema
        .createTable('request')
        .addColumn('id', 'text', (c) => c.primaryKey())
        .addColumn('organizer', 'text', notNull)
        .addColumn('body', 'text', notNull)
        .addColumn('options', 'text', notNull)
        .addColumn('created_ms', 'bigint', notNull)
        .execute();
      await db.schema
        .createTable('booking')
        .addColumn('id', 'text', (c) => c.primaryKey())
        .addColumn('idem_key', 'text', notNull)
        .addColumn('request_id', 'text')
        .addColumn('option_id', 'text')
        .addColumn('series_id', 'text')
        .addColumn('organizer', 'text', notNull)
        .addColumn('title', 'text', notNull)
        .addColumn('start_ms', 'bigint', notNull)
        .addColumn('end_ms', 'bigint', notNull)
        .addColumn('room', 'text')
        .addColumn('state', 'text', (c) => c.notNull().check(sql`state in ('held', 'booked', 'cancelled')`))
        .addColumn('hold_expires_ms', 'bigint')
        .addColumn('sequence', 'integer', (c) => c.notNull().defaultTo(0))
        .addColumn('cancel_reason', 'text')
        .addColumn('created_ms', 'bigint', notNull)
        .addColumn('updated_ms', 'bigint', notNull)
        .addCheckConstraint('booking_positive_length', sql`end_ms > start_ms`)
        .execute();
      // One live booking per idempotency key; a cancelled one does not block booking the option again.
      await db.schema
        .createIndex('booking_idem_live')
        .on('booking')
        .column('idem_key')
        .unique()
        .where(sql.ref('state'), '<>', 'cancelled')
        .execute();
      await db.schema
        .createIndex('booking_state_expiry')
        .on('booking')
        .columns(['state', 'hold_expires_ms'])
        .execute();
      await db.schema
        .createTable('booking_attendee')
        .addColumn('booking_id', 'text', (c) => c.notNull().references('booking.id').onDelete('cascade'))
        .addColumn('person_id', 'text', notNull)
        .addColumn('role', 'text', (c) => c.notNull().check(sql`role in ('required', 'optional')`))
        .addPrimaryKeyConstraint('booking_attendee_pk', ['booking_id', 'person_id'])
        .execute();
      await autoId(db.schema.createTable('occupancy'), dialect)
        .addColumn('booking_id', 'text', (c) => c.notNull().references('booking.id').onDelete('cascade'))
        .addColumn('resource', 'text', notNull)
        .addColumn('start_ms', 'bigint', notNull)
        .addColumn('end_ms', 'bigint', notNull)
        .addColumn('state', 'text', (c) => c.notNull().check(sql`state in ('held', 'booked', 'cancelled')`))
        .addCheckConstraint('occupancy_positive_length', sql`end_ms > start_ms`)
        .execute();
      await db.schema
        .createIndex('occupancy_resource')
        .on('occupancy')
        .columns(['resource', 'start_ms'])
        .execute();
      await db.schema.createIndex('occupancy_booking').on('occupancy').column('booking_id').execute();
      if (dialect === 'postgres') {
        // The database refuses overlapping live rows of one resource even when two replicas race.
        // Several processes may migrate at once; the advisory lock keeps CREATE EXTENSION from colliding.
        await sql`select pg_advisory_xact_lock(5313177)`.execute(db);
        await sql`create extension if not exists btree_gist`.execute(db);
        await sql`alter table occupancy add column during int8range
          generated always as (int8range(start_ms, end_ms, '[)')) stored`.execute(db);
        await sql`alter table occupancy add constraint occupancy_no_overlap
          exclude using gist (resource with =, during with &&) where (state in ('held', 'booked'))`.execute(
          db,
        );
      }
      await db.schema
        .createTable('series')
        .addColumn('id', 'text', (c) => c.primaryKey())
        .addColumn('owner', 'text', notNull)
        .addColumn('body', 'text', notNull)
        .addColumn('created_ms', 'bigint', notNull)
        .execute();
      await db.schema
        .createTable('week_plan')
        .addColumn('id', 'text', (c) => c.primaryKey())
        .addColumn('iso_week', 'text', notNull)
        .addColumn('body', 'text', notNull)
        .addColumn('created_ms', 'bigint', notNull)
        .execute();
      await db.schema
        .createTable('fairness')
        .addColumn('person_id', 'text', notNull)
        .addColumn('iso_week', 'text', notNull)
        .addColumn('off_hours_count', 'integer', notNull)
        .addPrimaryKeyConstraint('fairness_pk', ['person_id', 'iso_week'])
        .execute();
      await db.schema
        .createTable('delivery')
        .addColumn('key', 'text', (c) => c.primaryKey())
        .addColumn('at_ms', 'bigint', notNull)
        .execute();
      await autoId(db.schema.createTable('audit'), dialect)
        .addColumn('actor', 'text', notNull)
        .addColumn('action', 'text', notNull)
        .addColumn('subject', 'text', notNull)
        .addColumn('outcome', 'text', notNull)
        .addColumn('detail', 'text')
        .addColumn('at_ms', 'bigint', notNull)
        .execute();
      await db.schema
        .createTable('subscription_token')
        .addColumn('token_hash', 'text', (c) => c.primaryKey())
        .addColumn('owner_kind', 'text', (c) => c.notNull().check(sql`owner_kind in ('person', 'room')`))
        .addColumn('owner_id', 'text', notNull)
        .addColumn('created_ms', 'bigint', notNull)
        .addColumn('revoked_ms', 'bigint')
        .execute();
    },
    async down(db: Db) {
      for (const t of [
        'subscription_token',
        'audit',
        'delivery',
        'fairness',
        'week_plan',
        'series',
        'occupancy',
        'booking_attendee',
        'booking',
        'request',
        'busy_cache',
        'feed',
        'rule',
        'group_',
        'room',
        'person',
      ]) {
        await db.schema.dropTable(t).ifExists().execute();
      }
    },
  };
}

/** Fetch state per feed id (workspace feeds too, which have no `feed` row): last good busy time and status. */
function feedState(): Migration {
  return {
    async up(db: Db) {
      await db.schema
        .createTable('feed_state')
        .addColumn('feed_id', 'text', (c) => c.primaryKey())
        .addColumn('busy', 'text', notNull)
        .addColumn('horizon_start_ms', 'bigint', notNull)
        .addColumn('horizon_end_ms', 'bigint', notNull)
        .addColumn('warnings', 'text', notNull)
        .addColumn('skipped', 'integer', notNull)
        .addColumn('fetched_ms', 'bigint')
        .addColumn('attempted_ms', 'bigint', notNull)
        .addColumn('etag', 'text')
        .addColumn('last_modified', 'text')
        .addColumn('error_code', 'text')
        .addColumn('error_message', 'text')
        .execute();
    },
    async down(db: Db) {
      await db.schema.dropTable('feed_state').ifExists().execute();
    },
  };
}

/** The migrations of the store, in code so they ship with the build; one dialect-aware set. */
export class StoreMigrationProvider implements MigrationProvider {
  readonly #dialect: StoreDialect;

  /** Builds the provider for one engine. */
  constructor(dialect: StoreDialect) {
    this.#dialect = dialect;
  }

  /** The migrations by name; names sort in the order they run. */
  async getMigrations(): Promise<Record<string, Migration>> {
    return { '0001-initial': initial(this.#dialect), '0002-feed-state': feedState() };
  }
}
