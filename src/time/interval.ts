/** A half-open range of UTC instants [start, end) in epoch milliseconds. */
export interface Interval {
  readonly start: number;
  readonly end: number;
}

/** How occupied a stretch of busy time is. */
export type BusyKind = 'busy' | 'tentative';

/** One merged stretch of someone's busy time. */
export interface BusyInterval extends Interval {
  readonly kind: BusyKind;
}

/**
 * Sorts intervals and merges those that overlap or touch. Input is not modified.
 */
export function mergeIntervals<T extends Interval>(intervals: readonly T[]): Interval[] {
  const sorted = [...intervals]
    .filter((i) => i.end > i.start)
    .sort((a, b) => a.start - b.start || a.end - b.end);
  const out: { start: number; end: number }[] = [];
  for (const i of sorted) {
    const last = out[out.length - 1];
    if (last !== undefined && i.start <= last.end) {
      if (i.end > last.end) last.end = i.end;
    } else {
      out.push({ start: i.start, end: i.end });
    }
  }
  return out;
}
