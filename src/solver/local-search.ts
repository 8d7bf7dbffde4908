// Local search over complete assignments: min-conflicts and simulated annealing. Hard violations
// always outrank the objective; both are deterministic for a seed and stop on the budget.
import { SlotwrightError } from '../errors.ts';
import { BudgetMeter } from './budget.ts';
import { type CompiledModel, checkedCost, compiled, type Model } from './model.ts';
import { Prng } from './prng.ts';
import type { LocalSearchOptions, LocalSearchResult } from './types.ts';

const WALK_PROBABILITY = 0.02;
const PROGRESS_EVERY = 256;
const EPOCH = 100;
const COOLING = 0.97;
const REHEAT_AFTER = 40;

/** Incrementally maintained violations and cost of one complete assignment. */
class Assignment {
  readonly cur: number[];
  readonly #m: CompiledModel;
  readonly #violated: Uint8Array;
  readonly #outside: Uint8Array;
  readonly #conflicts: Int32Array;
  // Variables with conflicts > 0, with positions for O(1) add and remove.
  readonly #list: Int32Array;
  readonly #pos: Int32Array;
  #listLen = 0;
  readonly #scratch: number[] = [];
  readonly #objective: ((a: readonly number[]) => number) | null;
  readonly #delta: ((a: readonly number[], v: number, b: number) => number) | null;
  violations = 0;
  modelCost = 0;
  objCost = 0;

  constructor(m: CompiledModel, start: readonly number[], options: LocalSearchOptions) {
    this.#m = m;
    this.cur = [...start];
    const n = m.variableCount;
    this.#violated = new Uint8Array(m.constraintCount);
    this.#outside = new Uint8Array(n);
    this.#conflicts = new Int32Array(n);
    this.#list = new Int32Array(n);
    this.#pos = new Int32Array(n).fill(-1);
    this.#objective = options.objective ?? null;
    this.#delta = options.objective === undefined ? null : (options.delta ?? null);
    for (let c = 0; c < m.constraintCount; c++) {
      if (!m.holds(c, this.cur, this.#scratch)) {
        this.#violated[c] = 1;
        this.violations++;
        for (const v of m.constraint(c).vars) this.#bump(v, 1);
      }
    }
    for (let v = 0; v < n; v++) {
      if (!m.inDomain(v, this.cur[v]!)) {
        this.#outside[v] = 1;
        this.violations++;
        this.#bump(v, 1);
      }
    }
    this.modelCost = m.costOf(this.cur);
    this.objCost = this.#objective === null ? 0 : checkedObjective(this.#objective(this.cur));
  }

  get cost(): number {
    return this.modelCost + this.objCost;
  }

  get conflictedCount(): number {
    return this.#listLen;
  }

  conflicted(i: number): number {
    return this.#list[i]!;
  }

  #bump(v: number, by: number): void {
    const before = this.#conflicts[v]!;
    const after = before + by;
    this.#conflicts[v] = after;
    if (before === 0 && after > 0) {
      this.#pos[v] = this.#listLen;
      this.#list[this.#listLen++] = v;
    } else if (before > 0 && after === 0) {
      const p = this.#pos[v]!;
      const last = this.#list[--this.#listLen]!;
      this.#list[p] = last;
      this.#pos[last] = p;
      this.#pos[v] = -1;
    }
  }

  /** Whether b is in the starting domain of v. */
  allows(v: number, b: number): boolean {
    return this.#m.inDomain(v, b);
  }

