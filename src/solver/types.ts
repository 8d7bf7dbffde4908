// Public option and result types of the solver.

/** Limits on a search; when one ends the best result so far is returned as incomplete. */
export interface Budget {
  /** Wall time in ms, measured with `clock` (required with timeMs; the engine never reads the clock). */
  readonly timeMs?: number;
  /** Search nodes (value assignments), or moves for local search. */
  readonly nodes?: number;
  /** Stops the search when aborted. */
  readonly signal?: AbortSignal;
  /** Milliseconds from any origin; used for `timeMs` and `elapsedMs`. */
  readonly clock?: () => number;
}

/** Orders values: lower scores are tried first. */
export type ValueScorer = (variable: number, value: number) => number;

/** What to search for. */
export type SolveMode = { kind: 'first' } | { kind: 'all'; limit?: number } | { kind: 'best'; k: number };

/** Options of `solve`. */
export interface SolveOptions {
  /** Look-ahead: none (plain backtracking), forward checking, or maintained arc consistency (AC-3). @default 'forward' */
  readonly propagation?: 'none' | 'forward' | 'arc';
  /** Variable order: as added, or fewest remaining values first with degree tie-break. @default 'mrv' */
  readonly variableOrder?: 'static' | 'mrv';
  /** Value order: ascending, least-constraining first, or a scorer. @default 'natural' */
  readonly valueOrder?: 'natural' | 'lcv' | ValueScorer;
  /** @default { kind: 'first' } */
  readonly mode?: SolveMode;
  /** Solve independent components of the constraint graph apart. @default true */
  readonly decompose?: boolean;
  /** @default no limit */
  readonly budget?: Budget;
  /**
   * In 'first' mode with MRV, restart with a new tie-break seed after a growing node cutoff (Luby);
   * still complete. @default true
   */
  readonly restarts?: boolean;
  /** Seed of the MRV tie-break (and restarts); results are deterministic for a seed. @default 0 */
  readonly seed?: number;
}

/** Counters of one solve. */
export interface SolveStats {
  /** Value assignments tried. */
  nodes: number;
  /** Assignments that failed (dead ends, including bound cut-offs). */
  backtracks: number;
  /** Values removed from domains by propagation. */
  pruned: number;
  /** Constraint revisions and propagator runs. */
  propagations: number;
  /** Elapsed ms by the budget clock (0 without a clock). */
  elapsedMs: number;
}

/** Outcome of `solve`. */
export interface SolveResult {
  /** incomplete = a budget ended; `solutions` holds the best found so far. */
  readonly status: 'solved' | 'unsatisfiable' | 'incomplete';
  readonly complete: boolean;
  /** Value per variable index; for 'best', ordered by cost ascending. */
  readonly solutions: readonly (readonly number[])[];
  /** Objective per solution (0 when no cost terms). */
  readonly costs: readonly number[];
  readonly stats: SolveStats;
}

/** Options of `improve` (local search over complete assignments). */
export interface LocalSearchOptions {
  readonly method: 'min-conflicts' | 'annealing';
  /** Extra cost to minimise, added to the model's cost terms. @default none */
  readonly objective?: (assignment: readonly number[]) => number;
  /** Fast change in `objective` if `variable` took `value`. @default full re-evaluation */
  readonly delta?: (assignment: readonly number[], variable: number, value: number) => number;
  /** @default ['change'] */
  readonly moves?: readonly ('change' | 'swap')[];
  /** Time or node (move) budget. */
  readonly budget: Budget;
  /** @default 0 */
  readonly seed?: number;
  /** Called every few hundred moves and at the end. @default none */
  readonly onProgress?: (p: { moves: number; violations: number; cost: number; elapsedMs: number }) => void;
}

/** Outcome of `improve`: the best assignment seen (never worse than the start). */
export interface LocalSearchResult {
  readonly assignment: readonly number[];
  readonly violations: number;
  readonly cost: number;
  /** True when the search stopped because nothing was left to improve (no violations, cost 0). */
  readonly complete: boolean;
  readonly moves: number;
}
