import { type Model, ModelBuilder } from '../../solver/index.ts';
import type { WeekSpace } from './week-space.ts';

/** A solver model over some series of a week, with the map from variables back to sessions. */
export interface WeekModel {
  readonly model: Model;
  /** Session index of each model variable (a session may own two: its start and its start x room). */
  readonly sessions: Int32Array;
  /** Per variable: true when its value is a start cell, false when it is start cell x room slot. */
  readonly isStart: Uint8Array;
  /** Series in the model. */
  readonly series: readonly number[];
}

/** Constraint group of the no-overlap rules between two series (or within one when a === b). */
export function pairGroup(space: WeekSpace, a: number, b: number): string {
  const ids = space.request.series;
  const [x, y] = a <= b ? [a, b] : [b, a];
  return x === y ? `self:${ids[x]!.id}` : `with:${ids[x]!.id}+${ids[y]!.id}`;
}

/** Constraint group of the room rules. */
export const ROOM_GROUP = 'rooms';
/** Constraint group tying a session's start to its start x room (never blamed). */
export const CHANNEL_GROUP = 'channel';

/** Per series, the cells any of its candidate sessions covers, as a bitset: series whose sets miss each other never overlap. */
function coveredCells(space: WeekSpace, series: readonly number[]): Map<number, Uint32Array> {
  const C = space.request.cells.length;
  const out = new Map<number, Uint32Array>();
  for (const s of series) {
    const bits = new Uint32Array((C + 31) >>> 5);
    const len = space.request.series[s]!.length;
    let last = -1;
    for (const v of space.candidates[s]!) {
      const c = space.cellOf(v);
      if (c === last) continue;
      last = c;
      for (let k = 0; k < len; k++) bits[(c + k) >>> 5]! |= 1 << ((c + k) & 31);
    }
    out.set(s, bits);
  }
  return out;
}

function meet(a: Uint32Array, b: Uint32Array): boolean {
  for (let i = 0; i < a.length; i++) if ((a[i]! & b[i]!) !== 0) return true;
  return false;
}

/** For each attendee, the sessions (of the given series) they attend. */
function sessionsByAttendee(space: WeekSpace, series: readonly number[]): number[][] {
  const req = space.request;
  const out: number[][] = req.attendees.map(() => []);
  for (const s of series)
    for (let i = space.seriesFirst[s]!; i < space.seriesFirst[s + 1]!; i++)
      for (const a of new Set(req.series[s]!.attendees)) out[a]!.push(i);
  return out;
}

/** Pairs of sessions that may not overlap: same series or a shared attendee; each pair once. */
function clashPairs(space: WeekSpace, series: readonly number[]): [number, number][] {
  const n = space.sessionCount;
  const covered = coveredCells(space, series);
  const seen = new Set<number>();
  const out: [number, number][] = [];
  const add = (i: number, j: number) => {
    const [x, y] = i < j ? [i, j] : [j, i];
    const key = x * n + y;
    if (seen.has(key)) return;
    seen.add(key);
    const sx = space.sessionSeries[x]!;
    const sy = space.sessionSeries[y]!;
    if (sx !== sy && !meet(covered.get(sx)!, covered.get(sy)!)) return;
    out.push([x, y]);
  };
  for (const s of series)
    for (let i = space.seriesFirst[s]!; i < space.seriesFirst[s + 1]!; i++)
      for (let j = i + 1; j < space.seriesFirst[s + 1]!; j++) add(i, j);
  for (const list of sessionsByAttendee(space, series))
    for (let x = 0; x < list.length; x++) for (let y = x + 1; y < list.length; y++) add(list[x]!, list[y]!);
  return out;
}

