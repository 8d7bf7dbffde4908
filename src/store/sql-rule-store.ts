import { SlotwrightError } from '../errors.ts';
import { type Rule, ruleSchema } from '../rules/index.ts';
import type { StoreHandle } from './open-store.ts';

/** A rule as the rules use cases save it (the RuleStore port's StoredRule). */
export interface SavedRule {
  readonly id: string;
  /** Person id, or `room:<id>` / `group:<id>`. */
  readonly ownerId: string;
  readonly rule: Rule;
  /** The normalized sentence the owner confirmed. */
  readonly text: string;
  readonly createdAt: number;
}

/**
 * The RuleStore port in SQL: one row per rule with its owner, the confirmed sentence and the
 * structure as JSON. Rows are checked against the rule schema when read, so a bad row is reported
 * instead of reaching the scheduler.
 */
export class SqlRuleStore {
  readonly #handle: StoreHandle;

  /** Wraps an open store. */
  constructor(handle: StoreHandle) {
    this.#handle = handle;
  }

  /** The rules of one owner, oldest first. */
  async list(ownerId: string): Promise<readonly SavedRule[]> {
    const rows = await this.#handle.db
      .selectFrom('rule')
      .selectAll()
      .where('owner', '=', ownerId)
      .orderBy('created_ms')
      .orderBy('id')
      .execute();
    return rows.map((r) => {
      const parsed = ruleSchema.safeParse(JSON.parse(r.structure));
      if (!parsed.success)
        throw new SlotwrightError(
          'store_unavailable',
          `stored rule ${r.id} of ${r.owner} does not match the rule structure; remove it and say the rule again`,
          { cause: parsed.error },
        );
      return {
        id: r.id,
        ownerId: r.owner,
        rule: parsed.data,
        text: r.sentence,
        createdAt: Number(r.created_ms),
      };
    });
  }

  /** Saves a rule; an id already in use is refused so nothing stored is overwritten. */
  async add(rule: SavedRule): Promise<void> {
    const res = await this.#handle.db
      .insertInto('rule')
      .values({
        id: rule.id,
        owner: rule.ownerId,
        sentence: rule.text,
        structure: JSON.stringify(rule.rule),
        created_ms: rule.createdAt,
      })
      .onConflict((oc) => oc.column('id').doNothing())
      .executeTakeFirst();
    if (Number(res.numInsertedOrUpdatedRows ?? 0n) !== 1)
      throw new SlotwrightError('bad_argument', `rule id '${rule.id}' is already used`);
  }

  /** Removes one rule of an owner; false when that owner has no rule with that id. */
  async remove(ownerId: string, ruleId: string): Promise<boolean> {
    const res = await this.#handle.db
      .deleteFrom('rule')
      .where('id', '=', ruleId)
      .where('owner', '=', ownerId)
      .executeTakeFirst();
    return Number(res.numDeletedRows) === 1;
  }
}
