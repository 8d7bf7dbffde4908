import { readFileSync } from 'node:fs';
import { ICalCalendar, ICalCalendarMethod, ICalEventRepeatingFreq, ICalWeekday } from 'ical-generator';
import { Temporal } from 'temporal-polyfill';
import { busyFromIcs } from '../calendar/busy-from-ics.ts';
import { PRODID } from '../calendar/invite.ts';
import { vtimezoneFor } from '../calendar/invite-vtimezone.ts';
import type { Workspace } from '../config/load-workspace.ts';
import type { Result } from '../errors.ts';
import type { RuleEffect } from '../rules/effect.ts';
import { parseRule } from '../rules/parse-rule.ts';
import { ruleEffect } from '../rules/rule-effect.ts';
import { isoWeekOf } from '../scheduling/fairness.ts';
import type { SchedulingContext } from '../scheduling/types.ts';
import {
  type PastSession,
  planWeek,
  type ScoreParts,
  type WeekBlocker,
  type WeekPlan,
  type WeekProgress,
  type WorkspaceWeek,
  workspaceWeek,
} from '../scheduling/week/index.ts';
import type { BusyInterval, Interval } from '../time/interval.ts';
import { addDays, instantToZoned } from '../time/zoned.ts';
import { planWeekOnThreads, type ThreadRun } from './week-threads.ts';

/** One placed session of a workspace week plan. */
export interface PlannedSession {
  readonly series: string;
  /** Epoch ms, UTC. */
  readonly start: number;
  readonly end: number;
  readonly room: string | null;
}

/** A series the plan leaves out, with its blockers in plain words. */
export interface UnplacedView {
  readonly series: string;
  readonly code: string;
  readonly blockers: readonly WeekBlocker[];
  readonly reason: string;
}

/** A workspace's week plan, ready to print, diff or send. */
export interface WorkspaceWeekPlan {
  readonly isoWeek: string;
  readonly sessions: readonly PlannedSession[];
  readonly unplaced: readonly UnplacedView[];
  readonly score: { readonly total: number; readonly parts: ScoreParts };
  readonly complete: boolean;
  readonly violations: number;
  readonly week: WorkspaceWeek;
  readonly plan: WeekPlan;
}

/** Options of planWorkspaceWeek. */
export interface PlanWorkspaceWeekOptions {
  /** ISO week to plan. @default the ISO week after `now` (workspace zone) */
  readonly isoWeek?: string;
  /** Current instant (epoch ms). */
  readonly now: number;
  /** Search time in ms. @default WEEK_SEARCH_MS (5000) */
  readonly timeMs?: number;
  /** Clock in ms for the time budget. */
  readonly clock: () => number;
  /** @default 1 */
  readonly seed?: number;
  /** Last week's plan. @default [] */
  readonly lastWeek?: readonly PastSession[];
  /** Per-person off-hours multipliers (fairness across weeks). @default {} */
  readonly offHoursWeights?: Readonly<Record<string, number>>;
  readonly onProgress?: (p: WeekProgress) => void;
}

const DAY = 86_400_000;

/** Search time of a week plan when none is given, in ms. */
export const WEEK_SEARCH_MS = 5000;

/** The ISO week after the one holding `now`, read in `zone`. */
export function nextIsoWeek(now: number, zone: string): string {
  return isoWeekOf(addDays(instantToZoned(now, zone).date, 7));
}

/**
 * Busy time and rule effects of a workspace over a window, read from its file feeds and rules. Feeds
 * given as URLs are not fetched here; they are listed in `warnings`.
 */
