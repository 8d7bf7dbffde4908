import type { BusyInterval, Interval } from './interval.ts';
import { mergeIntervals } from './interval.ts';

/**
 * Turns raw busy stretches into the canonical form: clipped to the window, merged per kind
 * (overlapping or touching), tentative time cut around busy time (busy wins), sorted by start.
 */
export function normalizeBusy(raw: readonly BusyInterval[], window: Interval): BusyInterval[] {
  const clip = (i: Interval): Interval => ({
    start: Math.max(i.start, window.start),
    end: Math.min(i.end, window.end),
  });
  const busy = mergeIntervals(raw.filter((i) => i.kind === 'busy').map(clip));
  const tentative = mergeIntervals(raw.filter((i) => i.kind === 'tentative').map(clip));
  const out: BusyInterval[] = busy.map((i) => ({ start: i.start, end: i.end, kind: 'busy' }));
  let b = 0;
  for (const t of tentative) {
    let start = t.start;
    while (b < busy.length && busy[b]!.end <= start) b++;
    let k = b;
    while (start < t.end) {
      const next = busy[k];
      if (next === undefined || next.start >= t.end) {
        out.push({ start, end: t.end, kind: 'tentative' });
        break;
      }
      if (next.start > start) out.push({ start, end: next.start, kind: 'tentative' });
      start = Math.max(start, next.end);
      k++;
    }
  }
  return out.sort((x, y) => x.start - y.start || x.end - y.end);
}