/** Pairs of room-needing sessions whose possible rooms meet. */
function roomPairs(space: WeekSpace, series: readonly number[]): [number, number][] {
  const req = space.request;
  const withRoom = series.filter((s) => req.series[s]!.room !== undefined);
  const sets = new Map(withRoom.map((s) => [s, new Set(space.roomsFor(s))]));
  const covered = coveredCells(space, withRoom);
  const out: [number, number][] = [];
  for (let x = 0; x < withRoom.length; x++)
    for (let y = x + 1; y < withRoom.length; y++) {
      // sessions of one series never overlap in time, so they never share a room at once
      const a = withRoom[x]!;
      const b = withRoom[y]!;
      const sb = sets.get(b)!;
      if (![...sets.get(a)!].some((r) => sb.has(r)) || !meet(covered.get(a)!, covered.get(b)!)) continue;
      for (let i = space.seriesFirst[a]!; i < space.seriesFirst[a + 1]!; i++)
        for (let j = space.seriesFirst[b]!; j < space.seriesFirst[b + 1]!; j++) out.push([i, j]);
    }
  return out;
}

/**
 * Adds "no overlap" between two sessions as not-equal constraints with offsets, the engine's fast
 * path: sessions of lengths li and lj overlap exactly when y - x is in (-lj, li), in units of `unit`.
 */
function addNoOverlap(
  b: ModelBuilder,
  x: number,
  y: number,
  li: number,
  lj: number,
  unit: number,
  meta: { name: string },
): void {
  for (let k = -(lj - 1); k <= li - 1; k++) b.addNotEqualOffset(x, y, k * unit, meta);
}

/**
 * Builds the hard layer for construction: each session has a start variable (cells), and a
 * start x room variable when it needs a room, tied by a channel constraint. Sessions that share an
 * attendee or a series may not overlap (not-equal with offsets on the starts); two sessions in one
 * room may not overlap (all-different, or not-equal with offsets, on start x room).
 */
export function buildPlaceModel(space: WeekSpace, series: readonly number[]): WeekModel {
  const req = space.request;
  const RS = space.roomSlots;
  const C = req.cells.length;
  const b = new ModelBuilder();
  const sessions: number[] = [];
  const isStart: number[] = [];
  const startVar = new Int32Array(space.sessionCount).fill(-1);
  const roomVar = new Int32Array(space.sessionCount).fill(-1);
  const channel = (t: number, v: number): boolean => Math.floor(v / RS) === t;
  for (const s of series) {
    const ser = req.series[s]!;
    const cand = space.candidates[s]!;
    const starts = new Set<number>();
    for (const v of cand) starts.add(Math.floor(v / RS));
    for (let i = space.seriesFirst[s]!; i < space.seriesFirst[s + 1]!; i++) {
      const k = i - space.seriesFirst[s]!;
      startVar[i] = b.addVariable(`${ser.id}#${k}`, C, starts);
      sessions.push(i);
      isStart.push(1);
      if (ser.room !== undefined) {
        roomVar[i] = b.addVariable(`${ser.id}#${k}@room`, C * RS, cand);
        sessions.push(i);
        isStart.push(0);
        b.addBinary(startVar[i]!, roomVar[i]!, channel, { name: CHANNEL_GROUP });
      }
    }
  }
  const lengthOf = (i: number): number => req.series[space.sessionSeries[i]!]!.length;
  for (const [i, j] of clashPairs(space, series))
    addNoOverlap(b, startVar[i]!, startVar[j]!, lengthOf(i), lengthOf(j), 1, {
      name: pairGroup(space, space.sessionSeries[i]!, space.sessionSeries[j]!),
    });
  addRoomRules(b, space, series, roomVar);
  return { model: b.build(), sessions: Int32Array.from(sessions), isStart: Uint8Array.from(isStart), series };
}

function addRoomRules(
  b: ModelBuilder,
  space: WeekSpace,
  series: readonly number[],
  roomVar: Int32Array,
): void {
  const req = space.request;
  const lengthOf = (i: number): number => req.series[space.sessionSeries[i]!]!.length;
  const roomSessions: number[] = [];
  for (const s of series)
    if (req.series[s]!.room !== undefined)
      for (let i = space.seriesFirst[s]!; i < space.seriesFirst[s + 1]!; i++) roomSessions.push(i);
  if (roomSessions.length < 2) return;
  if (roomSessions.every((i) => lengthOf(i) === 1)) {
    // one (cell, room) value per session: taken at most once
    b.addAllDifferent(
      roomSessions.map((i) => roomVar[i]!),
      { name: ROOM_GROUP },
    );
    return;
  }
  for (const [i, j] of roomPairs(space, series))
    addNoOverlap(b, roomVar[i]!, roomVar[j]!, lengthOf(i), lengthOf(j), space.roomSlots, {
      name: ROOM_GROUP,
    });
}

