import cron, { type RunCoordinator } from 'node-cron';
import { normalizeError, type SlotwrightError } from '../errors.ts';

/** Name of the feed refresh job (for run-once coordination across replicas). */
export const FEED_REFRESH_JOB = 'feed-refresh';

/** Options of the feed refresh job. */
export interface FeedRefreshJobOptions {
  /** Cron expression (node-cron). @default '*\/15 * * * *' (every 15 minutes) */
  readonly schedule?: string;
  /** Shared across replicas so one of them refreshes per tick. @default undefined */
  readonly runCoordinator?: RunCoordinator;
  /** Called when a whole refresh run fails; single feed failures are kept in their state. @default undefined */
  readonly onError?: (error: SlotwrightError) => void;
}

/** A running feed refresh job. */
export interface FeedRefreshJob {
  /** Runs one refresh now (also what each tick does). */
  refreshNow(): Promise<void>;
  /** Stops the schedule. */
  stop(): Promise<void>;
}

/**
 * Refreshes calendar feeds on a node-cron schedule. The refresh itself (src/app/feeds.ts
 * refreshFeeds) keeps each feed's last good copy when a fetch fails; a tick still running when the
 * next one fires is skipped.
 */
export function startFeedRefreshJob(
  refresh: () => Promise<unknown>,
  options: FeedRefreshJobOptions = {},
): FeedRefreshJob {
  const schedule = options.schedule ?? '*/15 * * * *';
  if (!cron.validate(schedule))
    throw new RangeError(`feed refresh schedule '${schedule}' is not a cron expression`);
  const refreshNow = async (): Promise<void> => {
    await refresh();
  };
  const task = cron.schedule(
    schedule,
    async () => {
      try {
        await refreshNow();
      } catch (error) {
        options.onError?.(normalizeError(error));
      }
    },
    {
      name: FEED_REFRESH_JOB,
      noOverlap: true,
      unref: true,
      ...(options.runCoordinator === undefined
        ? {}
        : { distributed: true, runCoordinator: options.runCoordinator }),
    },
  );
  return {
    refreshNow,
    stop: async () => {
      await task.destroy();
    },
  };
}
