import { Temporal } from 'temporal-polyfill';
import type { Workspace } from '../config/load-workspace.ts';
import { normalizeError } from '../errors.ts';
import {
  PgRunOnceCoordinator,
  type RunOnceCoordinator,
  SingleProcessCoordinator,
  startWeekPostJob,
  type WeekPlanPoster,
  type WeekPostJob,
  type WeekPostJobOptions,
  type WeekPostRequest,
  type WeekPostSettings,
} from '../jobs/index.ts';
import { type RestSettings, withRestEffects } from '../rules/index.ts';
import type { UsualHours } from '../scheduling/fairness.ts';
import type { SchedulingContext } from '../scheduling/types.ts';
import type { Interval } from '../time/interval.ts';
import { zonedToInstant } from '../time/zoned.ts';
import { fairnessWeightsFor } from './fairness.ts';
import type { ChatTransport, FairnessLedger } from './ports.ts';
import { planWorkspaceWeek, WEEK_SEARCH_MS, type WorkspaceWeekPlan, weekContext } from './week.ts';

/** A chat message as the transport takes it. */
export interface WeekPostMessage {
  readonly text: string;
  readonly blocks?: readonly unknown[];
}

/** What the poster needs to plan and post a week. */
export interface WeekPostDeps {
  /** The workspace as it is now (re-read at each post so edits since start-up count). */
  readonly workspace: () => Workspace;
  readonly chat: Pick<ChatTransport, 'post'>;
  /** Current instant in epoch ms. */
  readonly now: () => number;
  /** Clock for the plan's time budget. */
  readonly clock: () => number;
  /** Turns a plan into a chat message. @default weekPlanMessage (plain text) */
  readonly render?: (plan: WorkspaceWeekPlan, workspace: Workspace) => WeekPostMessage;
  /** Fairness history; plans ignore it when absent. @default undefined */
  readonly fairness?: FairnessLedger;
  /** Search time of the plan in ms. @default 5000 */
  readonly timeMs?: number;
}

/** Each person's zone and working hours, as fairness measures "outside their usual hours". */
export function usualHoursOf(workspace: Workspace): Record<string, UsualHours> {
  return Object.fromEntries(workspace.people.map((p) => [p.id, { zone: p.zone, hours: p.workingHours }]));
}

/** Rest-between-days settings of a workspace, as withRestEffects takes them. */
export function restSettingsOf(workspace: Workspace): {
  workspace?: RestSettings;
  people: Record<string, RestSettings>;
} {
  const people: Record<string, RestSettings> = {};
  for (const p of workspace.people) if (p.rest !== undefined) people[p.id] = p.rest;
  return { ...(workspace.rest === undefined ? {} : { workspace: workspace.rest }), people };
}

/** A scheduling context with each person's rest between days added (when the workspace sets any). */
export function withWorkspaceRest(
  workspace: Workspace,
  context: SchedulingContext,
  window: Interval,
): SchedulingContext {
  return { ...context, people: withRestEffects(context.people, restSettingsOf(workspace), window) };
}

/** A plain-text rendering of a week plan: one line per session, on the workspace clock. */
export function weekPlanMessage(plan: WorkspaceWeekPlan, workspace: Workspace): WeekPostMessage {
  const zone = workspace.zone;
  const name = (id: string) => workspace.series.find((s) => s.id === id)?.name ?? id;
  const room = (id: string | null) =>
    id === null ? '' : ` in ${workspace.rooms.find((r) => r.id === id)?.name ?? id}`;
  const when = (ms: number) => {
    const z = Temporal.Instant.fromEpochMilliseconds(ms).toZonedDateTimeISO(zone);
    return `${z.toPlainDate().toLocaleString('en', { weekday: 'short' })} ${z.toPlainTime().toString().slice(0, 5)}`;
  };
  const lines = [`Week plan for ${plan.isoWeek} (times in ${zone}):`];
  for (const s of plan.sessions) lines.push(`- ${when(s.start)} ${name(s.series)}${room(s.room)}`);
  for (const u of plan.unplaced) lines.push(`- not placed: ${name(u.series)}: ${u.reason}`);
  if (plan.sessions.length === 0 && plan.unplaced.length === 0) lines.push('- no series to place');
  return { text: lines.join('\n') };
}

/**
 * The poster the week-post job calls: plans the announced week from the current workspace (weighing
 * fairness history when wired) and posts it to the channel. A plan that cannot be made is posted as
 * its issues, so the channel learns why there is no plan rather than hearing nothing.
 */
export function createWeekPlanPoster(deps: WeekPostDeps): WeekPlanPoster {
  return {
    async postWeekPlan(request: WeekPostRequest): Promise<void> {
      const workspace = deps.workspace();
      const monday = zonedToInstant(request.weekStart, 0, workspace.zone);
      // A day of margin each side: sessions are read on several zones' calendars.
      const window = { start: monday - 86_400_000, end: monday + 8 * 86_400_000 };
      const now = deps.now();
      const context = withWorkspaceRest(workspace, weekContext(workspace, now, window), window);
      const people = workspace.people.map((p) => p.id);
      const offHoursWeights =
        deps.fairness === undefined
          ? undefined
          : await fairnessWeightsFor(deps.fairness, people, request.isoWeek);
      const planned = planWorkspaceWeek(workspace, context, {
        now,
        isoWeek: request.isoWeek,
        clock: deps.clock,
        timeMs: deps.timeMs ?? WEEK_SEARCH_MS,
        ...(offHoursWeights === undefined ? {} : { offHoursWeights }),
      });
      const message = planned.ok
        ? (deps.render ?? weekPlanMessage)(planned.value, workspace)
        : {
            text: [
              `No week plan for ${request.isoWeek}:`,
              ...planned.issues.map((i) => `- ${i.message}`),
            ].join('\n'),
          };
      try {
        await deps.chat.post(request.channel, message);
      } catch (error) {
        throw normalizeError(error);
      }
    },
  };
}

/** Where the job's once-per-week record lives: a shared PostgreSQL pool, or this process alone. */
export type WeekPostCoordination =
  | { readonly kind: 'postgres'; readonly pool: import('pg').Pool; readonly replica: string }
  | { readonly kind: 'single' };

/**
 * Starts the scheduled week-plan post for a workspace's `weekPlan` post settings. With PostgreSQL the
 * replicas agree through an advisory lock so exactly one posts per week; with SQLite there is one
 * process and no coordination is needed.
 */
export function startWeekPlanPosting(
  settings: WeekPostSettings,
  deps: WeekPostDeps,
  coordination: WeekPostCoordination,
  options: WeekPostJobOptions = {},
): WeekPostJob {
  const coordinator: RunOnceCoordinator =
    coordination.kind === 'postgres'
      ? new PgRunOnceCoordinator(coordination.pool, { replica: coordination.replica, clock: deps.now })
      : new SingleProcessCoordinator();
  return startWeekPostJob(settings, createWeekPlanPoster(deps), coordinator, options);
}