  /** Violations among constraints of v if v took b (the rest unchanged). */
  violationsWith(v: number, b: number): number {
    const old = this.cur[v]!;
    this.cur[v] = b;
    let count = this.#m.inDomain(v, b) ? 0 : 1;
    for (const c of this.#m.constraintsOf(v)) if (!this.#m.holds(c, this.cur, this.#scratch)) count++;
    this.cur[v] = old;
    return count;
  }

  /** Current violations among constraints of v (including its domain). */
  violationsAt(v: number): number {
    let count = this.#outside[v]!;
    for (const c of this.#m.constraintsOf(v)) count += this.#violated[c]!;
    return count;
  }

  /** Change in cost if v took b. */
  costDelta(v: number, b: number): number {
    const m = this.#m;
    const old = this.cur[v]!;
    if (old === b) return 0;
    let d = 0;
    const uc = m.unaryCost[v];
    if (uc) d += uc[b]! - uc[old]!;
    for (let k = m.bcostStart[v]!; k < m.bcostStart[v + 1]!; k++) {
      const t = m.binaryCosts[m.bcostList[k]!]!;
      if (t.x === v) d += checkedCost(t.fn(b, this.cur[t.y]!)) - checkedCost(t.fn(old, this.cur[t.y]!));
      else d += checkedCost(t.fn(this.cur[t.x]!, b)) - checkedCost(t.fn(this.cur[t.x]!, old));
    }
    if (this.#objective !== null) {
      if (this.#delta !== null) d += this.#delta(this.cur, v, b);
      else {
        this.cur[v] = b;
        d += checkedObjective(this.#objective(this.cur)) - this.objCost;
        this.cur[v] = old;
      }
    }
    return d;
  }

  /** Sets v to b, updating violations and costs. */
  set(v: number, b: number): void {
    const m = this.#m;
    const old = this.cur[v]!;
    if (old === b) return;
    const dm = this.#modelDelta(v, b);
    const dObj =
      this.#objective === null ? 0 : this.#delta !== null ? this.#delta(this.cur, v, b) : Number.NaN;
    this.cur[v] = b;
    this.modelCost += dm;
    if (this.#objective !== null) {
      this.objCost = Number.isNaN(dObj) ? checkedObjective(this.#objective(this.cur)) : this.objCost + dObj;
    }
    const out = m.inDomain(v, b) ? 0 : 1;
    if (out !== this.#outside[v]) {
      this.violations += out - this.#outside[v]!;
      this.#bump(v, out - this.#outside[v]!);
      this.#outside[v] = out;
    }
    for (const c of m.constraintsOf(v)) {
      const now = m.holds(c, this.cur, this.#scratch) ? 0 : 1;
      const before = this.#violated[c]!;
      if (now === before) continue;
      this.#violated[c] = now;
      this.violations += now - before;
      for (const w of m.constraint(c).vars) this.#bump(w, now - before);
    }
  }

  #modelDelta(v: number, b: number): number {
    const m = this.#m;
    const old = this.cur[v]!;
    let d = 0;
    const uc = m.unaryCost[v];
    if (uc) d += uc[b]! - uc[old]!;
    for (let k = m.bcostStart[v]!; k < m.bcostStart[v + 1]!; k++) {
      const t = m.binaryCosts[m.bcostList[k]!]!;
      if (t.x === v) d += checkedCost(t.fn(b, this.cur[t.y]!)) - checkedCost(t.fn(old, this.cur[t.y]!));
      else d += checkedCost(t.fn(this.cur[t.x]!, b)) - checkedCost(t.fn(this.cur[t.x]!, old));
    }
    return d;
  }
}

function checkedObjective(c: number): number {
  if (!Number.isFinite(c)) {
    throw new SlotwrightError('model_invalid', `the local search objective returned ${c}; it must be finite`);
  }
  return c;
}

function better(v1: number, c1: number, v2: number, c2: number): boolean {
  return v1 < v2 || (v1 === v2 && c1 < c2 - 1e-9);
}

/** Improves a complete assignment by local search; never returns worse than `start`. */
export function improve(
  model: Model,
  start: readonly number[],
  options: LocalSearchOptions,
): LocalSearchResult {
  const m = compiled(model);
  const n = m.variableCount;
  if (start.length !== n) {
    throw new SlotwrightError(
      'bad_argument',
      `improve: start has ${start.length} values, the model has ${n} variables`,
    );
  }
  start.forEach((a, v) => {
    if (!Number.isInteger(a) || a < 0 || a >= m.sizes[v]!) {
      throw new SlotwrightError(
        'bad_argument',
        `improve: start value ${a} of variable ${v} ("${m.variableNames[v]}") is outside 0..${m.sizes[v]! - 1}`,
      );
    }
  });
  const b = options.budget;
  if (b === undefined || (b.nodes === undefined && b.timeMs === undefined && b.signal === undefined)) {
    throw new SlotwrightError(
      'bad_argument',
      'improve needs budget.nodes (moves) or budget.timeMs with budget.clock',
    );
  }
  if (options.method !== 'min-conflicts' && options.method !== 'annealing') {
    throw new SlotwrightError('bad_argument', `improve: method must be 'min-conflicts' or 'annealing'`);
  }
  const moves = options.moves ?? ['change'];
  if (moves.length === 0 || moves.some((k) => k !== 'change' && k !== 'swap')) {
    throw new SlotwrightError(
      'bad_argument',
      `improve: moves must be a non-empty list of 'change' and 'swap'`,
    );
  }
  const meter = new BudgetMeter(b);
  const rng = new Prng(options.seed ?? 0);
  const s = new Assignment(m, start, options);
  const hasCost = m.hasCosts || options.objective !== undefined;
  let best = [...s.cur];
  let bestV = s.violations;
  let bestC = s.cost;
  let count = 0;
  let complete = false;
  const report = (): void => {
    options.onProgress?.({ moves: count, violations: bestV, cost: bestC, elapsedMs: meter.elapsed() });
  };
  const note = (): void => {
    if (better(s.violations, s.cost, bestV, bestC)) {
      best = [...s.cur];
      bestV = s.violations;
      bestC = s.cost;
    }
  };
  const values = m.initial.map((bits) => {
    const out: number[] = [];
    for (let a = 0; a < bits.length * 32; a++) if ((bits[a >>> 5]! >>> (a & 31)) & 1) out.push(a);
    return Int32Array.from(out);
  });
  const done = (): boolean => bestV === 0 && (!hasCost || bestC <= 0);

  if (n > 0 && !done()) {
    if (options.method === 'min-conflicts') {
      while (meter.step()) {
        count++;
        const v =
          s.conflictedCount > 0 ? s.conflicted(rng.int(s.conflictedCount)) : hasCost ? rng.int(n) : -1;
        if (v < 0) break;
        const dom = values[v]!;
        if (dom.length === 0) continue;
        let choice: number;
        if (rng.next() < WALK_PROBABILITY) choice = dom[rng.int(dom.length)]!;
        else {
          choice = s.cur[v]!;
          let bv = Number.POSITIVE_INFINITY;
          let bc = Number.POSITIVE_INFINITY;
          let ties = 0;
          for (let i = 0; i < dom.length; i++) {
            const a = dom[i]!;
            const vv = s.violationsWith(v, a);
            if (vv > bv) continue;
            const cc = hasCost ? s.costDelta(v, a) : 0;
            if (vv < bv || cc < bc - 1e-12) {
              bv = vv;
              bc = cc;
              choice = a;
              ties = 1;
            } else if (Math.abs(cc - bc) <= 1e-12) {
              ties++;
              if (rng.int(ties) === 0) choice = a;
            }
          }
        }
        s.set(v, choice);
        note();
        if (done()) {
          complete = true;
          break;
        }
        if (count % PROGRESS_EVERY === 0) report();
      }
    } else {
      complete = anneal(
        s,
        values,
        moves,
        rng,
        meter,
        hasCost,
        note,
        done,
        () => {
          count++;
          if (count % PROGRESS_EVERY === 0) report();
        },
        b.nodes,
      );
    }
  } else if (done()) complete = true;
  report();
  const final = new Assignment(m, best, options);
  return { assignment: best, violations: final.violations, cost: final.cost, complete, moves: count };
}

function anneal(
  s: Assignment,
  values: readonly Int32Array[],
  moveKinds: readonly ('change' | 'swap')[],
  rng: Prng,
  meter: BudgetMeter,
  hasCost: boolean,
  note: () => void,
  done: () => boolean,
  tick: () => void,
  limit: number | undefined,
): boolean {
  const n = s.cur.length;
  // Starting temperature of the objective from the mean size of a few random worsening moves.
  let sum = 0;
  let samples = 0;
  if (hasCost) {
    for (let i = 0; i < 30; i++) {
      const v = rng.int(n);
      const dom = values[v]!;
      if (dom.length === 0) continue;
      const d = s.costDelta(v, dom[rng.int(dom.length)]!);
      if (d > 0) {
        sum += d;
        samples++;
      }
    }
  }
  const tc0 = samples > 0 ? sum / samples : 1;
  const tv0 = 0.5;
  // With a move budget, cool so the end is near 0.5% of the start; otherwise a fixed rate.
  const cooling = limit !== undefined && limit > EPOCH ? 0.005 ** (EPOCH / limit) : COOLING;
  let tc = tc0;
  let tv = tv0;
  let sinceBest = 0;
  let epochMoves = 0;
  let lastBestV = s.violations;
  let lastBestC = s.cost;
  while (meter.step()) {
    tick();
    const swap =
      moveKinds.length > 1 ? moveKinds[rng.int(moveKinds.length)] === 'swap' : moveKinds[0] === 'swap';
    const v0 = s.violations;
    const c0 = s.cost;
    let u = -1;
    let ua = 0;
    const v =
      s.conflictedCount > 0 && rng.next() < 0.5 ? s.conflicted(rng.int(s.conflictedCount)) : rng.int(n);
    const va = s.cur[v]!;
    if (swap) {
      u = rng.int(n);
      ua = s.cur[u]!;
      // Swaps stay inside both domains so cost terms only ever see valid values.
      if (u === v || ua === va || !s.allows(v, ua) || !s.allows(u, va)) continue;
      s.set(v, ua);
      s.set(u, va);
    } else {
      const dom = values[v]!;
      if (dom.length < 2) continue;
      const b = dom[rng.int(dom.length)]!;
      if (b === va) continue;
      s.set(v, b);
    }
    const dv = s.violations - v0;
    const dc = s.cost - c0;
    let accept: boolean;
    if (dv < 0 || (dv === 0 && dc <= 0)) accept = true;
    else if (dv > 0) accept = rng.next() < Math.exp(-dv / tv);
    else accept = rng.next() < Math.exp(-dc / tc);
    if (!accept) {
      if (u >= 0) {
        s.set(u, ua);
        s.set(v, va);
      } else s.set(v, va);
    } else note();
    if (done()) return true;
    if (++epochMoves >= EPOCH) {
      epochMoves = 0;
      tv *= cooling;
      tc *= cooling;
      if (better(s.violations, s.cost, lastBestV, lastBestC)) {
        lastBestV = s.violations;
        lastBestC = s.cost;
        sinceBest = 0;
      } else if (++sinceBest >= REHEAT_AFTER) {
        // Reheat: warm up by a fixed factor (capped at the start) to leave a plateau.
        tv = Math.min(tv0, tv * 20);
        tc = Math.min(tc0, tc * 20);
        sinceBest = 0;
      }
    }
  }
  return false;
}
