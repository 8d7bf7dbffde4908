import type { Issue, Result } from '../errors.ts';
import type { RuleEffect } from '../rules/effect.ts';
import { type Grid, makeGrid, ticksCovered, ticksTouched } from '../time/grid.ts';
import { publicHolidays } from '../time/holidays.ts';
import type { BusyInterval, Interval } from '../time/interval.ts';
import {
  describeWeeklyHours,
  isoWeekday,
  nextDate,
  workingIntervals,
  type ZoneClock,
  zoneClock,
} from '../time/working-hours.ts';
import { andInto, clearRange, emptyBits, fullBits, setRange, slide } from './bits.ts';
import type { MeetRequest, SchedulingContext, SchedulingPerson, SchedulingRoom } from './types.ts';

const MINUTE = 60_000;

/** One hard constraint of one attendee: the starts it allows, and how to name it when it blocks. */
export interface HardLayer {
  /** Constraint group in the model, e.g. "bo:calendar", "bo:rule:r1". */
  readonly group: string;
  readonly owner: string;
  readonly kind: 'calendar' | 'hours' | 'holidays' | 'rule';
  /** Plain words for blockers: "bo's calendar". */
  readonly detail: string;
  /** Starts allowed, one bit per start index. */
  readonly starts: Uint32Array;
}

/** One attendee's bitsets over the grid. */
export interface AttendeeView {
  readonly person: SchedulingPerson;
  readonly required: boolean;
  /** Wall clock of the attendee's zone over the grid. */
  readonly clock: ZoneClock;
  readonly hard: readonly HardLayer[];
  /** Starts every hard layer allows. */
  readonly ok: Uint32Array;
  /** Starts overlapping tentative time (only when tentative time is a penalty). */
  readonly tentative: Uint32Array | null;
  /** Starts against each preference. */
  readonly prefs: readonly { readonly text: string; readonly clash: Uint32Array }[];
  /** Ticks inside working hours, on the grid padded by `padTicks` each side (tick t of the grid is t + pad). */
  readonly workTicks: Uint32Array;
  /** Ticks inside working hours and free of busy time and holidays, on the same padded grid. */
  readonly freeTicks: Uint32Array;
}

/** One room's bitsets. */
export interface RoomView {
  readonly room: SchedulingRoom;
  /** Starts where the room is free for the whole meeting and its hard rules allow it. */
  readonly free: Uint32Array;
}

/** A request turned into bitsets over its tick grid, ready to be modelled, scored and explained. */
export interface Prepared {
  readonly context: SchedulingContext;
  readonly request: MeetRequest;
  readonly grid: Grid;
  /** Start indices 0 .. starts - 1; start s begins at grid.origin + s * grid.tickMs. */
  readonly starts: number;
  /** Meeting length in whole ticks (rounded up). */
  readonly lengthTicks: number;
  readonly lengthMs: number;
  readonly attendees: readonly AttendeeView[];
  /** null when no room is wanted. */
  readonly rooms: readonly RoomView[] | null;
  readonly seats: number;
  readonly needs: readonly string[];
  /** Day number (in the workspace zone) of every start, for spreading options over days. */
  readonly dayOfStart: Int32Array;
  readonly warnings: readonly string[];
}

/** Everything a request names, resolved to people. */
export interface Attendance {
  readonly required: readonly SchedulingPerson[];
  readonly optional: readonly SchedulingPerson[];
}

/** Expands groups and checks every id; unknown ids are issues that say what is known. */
export function resolveAttendees(context: SchedulingContext, request: MeetRequest): Result<Attendance> {
  const people = new Map(context.people.map((p) => [p.id, p]));
  const groups = new Map(context.groups.map((g) => [g.id, g]));
  const rooms = new Set(context.rooms.map((r) => r.id));
  const issues: Issue[] = [];
  const expand = (ids: readonly string[], key: string): SchedulingPerson[] => {
    const out: SchedulingPerson[] = [];
    ids.forEach((id, i) => {
      const p = people.get(id);
      if (p !== undefined) {
        out.push(p);
        return;
      }
      const g = groups.get(id);
      if (g !== undefined) {
        for (const m of g.members) {
          const q = people.get(m);
          if (q !== undefined) out.push(q);
        }
        return;
      }
      issues.push({
        code: rooms.has(id) ? 'room_as_attendee' : 'unknown_attendee',
        path: [key, i],
        message: rooms.has(id)
          ? `'${id}' is a room; ask for a room with seats or needs instead of naming it as an attendee`
          : `'${id}' is neither a person nor a group of this workspace`,
      });
    });
    return out;
  };
  const required = dedupe(expand(request.with, 'with'));
  const requiredIds = new Set(required.map((p) => p.id));
  const optional = dedupe(expand(request.optional ?? [], 'optional')).filter((p) => !requiredIds.has(p.id));
  if (request.with.length === 0)
    issues.push({ code: 'no_attendees', path: ['with'], message: 'name at least one required attendee' });
  if (issues.length > 0) return { ok: false, issues };
  return { ok: true, value: { required, optional } };
}

