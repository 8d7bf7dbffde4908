/**
 * Runs inside a worker thread of the solve pool: the pure scheduling calls, so a long solve never
 * blocks the event loop that answers chat requests.
 */
import type { Result } from '../errors.ts';
import {
  findOptions,
  type MeetOutcome,
  type MeetRequest,
  type SchedulingContext,
} from '../scheduling/index.ts';
import { planWeek } from '../scheduling/week/plan-week.ts';
import type { WeekRequest } from '../scheduling/week/week-request.ts';

/** A solve the pool can run; plain data, as it crosses a thread boundary. */
export type SolveTask =
  | { readonly kind: 'meet'; readonly context: SchedulingContext; readonly request: MeetRequest }
  | {
      readonly kind: 'week';
      readonly request: WeekRequest;
      /** Time budget in ms. @default no limit (the move budget ends it) */
      readonly timeMs?: number;
      /** Local-search moves. @default the planner's default */
      readonly moves?: number;
      /** @default 1 */
      readonly seed?: number;
    };

/** What the worker sends back for each kind of task. */
export type SolveAnswer =
  | { readonly kind: 'meet'; readonly outcome: Result<MeetOutcome> }
  | {
      readonly kind: 'week';
      readonly plan: Omit<ReturnType<typeof planWeek>, 'values'> & { readonly values: readonly number[] };
    };

/** Runs one task (called by piscina by name). */
export function solve(task: SolveTask): SolveAnswer {
  if (task.kind === 'meet') return { kind: 'meet', outcome: findOptions(task.context, task.request) };
  const plan = planWeek(task.request, {
    ...(task.timeMs === undefined ? {} : { timeMs: task.timeMs, clock: () => performance.now() }),
    ...(task.moves === undefined ? {} : { moves: task.moves }),
    ...(task.seed === undefined ? {} : { seed: task.seed }),
  });
  return { kind: 'week', plan: { ...plan, values: Array.from(plan.values) } };
}
