// Systematic search entry points: solve, solutions, countSolutions.
import { SlotwrightError } from '../errors.ts';
import { BudgetMeter } from './budget.ts';
import { components, kBestOfSum, LazyList, product } from './components.ts';
import {
  buildStructure,
  Engine,
  type EngineSettings,
  PROP_ARC,
  PROP_FORWARD,
  PROP_NONE,
  type Structure,
} from './engine.ts';
import { type CompiledModel, compiled, type Model } from './model.ts';
import type { SolveMode, SolveOptions, SolveResult, SolveStats } from './types.ts';

interface Resolved {
  readonly settings: EngineSettings;
  readonly decompose: boolean;
  readonly mode: SolveMode;
}

function bad(message: string): SlotwrightError {
  return new SlotwrightError('bad_argument', message);
}

function resolve(model: CompiledModel, options: SolveOptions): Resolved {
  const p = options.propagation ?? 'forward';
  const propagation = p === 'none' ? PROP_NONE : p === 'forward' ? PROP_FORWARD : p === 'arc' ? PROP_ARC : -1;
  if (propagation < 0) throw bad(`propagation must be 'none', 'forward' or 'arc', got ${String(p)}`);
  const vo = options.variableOrder ?? 'mrv';
  if (vo !== 'mrv' && vo !== 'static')
    throw bad(`variableOrder must be 'static' or 'mrv', got ${String(vo)}`);
  const valueOrder = options.valueOrder ?? 'natural';
  if (valueOrder !== 'natural' && valueOrder !== 'lcv' && typeof valueOrder !== 'function') {
    throw bad(`valueOrder must be 'natural', 'lcv' or a function, got ${String(valueOrder)}`);
  }
  const mode = options.mode ?? { kind: 'first' };
  if (mode.kind === 'best' && !(Number.isInteger(mode.k) && mode.k >= 1)) {
    throw bad(`mode.k must be an integer >= 1, got ${String(mode.k)}`);
  }
  if (mode.kind === 'all' && mode.limit !== undefined && !(mode.limit >= 1)) {
    throw bad(`mode.limit must be >= 1 (leave it out for no limit), got ${String(mode.limit)}`);
  }
  if (mode.kind !== 'first' && mode.kind !== 'all' && mode.kind !== 'best') {
    throw bad(`mode.kind must be 'first', 'all' or 'best'`);
  }
  return {
    settings: {
      propagation,
      mrv: vo === 'mrv',
      valueOrder,
      useBound: mode.kind === 'best' && model.hasCosts,
      seed: options.seed ?? 0,
    },
    decompose: options.decompose ?? true,
    mode,
  };
}

/** One solve over a model with some constraints switched off; builds engines per component. */
export class Run {
  readonly model: CompiledModel;
  readonly comps: readonly Int32Array[];
  readonly meter: BudgetMeter;
  readonly stats: SolveStats;
  readonly #settings: EngineSettings;
  readonly #active: Uint8Array | null;
  readonly #local: Int32Array;
  readonly #rootDom: Uint32Array[];
  readonly #engines: Engine[] = [];
  readonly #structures: Structure[] = [];

  /** `active` marks constraint ids to keep (null = all). */
  constructor(
    model: CompiledModel,
    settings: EngineSettings,
    decompose: boolean,
    active: Uint8Array | null,
    meter: BudgetMeter,
  ) {
    this.model = model;
    this.#settings = settings;
    this.#active = active;
    this.meter = meter;
    this.stats = { nodes: 0, backtracks: 0, pruned: 0, propagations: 0, elapsedMs: 0 };
    const n = model.variableCount;
    this.comps = decompose
      ? components(model, active)
      : n === 0
        ? []
        : [Int32Array.from({ length: n }, (_, i) => i)];
    const local = new Int32Array(n);
    for (const comp of this.comps) {
      for (let i = 0; i < comp.length; i++) local[comp[i]!] = i;
    }
    this.#local = local;
    this.#rootDom = model.initial.map((b) => b.slice());
    for (let i = 0; i < model.unaryVar.length; i++) {
      if (active !== null && active[model.unaryCons[i]!] !== 1) continue;
      const d = this.#rootDom[model.unaryVar[i]!]!;
      const bits = model.unaryBits[i]!;
      for (let w = 0; w < d.length; w++) d[w]! &= bits[w]!;
    }
  }

