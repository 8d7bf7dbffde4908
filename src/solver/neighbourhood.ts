// Simulated annealing over a problem that evaluates its own moves incrementally. The search owns the
// walk (which move, whether to take it, the temperature, the best seen, the budget); the problem owns
// the state and answers what a move would cost, refusing any move that breaks a hard rule. The walk
// therefore never leaves the feasible region, and the problem can use whatever counters make a move's
// cost cheap: a model-agnostic check of every constraint per move is what makes generic local search
// slow on large weeks.
import { SlotwrightError } from '../errors.ts';
import { checkBudget } from './budget.ts';
import { Prng } from './prng.ts';
import type { Budget } from './types.ts';

/**
 * A feasible assignment that can change one move at a time. Variables are 0..size-1; values are
 * whatever the problem's domains hold.
 */
export interface NeighbourhoodProblem {
  /** Number of variables. */
  readonly size: number;
  /** Current value of a variable. */
  value(variable: number): number;
  /** Values a variable may take; fixed during the search. */
  domain(variable: number): ArrayLike<number>;
  /** Cost of the current assignment (lower is better). */
  cost(): number;
  /**
   * Tries `variable := value`. When the change breaks a hard rule, nothing changes and `accept` is not
   * called. Otherwise `accept(delta)` is asked with the cost change; the change stays when it answers
   * true and is undone when it answers false. Returns whether the change stayed.
   */
  tryChange(variable: number, value: number, accept: (delta: number) => boolean): boolean;
  /** Like `tryChange`, for exchanging the values of two variables. Optional. */
  trySwap?(a: number, b: number, accept: (delta: number) => boolean): boolean;
  /**
   * Like `tryChange`, for a compound move the problem builds around `variable := value`: say, moving
   * the variable together with everything it would clash with (a Kempe chain exchange between two
   * periods). Optional.
   */
  tryChain?(variable: number, value: number, accept: (delta: number) => boolean): boolean;
  /** Sets every variable at once (to a feasible assignment the search saw before). */
  assign(values: ArrayLike<number>): void;
}

/** Options of `anneal`. */
export interface AnnealOptions {
  /** Move or time budget; `nodes` counts tried moves. */
  readonly budget: Budget;
  /** @default 0 */
  readonly seed?: number;
  /** Share of tried moves that are swaps, when the problem offers them. @default 0.5, or less so the shares sum to at most 1 */
  readonly swapShare?: number;
  /** Share of tried moves that are chain moves, when the problem offers them. @default 0.1 */
  readonly chainShare?: number;
  /**
   * Without a move or time limit (only a signal ends the search): moves of the first annealing round;
   * each later round is `growth` times longer and starts again, warm, from the best assignment so far.
   * With a limit, the search cools once over the whole budget instead: one long cooling finds far
   * better assignments than several short ones.
   * @default 200 x size, at least 20000
   */
  readonly roundMoves?: number;
  /** @default 2 */
  readonly growth?: number;
  /** Temperature at the start of the cooling. @default three times the smallest worsening of sampled moves */
  readonly startTemperature?: number;
  /** Temperature at the end of the cooling, as a share of the start. @default 0.01 */
  readonly endShare?: number;
  /** A cost no assignment can beat (the search stops on reaching it). @default none */
  readonly lowerBound?: number;
  /**
   * Stop when this many moves in a row found no better assignment: a small problem has settled long
   * before a generous time budget ends, and an answer in chat should not wait for the clock. With a
   * time limit, a fifth of it must also have passed since the last better assignment.
   * @default 200000 + 50000 x size
   */
  readonly stallMoves?: number;
  /** Called about every 4096 moves and at the end. */
  readonly onProgress?: (p: AnnealProgress) => void;
}

/** Progress of a running `anneal`. */
export interface AnnealProgress {
  readonly moves: number;
  readonly rounds: number;
  readonly best: number;
  readonly current: number;
  readonly temperature: number;
  readonly elapsedMs: number;
}