/**
 * Builds the model the local search moves in: one start x room variable per session (room slot
 * "none" for sessions without a room). Sessions sharing an attendee or a series may not overlap
 * (a predicate on the two values: the engine's local search evaluates it directly); two sessions in
 * one room may not overlap (not-equal with offsets).
 */
export function buildImproveModel(space: WeekSpace, series: readonly number[]): WeekModel {
  const req = space.request;
  const RS = space.roomSlots;
  const size = req.cells.length * RS;
  const b = new ModelBuilder();
  const sessions: number[] = [];
  const valueVar = new Int32Array(space.sessionCount).fill(-1);
  for (const s of series)
    for (let i = space.seriesFirst[s]!; i < space.seriesFirst[s + 1]!; i++) {
      valueVar[i] = b.addVariable(
        `${req.series[s]!.id}#${i - space.seriesFirst[s]!}`,
        size,
        space.candidates[s]!,
      );
      sessions.push(i);
    }
  const lengthOf = (i: number): number => req.series[space.sessionSeries[i]!]!.length;
  const sameCellFree = (x: number, y: number): boolean => Math.floor(x / RS) !== Math.floor(y / RS);
  const overlapFree = new Map<string, (x: number, y: number) => boolean>();
  const predicate = (li: number, lj: number) => {
    if (li === 1 && lj === 1) return sameCellFree;
    const key = `${li},${lj}`;
    let fn = overlapFree.get(key);
    if (fn === undefined) {
      fn = (x: number, y: number) => {
        const cx = Math.floor(x / RS);
        const cy = Math.floor(y / RS);
        return cx + li <= cy || cy + lj <= cx;
      };
      overlapFree.set(key, fn);
    }
    return fn;
  };
  for (const [i, j] of clashPairs(space, series))
    b.addBinary(valueVar[i]!, valueVar[j]!, predicate(lengthOf(i), lengthOf(j)), {
      name: pairGroup(space, space.sessionSeries[i]!, space.sessionSeries[j]!),
    });
  // pairwise room rules: an all-different over hundreds of sessions is slow to re-check per move
  for (const [i, j] of roomPairs(space, series))
    addNoOverlap(b, valueVar[i]!, valueVar[j]!, lengthOf(i), lengthOf(j), RS, { name: ROOM_GROUP });
  return {
    model: b.build(),
    sessions: Int32Array.from(sessions),
    isStart: new Uint8Array(sessions.length),
    series,
  };
}

/**
 * Counts the hard violations of a plan (values per session, -1 = not placed) straight from the
 * request: overlaps of an attendee or a room, sessions outside their candidates. Per session, the
 * number of violations it takes part in goes into `perSession` when given.
 */
export function countViolations(
  space: WeekSpace,
  values: ArrayLike<number>,
  perSession?: Int32Array,
): number {
  const req = space.request;
  const C = req.cells.length;
  const RS = space.roomSlots;
  const R = req.rooms.length;
  const owner = new Map<number, number[]>();
  let count = 0;
  const mark = (i: number) => {
    if (perSession !== undefined) perSession[i]!++;
  };
  for (let i = 0; i < space.sessionCount; i++) {
    const v = values[i] ?? -1;
    if (v < 0) continue;
    const s = space.sessionSeries[i]!;
    const ser = req.series[s]!;
    if (!space.allows(s, v)) {
      count++;
      mark(i);
    }
    const c = Math.floor(v / RS);
    const r = v % RS;
    // keys: attendee a at cell k, room r at cell k, the series itself at cell k
    const keys: number[] = [];
    for (let k = 0; k < ser.length; k++) {
      for (const a of ser.attendees) keys.push(a * C + c + k);
      if (r !== R) keys.push((req.attendees.length + r) * C + c + k);
      keys.push((req.attendees.length + R + s) * C + c + k);
    }
    for (const key of new Set(keys)) {
      const list = owner.get(key);
      if (list === undefined) owner.set(key, [i]);
      else {
        for (const j of list) {
          count++;
          mark(i);
          mark(j);
        }
        list.push(i);
      }
    }
  }
  return count;
}
