// Minimal conflicts over constraint groups: QuickXplain with a bounded consistency check per step.
import { SlotwrightError } from '../errors.ts';
import { BudgetMeter } from './budget.ts';
import { type CompiledModel, compiled, type Model } from './model.ts';
import { satisfiable } from './solve.ts';
import type { Budget } from './types.ts';

/** Options of `minimalConflict`. */
export interface ConflictOptions {
  /**
   * `nodes` limits each consistency check (@default 100000 nodes per check); `timeMs`/`clock` and
   * `signal` limit the whole search. A group whose check runs out of budget is kept, so the answer is
   * still a conflict but may then not be minimal.
   */
  readonly budget?: Budget;
}

const DEFAULT_CHECK_NODES = 100_000;

/**
 * A minimal set of constraint groups that, with the variables' domains and the groups not in
 * `groups` (always kept), has no solution; null when the whole model is satisfiable. Every proper
 * subset of the answer (with the kept groups) is satisfiable, when every check finished in budget.
 */
export function minimalConflict(
  model: Model,
  groups?: readonly string[],
  options: ConflictOptions = {},
): readonly string[] | null {
  const m = compiled(model);
  const budget = options.budget ?? {};
  const perCheck = budget.nodes ?? DEFAULT_CHECK_NODES;
  const overall = new BudgetMeter(omitNodes(budget));
  const index = new Map(m.groups.map((g, i) => [g, i] as const));
  let candidates: number[];
  if (groups === undefined) candidates = m.groups.map((_, i) => i);
  else {
    candidates = [];
    for (const g of groups) {
      const i = index.get(g);
      if (i === undefined) {
        throw new SlotwrightError(
          'bad_argument',
          `minimalConflict: no constraint group named "${g}"; known groups: ${m.groups.join(', ')}`,
        );
      }
      if (!candidates.includes(i)) candidates.push(i);
    }
  }
  const on = new Uint8Array(m.groups.length).fill(1);
  const check = (): boolean | null => {
    overall.check();
    if (overall.stopped) return null;
    const meter = new BudgetMeter(checkBudget(budget, perCheck, overall));
    return satisfiable(m, activeMask(m, on), meter);
  };
  const all = check();
  if (all === true) return null;
  if (all === null) {
    throw new SlotwrightError(
      'budget_exhausted',
      'minimalConflict: could not decide whether the model has a solution within the budget; raise budget.nodes',
    );
  }
  for (const g of candidates) on[g] = 0;
  if (check() === false) return [];
  // QuickXplain (Junker 2004) over the candidates; the groups outside them stay on throughout.
  // `consistent` switches on exactly the given candidates; an inconclusive check counts as
  // consistent, which only ever keeps more groups, so the answer stays a conflict.
  let inconclusive = false;
  const consistent = (set: readonly number[]): boolean => {
    for (const g of candidates) on[g] = 0;
    for (const g of set) on[g] = 1;
    const r = check();
    if (r === null) inconclusive = true;
    return r !== false;
  };
  const qx = (background: number[], delta: boolean, c: number[]): number[] => {
    if (delta && !consistent(background)) return [];
    if (c.length === 1) return c;
    const half = c.length >> 1;
    const c1 = c.slice(0, half);
    const c2 = c.slice(half);
    const d2 = qx([...background, ...c1], c1.length > 0, c2);
    const d1 = qx([...background, ...d2], d2.length > 0, c1);
    return [...d1, ...d2];
  };
  let answer = qx([], false, candidates);
  if (inconclusive) {
    // Some check ran out of budget: a deletion pass over the (small) answer restores minimality
    // wherever the checks now finish.
    const kept: number[] = [];
    for (let i = 0; i < answer.length; i++) {
      if (consistent([...kept, ...answer.slice(i + 1)])) kept.push(answer[i]!);
    }
    answer = kept;
  }
  const order = new Map(candidates.map((g, i) => [g, i] as const));
  answer.sort((a, b) => order.get(a)! - order.get(b)!);
  return answer.map((g) => m.groups[g]!);
}

function omitNodes(b: Budget): Budget {
  return {
    ...(b.signal === undefined ? {} : { signal: b.signal }),
    ...(b.clock === undefined ? {} : { clock: b.clock }),
    ...(b.timeMs === undefined ? {} : { timeMs: b.timeMs }),
  };
}

function checkBudget(b: Budget, nodes: number, overall: BudgetMeter): Budget {
  const out: { nodes: number; signal?: AbortSignal; clock?: () => number; timeMs?: number } = { nodes };
  if (b.signal !== undefined) out.signal = b.signal;
  if (b.clock !== undefined && b.timeMs !== undefined) {
    out.clock = b.clock;
    out.timeMs = Math.max(0, b.timeMs - overall.elapsed());
  }
  return out;
}

/** Constraint mask for the groups switched on. */
export function activeMask(m: CompiledModel, groupOn: Uint8Array): Uint8Array {
  const active = new Uint8Array(m.constraintCount);
  for (let c = 0; c < active.length; c++) active[c] = groupOn[m.consGroup[c]!]!;
  return active;
}