/** Outcome of `anneal`: the problem is left holding the best assignment seen. */
export interface AnnealResult {
  readonly values: Int32Array;
  readonly cost: number;
  readonly startCost: number;
  readonly moves: number;
  readonly accepted: number;
  readonly rounds: number;
}

const CHECK_EVERY = 128;
/** Share of a time limit that must pass without a better plan before the stall rule may stop a timed run. */
const STALL_TIME_SHARE = 0.2;
const PROGRESS_EVERY = 4096;
const EPOCH = 64;

/**
 * Walks a feasible assignment to a cheaper one by simulated annealing with change, swap and chain
 * moves: one geometric cooling over the whole move or time budget (or, with only a signal to end it,
 * rounds of growing length, each from the best so far). Never ends worse than it started and leaves
 * the problem holding the best assignment. Deterministic for a seed and a move budget.
 */
export function anneal(problem: NeighbourhoodProblem, options: AnnealOptions): AnnealResult {
  const b = options.budget;
  if (b.nodes === undefined && b.timeMs === undefined && b.signal === undefined) {
    throw new SlotwrightError(
      'bad_argument',
      'anneal needs budget.nodes (moves) or budget.timeMs with budget.clock',
    );
  }
  checkBudget(b);
  const n = problem.size;
  const rng = new Prng(options.seed ?? 0);
  const clock = b.clock;
  const t0 = clock?.() ?? 0;
  const limit = b.nodes ?? Number.POSITIVE_INFINITY;
  const deadline = b.timeMs === undefined ? Number.POSITIVE_INFINITY : t0 + b.timeMs;
  // shares as asked (a share for a move the problem lacks is dropped, not an error)
  const askedChain = options.chainShare ?? 0.1;
  const askedSwap = options.swapShare ?? Math.min(0.5, 1 - askedChain);
  const swapShare = problem.trySwap === undefined ? 0 : askedSwap;
  const chainShare = problem.tryChain === undefined ? 0 : askedChain;
  const growth = options.growth ?? 2;
  const endShare = options.endShare ?? 0.01;
  if (
    !(growth >= 1) ||
    !(endShare > 0 && endShare <= 1) ||
    !(askedSwap >= 0 && askedChain >= 0 && askedSwap + askedChain <= 1 + 1e-12)
  ) {
    throw new SlotwrightError(
      'bad_argument',
      'anneal: growth must be >= 1, endShare in (0, 1], and swapShare and chainShare at least 0 with a sum of at most 1',
    );
  }
  const domains = Array.from({ length: n }, (_, v) => problem.domain(v));
  const best = Int32Array.from({ length: n }, (_, v) => problem.value(v));
  const startCost = problem.cost();
  let bestCost = startCost;
  let cost = startCost;
  let moves = 0;
  let accepted = 0;
  let rounds = 0;
  const lowerBound = options.lowerBound ?? Number.NEGATIVE_INFINITY;
  const stallMoves = options.stallMoves ?? 200_000 + 50_000 * n;
  let lastBest = 0;
  // With a time limit the cooling follows the clock, and a faster walk would cross the stall count
  // while still hot, between two better plans: there the stall also needs a fifth of the time
  // limit since the last better plan.
  const timed = clock !== undefined && Number.isFinite(deadline);
  let lastBestAt = t0;
  let stopped = n === 0 || limit <= 0 || b.signal?.aborted === true || startCost <= lowerBound;
  const out = (): boolean => {
    if (stopped) return true;
    if (moves >= limit || (!timed && moves - lastBest >= stallMoves)) stopped = true;
    else if (moves % CHECK_EVERY === 0) {
      if (b.signal?.aborted === true) stopped = true;
      else if (clock !== undefined) {
        const now = clock();
        if (now >= deadline) stopped = true;
        else if (
          timed &&
          moves - lastBest >= stallMoves &&
          now - lastBestAt >= STALL_TIME_SHARE * (deadline - t0)
        )
          stopped = true;
      }
    }
    return stopped;
  };

  let pendingDelta = 0;
  let temperature = 1;
  const metropolis = (delta: number): boolean => {
    if (delta <= 0 || rng.next() < Math.exp(-delta / temperature)) {
      pendingDelta = delta;
      return true;
    }
    return false;
  };
  const tryOne = (accept: (d: number) => boolean): boolean => {
    const v = rng.int(n);
    const kind = rng.next();
    if (kind < swapShare) {
      const u = rng.int(n);
      if (u === v) return false;
      return problem.trySwap!(v, u, accept);
    }
    const dom = domains[v]!;
    if (dom.length < 2) return false;
    const value = dom[rng.int(dom.length)]!;
    if (value === problem.value(v)) return false;
    if (kind < swapShare + chainShare) return problem.tryChain!(v, value, accept);
    return problem.tryChange(v, value, accept);
  };

  // Starting temperature: three times the smallest worsening among a sample of feasible moves (all
  // undone). The smallest step is the cost's unit; a mean or median would follow the far costlier
  // moves of a fresh plan and start much too hot. No sample when the search will not run.
  let t = options.startTemperature;
  if (t === undefined && !stopped) {
    let least = Number.POSITIVE_INFINITY;
    let count = 0;
    const sample = (d: number): boolean => {
      if (d > 1e-9) {
        least = Math.min(least, d);
        count++;
      }
      return false;
    };
    for (let i = 0; i < 40 * Math.min(n, 500) && count < 200; i++) tryOne(sample);
    if (count > 0) t = 3 * least;
  }
  t ??= 1;
  if (!(t > 0) || !Number.isFinite(t)) {
    throw new SlotwrightError('bad_argument', `anneal: startTemperature must be a positive number, got ${t}`);
  }
  const tStart = t;
  const report = (): void =>
    options.onProgress?.({
      moves,
      rounds,
      best: bestCost,
      current: cost,
      temperature,
      elapsedMs: (clock?.() ?? 0) - t0,
    });

  const note = (): void => {
    if (cost < bestCost - 1e-9) {
      bestCost = cost;
      lastBest = moves;
      if (timed) lastBestAt = clock!();
      for (let v = 0; v < n; v++) best[v] = problem.value(v);
      if (bestCost <= lowerBound) stopped = true;
    }
  };
  const step = (): void => {
    moves++;
    if (tryOne(metropolis)) {
      accepted++;
      cost += pendingDelta;
      note();
    }
    if (moves % PROGRESS_EVERY === 0) report();
  };
  const bounded = Number.isFinite(limit) || Number.isFinite(deadline);
  if (bounded) {
    // One cooling over the whole budget: the temperature follows the share of the budget spent
    // (moves or time, whichever is further along), from tStart down to tStart x endShare.
    const span = Number.isFinite(deadline) ? deadline - t0 : 0;
    let share = 0;
    temperature = tStart;
    while (!out()) {
      step();
      if (moves % EPOCH === 0) {
        share = Math.max(share, moves / limit, span > 0 ? ((clock?.() ?? t0) - t0) / span : 0);
        temperature = tStart * endShare ** Math.min(1, share);
      }
    }
    rounds = 1;
  } else {
    // No end in sight (only a signal): rounds of growing length, each from the best so far.
    let roundMoves = options.roundMoves ?? Math.max(20_000, 200 * n);
    while (!stopped) {
      const epochs = Math.max(1, Math.floor(roundMoves / EPOCH));
      const cooling = endShare ** (1 / epochs);
      temperature = tStart;
      for (let e = 0; e < epochs && !stopped; e++) {
        for (let k = 0; k < EPOCH && !out(); k++) step();
        temperature *= cooling;
      }
      rounds++;
      problem.assign(best);
      cost = problem.cost();
      bestCost = Math.min(bestCost, cost);
      roundMoves = Math.round(roundMoves * growth);
    }
  }
  problem.assign(best);
  report();
  return { values: best, cost: problem.cost(), startCost, moves, accepted, rounds };
}
