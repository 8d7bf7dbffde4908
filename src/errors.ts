/**
 * One error type for every thrown failure in slotwright. Expected failures (no slot, conflict,
 * bad input) are returned as `{ ok: false, issues }` instead; see `Issue` below.
 */

/** Stable codes of thrown errors. Add new codes here, grouped by area, never reuse one. */
export type ErrorCode =
  // general
  | 'internal'
  | 'bad_argument'
  | 'not_found'
  | 'unauthorized'
  // config and workspace
  | 'config_invalid'
  | 'config_unreadable'
  // calendar feeds
  | 'feed_unreadable'
  | 'feed_refused'
  | 'feed_too_large'
  | 'feed_timeout'
  | 'feed_http'
  | 'ics_invalid'
  | 'zone_unknown'
  // rules
  | 'rule_unreadable'
  | 'rule_ambiguous'
  // solver and scheduling
  | 'model_invalid'
  | 'budget_exhausted'
  // store and booking
  | 'store_unavailable'
  | 'conflict'
  | 'hold_expired'
  | 'secret_key_invalid'
  // chat
  | 'chat_signature'
  | 'chat_unknown_user'
  | 'chat_api';

/** Base class of every error slotwright throws; `code` is stable, `cause` keeps the original. */
export class SlotwrightError extends Error {
  readonly code: ErrorCode;
  readonly details: Readonly<Record<string, unknown>> | undefined;

  constructor(
    code: ErrorCode,
    message: string,
    options: { cause?: unknown; details?: Readonly<Record<string, unknown>> } = {},
  ) {
    super(message, options.cause === undefined ? undefined : { cause: options.cause });
    this.name = 'SlotwrightError';
    this.code = code;
    this.details = options.details;
  }
}

/** Turns anything thrown into a SlotwrightError; run it at every edge (CLI, bot, jobs). */
export function normalizeError(error: unknown): SlotwrightError {
  if (error instanceof SlotwrightError) return error;
  if (error instanceof Error) return new SlotwrightError('internal', error.message, { cause: error });
  return new SlotwrightError('internal', String(error), { cause: error });
}

/** One expected failure, tagged by code, pointing at the part of the input it is about. */
export interface Issue {
  readonly code: string;
  readonly path: readonly (string | number)[];
  readonly message: string;
}

/** Result of an operation whose failure is expected and carries issues rather than throwing. */
export type Result<T> =
  | { readonly ok: true; readonly value: T }
  | { readonly ok: false; readonly issues: readonly Issue[] };