  /** The engine of component k (created on first use). */
  engine(k: number): Engine {
    let e = this.#engines[k];
    if (e === undefined) {
      e = this.#fresh(k, this.#settings);
      this.#engines[k] = e;
    }
    return e;
  }

  #fresh(k: number, settings: EngineSettings): Engine {
    let st = this.#structures[k];
    if (st === undefined) {
      st = buildStructure(this.model, this.comps[k]!, this.#local, this.#active);
      this.#structures[k] = st;
    }
    return new Engine(this.model, st, this.#rootDom, settings, this.meter, this.stats);
  }

  /**
   * First solution of component k with restarts: each run gets a new MRV tie-break seed and a node
   * cutoff growing by the Luby sequence, which tames the heavy tails of backtracking while staying
   * complete (cutoffs grow without bound) and deterministic for a seed.
   */
  #firstWithRestarts(k: number, out: number[]): boolean {
    const unit = 10 * this.comps[k]!.length + 100;
    for (let r = 0; ; r++) {
      const base = this.#settings.seed;
      const seed = r === 0 ? base : (Math.imul(base ^ 0x5bd1e995, 31) + Math.imul(r, 0x9e3779b9)) >>> 0 || 1;
      const e = this.#fresh(k, { ...this.#settings, seed });
      e.nodeCap = this.stats.nodes + unit * luby(r + 1);
      this.#engines[k] = e;
      if (e.next()) {
        e.write(out);
        return true;
      }
      if (!e.cutOff) return false;
    }
  }

  /** Whether any engine was stopped by the budget. */
  get stopped(): boolean {
    return this.meter.stopped || this.#engines.some((e) => e?.stoppedByBudget === true);
  }

  /** Final statistics (elapsed time filled in). */
  finalStats(): SolveStats {
    return { ...this.stats, elapsedMs: this.meter.elapsed() };
  }

  /** Lazily every full solution (product over components). */
  *all(): Generator<number[]> {
    const n = this.model.variableCount;
    if (n === 0) {
      yield [];
      return;
    }
    const lists = this.comps.map((_, k) => new LazyList(engineSolutions(this.engine(k))));
    for (const parts of product(lists)) {
      const out = new Array<number>(n);
      parts.forEach((part, k) => {
        const comp = this.comps[k]!;
        for (let i = 0; i < comp.length; i++) out[comp[i]!] = part[i]!;
      });
      yield out;
    }
  }

