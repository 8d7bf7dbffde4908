import cron from 'node-cron';
import { normalizeError, type SlotwrightError } from '../errors.ts';
import type { RunOnceCoordinator, RunOnceOutcome } from './run-once.ts';
import {
  parseWeekPostTime,
  type WeekPostSettings,
  weekAnnouncedAt,
  weekPostCron,
} from './week-post-schedule.ts';

/** Job name in logs, in node-cron's task list and in the coordinator's records. */
export const WEEK_POST_JOB = 'week-plan-post';

/** What the post asks the chat side to do: plan the announced week and post it to the channel. */
export interface WeekPostRequest {
  readonly channel: string;
  /** The announced week, `YYYY-Www`. */
  readonly isoWeek: string;
  /** Its Monday, `YYYY-MM-DD`, on the clock of `zone`. */
  readonly weekStart: string;
  readonly zone: string;
}

/** The small port the chat side implements: plan a week and post it. */
export interface WeekPlanPoster {
  /** Posts the plan of one week; resolves once the message is posted. */
  postWeekPlan(request: WeekPostRequest): Promise<void>;
}

/** Options of the week-post job. */
export interface WeekPostJobOptions {
  /** Attempts when posting fails (each through the coordinator). @default 3 */
  readonly attempts?: number;
  /** Waits between attempts, in ms. @default 60000 */
  readonly retryDelayMs?: number;
  /** Called after each fire with how it ended. @default undefined */
  readonly onOutcome?: (outcome: RunOnceOutcome, request: WeekPostRequest) => void;
  /** Called when every attempt failed. @default undefined */
  readonly onError?: (error: SlotwrightError, request: WeekPostRequest) => void;
}

/** A scheduled week-post job. */
export interface WeekPostJob {
  /** The cron expression and zone node-cron runs. */
  readonly cron: string;
  readonly timezone: string;
  /** The next fire instants as node-cron computes them. */
  nextRuns(count: number): Date[];
  /** Does what one fire does, for the instant `firedAt`. */
  fire(firedAt: number): Promise<RunOnceOutcome | 'failed'>;
  stop(): Promise<void>;
}

const DEFAULTS = { attempts: 3, retryDelayMs: 60_000 } satisfies WeekPostJobOptions;

const pause = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

/**
 * Posts next week's plan at the workspace's post time (e.g. "fri 14:00" in Europe/Lisbon) with
 * node-cron's `timezone`, so the local time holds across daylight-saving changes. With several replicas
 * the coordinator lets one post per ISO week; a replica that fires late finds the week done.
 */
export function startWeekPostJob(
  settings: WeekPostSettings,
  poster: WeekPlanPoster,
  coordinator: RunOnceCoordinator,
  options: WeekPostJobOptions = {},
): WeekPostJob {
  const o = { ...DEFAULTS, ...options };
  const expression = weekPostCron(parseWeekPostTime(settings.post));
  const fire = async (firedAt: number): Promise<RunOnceOutcome | 'failed'> => {
    const week = weekAnnouncedAt(firedAt, settings.zone);
    const request: WeekPostRequest = { channel: settings.channel, zone: settings.zone, ...week };
    let lastError: SlotwrightError | undefined;
    for (let attempt = 1; attempt <= o.attempts; attempt++) {
      try {
        const outcome = await coordinator.runOnce(WEEK_POST_JOB, `${settings.channel}:${week.isoWeek}`, () =>
          poster.postWeekPlan(request),
        );
        o.onOutcome?.(outcome, request);
        return outcome;
      } catch (error) {
        lastError = normalizeError(error);
        if (attempt < o.attempts) await pause(o.retryDelayMs);
      }
    }
    o.onError?.(lastError!, request);
    return 'failed';
  };
  const task = cron.schedule(expression, (ctx) => fire(ctx.date.getTime()), {
    name: `${WEEK_POST_JOB}:${settings.channel}`,
    timezone: settings.zone,
    noOverlap: true,
  });
  return {
    cron: expression,
    timezone: settings.zone,
    nextRuns: (count) => task.getNextRuns(count),
    fire,
    stop: async () => {
      await task.stop();
      await task.destroy();
    },
  };
}
