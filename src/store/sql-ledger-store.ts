import { createHash } from 'node:crypto';
import { sql } from 'kysely';
import type { StoreHandle } from './open-store.ts';

/** One audit entry: who did what to which thing, and how it ended. */
export interface AuditEntry {
  readonly actor: string;
  readonly action: string;
  readonly subject: string;
  /** `ok`, `refused:<code>` or `failed:<code>`. */
  readonly outcome: string;
  readonly detail?: Readonly<Record<string, unknown>>;
  readonly at: number;
}

/** The owner a subscription token opens. */
export interface SubscriptionOwner {
  readonly kind: 'person' | 'room';
  readonly id: string;
}

/** sha-256 of a subscription token, hex; only this is stored so a leaked database opens no feed. */
export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

/**
 * The append-mostly records: processed chat deliveries, the audit log, fairness history and
 * subscription tokens.
 */
export class SqlLedgerStore {
  readonly #handle: StoreHandle;

  /** Wraps an open store. */
  constructor(handle: StoreHandle) {
    this.#handle = handle;
  }

  /** Records a chat delivery; true when it is new, false when it was seen before (a retry). */
  async recordDelivery(key: string, at: number): Promise<boolean> {
    const res = await this.#handle.db
      .insertInto('delivery')
      .values({ key, at_ms: at })
      .onConflict((oc) => oc.column('key').doNothing())
      .executeTakeFirst();
    return Number(res.numInsertedOrUpdatedRows ?? 0n) === 1;
  }

  /** The DeliveryLog port: true the first time a key is seen, false for every retry. */
  claim(key: string, atMs: number): Promise<boolean> {
    return this.recordDelivery(key, atMs);
  }

  /** Forgets deliveries older than `before`; returns how many. */
  async pruneDeliveries(before: number): Promise<number> {
    const res = await this.#handle.db.deleteFrom('delivery').where('at_ms', '<', before).executeTakeFirst();
    return Number(res.numDeletedRows);
  }

  /** Appends to the audit log. */
  async audit(entry: AuditEntry): Promise<void> {
    await this.#handle.db
      .insertInto('audit')
      .values({
        actor: entry.actor,
        action: entry.action,
        subject: entry.subject,
        outcome: entry.outcome,
        detail: entry.detail === undefined ? null : JSON.stringify(entry.detail),
        at_ms: entry.at,
      })
      .execute();
  }

  /** Audit entries, oldest first, optionally about one subject. */
  async auditLog(filter: { readonly subject?: string } = {}): Promise<AuditEntry[]> {
    let q = this.#handle.db.selectFrom('audit').selectAll().orderBy('id');
    if (filter.subject !== undefined) q = q.where('subject', '=', filter.subject);
    const rows = await q.execute();
    return rows.map((r) => ({
      actor: r.actor,
      action: r.action,
      subject: r.subject,
      outcome: r.outcome,
      ...(r.detail === null ? {} : { detail: JSON.parse(r.detail) as Record<string, unknown> }),
      at: Number(r.at_ms),
    }));
  }

  /** Adds `count` off-hours sessions to a person's tally for one ISO week (e.g. `2026-W49`). */
  async addOffHours(person: string, isoWeek: string, count: number): Promise<void> {
    await this.#handle.db
      .insertInto('fairness')
      .values({ person_id: person, iso_week: isoWeek, off_hours_count: count })
      .onConflict((oc) =>
        oc
          .columns(['person_id', 'iso_week'])
          .doUpdateSet({ off_hours_count: sql`fairness.off_hours_count + excluded.off_hours_count` }),
      )
      .execute();
  }

  /** Off-hours tallies of some people in some weeks. */
  async offHours(
    people: readonly string[],
    weeks: readonly string[],
  ): Promise<{ person: string; isoWeek: string; count: number }[]> {
    if (people.length === 0 || weeks.length === 0) return [];
    const rows = await this.#handle.db
      .selectFrom('fairness')
      .selectAll()
      .where('person_id', 'in', people)
      .where('iso_week', 'in', weeks)
      .orderBy('person_id')
      .orderBy('iso_week')
      .execute();
    return rows.map((r) => ({ person: r.person_id, isoWeek: r.iso_week, count: Number(r.off_hours_count) }));
  }

  /** Stores a subscription token (the caller makes it from 32 random bytes); only its hash is kept. */
  async saveSubscriptionToken(token: string, owner: SubscriptionOwner, at: number): Promise<void> {
    await this.#handle.db
      .insertInto('subscription_token')
      .values({
        token_hash: hashToken(token),
        owner_kind: owner.kind,
        owner_id: owner.id,
        created_ms: at,
        revoked_ms: null,
      })
      .execute();
  }

  /** Who a token opens, or undefined for an unknown or revoked token. */
  async lookupSubscriptionToken(token: string): Promise<SubscriptionOwner | undefined> {
    const row = await this.#handle.db
      .selectFrom('subscription_token')
      .select(['owner_kind', 'owner_id'])
      .where('token_hash', '=', hashToken(token))
      .where('revoked_ms', 'is', null)
      .executeTakeFirst();
    return row === undefined ? undefined : { kind: row.owner_kind, id: row.owner_id };
  }

  /** Revokes every token of an owner; returns how many. */
  async revokeSubscriptionTokens(owner: SubscriptionOwner, at: number): Promise<number> {
    const res = await this.#handle.db
      .updateTable('subscription_token')
      .set({ revoked_ms: at })
      .where('owner_kind', '=', owner.kind)
      .where('owner_id', '=', owner.id)
      .where('revoked_ms', 'is', null)
      .executeTakeFirst();
    return Number(res.numUpdatedRows);
  }
}
