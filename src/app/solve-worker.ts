/**
 * Runs inside a worker thread of the solve pool: the pure scheduling calls, so a long solve never
 * blocks the event loop that answers chat requests.
 */

import type { Workspace } from '../config/index.ts';
import type { Result } from '../errors.ts';
import {
  findOptions,
  type MeetOutcome,
  type MeetRequest,
  type SchedulingContext,
} from '../scheduling/index.ts';
import { planWeek } from '../scheduling/week/plan-week.ts';
import type { WeekRequest } from '../scheduling/week/week-request.ts';
import { type PlannedSession, planWorkspaceWeek, WEEK_SEARCH_MS } from './week.ts';

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
    }
  | {
      readonly kind: 'workspace-week';
      readonly workspace: Workspace;
      readonly context: SchedulingContext;
      readonly isoWeek?: string;
      readonly now: number;
      /** @default WEEK_SEARCH_MS (5000) */
      readonly timeMs?: number;
    };

/** What the worker sends back for each kind of task. */
export type SolveAnswer =
  | { readonly kind: 'meet'; readonly outcome: Result<MeetOutcome> }
  | {
      readonly kind: 'week';
      readonly plan: Omit<ReturnType<typeof planWeek>, 'values'> & { readonly values: readonly number[] };
    }
  | {
      readonly kind: 'workspace-week';
      readonly outcome: Result<{
        readonly isoWeek: string;
        readonly sessions: readonly PlannedSession[];
        readonly unplaced: readonly { readonly series: string; readonly reason: string }[];
      }>;
    };

/** Runs one task (called by piscina by name). */
export function solve(task: SolveTask): SolveAnswer {
  if (task.kind === 'meet') return { kind: 'meet', outcome: findOptions(task.context, task.request) };
  if (task.kind === 'workspace-week') {
    const r = planWorkspaceWeek(task.workspace, task.context, {
      now: task.now,
      clock: () => performance.now(),
      timeMs: task.timeMs ?? WEEK_SEARCH_MS,
      ...(task.isoWeek === undefined ? {} : { isoWeek: task.isoWeek }),
    });
    if (!r.ok) return { kind: 'workspace-week', outcome: r };
    // Only what the chat shows crosses back; the model and search state stay in the worker.
    const { isoWeek, sessions, unplaced } = r.value;
    return {
      kind: 'workspace-week',
      outcome: {
        ok: true,
        value: { isoWeek, sessions, unplaced: unplaced.map((u) => ({ series: u.series, reason: u.reason })) },
      },
    };
  }
  const plan = planWeek(task.request, {
    ...(task.timeMs === undefined ? {} : { timeMs: task.timeMs, clock: () => performance.now() }),
    ...(task.moves === undefined ? {} : { moves: task.moves }),
    ...(task.seed === undefined ? {} : { seed: task.seed }),
  });
  return { kind: 'week', plan: { ...plan, values: Array.from(plan.values) } };
}
