import { UsageError } from './io.ts';

/** Longest length accepted, in minutes (one week): anything longer is surely a typo. */
export const MAX_DURATION_MINUTES = 7 * 24 * 60;

/**
 * Reads a meeting length: `45m`, `1h`, `1h30m`, `2h 15m`, or a bare number of minutes (`90`).
 * Returns whole minutes; anything else is a UsageError that shows the accepted forms.
 */
export function parseDuration(text: string, option = 'length'): number {
  const t = text.trim().toLowerCase();
  const forms = 'use forms like 45m, 1h30m or 90 (minutes)';
  let minutes: number | undefined;
  if (/^\d+$/.test(t)) minutes = Number(t);
  else {
    const m = /^(?:(\d+)\s*h)?\s*(?:(\d+)\s*m(?:in)?)?$/.exec(t);
    if (m !== null && (m[1] !== undefined || m[2] !== undefined))
      minutes = Number(m[1] ?? 0) * 60 + Number(m[2] ?? 0);
  }
  if (minutes === undefined) throw new UsageError(`--${option} '${text}' is not a length; ${forms}`);
  if (minutes <= 0) throw new UsageError(`--${option} must be longer than 0 minutes, got '${text}'`);
  if (minutes > MAX_DURATION_MINUTES)
    throw new UsageError(`--${option} '${text}' is longer than a week; ${forms}`);
  return minutes;
}
