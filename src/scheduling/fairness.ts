import { Temporal } from 'temporal-polyfill';
import { SlotwrightError } from '../errors.ts';
import type { Interval } from '../time/interval.ts';
import { type WeeklyHours, workingIntervals } from '../time/working-hours.ts';

/** One person's off-hours tally for one ISO week, as the fairness history stores it. */
export interface OffHoursTally {
  readonly person: string;
  /** ISO 8601 week, e.g. `2026-W49`. */
  readonly isoWeek: string;
  /** Sessions placed outside the person's usual hours that week. */
  readonly count: number;
}

/** Whose usual hours a session is measured against. */
export interface UsualHours {
  /** IANA zone of the person. */
  readonly zone: string;
  /** Weekly local hours the person usually works. */
  readonly hours: WeeklyHours;
}

/** A placed session: when, and who attends (person ids). */
export interface AttendedSession extends Interval {
  readonly attendees: readonly string[];
}

/** Options of `offHoursWeights`. */
export interface FairnessWeightOptions {
  /** Weight added per off-hours session a person had beyond the least-burdened person. @default 1 */
  readonly step?: number;
  /** Largest weight, so one long-burdened person cannot swamp every other preference. @default 10 */
  readonly maxWeight?: number;
}

const WEIGHT_DEFAULTS = { step: 1, maxWeight: 10 } satisfies Required<FairnessWeightOptions>;

/** The ISO 8601 week of a calendar date, as `YYYY-Www` (e.g. 2026-12-01 is in `2026-W49`). */
export function isoWeekOf(date: string): string {
  const d = Temporal.PlainDate.from(date);
  return `${d.yearOfWeek}-W${String(d.weekOfYear).padStart(2, '0')}`;
}

/** The Monday (`YYYY-MM-DD`) that starts an ISO week `YYYY-Www`. */
export function mondayOfIsoWeek(isoWeek: string): string {
  const m = /^(\d{4})-W(\d{2})$/.exec(isoWeek);
  if (m === null)
    throw new SlotwrightError('bad_argument', `'${isoWeek}' is not an ISO week such as 2026-W49`);
  // 4 January is always in week 1 (ISO 8601), so week 1 starts on the Monday of that week.
  const jan4 = Temporal.PlainDate.from({ year: Number(m[1]), month: 1, day: 4 });
  const monday = jan4.subtract({ days: jan4.dayOfWeek - 1 }).add({ weeks: Number(m[2]) - 1 });
  if (isoWeekOf(monday.toString()) !== isoWeek)
    throw new SlotwrightError('bad_argument', `${isoWeek} does not exist (that year has 52 weeks)`);
  return monday.toString();
}

/** The `count` ISO weeks before `isoWeek`, oldest first. */
export function weeksBefore(isoWeek: string, count: number): string[] {
  const monday = Temporal.PlainDate.from(mondayOfIsoWeek(isoWeek));
  const out: string[] = [];
  for (let i = count; i >= 1; i--) out.push(isoWeekOf(monday.subtract({ weeks: i }).toString()));
  return out;
}

/** True when the session is not wholly inside the person's usual hours. */
export function isOffHours(session: Interval, usual: UsualHours): boolean {
  const inside = workingIntervals(usual.hours, usual.zone, session).reduce(
    (n, i) => n + (i.end - i.start),
    0,
  );
  return inside < session.end - session.start;
}

/**
 * Counts, per attendee, the sessions placed outside their usual hours. People without known usual hours
 * are left out rather than counted as always off-hours.
 */
export function countOffHours(
  sessions: readonly AttendedSession[],
  usual: Readonly<Record<string, UsualHours>>,
): Map<string, number> {
  const counts = new Map<string, number>();
  for (const s of sessions) {
    for (const person of s.attendees) {
      const u = usual[person];
      if (u === undefined) continue;
      counts.set(person, (counts.get(person) ?? 0) + (isOffHours(s, u) ? 1 : 0));
    }
  }
  return counts;
}

/**
 * Per-person off-hours weights from history: everyone starts at 1, and each off-hours session a person
 * had beyond the least-burdened of `people` adds `step`, up to `maxWeight`. The week plan multiplies a
 * person's off-hours cost by this, so the next inconvenient slot goes to someone who has had fewer.
 * Relative to the least-burdened person (not absolute) so the weights stay small over many weeks.
 */
export function offHoursWeights(
  people: readonly string[],
  history: readonly OffHoursTally[],
  options: FairnessWeightOptions = {},
): Record<string, number> {
  const o = { ...WEIGHT_DEFAULTS, ...options };
  const totals = new Map<string, number>(people.map((p) => [p, 0]));
  for (const h of history) if (totals.has(h.person)) totals.set(h.person, totals.get(h.person)! + h.count);
  const least = Math.min(...totals.values());
  const out: Record<string, number> = {};
  for (const p of people) out[p] = Math.min(o.maxWeight, 1 + o.step * (totals.get(p)! - least));
  return out;
}
