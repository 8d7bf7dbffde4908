import type { Interval } from '../time/interval.ts';
import { zonedToInstant } from '../time/zoned.ts';
import { describeRule } from './describe-rule.ts';
import { intersect, totalLength } from './interval-sets.ts';
import type { DayParts, Rule, RuleSubject } from './rule.ts';
import { ruleEffect } from './rule-effect.ts';

/** How an existing rule relates to a new one. */
export type RuleRelation = 'same' | 'overlaps' | 'contradicts';

/** One existing rule that a new rule repeats, overlaps or contradicts. */
export interface RuleComparison {
  /** Position of the existing rule in the list given to compareRules. */
  readonly index: number;
  readonly relation: RuleRelation;
  /** The existing rule's normalized sentence. */
  readonly text: string;
  /** One plain sentence saying how the two relate. */
  readonly message: string;
}

/** Options of compareRules. */
export interface CompareOptions {
  /** Zone of the person the rules bind. @default 'UTC' */
  readonly zone?: string;
  /** Clock bands of the parts of day. @default DEFAULT_DAY_PARTS */
  readonly dayParts?: DayParts;
}

type TimeShape = { readonly type: 'avoid' | 'only'; readonly set: readonly Interval[] };

function sameSubject(a: RuleSubject, b: RuleSubject): boolean {
  return a.kind === b.kind && (a.kind === 'speaker' || (b.kind !== 'speaker' && a.id === b.id));
}

/** A window that shows both rules: their date ranges when they have any, else one plain week. */
function windowFor(a: Rule, b: Rule, zone: string): { from: number; to: number } {
  const dates = [a.body, b.body].flatMap((x) => (x.kind === 'dates' ? [x.from, x.to] : [])).sort();
  if (dates.length === 0)
    // 2026-01-05 is a Monday with no DST change anywhere near it in either hemisphere's common zones
    return { from: zonedToInstant('2026-01-05', 0, zone), to: zonedToInstant('2026-01-12', 0, zone) };
  return {
    from: zonedToInstant(dates[0]!, 0, zone),
    to: zonedToInstant(dates[dates.length - 1]!, 1440, zone),
  };
}

function timeShape(
  rule: Rule,
  zone: string,
  win: { from: number; to: number },
  parts?: DayParts,
): TimeShape | undefined {
  const b = rule.body;
  if (b.kind !== 'window' && b.kind !== 'keep-free' && b.kind !== 'dates') return undefined;
  const type = b.kind === 'keep-free' || b.mode === 'avoid' ? 'avoid' : 'only';
  // for `only` rules look at the allowed time itself, not its complement
  const asAvoid: Rule =
    type === 'only' && b.kind !== 'keep-free' ? { ...rule, body: { ...b, mode: 'avoid' } } : rule;
  const effect = ruleEffect(asAvoid, {
    zone,
    from: win.from,
    to: win.to,
    now: win.from,
    ...(parts ? { dayParts: parts } : {}),
  });
  return { type, set: effect.avoid };
}

function equalSets(a: readonly Interval[], b: readonly Interval[]): boolean {
  return a.length === b.length && a.every((x, i) => x.start === b[i]!.start && x.end === b[i]!.end);
}

function relate(a: TimeShape, b: TimeShape): RuleRelation | undefined {
  const common = totalLength(intersect(a.set, b.set));
  if (a.type === b.type) {
    if (equalSets(a.set, b.set)) return 'same';
    if (a.type === 'only' && common === 0) return 'contradicts';
    return common > 0 ? 'overlaps' : undefined;
  }
  const wanted = a.type === 'only' ? a : b;
  if (common === 0) return undefined;
  return common === totalLength(wanted.set) ? 'contradicts' : 'overlaps';
}

const MESSAGES: Readonly<Record<RuleRelation, (mine: string, theirs: string) => string>> = {
  same: (mine, theirs) => `'${mine}' says the same as your rule '${theirs}'`,
  overlaps: (mine, theirs) => `'${mine}' overlaps your rule '${theirs}'`,
  contradicts: (mine, theirs) => `'${mine}' contradicts your rule '${theirs}': both cannot hold`,
};

/**
 * Which existing rules of the same person, room or group a new rule repeats, overlaps or contradicts
 * ("no meetings before 10am" against "prefer meetings at 9am" contradicts: all the wished-for time
 * is excluded). Time rules are compared as sets of instants over a window that shows both; rules
 * of the same numeric kind (limits, gaps, notice, lengths) overlap unless they are identical.
 */
export function compareRules(
  newRule: Rule,
  existing: readonly Rule[],
  options: CompareOptions = {},
): RuleComparison[] {
  const zone = options.zone ?? 'UTC';
  const mine = describeRule(newRule);
  const out: RuleComparison[] = [];
  existing.forEach((old, index) => {
    if (!sameSubject(newRule.subject, old.subject)) return;
    const theirs = describeRule(old);
    let relation: RuleRelation | undefined;
    if (JSON.stringify(old) === JSON.stringify(newRule)) relation = 'same';
    else {
      const win = windowFor(newRule, old, zone);
      const a = timeShape(newRule, zone, win, options.dayParts);
      const b = timeShape(old, zone, win, options.dayParts);
      if (a !== undefined && b !== undefined) relation = relate(a, b);
      else if (a === undefined && b === undefined && newRule.body.kind === old.body.kind)
        relation = 'overlaps';
    }
    if (relation !== undefined)
      out.push({ index, relation, text: theirs, message: MESSAGES[relation](mine, theirs) });
  });
  return out;
}
