import type { Interval } from './interval.ts';

/**
 * A tick grid over a search window: tick `t` covers [origin + t * tickMs, origin + (t + 1) * tickMs).
 * Candidate meeting starts lie on tick boundaries.
 */
export interface Grid {
  /** First tick boundary, in epoch milliseconds; a multiple of `tickMs` since the epoch. */
  readonly origin: number;
  /** Length of one tick in milliseconds. */
  readonly tickMs: number;
  /** Number of whole ticks inside the window. */
  readonly ticks: number;
}

const MINUTE = 60_000;

/**
 * The grid of `minutes`-long ticks over a window. The origin is the first multiple of the tick length
 * (counted from the Unix epoch, so every real zone offset of 15-minute granularity lines up with a
 * 5- or 15-minute grid) at or after the window start; ticks end at or before the window end.
 */
export function makeGrid(window: Interval, minutes: number): Grid {
  if (!Number.isInteger(minutes) || minutes < 1)
    throw new RangeError(`grid minutes must be a whole number >= 1`);
  const tickMs = minutes * MINUTE;
  const origin = Math.ceil(window.start / tickMs) * tickMs;
  const ticks = Math.max(0, Math.floor((window.end - origin) / tickMs));
  return { origin, tickMs, ticks };
}

/** The instant where tick `t` begins. */
export function tickStart(grid: Grid, t: number): number {
  return grid.origin + t * grid.tickMs;
}

/**
 * The ticks an interval touches, as a half-open range [first, end) clamped to the grid; empty when
 * the interval lies outside it. A tick counts as touched if any part of it overlaps the interval.
 */
export function ticksTouched(
  grid: Grid,
  interval: Interval,
): { readonly first: number; readonly end: number } {
  const first = Math.max(0, Math.floor((interval.start - grid.origin) / grid.tickMs));
  const end = Math.min(grid.ticks, Math.ceil((interval.end - grid.origin) / grid.tickMs));
  return end > first ? { first, end } : { first: 0, end: 0 };
}

/**
 * The ticks an interval covers entirely, as a half-open range [first, end) clamped to the grid.
 */
export function ticksCovered(
  grid: Grid,
  interval: Interval,
): { readonly first: number; readonly end: number } {
  const first = Math.max(0, Math.ceil((interval.start - grid.origin) / grid.tickMs));
  const end = Math.min(grid.ticks, Math.floor((interval.end - grid.origin) / grid.tickMs));
  return end > first ? { first, end } : { first: 0, end: 0 };
}
