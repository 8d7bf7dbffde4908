import type { RuleStore, StoredRule } from './ports.ts';

/** A RuleStore in process memory, for tests and the terminal console; nothing survives a restart. */
export class InMemoryRuleStore implements RuleStore {
  readonly #rules = new Map<string, StoredRule[]>();

  /** The rules of one owner, oldest first. */
  async list(ownerId: string): Promise<readonly StoredRule[]> {
    return [...(this.#rules.get(ownerId) ?? [])];
  }

  /** Saves a rule; an id already used by that owner is refused so nothing stored is overwritten. */
  async add(rule: StoredRule): Promise<void> {
    const mine = this.#rules.get(rule.ownerId) ?? [];
    if (mine.some((r) => r.id === rule.id)) throw new Error(`rule id '${rule.id}' is already used`);
    this.#rules.set(rule.ownerId, [...mine, rule]);
  }

  /** Removes one rule of an owner; false when there is none with that id. */
  async remove(ownerId: string, ruleId: string): Promise<boolean> {
    const mine = this.#rules.get(ownerId) ?? [];
    const kept = mine.filter((r) => r.id !== ruleId);
    this.#rules.set(ownerId, kept);
    return kept.length !== mine.length;
  }
}
