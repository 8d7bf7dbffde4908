import { createHmac, timingSafeEqual } from 'node:crypto';
import type { Result } from '../errors.ts';

/** How old a signed request may be before it is refused, in seconds (replay protection). */
export const SIGNATURE_MAX_AGE_SECONDS = 300;

/** Computes the `v0=` signature the chat platform puts in X-Slack-Signature for a raw body. */
export function signSlackRequest(signingSecret: string, timestamp: string | number, rawBody: string): string {
  const digest = createHmac('sha256', signingSecret).update(`v0:${timestamp}:${rawBody}`).digest('hex');
  return `v0=${digest}`;
}

/** The parts of a request the signature check needs. */
export interface SignedRequestParts {
  /** Value of X-Slack-Signature. */
  readonly signature: string | undefined;
  /** Value of X-Slack-Request-Timestamp (seconds since the epoch). */
  readonly timestamp: string | undefined;
  /** The body exactly as received, before any parsing. */
  readonly rawBody: string;
}

/**
 * Checks a request's signature and age. `nowSeconds` is passed in so the check is testable against
 * published examples; requests older or newer than five minutes are refused to stop replays.
 */
export function verifySlackRequest(
  signingSecret: string,
  parts: SignedRequestParts,
  nowSeconds: number,
): Result<true> {
  const { signature, timestamp, rawBody } = parts;
  if (signature === undefined || timestamp === undefined) {
    return fail('signature_missing', 'the X-Slack-Signature or X-Slack-Request-Timestamp header is missing');
  }
  if (!/^\d{1,12}$/.test(timestamp))
    return fail('timestamp_invalid', 'the request timestamp is not a number');
  if (Math.abs(nowSeconds - Number(timestamp)) > SIGNATURE_MAX_AGE_SECONDS) {
    return fail('timestamp_stale', 'the request timestamp is more than five minutes from now');
  }
  const expected = Buffer.from(signSlackRequest(signingSecret, timestamp, rawBody));
  const given = Buffer.from(signature);
  // Compare in constant time so the signature cannot be guessed byte by byte.
  if (expected.length !== given.length || !timingSafeEqual(expected, given)) {
    return fail('signature_mismatch', 'the request signature does not match its body');
  }
  return { ok: true, value: true };
}

function fail(code: string, message: string): Result<true> {
  return { ok: false, issues: [{ code, path: ['headers'], message }] };
}
