import { readFile } from 'node:fs/promises';
import {
  busyFromIcs,
  type FeedState,
  type FetchFeedOptions,
  type FetchFeedResult,
  fetchFeed,
  redactUrl,
} from '../calendar/index.ts';
import { normalizeError } from '../errors.ts';
import { type BusyInterval, type Interval, normalizeBusy } from '../time/index.ts';
import type { FeedStateStore } from './ports.ts';

/** One feed of a person or room. */
export interface FeedSpec {
  /** Stable id of the feed (for example `maren:0`). */
  readonly id: string;
  /** Person or room id the busy time belongs to. */
  readonly ownerId: string;
  /** An https URL (already opened with openSecret if it was stored sealed) or a local file path. */
  readonly source: string;
  /** Owner's IANA zone, for all-day dates and floating times. */
  readonly zone: string;
  /** Owner's email, so declined invitations are free. @default undefined */
  readonly ownerEmail?: string;
}

/** What the feed use cases need from the outside world. */
export interface FeedsDeps {
  /** Last good busy time per feed. */
  readonly states: FeedStateStore;
  /** Current time, epoch ms. */
  readonly clock: () => number;
  /** Fetches URLs. @default fetchFeed from src/calendar */
  readonly fetch?: (url: string, options: FetchFeedOptions) => Promise<FetchFeedResult>;
  /** Reads local feed files. @default node:fs readFile as UTF-8 */
  readonly readFile?: (path: string) => Promise<string>;
  /** Fetch policy (allowlist, limits). @default {} */
  readonly fetchOptions?: FetchFeedOptions;
  /** Days ahead of now that busy time is kept for. @default 62 */
  readonly horizonDays?: number;
  /** A copy older than this is reported stale even if the last attempt worked. @default 21600000 (6 h) */
  readonly staleAfterMs?: number;
}

/** How fresh one feed's busy time is. */
export interface FeedFreshness {
  readonly feedId: string;
  /** True when the last refresh failed or the good copy is older than `staleAfterMs`. */
  readonly stale: boolean;
  /** Milliseconds since the good copy was fetched; undefined when there never was one. */
  readonly ageMs: number | undefined;
  /** Why the last refresh failed (URL redacted). */
  readonly error: string | undefined;
}

/** Busy time of one person or room from all their feeds, with how fresh each feed is. */
export interface OwnerBusy {
  readonly ownerId: string;
  readonly busy: readonly BusyInterval[];
  readonly warnings: readonly string[];
  readonly feeds: readonly FeedFreshness[];
}

const DAY = 86_400_000;
const DEFAULTS = { horizonDays: 62, staleAfterMs: 6 * 3_600_000 } as const;

const isUrl = (s: string) => /^[a-z][a-z0-9+.-]*:\/\//i.test(s);

function horizonAt(now: number, days: number): Interval {
  const start = Math.floor(now / DAY) * DAY - DAY;
  return { start, end: start + (days + 1) * DAY };
}

