import { type Interval, mergeIntervals } from '../time/interval.ts';

/** Intervals clipped to [from, to), merged. */
export function clip(intervals: readonly Interval[], from: number, to: number): Interval[] {
  return mergeIntervals(
    intervals
      .map((i) => ({ start: Math.max(i.start, from), end: Math.min(i.end, to) }))
      .filter((i) => i.end > i.start),
  );
}

/** The parts of [from, to) not covered by `intervals`. */
export function complement(intervals: readonly Interval[], from: number, to: number): Interval[] {
  const out: Interval[] = [];
  let cursor = from;
  for (const i of clip(intervals, from, to)) {
    if (i.start > cursor) out.push({ start: cursor, end: i.start });
    cursor = Math.max(cursor, i.end);
  }
  if (cursor < to) out.push({ start: cursor, end: to });
  return out;
}

/** Where two merged interval lists overlap. */
export function intersect(a: readonly Interval[], b: readonly Interval[]): Interval[] {
  const out: Interval[] = [];
  const x = mergeIntervals(a);
  const y = mergeIntervals(b);
  let i = 0;
  let j = 0;
  while (i < x.length && j < y.length) {
    const p = x[i]!;
    const q = y[j]!;
    const start = Math.max(p.start, q.start);
    const end = Math.min(p.end, q.end);
    if (end > start) out.push({ start, end });
    if (p.end < q.end) i++;
    else j++;
  }
  return out;
}

/** Total length of merged intervals. */
export function totalLength(intervals: readonly Interval[]): number {
  return mergeIntervals(intervals).reduce((n, i) => n + (i.end - i.start), 0);
}