export function weekContext(workspace: Workspace, now: number, window: Interval): SchedulingContext {
  const warnings: string[] = [...workspace.warnings];
  const readBusy = (
    owner: string,
    zone: string,
    feeds: Workspace['people'][number]['feeds'],
    email?: string,
  ) => {
    const busy: BusyInterval[] = [];
    for (const f of feeds) {
      if (f.kind === 'url') {
        warnings.push(`${owner}: feed ${f.ref} is a URL and was not fetched for the week plan`);
        continue;
      }
      let text: string;
      try {
        text = readFileSync(f.path, 'utf8');
      } catch {
        warnings.push(`${owner}: feed ${f.ref} could not be read; their calendar counts as free`);
        continue;
      }
      const r = busyFromIcs(text, { window, zone, ...(email === undefined ? {} : { ownerEmail: email }) });
      busy.push(...r.busy);
      for (const w of r.warnings) warnings.push(`${owner}: ${w}`);
    }
    return busy.sort((a, b) => a.start - b.start);
  };
  const effects = (owner: string, zone: string, rules: readonly string[]): RuleEffect[] => {
    const out: RuleEffect[] = [];
    rules.forEach((text, i) => {
      const parsed = parseRule(text, { zone, now, speaker: owner });
      if (!parsed.ok) {
        warnings.push(`${owner}: rule ${i + 1} ('${text}') was not understood and is left out`);
        return;
      }
      out.push(
        ruleEffect(parsed.rule, { zone, from: window.start, to: window.end, now, id: `${owner}:${i + 1}` }),
      );
    });
    return out;
  };
  return {
    zone: workspace.zone,
    gridMinutes: workspace.grid,
    tentative: workspace.tentative,
    now,
    people: workspace.people.map((p) => ({
      id: p.id,
      zone: p.zone,
      workingHours: p.workingHours,
      ...(p.holidays === undefined ? {} : { holidayRegion: p.holidays }),
      busy: readBusy(p.id, p.zone, p.feeds, p.email),
      rules: effects(p.id, p.zone, p.rules),
    })),
    rooms: workspace.rooms.map((r) => ({
      id: r.id,
      capacity: r.capacity,
      features: r.features,
      zone: r.zone,
      busy: readBusy(r.id, r.zone, r.feeds),
      rules: effects(r.id, r.zone, r.rules).filter((e) => e.strength === 'hard'),
    })),
    groups: workspace.groups.map((g) => ({ id: g.id, members: g.members })),
    warnings,
  };
}

function blockerText(b: WeekBlocker): string {
  switch (b.kind) {
    case 'attendee':
      return `${b.id}'s free time`;
    case 'series':
      return `series ${b.id}`;
    case 'rooms':
      return 'the rooms that fit';
    case 'series-hours':
      return "the series' allowed days and hours";
  }
}

function reasonOf(code: string, blockers: readonly WeekBlocker[]): string {
  const list = blockers.map(blockerText).join(', ');
  if (code === 'no_free_start') return `no common free time for a session: ${list || 'no start fits'}`;
  if (code === 'conflict') return `does not fit together with ${list || 'the other series'}`;
  return 'the search ran out of time before placing it; try more --seconds';
}

/** Plans a workspace's week: its series on the coarse grid, jointly, within the time budget. */
export function planWorkspaceWeek(
  workspace: Workspace,
  context: SchedulingContext,
  options: PlanWorkspaceWeekOptions,
): Result<WorkspaceWeekPlan> {
  const built = buildWorkspaceWeek(workspace, context, options);
  if (!built.ok) return built;
  const { isoWeek, week } = built.value;
  const plan = planWeek(week.request, {
    ...searchOf(options),
    clock: options.clock,
    ...(options.onProgress === undefined ? {} : { onProgress: options.onProgress }),
  });
  return { ok: true, value: workspacePlanOf(isoWeek, week, plan) };
}

/** Options of planWorkspaceWeekOnThreads: those of planWorkspaceWeek, a thread count, no clock. */
export type PlanWorkspaceWeekOnThreadsOptions = Omit<PlanWorkspaceWeekOptions, 'clock' | 'onProgress'> & {
  /** Independent runs, one per worker thread (seeds seed, seed + 1, ...); the best plan is kept. */
  readonly threads: number;
};

/**
 * Plans a workspace's week as `threads` independent runs on worker threads, each with the whole
 * time budget and its own seed, and keeps the best plan (see planWeekOnThreads).
 */
