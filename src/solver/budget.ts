// Budget accounting shared by every part of one solve.
import { SlotwrightError } from '../errors.ts';
import type { Budget } from './types.ts';

/** Throws on a time budget without a clock or a negative node budget. */
export function checkBudget(b: Budget): void {
  if (b.timeMs !== undefined && b.clock === undefined) {
    throw new SlotwrightError(
      'bad_argument',
      'budget.timeMs needs budget.clock (a function returning ms); the solver never reads the clock itself',
    );
  }
  if (b.nodes !== undefined && !(b.nodes >= 0)) {
    throw new SlotwrightError('bad_argument', `budget.nodes must be >= 0, got ${b.nodes}`);
  }
}

/**
 * Counts nodes against a budget. The clock and the signal are read at every step when set: a node can
 * be expensive (ordering thousands of values), so checking only every few hundred overshoots badly.
 */
export class BudgetMeter {
  readonly #nodeLimit: number;
  readonly #deadline: number;
  readonly #clock: (() => number) | null;
  readonly #signal: AbortSignal | null;
  readonly #start: number;
  #steps = 0;
  readonly #watch: boolean;
  /** True once a limit was reached; every later step fails. */
  stopped = false;

  /** Reads the limits; throws on a time budget without a clock. */
  constructor(budget: Budget | undefined) {
    const b = budget ?? {};
    checkBudget(b);
    this.#nodeLimit = b.nodes ?? Number.POSITIVE_INFINITY;
    this.#clock = b.clock ?? null;
    this.#signal = b.signal ?? null;
    this.#start = this.#clock === null ? 0 : this.#clock();
    this.#deadline = b.timeMs === undefined ? Number.POSITIVE_INFINITY : this.#start + b.timeMs;
    this.#watch = this.#signal !== null || this.#deadline !== Number.POSITIVE_INFINITY;
    if (this.#signal?.aborted === true) this.stopped = true;
  }

  /** Counts one step; false when the budget is spent (the step must not be taken). */
  step(): boolean {
    if (this.stopped) return false;
    if (this.#steps >= this.#nodeLimit) {
      this.stopped = true;
      return false;
    }
    this.#steps++;
    if (this.#watch) return this.check();
    return true;
  }

  /** Checks clock and signal now; false when either says stop. */
  check(): boolean {
    if (this.stopped) return false;
    if (this.#signal?.aborted === true) this.stopped = true;
    else if (this.#clock !== null && this.#clock() >= this.#deadline) this.stopped = true;
    return !this.stopped;
  }

  /** Steps counted so far. */
  get steps(): number {
    return this.#steps;
  }

  /** Ms since the meter started, by the budget clock (0 without one). */
  elapsed(): number {
    return this.#clock === null ? 0 : this.#clock() - this.#start;
  }
}