function dedupe(list: SchedulingPerson[]): SchedulingPerson[] {
  const seen = new Set<string>();
  return list.filter((p) => {
    if (seen.has(p.id)) return false;
    seen.add(p.id);
    return true;
  });
}

/** Ticks of padding (one day) around the grid for the stretches the score reads. */
export function padTicks(grid: Grid): number {
  return Math.ceil(86_400_000 / grid.tickMs);
}

/** Starts whose meeting [s, s + length) touches none of `blocked` (each widened by `pad` ms). */
function startsAvoiding(grid: Grid, len: number, blocked: readonly Interval[], pad = 0): Uint32Array {
  const free = fullBits(grid.ticks);
  for (const b of blocked) {
    const r = ticksTouched(grid, { start: b.start - pad, end: b.end + pad });
    if (r.end > r.first) clearRange(free, r.first, r.end);
  }
  return slide(free, grid.ticks, len);
}

/** Starts whose meeting lies inside one of `inside`. */
function startsInside(grid: Grid, len: number, inside: readonly Interval[]): Uint32Array {
  const ok = emptyBits(grid.ticks);
  for (const i of inside) {
    const r = ticksCovered(grid, i);
    if (r.end > r.first) setRange(ok, r.first, r.end);
  }
  return slide(ok, grid.ticks, len);
}

/** Local days of a zone over the grid, each with the start indices that begin on it. */
function daysOf(
  grid: Grid,
  starts: number,
  clock: ZoneClock,
): { date: string; first: number; end: number; from: number; to: number }[] {
  const out: { date: string; first: number; end: number; from: number; to: number }[] = [];
  const gridEnd = grid.origin + grid.ticks * grid.tickMs;
  let date = clock.dateOf(grid.origin);
  for (;;) {
    const from = clock.toInstant(date, 0);
    if (from >= gridEnd) break;
    const next = nextDate(date);
    const to = clock.toInstant(next, 0);
    const first = Math.max(0, Math.ceil((from - grid.origin) / grid.tickMs));
    const end = Math.min(starts, Math.ceil((to - grid.origin) / grid.tickMs));
    out.push({ date, first, end: Math.max(first, end), from, to });
    date = next;
  }
  return out;
}

/** Starts a rule effect allows for its owner (busy time is theirs, for gaps and daily limits). */
function ruleStarts(
  clocks: (zone: string) => ZoneClock,
  grid: Grid,
  starts: number,
  len: number,
  lengthMs: number,
  effect: RuleEffect,
  busy: readonly BusyInterval[],
): Uint32Array {
  let ok = startsAvoiding(grid, len, effect.avoid);
  if (effect.maxLengthMinutes !== undefined && lengthMs > effect.maxLengthMinutes * MINUTE)
    ok = emptyBits(starts);
  if (effect.gapMinutes !== undefined && effect.gapMinutes > 0) {
    andInto(
      ok,
      startsAvoiding(
        grid,
        len,
        busy.filter((b) => b.kind === 'busy'),
        effect.gapMinutes * MINUTE,
      ),
    );
  }
  const limit = effect.dailyLimit;
  if (limit !== undefined && (limit.maxMeetings !== undefined || limit.maxMinutes !== undefined)) {
    for (const day of daysOf(grid, starts, clocks(limit.zone))) {
      if (limit.weekdays !== undefined && !limit.weekdays.includes(isoWeekday(day.date))) continue;
      let count = 0;
      let minutes = 0;
      // busy stretches are merged, so back-to-back meetings count as one
      for (const b of busy) {
        if (b.kind !== 'busy') continue;
        if (b.start >= day.from && b.start < day.to) count++;
        const overlap = Math.min(b.end, day.to) - Math.max(b.start, day.from);
        if (overlap > 0) minutes += overlap / MINUTE;
      }
      const over =
        (limit.maxMeetings !== undefined && count + 1 > limit.maxMeetings) ||
        (limit.maxMinutes !== undefined && minutes + lengthMs / MINUTE > limit.maxMinutes);
      if (over && day.end > day.first) clearRange(ok, day.first, day.end);
    }
  }
  return ok;
}