export async function planWorkspaceWeekOnThreads(
  workspace: Workspace,
  context: SchedulingContext,
  options: PlanWorkspaceWeekOnThreadsOptions,
): Promise<Result<WorkspaceWeekPlan & { readonly seed: number; readonly runs: readonly ThreadRun[] }>> {
  const built = buildWorkspaceWeek(workspace, context, options);
  if (!built.ok) return built;
  const { isoWeek, week } = built.value;
  const threaded = await planWeekOnThreads(week.request, {
    threads: options.threads,
    ...searchOf(options),
  });
  return {
    ok: true,
    value: { ...workspacePlanOf(isoWeek, week, threaded.plan), seed: threaded.seed, runs: threaded.runs },
  };
}

/** The search time and seed of a plan, defaults filled in. */
function searchOf(options: Pick<PlanWorkspaceWeekOptions, 'timeMs' | 'seed'>): {
  timeMs: number;
  seed: number;
} {
  return { timeMs: options.timeMs ?? WEEK_SEARCH_MS, seed: options.seed ?? 1 };
}

function buildWorkspaceWeek(
  workspace: Workspace,
  context: SchedulingContext,
  options: Pick<PlanWorkspaceWeekOptions, 'isoWeek' | 'now' | 'lastWeek' | 'offHoursWeights'>,
): Result<{ isoWeek: string; week: WorkspaceWeek }> {
  const isoWeek = options.isoWeek ?? nextIsoWeek(options.now, workspace.zone);
  const built = workspaceWeek({
    context,
    series: workspace.series,
    settings: workspace.weekPlan,
    isoWeek,
    ...(options.lastWeek === undefined ? {} : { lastWeek: options.lastWeek }),
    ...(options.offHoursWeights === undefined ? {} : { offHoursWeights: options.offHoursWeights }),
  });
  return built.ok ? { ok: true, value: { isoWeek, week: built.value } } : built;
}

/** A plan on the grid as the workspace's sessions (instants, in start order) and reasons. */
function workspacePlanOf(isoWeek: string, week: WorkspaceWeek, plan: WeekPlan): WorkspaceWeekPlan {
  const sessions = plan.sessions
    .map((s) => {
      const start = week.request.cells[s.cell]!.start;
      return { series: s.series, start, end: start + week.minutes[s.series]! * 60_000, room: s.room };
    })
    .sort((a, b) => a.start - b.start || a.series.localeCompare(b.series));
  return {
    isoWeek,
    sessions,
    unplaced: plan.unplaced.map((u) => ({ ...u, reason: reasonOf(u.code, u.blockers) })),
    score: plan.score,
    complete: plan.complete,
    violations: plan.violations,
    week,
    plan,
  };
}

/** How one session changed against last week's plan. */
export interface WeekDiffEntry {
  readonly series: string;
  readonly change: 'kept' | 'moved' | 'added' | 'removed';
  /** Last week's session moved onto this week (same local weekday and time). */
  readonly before?: PlannedSession;
  readonly after?: PlannedSession;
}

/**
 * Compares a plan with last week's: a session is kept when last week had one of the same series at
 * the same local weekday, time and room; unmatched ones pair up as moves, the rest are added or removed.
 */
export function diffWeekPlans(
  zone: string,
  lastWeek: readonly PlannedSession[],
  current: readonly PlannedSession[],
): WeekDiffEntry[] {
  const shift = (s: PlannedSession): PlannedSession => {
    const z = Temporal.Instant.fromEpochMilliseconds(s.start).toZonedDateTimeISO(zone).add({ days: 7 });
    return { ...s, start: z.epochMilliseconds, end: z.epochMilliseconds + (s.end - s.start) };
  };
  const out: WeekDiffEntry[] = [];
  const bySeries = new Set([...lastWeek.map((s) => s.series), ...current.map((s) => s.series)]);
  for (const series of [...bySeries].sort()) {
    const before = lastWeek.filter((s) => s.series === series).map(shift);
    const after = current.filter((s) => s.series === series);
    const left = [...before];
    const unmatched: PlannedSession[] = [];
    for (const a of after) {
      const k = left.findIndex((b) => b.start === a.start && b.room === a.room);
      if (k >= 0) {
        out.push({ series, change: 'kept', before: left[k]!, after: a });
        left.splice(k, 1);
      } else unmatched.push(a);
    }
    unmatched.forEach((a, i) => {
      const b = left[i];
      out.push(
        b === undefined
          ? { series, change: 'added', after: a }
          : { series, change: 'moved', before: b, after: a },
      );
    });
    for (const b of left.slice(unmatched.length)) out.push({ series, change: 'removed', before: b });
  }
  return out;
}