async function refreshOne(feed: FeedSpec, deps: FeedsDeps, now: number): Promise<FeedState> {
  const previous = await deps.states.load(feed.id);
  const horizon = horizonAt(now, deps.horizonDays ?? DEFAULTS.horizonDays);
  try {
    let text: string | undefined;
    let etag: string | undefined;
    let lastModified: string | undefined;
    if (isUrl(feed.source)) {
      // a held copy whose horizon still reaches far enough may be confirmed with a 304
      const reusable = previous?.fetchedAt !== undefined && previous.horizon.end >= horizon.end - 7 * DAY;
      const result = await (deps.fetch ?? fetchFeed)(feed.source, {
        ...deps.fetchOptions,
        ...(reusable && previous.etag !== undefined ? { etag: previous.etag } : {}),
        ...(reusable && previous.lastModified !== undefined ? { lastModified: previous.lastModified } : {}),
      });
      if (result.status === 'not-modified' && previous !== undefined) {
        const state: FeedState = { ...previous, fetchedAt: now, attemptedAt: now, lastError: undefined };
        await deps.states.save(feed.id, state);
        return state;
      }
      if (result.status === 'ok') {
        text = result.body;
        etag = result.etag;
        lastModified = result.lastModified;
      }
    } else {
      text = await (deps.readFile ?? ((p: string) => readFile(p, 'utf8')))(feed.source);
    }
    const report = busyFromIcs(text ?? '', {
      window: horizon,
      zone: feed.zone,
      ...(feed.ownerEmail === undefined ? {} : { ownerEmail: feed.ownerEmail }),
    });
    const state: FeedState = {
      busy: report.busy,
      horizon,
      warnings: report.warnings,
      skipped: report.skipped,
      fetchedAt: now,
      attemptedAt: now,
      etag,
      lastModified,
      lastError: undefined,
    };
    await deps.states.save(feed.id, state);
    return state;
  } catch (error) {
    const e = normalizeError(error);
    const message = isUrl(feed.source)
      ? e.message.replaceAll(feed.source, redactUrl(feed.source))
      : e.message;
    // the last good busy time stays; only the attempt and its error are recorded
    const state: FeedState = {
      busy: previous?.busy ?? [],
      horizon: previous?.horizon ?? { start: horizon.start, end: horizon.start },
      warnings: previous?.warnings ?? [],
      skipped: previous?.skipped ?? 0,
      fetchedAt: previous?.fetchedAt,
      attemptedAt: now,
      etag: previous?.etag,
      lastModified: previous?.lastModified,
      lastError: { code: e.code, message },
    };
    await deps.states.save(feed.id, state);
    return state;
  }
}

/** Refreshes feeds one after another; a failure keeps that feed's last good copy and is recorded. */
export async function refreshFeeds(feeds: readonly FeedSpec[], deps: FeedsDeps): Promise<FeedFreshness[]> {
  const out: FeedFreshness[] = [];
  for (const feed of feeds) {
    const now = deps.clock();
    out.push(freshness(feed.id, await refreshOne(feed, deps, now), now, deps));
  }
  return out;
}

function freshness(
  feedId: string,
  state: FeedState | undefined,
  now: number,
  deps: FeedsDeps,
): FeedFreshness {
  const ageMs = state?.fetchedAt === undefined ? undefined : now - state.fetchedAt;
  const stale =
    state === undefined ||
    state.lastError !== undefined ||
    ageMs === undefined ||
    ageMs > (deps.staleAfterMs ?? DEFAULTS.staleAfterMs);
  return { feedId, stale, ageMs, error: state?.lastError?.message };
}

/**
 * Busy time per owner over a window from the stored feed states, refreshing first when asked.
 * Parts of the window outside a feed's stored horizon are reported in the owner's warnings.
 */
export async function busyByOwner(
  feeds: readonly FeedSpec[],
  window: Interval,
  deps: FeedsDeps,
  options: { readonly refresh?: boolean } = {},
): Promise<Map<string, OwnerBusy>> {
  if (options.refresh === true) await refreshFeeds(feeds, deps);
  const now = deps.clock();
  const byOwner = new Map<string, { busy: BusyInterval[]; warnings: string[]; feeds: FeedFreshness[] }>();
  for (const feed of feeds) {
    const state = await deps.states.load(feed.id);
    const entry = byOwner.get(feed.ownerId) ?? { busy: [], warnings: [], feeds: [] };
    byOwner.set(feed.ownerId, entry);
    entry.feeds.push(freshness(feed.id, state, now, deps));
    if (state === undefined) {
      entry.warnings.push(`feed ${feed.id} has not been read yet`);
      continue;
    }
    entry.busy.push(...state.busy);
    entry.warnings.push(...state.warnings.map((w) => `feed ${feed.id}: ${w}`));
    if (state.horizon.start > window.start || state.horizon.end < window.end)
      entry.warnings.push(`feed ${feed.id} covers only part of the requested time`);
  }
  const out = new Map<string, OwnerBusy>();
  for (const [ownerId, e] of byOwner)
    out.set(ownerId, { ownerId, busy: normalizeBusy(e.busy, window), warnings: e.warnings, feeds: e.feeds });
  return out;
}