function possessive(id: string): string {
  return `${id}'s`;
}

function attendeeView(
  clocks: (zone: string) => ZoneClock,
  context: SchedulingContext,
  grid: Grid,
  starts: number,
  len: number,
  lengthMs: number,
  bufferMs: number,
  person: SchedulingPerson,
  required: boolean,
): AttendeeView {
  const gridWindow = { start: grid.origin, end: grid.origin + grid.ticks * grid.tickMs };
  const hard: HardLayer[] = [];
  const hardBusy = person.busy.filter((b) => b.kind === 'busy' || context.tentative === 'hard');
  hard.push({
    group: `${person.id}:calendar`,
    owner: person.id,
    kind: 'calendar',
    detail:
      bufferMs > 0
        ? `${possessive(person.id)} calendar (with ${bufferMs / MINUTE}-minute buffers)`
        : `${possessive(person.id)} calendar`,
    starts: startsAvoiding(grid, len, hardBusy, bufferMs),
  });
  const work = workingIntervals(person.workingHours, person.zone, gridWindow, clocks(person.zone));
  hard.push({
    group: `${person.id}:hours`,
    owner: person.id,
    kind: 'hours',
    detail: `${possessive(person.id)} working hours (${describeWeeklyHours(person.workingHours)} ${person.zone})`,
    starts: startsInside(grid, len, work),
  });
  const holidays =
    person.holidayRegion === undefined
      ? []
      : publicHolidays(person.holidayRegion, person.zone, gridWindow, clocks(person.zone));
  if (holidays.length > 0) {
    const named = holidays
      .slice(0, 3)
      .map((h) => `${h.date} ${h.name}`)
      .join(', ');
    hard.push({
      group: `${person.id}:holidays`,
      owner: person.id,
      kind: 'holidays',
      detail: `${possessive(person.id)} public holidays (${person.holidayRegion}: ${named}${holidays.length > 3 ? ', ...' : ''})`,
      starts: startsAvoiding(
        grid,
        len,
        holidays.map((h) => h.interval),
      ),
    });
  }
  const prefs: { text: string; clash: Uint32Array }[] = [];
  for (const rule of person.rules) {
    const ok = ruleStarts(clocks, grid, starts, len, lengthMs, rule, person.busy);
    if (rule.strength === 'hard') {
      hard.push({
        group: `${person.id}:rule:${rule.ruleId}`,
        owner: person.id,
        kind: 'rule',
        detail: `${possessive(person.id)} rule: ${rule.text}`,
        starts: ok,
      });
    } else {
      const clash = fullBits(starts);
      for (let i = 0; i < clash.length; i++) clash[i]! &= ~ok[i]!;
      prefs.push({ text: rule.text, clash });
    }
  }
  const all = fullBits(starts);
  for (const h of hard) andInto(all, h.starts);
  let tentative: Uint32Array | null = null;
  const tentativeBusy = person.busy.filter((b) => b.kind === 'tentative');
  if (context.tentative === 'penalty' && tentativeBusy.length > 0) {
    const ok = startsAvoiding(grid, len, tentativeBusy);
    tentative = fullBits(starts);
    for (let i = 0; i < tentative.length; i++) tentative[i]! &= ~ok[i]!;
  }
  // Stretches for the score are read on a grid padded by a day each side, so a window edge is not
  // mistaken for the start or end of someone's day.
  const pad = padTicks(grid);
  const wide: Grid = {
    origin: grid.origin - pad * grid.tickMs,
    tickMs: grid.tickMs,
    ticks: grid.ticks + 2 * pad,
  };
  const wideWindow = { start: wide.origin, end: wide.origin + wide.ticks * wide.tickMs };
  const wideClock = clocks(person.zone); // a zone clock holds two days past its span
  const workTicks = emptyBits(wide.ticks);
  for (const i of workingIntervals(person.workingHours, person.zone, wideWindow, wideClock)) {
    const r = ticksCovered(wide, i);
    if (r.end > r.first) setRange(workTicks, r.first, r.end);
  }
  const wideHolidays =
    person.holidayRegion === undefined
      ? []
      : publicHolidays(person.holidayRegion, person.zone, wideWindow, wideClock);
  const freeTicks = workTicks.slice();
  for (const b of [...person.busy, ...wideHolidays.map((h) => h.interval)]) {
    const r = ticksTouched(wide, b);
    if (r.end > r.first) clearRange(freeTicks, r.first, r.end);
  }
  return {
    person,
    required,
    clock: clocks(person.zone),
    hard,
    ok: all,
    tentative,
    prefs,
    workTicks,
    freeTicks,
  };
}

