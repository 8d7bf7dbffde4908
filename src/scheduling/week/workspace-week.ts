import type { SeriesConfig, WeekPlanSettings } from '../../config/series-schema.ts';
import type { Issue, Result } from '../../errors.ts';
import type { Interval } from '../../time/interval.ts';
import { WEEKDAY_KEYS, workingIntervals } from '../../time/working-hours.ts';
import { addDays, instantToZoned, weekdayOf, zonedToInstant } from '../../time/zoned.ts';
import { hasBit } from '../bits.ts';
import { mondayOfIsoWeek } from '../fairness.ts';
import { prepare } from '../prepare.ts';
import type { SchedulingContext } from '../types.ts';
import type { PlacedSession, WeekAttendee, WeekRequest, WeekSeries } from './week-request.ts';

const MINUTE = 60_000;

/** A session of an earlier plan, in instants. */
export interface PastSession {
  readonly series: string;
  /** Epoch ms, UTC. */
  readonly start: number;
  readonly room: string | null;
}

/** What the week plan of a workspace is made from. */
export interface WorkspaceWeekInput {
  /** People and rooms with busy time and rule effects over at least the week, and `now`. */
  readonly context: SchedulingContext;
  readonly series: readonly SeriesConfig[];
  readonly settings: WeekPlanSettings;
  /** ISO week, e.g. `2026-W50`. */
  readonly isoWeek: string;
  /** Last week's plan; each session is compared with the same local weekday and time this week. */
  readonly lastWeek?: readonly PastSession[];
  /** Per-person multiplier of the off-hours cost (fairness across weeks). @default 1 each */
  readonly offHoursWeights?: Readonly<Record<string, number>>;
}

/** The week's request, with the facts needed to turn a plan back into instants. */
export interface WorkspaceWeek {
  readonly request: WeekRequest;
  readonly isoWeek: string;
  /** Local dates (workspace zone) of the plan days, Monday first. */
  readonly dates: readonly string[];
  /** Week start and end (Monday 00:00 to next Monday 00:00, workspace zone). */
  readonly window: Interval;
  /** Session length of each series in minutes, by series id. */
  readonly minutes: Readonly<Record<string, number>>;
  /** Person ids attending each series (groups expanded), by series id. */
  readonly people: Readonly<Record<string, readonly string[]>>;
}

function minutesOf(hhmm: string): number {
  return Number(hhmm.slice(0, 2)) * 60 + Number(hhmm.slice(3, 5));
}

/** True when local [from, to) minutes of one day lies inside one of the ranges ("HH:MM-HH:MM"). */
function insideRanges(from: number, to: number, ranges: readonly string[]): boolean {
  return ranges.some((r) => {
    const [a, b] = r.split('-') as [string, string];
    return from >= minutesOf(a) && to <= minutesOf(b);
  });
}

/**
 * Turns a workspace's series into a week-plan request over a coarse grid (`settings.step` minutes):
 * each person's free cells come from the scheduling layer's own availability (busy time, working
 * hours, public holidays, hard rules), their preference rules and tentative time become costs, rooms
 * keep their busy time. Unknown attendee ids are issues.
 */
