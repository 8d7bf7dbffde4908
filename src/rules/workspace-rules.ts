import { describeRule } from './describe-rule.ts';
import { parseRule } from './parse-rule.ts';
import type { NamedEntity, Rule, RuleIssue } from './rule.ts';

/** A person or room with the rule sentences written under it in workspace.yaml. */
export interface RuleOwner {
  readonly kind: 'person' | 'room';
  readonly id: string;
  readonly name?: string;
  /** IANA zone of the owner; the sentences are read in it. */
  readonly zone: string;
  readonly rules: readonly string[];
}

/** One parsed workspace rule, still tied to its owner and its place in the file. */
export interface OwnedRule {
  readonly ownerKind: 'person' | 'room';
  readonly ownerId: string;
  /** Position of the sentence in the owner's `rules` list. */
  readonly index: number;
  readonly rule: Rule;
  /** The normalized sentence. */
  readonly text: string;
}

/** What parseWorkspaceRules needs besides the owners. */
export interface WorkspaceRuleContext {
  /** Current instant (epoch ms); dates like "the 24th" are read from here. */
  readonly now: number;
  /** People a sentence may name. @default [] */
  readonly people?: readonly NamedEntity[];
  /** Rooms a sentence may name. @default [] */
  readonly rooms?: readonly NamedEntity[];
  /** Groups a sentence may name. @default [] */
  readonly groups?: readonly NamedEntity[];
}

/**
 * Reads the `rules:` sentences of every person and room as parseRule does, each in its owner's zone
 * with the owner as speaker. Any sentence that is unreadable, ambiguous or about someone else stops
 * the whole load: the issues name the owner, the sentence's position and the sentence, and nothing
 * is half-applied.
 */
export function parseWorkspaceRules(
  owners: readonly RuleOwner[],
  context: WorkspaceRuleContext,
):
  | { readonly ok: true; readonly rules: readonly OwnedRule[] }
  | { readonly ok: false; readonly issues: readonly RuleIssue[] } {
  const rules: OwnedRule[] = [];
  const issues: RuleIssue[] = [];
  for (const owner of owners) {
    const who = `${owner.kind} ${owner.id}${owner.name === undefined ? '' : ` (${owner.name})`}`;
    const section = owner.kind === 'person' ? 'people' : 'rooms';
    owner.rules.forEach((sentence, index) => {
      const where = `${who}, rule ${index + 1} "${sentence}"`;
      const path = [section, owner.id, 'rules', index];
      const parsed = parseRule(sentence, {
        zone: owner.zone,
        now: context.now,
        speaker: owner.id,
        people: context.people ?? [],
        rooms: context.rooms ?? [],
        groups: context.groups ?? [],
      });
      if (!parsed.ok) {
        for (const i of parsed.issues) issues.push({ ...i, path, message: `${where}: ${i.message}` });
        return;
      }
      const s = parsed.rule.subject;
      const own = s.kind === 'speaker' || (s.kind === owner.kind && s.id === owner.id);
      if (!own) {
        issues.push({
          code: 'rule_ambiguous',
          path,
          message: `${where}: it is about ${s.kind} ${s.id}; move it under that ${s.kind}`,
          suggestions: [],
        });
        return;
      }
      const rule: Rule = { ...parsed.rule, subject: { kind: 'speaker' } };
      rules.push({
        ownerKind: owner.kind,
        ownerId: owner.id,
        index,
        rule,
        text: describeRule(rule),
      });
    });
  }
  return issues.length > 0 ? { ok: false, issues } : { ok: true, rules };
}
