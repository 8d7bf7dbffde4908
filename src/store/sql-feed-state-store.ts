import { z } from 'zod';
import { SlotwrightError } from '../errors.ts';
import type { BusyInterval, Interval } from '../time/index.ts';
import type { StoreHandle } from './open-store.ts';

/** A feed's saved state (the FeedStateStore port's FeedState, declared here by shape). */
export interface SavedFeedState {
  readonly busy: readonly BusyInterval[];
  readonly horizon: Interval;
  readonly warnings: readonly string[];
  readonly skipped: number;
  readonly fetchedAt: number | undefined;
  readonly attemptedAt: number;
  readonly etag: string | undefined;
  readonly lastModified: string | undefined;
  readonly lastError: { readonly code: string; readonly message: string } | undefined;
}

const busySchema = z.array(
  z.strictObject({ start: z.number(), end: z.number(), kind: z.enum(['busy', 'tentative']) }),
);
const warningsSchema = z.array(z.string());

/**
 * The FeedStateStore port in SQL, one row per feed id, so every replica sees the last good busy
 * time and the conditional-request headers (ETag, Last-Modified) of each feed.
 */
export class SqlFeedStateStore {
  readonly #handle: StoreHandle;

  /** Wraps an open store. */
  constructor(handle: StoreHandle) {
    this.#handle = handle;
  }

  /** The saved state of a feed, or undefined before its first refresh. */
  async load(feedId: string): Promise<SavedFeedState | undefined> {
    const r = await this.#handle.db
      .selectFrom('feed_state')
      .selectAll()
      .where('feed_id', '=', feedId)
      .executeTakeFirst();
    if (r === undefined) return undefined;
    const busy = busySchema.safeParse(JSON.parse(r.busy));
    const warnings = warningsSchema.safeParse(JSON.parse(r.warnings));
    if (!busy.success || !warnings.success)
      throw new SlotwrightError(
        'store_unavailable',
        `stored state of feed ${feedId} is damaged; it will be rebuilt by the next refresh once removed`,
        { cause: busy.error ?? warnings.error },
      );
    return {
      busy: busy.data,
      horizon: { start: Number(r.horizon_start_ms), end: Number(r.horizon_end_ms) },
      warnings: warnings.data,
      skipped: Number(r.skipped),
      fetchedAt: r.fetched_ms === null ? undefined : Number(r.fetched_ms),
      attemptedAt: Number(r.attempted_ms),
      etag: r.etag ?? undefined,
      lastModified: r.last_modified ?? undefined,
      lastError: r.error_code === null ? undefined : { code: r.error_code, message: r.error_message ?? '' },
    };
  }

  /** Saves the state of a feed, replacing the previous one. */
  async save(feedId: string, state: SavedFeedState): Promise<void> {
    const row = {
      busy: JSON.stringify(state.busy.map((b) => ({ start: b.start, end: b.end, kind: b.kind }))),
      horizon_start_ms: state.horizon.start,
      horizon_end_ms: state.horizon.end,
      warnings: JSON.stringify(state.warnings),
      skipped: state.skipped,
      fetched_ms: state.fetchedAt ?? null,
      attempted_ms: state.attemptedAt,
      etag: state.etag ?? null,
      last_modified: state.lastModified ?? null,
      error_code: state.lastError?.code ?? null,
      error_message: state.lastError?.message ?? null,
    };
    await this.#handle.db
      .insertInto('feed_state')
      .values({ feed_id: feedId, ...row })
      .onConflict((oc) => oc.column('feed_id').doUpdateSet(row))
      .execute();
  }
}