export function workspaceWeek(input: WorkspaceWeekInput): Result<WorkspaceWeek> {
  const { context, settings } = input;
  const zone = context.zone;
  const step = settings.step;
  const issues: Issue[] = [];
  if (step % context.gridMinutes !== 0)
    issues.push({
      code: 'bad_step',
      path: ['weekPlan', 'step'],
      message: `the week-plan step (${step} minutes) must be a multiple of the workspace grid (${context.gridMinutes} minutes)`,
    });
  let monday: string;
  try {
    monday = mondayOfIsoWeek(input.isoWeek);
  } catch (error) {
    return {
      ok: false,
      issues: [
        { code: 'bad_week', path: ['week'], message: error instanceof Error ? error.message : String(error) },
      ],
    };
  }
  const dates = Array.from({ length: 7 }, (_, i) => addDays(monday, i));
  const window = { start: zonedToInstant(monday, 0, zone), end: zonedToInstant(addDays(monday, 7), 0, zone) };
  const cells: { start: number; end: number; day: number }[] = [];
  for (let t = window.start; t + step * MINUTE <= window.end; t += step * MINUTE) {
    const day = dates.indexOf(instantToZoned(t, zone).date);
    cells.push({ start: t, end: t + step * MINUTE, day: Math.max(0, day) });
  }
  const C = cells.length;

  // attendees: every person, then groups that opt in to compactness
  const people = context.people;
  const personIndex = new Map(people.map((p, i) => [p.id, i]));
  const groups = new Map(context.groups.map((g) => [g.id, g]));
  const compact = new Set(settings.compact);
  for (const [i, id] of settings.compact.entries())
    if (!personIndex.has(id) && !groups.has(id))
      issues.push({
        code: 'unknown_attendee',
        path: ['weekPlan', 'compact', i],
        message: `'${id}' is neither a person nor a group of the workspace`,
      });
  const attendees: WeekAttendee[] = [];
  const wantsRooms = context.rooms.length > 0;
  let roomFree: boolean[][] = context.rooms.map(() => new Array<boolean>(C).fill(false));
  if (people.length > 0) {
    const prepared = prepare(context, {
      with: people.map((p) => p.id),
      lengthMinutes: step,
      window,
      ...(wantsRooms ? { seats: 1 } : {}),
    });
    if (!prepared.ok) return prepared;
    const pr = prepared.value;
    const tickOf = (cell: number): number => {
      const t = (cells[cell]!.start - pr.grid.origin) / pr.grid.tickMs;
      return Number.isInteger(t) && t >= 0 && t < pr.starts ? t : -1;
    };
    const ticks = cells.map((_, c) => tickOf(c));
    const at = (bits: Uint32Array, c: number) => ticks[c]! >= 0 && hasBit(bits, ticks[c]!);
    pr.attendees.forEach((view) => {
      const person = view.person;
      const usual: Interval[] = workingIntervals(person.workingHours, person.zone, window)
        .map((w) => ({
          start: w.start + settings.usualEdgeMinutes * MINUTE,
          end: w.end - settings.usualEdgeMinutes * MINUTE,
        }))
        .filter((w) => w.end > w.start);
      attendees.push({
        id: person.id,
        free: cells.map((_, c) => at(view.ok, c)),
        compact: compact.has(person.id),
        offHours: cells.map((cell) => {
          let inside = 0;
          for (const u of usual)
            inside += Math.max(0, Math.min(u.end, cell.end) - Math.max(u.start, cell.start));
          return 1 - inside / (cell.end - cell.start);
        }),
        offHoursWeight: input.offHoursWeights?.[person.id] ?? 1,
        ruleCost: cells.map((_, c) => {
          let n = 0;
          for (const p of view.prefs) if (at(p.clash, c)) n++;
          if (view.tentative !== null && at(view.tentative, c)) n++;
          return n;
        }),
      });
    });
    if (pr.rooms !== null) roomFree = pr.rooms.map((r) => cells.map((_, c) => at(r.free, c)));
  }
  const groupAttendee = new Map<string, number>();
  for (const g of context.groups)
    if (compact.has(g.id)) {
      groupAttendee.set(g.id, attendees.length);
      attendees.push({ id: g.id, compact: true });
    }

  const minutes: Record<string, number> = {};
  const peopleOf: Record<string, string[]> = {};
  const series: WeekSeries[] = [];
  input.series.forEach((s, si) => {
    const members = new Set<number>();
    const extra = new Set<number>();
    s.attendees.forEach((id, ai) => {
      const p = personIndex.get(id);
      if (p !== undefined) {
        members.add(p);
        return;
      }
      const g = groups.get(id);
      if (g === undefined) {
        issues.push({
          code: 'unknown_attendee',
          path: ['series', si, 'attendees', ai],
          message: `series '${s.id}' names '${id}', who is neither a person nor a group; add them or fix the id`,
        });
        return;
      }
      for (const m of g.members) {
        const mi = personIndex.get(m);
        if (mi !== undefined) members.add(mi);
      }
      const ga = groupAttendee.get(id);
      if (ga !== undefined) extra.add(ga);
    });
    const roomIds = new Set(context.rooms.map((r) => r.id));
    s.room?.only?.forEach((id, k) => {
      if (!roomIds.has(id))
        issues.push({
          code: 'unknown_room',
          path: ['series', si, 'room', 'only', k],
          message: `series '${s.id}' names room '${id}', which is not under rooms:; add it or fix the id`,
        });
    });
    const length = Math.ceil(s.minutes / step);
    const seriesZone = s.zone ?? zone;
    const allowed: boolean[] = [];
    const preferredStarts: boolean[] = [];
    for (let c = 0; c < C; c++) {
      const from = instantToZoned(cells[c]!.start, seriesZone);
      const endAt = cells[c]!.start + s.minutes * MINUTE;
      const to = instantToZoned(endAt - 1, seriesZone);
      const sameDay = to.date === from.date;
      const end = to.minutes + 1;
      const key = WEEKDAY_KEYS[from.weekday - 1]!;
      let ok = s.days === undefined || s.days.includes(key);
      if (ok && s.hours !== undefined) ok = sameDay && insideRanges(from.minutes, end, s.hours);
      allowed.push(ok);
      preferredStarts.push(
        s.preferredHours === undefined || (sameDay && insideRanges(from.minutes, end, s.preferredHours)),
      );
    }
    const memberList = [...members];
    minutes[s.id] = s.minutes;
    peopleOf[s.id] = memberList.map((m) => people[m]!.id);
    series.push({
      id: s.id,
      attendees: [...memberList, ...extra],
      sessions: s.sessions,
      minDays: s.minDays ?? s.sessions,
      length,
      allowed,
      ...(s.preferredDays === undefined
        ? {}
        : { preferredDays: dates.map((d) => s.preferredDays!.includes(WEEKDAY_KEYS[weekdayOf(d) - 1]!)) }),
      ...(s.preferredHours === undefined ? {} : { preferredStarts }),
      ...(s.room === undefined
        ? {}
        : {
            room: {
              seats: s.room.seats ?? Math.max(1, memberList.length),
              features: s.room.features,
              ...(s.room.only === undefined ? {} : { only: s.room.only }),
            },
          }),
      ...(s.weights === undefined ? {} : { weights: stripUndefined(s.weights) }),
    });
  });
  if (issues.length > 0) return { ok: false, issues };

  // last week's sessions, moved onto the same local weekday and time of this week
  const lastWeek: PlacedSession[] = (input.lastWeek ?? []).map((p) => {
    const z = instantToZoned(p.start, zone);
    const t = zonedToInstant(addDays(z.date, 7), z.minutes, zone);
    const cell = cells.findIndex((c) => c.start === t);
    return { series: p.series, cell, room: p.room };
  });
  const request: WeekRequest = {
    cells,
    days: 7,
    rooms: context.rooms.map((r, i) => ({
      id: r.id,
      seats: r.capacity,
      features: r.features,
      free: roomFree[i]!,
    })),
    attendees,
    series,
    weights: { ...settings.weights, rules: 1 },
    seatsHard: settings.seatsHard,
    ...(lastWeek.length > 0 ? { lastWeek } : {}),
  };
  return { ok: true, value: { request, isoWeek: input.isoWeek, dates, window, minutes, people: peopleOf } };
}

function stripUndefined<T extends object>(o: T): { [K in keyof T]: Exclude<T[K], undefined> } {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as never;
}
