import { SlotwrightError } from '../errors.ts';
import { type Interval, mergeIntervals } from '../time/interval.ts';
import { addDays, instantToZoned, zonedToInstant } from '../time/zoned.ts';
import type { RuleEffect, RuleStrength } from './effect.ts';

/**
 * Caution shown wherever rest between days is configured. Working-time and rest rules differ by
 * country and contract; slotwright only helps keep a chosen minimum and gives no legal advice.
 */
export const REST_CAUTION =
  'Rest between days is a scheduling aid, not legal advice. Working-time and rest rules differ by ' +
  'country, sector and contract (for example, the EU working-time directive 2003/88/EC sets 11 ' +
  'consecutive hours of daily rest); follow local law and company policy, and ask a qualified ' +
  'adviser when in doubt.';

/** Options of `restEffect` and `restBreaches`. */
export interface RestOptions {
  /** IANA zone whose calendar days separate "one day" from "the next" (the person's own zone). */
  readonly zone: string;
  /** Minimum hours between the last meeting of a day and the first of the next day. */
  readonly hours: number;
  /** Start of the search window, UTC epoch ms; avoid-intervals are clipped to [from, to). */
  readonly from: number;
  /** End of the search window, UTC epoch ms. */
  readonly to: number;
  /** Rule id carried into explanations. @default 'rest-between-days' */
  readonly ruleId?: string;
  /** Hard rule or preference. @default 'hard' */
  readonly strength?: RuleStrength;
  /**
   * Busy stretches longer than this are not meetings (all-day leave, blocked days) and do not start
   * or end a working day. @default 720
   */
  readonly maxMeetingMinutes?: number;
}

const DEFAULTS = {
  ruleId: 'rest-between-days',
  strength: 'hard',
  maxMeetingMinutes: 720,
} satisfies Required<Pick<RestOptions, 'ruleId' | 'strength' | 'maxMeetingMinutes'>>;

/** First start and last end of the meetings that start on each local date. */
interface DaySpan {
  readonly firstStart: number;
  readonly lastEnd: number;
}

function daySpans(
  busy: readonly Interval[],
  zone: string,
  maxMeetingMinutes: number,
): Map<string, { firstStart: number; lastEnd: number }> {
  const spans = new Map<string, { firstStart: number; lastEnd: number }>();
  for (const b of busy) {
    if (b.end <= b.start || b.end - b.start > maxMeetingMinutes * 60_000) continue;
    const date = instantToZoned(b.start, zone).date;
    const s = spans.get(date);
    if (s === undefined) spans.set(date, { firstStart: b.start, lastEnd: b.end });
    else {
      if (b.start < s.firstStart) s.firstStart = b.start;
      if (b.end > s.lastEnd) s.lastEnd = b.end;
    }
  }
  return spans;
}

function checkOptions(options: RestOptions): void {
  if (!Number.isFinite(options.hours) || options.hours <= 0 || options.hours > 24) {
    throw new SlotwrightError(
      'bad_argument',
      `rest between days takes more than 0 and at most 24 hours, got ${options.hours}; set e.g. hours: 11`,
    );
  }
  if (!(options.to > options.from))
    throw new SlotwrightError('bad_argument', 'the rest window must end after it starts');
}

/**
 * The rest-between-days rule as a RuleEffect: avoid-intervals that keep at least `hours` between a
 * person's last meeting of one local day and their first meeting of the next, computed from busy time.
 * Both directions are covered: a new meeting on day D+1 may not start within `hours` after the last
 * meeting of day D, and a new meeting on day D may not end within `hours` before the first meeting
 * of day D+1. Meetings on the same day are left alone (that is the gap rule's job).
 */
export function restEffect(busy: readonly Interval[], options: RestOptions): RuleEffect {
  checkOptions(options);
  const o = { ...DEFAULTS, ...options };
  const restMs = o.hours * 3_600_000;
  const spans = daySpans(busy, o.zone, o.maxMeetingMinutes);
  const avoid: Interval[] = [];
  // Days reach back and forward by one so a meeting just outside the window still casts its rest.
  const first = addDays(instantToZoned(o.from, o.zone).date, -1);
  const last = addDays(instantToZoned(o.to, o.zone).date, 1);
  for (let d = first; d <= last; d = addDays(d, 1)) {
    const next = addDays(d, 1);
    const nextStart = zonedToInstant(next, 0, o.zone);
    const today: DaySpan | undefined = spans.get(d);
    const tomorrow: DaySpan | undefined = spans.get(next);
    // After the last meeting of d: a meeting starting on d+1 within the rest would open d+1 too soon.
    if (today !== undefined) {
      avoid.push({ start: Math.max(today.lastEnd, nextStart), end: today.lastEnd + restMs });
    }
    // Before the first meeting of d+1: a meeting starting on d may not run into the rest before it.
    if (tomorrow !== undefined) {
      avoid.push({ start: tomorrow.firstStart - restMs, end: Math.min(tomorrow.firstStart, nextStart) });
    }
  }
  const clipped = avoid
    .map((i) => ({ start: Math.max(i.start, o.from), end: Math.min(i.end, o.to) }))
    .filter((i) => i.end > i.start);
  return {
    ruleId: o.ruleId,
    text: `at least ${o.hours} hours of rest between the last meeting of a day and the first of the next (days in ${o.zone})`,
    strength: o.strength,
    avoid: mergeIntervals(clipped),
  };
}

/** One pair of consecutive days with too little rest between them. */
export interface RestBreach {
  /** Local date of the earlier day. */
  readonly date: string;
  /** End of that day's last meeting, UTC epoch ms. */
  readonly lastEnd: number;
  /** Start of the next day's first meeting, UTC epoch ms. */
  readonly nextStart: number;
  /** Rest actually left, in minutes. */
  readonly restMinutes: number;
}

/**
 * Checks a person's full set of meetings (existing plus planned) and lists the consecutive local days
 * whose rest is shorter than `hours`. Used to verify a whole week plan after it is placed.
 */
export function restBreaches(
  meetings: readonly Interval[],
  options: Pick<RestOptions, 'zone' | 'hours' | 'maxMeetingMinutes'>,
): RestBreach[] {
  const spans = daySpans(meetings, options.zone, options.maxMeetingMinutes ?? DEFAULTS.maxMeetingMinutes);
  const out: RestBreach[] = [];
  for (const date of [...spans.keys()].sort()) {
    const today = spans.get(date)!;
    const tomorrow = spans.get(addDays(date, 1));
    if (tomorrow === undefined) continue;
    const restMinutes = (tomorrow.firstStart - today.lastEnd) / 60_000;
    if (restMinutes < options.hours * 60) {
      out.push({ date, lastEnd: today.lastEnd, nextStart: tomorrow.firstStart, restMinutes });
    }
  }
  return out;
}
