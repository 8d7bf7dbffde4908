import type { Workspace } from '../config/index.ts';
import type { Result } from '../errors.ts';
import { findOptions, type MeetOutcome, WIDEN_DAYS } from '../scheduling/index.ts';
import type { Interval } from '../time/index.ts';
import type { BusyOf } from './book.ts';
import { withWorkspaceRest } from './week-post.ts';
import { type StaleFeed, workspaceContext } from './workspace.ts';

const DAY_MS = 86_400_000;

/** A meeting request as the CLI and the chat bot give it. */
export interface MeetAsk {
  /** Required people or groups. */
  readonly with: readonly string[];
  /** Optional people or groups. @default [] */
  readonly optional?: readonly string[];
  readonly lengthMinutes: number;
  /** Where to look. @default now .. now + the workspace horizon */
  readonly window?: Interval;
  /** Seats wanted; asks for a room. @default no room */
  readonly seats?: number;
  /** Room features wanted; asks for a room. @default [] */
  readonly needs?: readonly string[];
  /** Minutes kept free around the meeting in attendees' calendars. @default 0 */
  readonly bufferMinutes?: number;
  /** Options wanted. @default 5 */
  readonly options?: number;
}

/** Options of meet. */
export interface MeetUseCaseOptions {
  /** Current instant (epoch ms). */
  readonly now: number;
  /** Fresh busy time by id (the feed cache); the default reads file feeds. @default file feeds */
  readonly busyOf?: BusyOf;
  /** Feeds known to be stale, for warnings. @default [] */
  readonly stale?: readonly StaleFeed[];
}

/**
 * Proposes ranked options for a request, or blockers and relaxations when none fit. Busy time is
 * read a week past the window so "widen the window" can be counted.
 */
export async function meet(
  workspace: Workspace,
  ask: MeetAsk,
  options: MeetUseCaseOptions,
): Promise<Result<MeetOutcome>> {
  const window = ask.window ?? { start: options.now, end: options.now + workspace.horizon * DAY_MS };
  const span = { start: Math.min(window.start, options.now), end: window.end + WIDEN_DAYS * DAY_MS };
  const context = await workspaceContext(workspace, {
    now: options.now,
    span,
    ...(options.busyOf === undefined ? {} : { busyOf: options.busyOf }),
    ...(options.stale === undefined ? {} : { stale: options.stale }),
  });
  if (!context.ok) return context;
  // Rest between days (workspace.yaml `rest:`) joins each person's rules over the span read.
  const rested = withWorkspaceRest(workspace, context.value, span);
  return findOptions(rested, {
    with: ask.with,
    optional: ask.optional ?? [],
    lengthMinutes: ask.lengthMinutes,
    window,
    ...(ask.seats === undefined ? {} : { seats: ask.seats }),
    needs: ask.needs ?? [],
    bufferMinutes: ask.bufferMinutes ?? 0,
    options: ask.options ?? 5,
  });
}
