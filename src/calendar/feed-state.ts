import type { BusyInterval, Interval } from '../time/index.ts';

/**
 * What is kept of one feed between refreshes: the busy time read from the last good copy over a
 * horizon (never the raw calendar text, so titles and attendees are not stored), the validators for
 * conditional GET, and how the last attempt went. A failed fetch keeps the last good busy time.
 */
export interface FeedState {
  /** Busy time of the last good copy over `horizon`. */
  readonly busy: readonly BusyInterval[];
  /** The window `busy` covers. */
  readonly horizon: Interval;
  /** Warnings from reading the last good copy. */
  readonly warnings: readonly string[];
  /** Components of the last good copy that could not be read. */
  readonly skipped: number;
  /** When the last good copy was fetched or confirmed unchanged (304); undefined before the first success. */
  readonly fetchedAt: number | undefined;
  /** When a refresh was last tried. */
  readonly attemptedAt: number;
  /** ETag of the last good copy. */
  readonly etag: string | undefined;
  /** Last-Modified of the last good copy. */
  readonly lastModified: string | undefined;
  /** Why the last attempt failed (URL redacted), or undefined when it worked. */
  readonly lastError: { readonly code: string; readonly message: string } | undefined;
}

/** Keeps feed states in memory; for tests, the console and single-process use. */
export class InMemoryFeedStateStore {
  readonly #states = new Map<string, FeedState>();

  /** The saved state of a feed, or undefined before its first refresh. */
  async load(feedId: string): Promise<FeedState | undefined> {
    return this.#states.get(feedId);
  }

  /** Saves the state of a feed, replacing the previous one. */
  async save(feedId: string, state: FeedState): Promise<void> {
    this.#states.set(feedId, state);
  }
}