  /** The first solution, or null; `restarts` applies to MRV order only (static order is fixed). */
  first(restarts: boolean): number[] | null {
    const out = new Array<number>(this.model.variableCount).fill(0);
    const withRestarts = restarts && this.#settings.mrv;
    for (let k = 0; k < this.comps.length; k++) {
      if (withRestarts && this.comps[k]!.length > 1) {
        if (!this.#firstWithRestarts(k, out)) return null;
        continue;
      }
      const e = this.engine(k);
      if (!e.next()) return null;
      e.write(out);
    }
    return out;
  }
}

/** The i-th term (from 1) of the Luby sequence 1 1 2 1 1 2 4 1 1 2 ... */
export function luby(i: number): number {
  for (let k = 1; ; k++) {
    const top = 2 ** k - 1;
    if (i === top) return 2 ** (k - 1);
    if (i < top) return luby(i - 2 ** (k - 1) + 1);
  }
}

function* engineSolutions(e: Engine): Generator<Int32Array> {
  while (e.next()) yield e.snapshot();
}

/** Solves a model: the first solution, all (up to a limit), or the k cheapest. */
export function solve(model: Model, options: SolveOptions = {}): SolveResult {
  const m = compiled(model);
  const r = resolve(m, options);
  const run = new Run(m, r.settings, r.decompose, null, new BudgetMeter(options.budget));
  const mode = r.mode;
  let found: number[][] = [];
  let costs: number[] = [];
  if (mode.kind === 'first') {
    const s = run.first(options.restarts ?? true);
    if (s !== null) {
      found = [s];
      costs = [m.costOf(s)];
    }
  } else if (mode.kind === 'all') {
    const limit = mode.limit ?? Number.POSITIVE_INFINITY;
    for (const s of run.all()) {
      found.push(s);
      if (found.length >= limit) break;
    }
    costs = found.map((s) => m.costOf(s));
  } else {
    const best = bestK(run, mode.k);
    found = best.map((b) => b.solution);
    costs = best.map((b) => b.cost);
  }
  const stopped = run.stopped;
  const complete = !stopped || (mode.kind === 'first' && found.length > 0);
  return {
    status: !complete ? 'incomplete' : found.length > 0 ? 'solved' : 'unsatisfiable',
    complete,
    solutions: found,
    costs,
    stats: run.finalStats(),
  };
}

function bestK(run: Run, k: number): { solution: number[]; cost: number }[] {
  const m = run.model;
  const useBound = m.hasCosts;
  const lists: { cost: number; item: Int32Array }[][] = [];
  for (let c = 0; c < run.comps.length; c++) {
    const e = run.engine(c);
    const list: { cost: number; item: Int32Array }[] = [];
    while (e.next()) {
      const entry = { cost: e.cost, item: e.snapshot() };
      let i = list.length;
      while (i > 0 && list[i - 1]!.cost > entry.cost) i--;
      list.splice(i, 0, entry);
      if (list.length > k) list.pop();
      if (list.length === k) {
        if (!useBound) break;
        e.bound = list[k - 1]!.cost;
      }
    }
    if (list.length === 0) return [];
    lists.push(list);
  }
  return kBestOfSum(lists, k).map((s) => {
    const out = new Array<number>(m.variableCount);
    s.parts.forEach((part, c) => {
      const comp = run.comps[c]!;
      for (let i = 0; i < comp.length; i++) out[comp[i]!] = part[i]!;
    });
    // The cost is recomputed on the whole assignment so it is exact for the caller.
    return { solution: out, cost: m.costOf(out) };
  });
}

/** Lazily yields every solution (independent components combined as a product). */
export function* solutions(
  model: Model,
  options: Omit<SolveOptions, 'mode'> = {},
): Generator<readonly number[]> {
  const m = compiled(model);
  const r = resolve(m, options);
  const run = new Run(m, r.settings, r.decompose, null, new BudgetMeter(options.budget));
  yield* run.all();
}

/** Counts solutions (product of component counts); complete is false when a budget ended. */
export function countSolutions(
  model: Model,
  options: Omit<SolveOptions, 'mode'> = {},
): { count: number; complete: boolean } {
  const m = compiled(model);
  const r = resolve(m, options);
  const run = new Run(m, r.settings, r.decompose, null, new BudgetMeter(options.budget));
  let count = 1;
  for (let k = 0; k < run.comps.length; k++) {
    const e = run.engine(k);
    let c = 0;
    while (e.next()) c++;
    count *= c;
    if (c === 0 && !run.stopped) return { count: 0, complete: true };
  }
  return { count, complete: !run.stopped };
}

/** Whether the model restricted to `active` constraints has a solution: true, false, or null if unknown. */
export function satisfiable(
  model: CompiledModel,
  active: Uint8Array | null,
  meter: BudgetMeter,
  propagation: 'forward' | 'arc' = 'arc',
): boolean | null {
  const run = new Run(
    model,
    {
      propagation: propagation === 'arc' ? PROP_ARC : PROP_FORWARD,
      mrv: true,
      valueOrder: 'natural',
      useBound: false,
      seed: 0,
    },
    true,
    active,
    meter,
  );
  const s = run.first(true);
  if (s !== null) return true;
  return run.stopped ? null : false;
}