const ICAL_DAY: readonly ICalWeekday[] = [
  ICalWeekday.MO,
  ICalWeekday.TU,
  ICalWeekday.WE,
  ICalWeekday.TH,
  ICalWeekday.FR,
  ICalWeekday.SA,
  ICalWeekday.SU,
];

/** Options of weekPlanIcs. */
export interface WeekIcsOptions {
  /** Domain of the UIDs, e.g. `slotwright.saltline.example`. */
  readonly domain: string;
  /** DTSTAMP (epoch ms). */
  readonly stamp: number;
  /** Weeks the RRULE repeats, counting the planned one. @default 1 */
  readonly weeks?: number;
}

/**
 * One iCalendar text per placed series: a VEVENT per distinct local start time and room, repeating
 * weekly (RRULE FREQ=WEEKLY with BYDAY, RFC 5545 section 3.3.10) until the end of the last week,
 * with TZID and VTIMEZONE so the wall time holds across daylight-saving changes.
 */
export function weekPlanIcs(
  workspace: Workspace,
  result: WorkspaceWeekPlan,
  options: WeekIcsOptions,
): Record<string, string> {
  const out: Record<string, string> = {};
  const people = new Map(workspace.people.map((p) => [p.id, p]));
  const rooms = new Map(workspace.rooms.map((r) => [r.id, r]));
  const until = result.week.window.end + ((options.weeks ?? 1) - 1) * 7 * DAY;
  for (const series of workspace.series) {
    const mine = result.sessions.filter((s) => s.series === series.id);
    if (mine.length === 0) continue;
    const zone = series.zone ?? workspace.zone;
    const groups = new Map<string, PlannedSession[]>();
    for (const s of mine) {
      const z = instantToZoned(s.start, zone);
      const key = `${z.minutes}|${s.room ?? ''}`;
      groups.set(key, [...(groups.get(key) ?? []), s]);
    }
    const cal = new ICalCalendar({
      prodId: PRODID,
      method: ICalCalendarMethod.REQUEST,
      timezone: { name: null, generator: (tz) => vtimezoneFor(tz, result.week.window.start, until) },
    });
    const attendees = (result.week.people[series.id] ?? [])
      .map((id) => people.get(id))
      .filter((p) => p?.email !== undefined)
      .map((p) => ({ name: p!.name, email: p!.email! }));
    // RFC 5546 section 3.2.2: a REQUEST names its ORGANIZER; the first admin with an email organizes
    const admin = workspace.admins.map((id) => people.get(id)).find((p) => p?.email !== undefined);
    let k = 0;
    for (const list of groups.values()) {
      const first = list[0]!;
      const zoned = (ms: number) => Temporal.Instant.fromEpochMilliseconds(ms).toZonedDateTimeISO(zone);
      const room = first.room === null ? undefined : rooms.get(first.room);
      cal.createEvent({
        id: `${series.id}-${result.isoWeek}-${k++}@${options.domain}`,
        stamp: new Date(options.stamp),
        summary: series.name,
        timezone: zone,
        start: zoned(first.start),
        end: zoned(first.end),
        attendees,
        ...(admin === undefined ? {} : { organizer: { name: admin.name, email: admin.email! } }),
        ...(room === undefined ? {} : { location: room.name }),
        repeating: {
          freq: ICalEventRepeatingFreq.WEEKLY,
          byDay: [...new Set(list.map((s) => instantToZoned(s.start, zone).weekday))]
            .sort((a, b) => a - b)
            .map((d) => ICAL_DAY[d - 1]!),
          until: new Date(until),
        },
      });
    }
    out[series.id] = cal.toString();
  }
  return out;
}
