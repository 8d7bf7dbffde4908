/**
 * A week plan searched on several threads at once: each thread runs the whole planner with its own
 * seed (seed, seed + 1, ...), and the best plan wins. The annealing's outcome varies widely from
 * seed to seed, so on a machine with spare cores the best of a few independent runs is a better
 * plan in the same wall-clock time. Same seed, thread count and move budget, same plan.
 */

import { SlotwrightError } from '../errors.ts';
import type { WeekPlan } from '../scheduling/week/plan-week.ts';
import type { WeekRequest } from '../scheduling/week/week-request.ts';
import { SolvePool } from './solve-pool.ts';

/** Options of `planWeekOnThreads`. */
export interface ThreadedWeekOptions {
  /** Independent runs, one per thread. */
  readonly threads: number;
  /** Time budget of each run in ms (from the moment the run starts on its thread). */
  readonly timeMs?: number;
  /** Annealing moves of each run. @default the planner's */
  readonly moves?: number;
  /** Seed of the first run; run k takes seed + k. @default 1 */
  readonly seed?: number;
  /** A pool to run on (it must allow `threads` threads, or runs wait for each other); one of its own when absent. */
  readonly pool?: SolvePool;
}

/** One thread's outcome, for reports. */
export interface ThreadRun {
  readonly seed: number;
  readonly total: number;
  readonly unplaced: number;
  readonly violations: number;
}

/** The winning plan, its seed, and every run's outcome in seed order. */
export interface ThreadedWeekPlan {
  readonly plan: WeekPlan;
  readonly seed: number;
  readonly runs: readonly ThreadRun[];
}

/** Most threads one plan may use. */
export const MAX_THREADS = 64;

/**
 * Runs `threads` independent week plans on worker threads and keeps the best: fewest series left
 * out, then fewest hard violations, then the lowest preference cost, then the lowest seed.
 */
export async function planWeekOnThreads(
  request: WeekRequest,
  options: ThreadedWeekOptions,
): Promise<ThreadedWeekPlan> {
  const { threads } = options;
  const seed = options.seed ?? 1;
  if (!(Number.isInteger(threads) && threads >= 1 && threads <= MAX_THREADS))
    throw new SlotwrightError(
      'bad_argument',
      `threads must be a whole number from 1 to ${MAX_THREADS}, got ${threads}`,
    );
  if (!(Number.isInteger(seed) && seed >= 0 && seed + threads - 1 <= 0xffffffff))
    throw new SlotwrightError(
      'bad_argument',
      `seed must be a whole number from 0 to ${0xffffffff - threads + 1} with ${threads} threads, got ${seed}`,
    );
  const pool = options.pool ?? new SolvePool({ maxThreads: threads, minThreads: threads });
  try {
    const answers = await Promise.all(
      Array.from({ length: threads }, (_, k) =>
        pool.run({
          kind: 'week',
          request,
          seed: seed + k,
          ...(options.timeMs === undefined ? {} : { timeMs: options.timeMs }),
          ...(options.moves === undefined ? {} : { moves: options.moves }),
        }),
      ),
    );
    const plans: WeekPlan[] = answers.map((a) => ({ ...a.plan, values: Int32Array.from(a.plan.values) }));
    let best = 0;
    for (let k = 1; k < plans.length; k++) if (betterWeekPlan(plans[k]!, plans[best]!)) best = k;
    return {
      plan: plans[best]!,
      seed: seed + best,
      runs: plans.map((p, k) => ({
        seed: seed + k,
        total: p.score.total,
        unplaced: p.unplaced.length,
        violations: p.violations,
      })),
    };
  } finally {
    if (options.pool === undefined) await pool.close();
  }
}

/**
 * True when plan `a` beats plan `b`: fewer series left out, then fewer hard violations, then a lower
 * preference cost. A tie is not a win, so the earlier seed keeps its place.
 */
export function betterWeekPlan(
  a: Pick<WeekPlan, 'unplaced' | 'violations' | 'score'>,
  b: Pick<WeekPlan, 'unplaced' | 'violations' | 'score'>,
): boolean {
  if (a.unplaced.length !== b.unplaced.length) return a.unplaced.length < b.unplaced.length;
  if (a.violations !== b.violations) return a.violations < b.violations;
  return a.score.total < b.score.total - 1e-9;
}
