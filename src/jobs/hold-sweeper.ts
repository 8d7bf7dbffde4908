import cron, { type RunCoordinator } from 'node-cron';
import { normalizeError, type SlotwrightError } from '../errors.ts';

/** What the sweeper calls on the store. */
export interface HoldReleaser {
  /** Releases holds whose expiry is at or before `now`; returns how many. */
  releaseExpiredHolds(now: number): Promise<number>;
}

/** Options of the hold sweeper. */
export interface HoldSweeperOptions {
  /** Cron expression (node-cron, seconds field allowed). @default '* * * * *' (every minute) */
  readonly schedule?: string;
  /** Shared across replicas so one of them sweeps per tick; releasing is idempotent either way. @default undefined */
  readonly runCoordinator?: RunCoordinator;
  /** Called after each sweep with how many holds were released. @default undefined */
  readonly onSwept?: (released: number, at: number) => void;
  /** Called when a sweep fails; the next tick tries again. @default undefined */
  readonly onError?: (error: SlotwrightError) => void;
}

/** A running sweeper. */
export interface HoldSweeper {
  /** Runs one sweep now (also what each tick does); resolves to how many holds were released. */
  sweepNow(): Promise<number>;
  /** Stops the schedule. */
  stop(): Promise<void>;
}

const DEFAULTS = { schedule: '* * * * *' } satisfies HoldSweeperOptions;

/**
 * Releases expired holds on a node-cron schedule. Booking already ignores expired holds, so the
 * sweeper only tidies up; a tick that is still running when the next one fires is skipped.
 */
export function startHoldSweeper(
  store: HoldReleaser,
  clock: () => number,
  options: HoldSweeperOptions = {},
): HoldSweeper {
  const opts = { ...DEFAULTS, ...options };
  if (!cron.validate(opts.schedule))
    throw new RangeError(`hold sweeper schedule '${opts.schedule}' is not a cron expression`);
  const sweepNow = async (): Promise<number> => {
    const at = clock();
    const released = await store.releaseExpiredHolds(at);
    opts.onSwept?.(released, at);
    return released;
  };
  const task = cron.schedule(
    opts.schedule,
    async () => {
      try {
        await sweepNow();
      } catch (error) {
        opts.onError?.(normalizeError(error));
      }
    },
    {
      name: 'hold-sweeper',
      noOverlap: true,
      unref: true,
      ...(opts.runCoordinator === undefined
        ? {}
        : { distributed: true, runCoordinator: opts.runCoordinator }),
    },
  );
  return {
    sweepNow,
    stop: async () => {
      await task.destroy();
    },
  };
}