/** Starts a room can host: free (busy or tentative time both count as taken) and its hard rules allow. */
function roomView(
  clocks: (zone: string) => ZoneClock,
  grid: Grid,
  starts: number,
  len: number,
  lengthMs: number,
  room: SchedulingRoom,
): RoomView {
  const free = startsAvoiding(grid, len, room.busy);
  for (const rule of room.rules) {
    if (rule.strength === 'hard')
      andInto(free, ruleStarts(clocks, grid, starts, len, lengthMs, rule, room.busy));
  }
  return { room, free };
}

/** Options of prepare. */
export interface PrepareOptions {
  /** Search to this instant instead of the request's window end (for "widen the window"). @default request.window.end */
  readonly windowEnd?: number;
  /** Use this length instead of the request's (for "shorten"). @default request.lengthMinutes */
  readonly lengthMinutes?: number;
}

/**
 * Turns a request into bitsets: a tick grid from max(window start, now) to the window end, each
 * attendee's hard layers as allowed starts, each room's free starts. Returns issues for unknown ids
 * and impossible numbers.
 */
export function prepare(
  context: SchedulingContext,
  request: MeetRequest,
  options: PrepareOptions = {},
): Result<Prepared> {
  const resolved = resolveAttendees(context, request);
  if (!resolved.ok) return resolved;
  const lengthMinutes = options.lengthMinutes ?? request.lengthMinutes;
  const issues: Issue[] = [];
  if (!Number.isInteger(lengthMinutes) || lengthMinutes < 1)
    issues.push({
      code: 'bad_length',
      path: ['lengthMinutes'],
      message: 'the length is a whole number of minutes, at least 1',
    });
  if (request.window.end <= request.window.start)
    issues.push({ code: 'bad_window', path: ['window'], message: 'the window must end after it starts' });
  const buffer = request.bufferMinutes ?? 0;
  if (!Number.isInteger(buffer) || buffer < 0)
    issues.push({
      code: 'bad_buffer',
      path: ['bufferMinutes'],
      message: 'the buffer is a whole number of minutes, 0 or more',
    });
  if (request.seats !== undefined && (!Number.isInteger(request.seats) || request.seats < 1))
    issues.push({ code: 'bad_seats', path: ['seats'], message: 'seats is a whole number, at least 1' });
  if (issues.length > 0) return { ok: false, issues };
  const warnings: string[] = [...(context.warnings ?? [])];
  const start = Math.max(request.window.start, context.now);
  const end = options.windowEnd ?? request.window.end;
  const grid = makeGrid({ start, end: Math.max(start, end) }, context.gridMinutes);
  const lengthMs = lengthMinutes * MINUTE;
  // one wall clock per zone, shared by everyone in it
  const span = { start: grid.origin, end: grid.origin + grid.ticks * grid.tickMs };
  const clockCache = new Map<string, ZoneClock>();
  const clocks = (zone: string): ZoneClock => {
    let c = clockCache.get(zone);
    if (c === undefined) {
      c = zoneClock(zone, span);
      clockCache.set(zone, c);
    }
    return c;
  };
  const lengthTicks = Math.ceil(lengthMs / grid.tickMs);
  const starts = Math.max(0, grid.ticks - lengthTicks + 1);
  const attendees = [
    ...resolved.value.required.map((p) =>
      attendeeView(clocks, context, grid, starts, lengthTicks, lengthMs, buffer * MINUTE, p, true),
    ),
    ...resolved.value.optional.map((p) =>
      attendeeView(clocks, context, grid, starts, lengthTicks, lengthMs, buffer * MINUTE, p, false),
    ),
  ];
  const needs = [...new Set(request.needs ?? [])];
  const wantsRoom = request.seats !== undefined || needs.length > 0;
  const rooms = wantsRoom
    ? context.rooms.map((r) => roomView(clocks, grid, starts, lengthTicks, lengthMs, r))
    : null;
  const dayOfStart = new Int32Array(starts);
  daysOf(grid, starts, clocks(context.zone)).forEach((d, i) => {
    dayOfStart.fill(i, d.first, d.end);
  });
  return {
    ok: true,
    value: {
      context,
      request,
      grid,
      starts,
      lengthTicks,
      lengthMs,
      attendees,
      rooms,
      seats: request.seats ?? attendees.length,
      needs,
      dayOfStart,
      warnings,
    },
  };
}
