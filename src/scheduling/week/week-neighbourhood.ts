import { SlotwrightError } from '../../errors.ts';
import { type NeighbourhoodProblem, Prng } from '../../solver/index.ts';
import type { WeekScorer } from './week-scorer.ts';
import type { WeekSpace } from './week-space.ts';

/**
 * The improvement phase's view of a week plan for the engine's annealing: one variable per placed
 * session, its domain the series' candidate values (start cell x room slot). Moves are priced by the
 * scorer's counters and refused when they would put an attendee, a room or a series in two places at
 * once, so the walk never leaves the hard layer the construction found.
 */
export class WeekNeighbourhood implements NeighbourhoodProblem {
  readonly size: number;
  readonly #space: WeekSpace;
  readonly #scorer: WeekScorer;
  readonly #sessions: Int32Array;
  /** Per value with a room: the variable holding it, or -1. */
  readonly #holder: Int32Array;
  readonly #noRoom: number;
  /** Per attendee x cell: the variable whose session covers it, or -1 (kept for chain moves). */
  readonly #who: Int32Array;
  /** Variable of each session in the search. */
  readonly #variableOf: Map<number, number>;
  /** Rooms each series may take (empty when it needs none), fewest missing seats first. */
  readonly #roomsOf: readonly Int32Array[];
  /** Chain scratch: the chain's stamp per variable, its members and their sides and old values. */
  readonly #mark: Int32Array;
  #stamp = 0;
  // (typed arrays of the longest chain: emptying plain arrays by length is a slow builtin call)
  readonly #members = new Int32Array(MAX_CHAIN);
  readonly #side = new Int32Array(MAX_CHAIN);
  readonly #olds = new Int32Array(MAX_CHAIN);
  readonly #news = new Int32Array(MAX_CHAIN);
  readonly #ids = new Int32Array(MAX_CHAIN);
  readonly #cells = new Int32Array(2);
  #cost: number;
  readonly #keepRoom: number;
  readonly #roomMove: number;
  readonly #fallback: boolean;
  readonly #roomPulls: number;
  readonly #focus: number;
  readonly #rng: Prng;

  /** `sessions` are the session indexes to move; the scorer must hold a plan without clashes. */
  constructor(
    space: WeekSpace,
    scorer: WeekScorer,
    sessions: Int32Array,
    options: WeekNeighbourhoodOptions = {},
  ) {
    this.#keepRoom = options.keepRoomShare ?? DEFAULT_KEEP_ROOM;
    this.#roomMove = options.roomMoveShare ?? DEFAULT_ROOM_MOVE;
    this.#fallback = options.otherRoom ?? true;
    this.#roomPulls = options.roomPulls ?? DEFAULT_ROOM_PULLS;
    this.#focus = options.focusShare ?? DEFAULT_FOCUS;
    if (
      !(this.#keepRoom >= 0 && this.#keepRoom <= 1) ||
      !(this.#roomMove >= 0 && this.#roomMove <= 1) ||
      !(this.#focus >= 0 && this.#focus < 1) ||
      !(Number.isInteger(this.#roomPulls) && this.#roomPulls >= 0)
    ) {
      throw new SlotwrightError(
        'bad_argument',
        'week moves: keepRoomShare and roomMoveShare must be shares between 0 and 1, focusShare at least 0 and below 1, and roomPulls a whole number of at least 0',
      );
    }
    this.#rng = new Prng(options.seed ?? 0);
    this.#space = space;
    this.#scorer = scorer;
    this.#sessions = sessions;
    this.size = sessions.length;
    this.#holder = new Int32Array(space.request.cells.length * space.roomSlots).fill(-1);
    this.#noRoom = space.request.rooms.length;
    this.#who = new Int32Array(space.request.attendees.length * space.request.cells.length).fill(-1);
    this.#variableOf = new Map(Array.from(sessions, (session, v) => [session, v]));
    // (a stable sort: rooms of equal seats keep the space's order)
    this.#roomsOf = space.request.series.map((_, s) =>
      Int32Array.from([...space.roomsFor(s)].sort((a, b) => scorer.seatCost(s, a) - scorer.seatCost(s, b))),
    );
    this.#mark = new Int32Array(sessions.length);
    this.#cost = scorer.total();
    this.#hold();
  }

  #hold(): void {
    this.#holder.fill(-1);
    this.#who.fill(-1);
    for (let v = 0; v < this.size; v++) this.#take(v, this.value(v));
  }

  #take(variable: number, value: number): void {
    if (value < 0) return;
    if (this.#space.roomOf(value) !== this.#noRoom) this.#holder[value] = variable;
    this.#cover(variable, value, variable, -1);
  }

  /** Writes `to` over the attendee-cells the variable's session covers at `value` that hold `from`. */
  #cover(variable: number, value: number, to: number, from: number): void {
    const sp = this.#space;
    const ser = sp.request.series[sp.sessionSeries[this.#sessions[variable]!]!]!;
    const C = sp.request.cells.length;
    const c = sp.cellOf(value);
    for (const a of ser.attendees)
      for (let k = 0; k < ser.length; k++) {
        const i = a * C + c + k;
        if (from < 0 || this.#who[i] === from) this.#who[i] = to;
      }
  }

  #drop(variable: number, value: number): void {
    if (value < 0) return;
    if (this.#holder[value] === variable) this.#holder[value] = -1;
    this.#cover(variable, value, -1, variable);
  }

  value(variable: number): number {
    return this.#scorer.valueOf(this.#sessions[variable]!);
  }

  domain(variable: number): ArrayLike<number> {
    return this.#space.candidates[this.#space.sessionSeries[this.#sessions[variable]!]!]!;
  }

  cost(): number {
    return this.#cost;
  }

  /**
   * True when the move proposed from this variable is to be turned down unpriced: in `focusShare` of
   * proposals when its session is settled (carries no cost a move of it could mend). The walk then
   * spends its time on the sessions that carry cost, while settled ones still move now and then.
   */
  #passOver(variable: number): boolean {
    return (
      this.#focus > 0 && this.#rng.next() < this.#focus && this.#scorer.settled(this.#sessions[variable]!)
    );
  }

  /**
   * Moves a session to a start and room; when another session holds exactly that start and room, the
   * two exchange places instead (a plain move there could only clash).
   */
  tryChange(variable: number, value: number, accept: (delta: number) => boolean): boolean {
    if (this.#passOver(variable)) return false;
    const sp = this.#space;
    const sc = this.#scorer;
    const session = this.#sessions[variable]!;
    const series = sp.sessionSeries[session]!;
    const current = sc.valueOf(session);
    const room = sp.roomOf(current);
    if (this.#roomMove > 0 && room !== this.#noRoom && this.#rng.next() < this.#roomMove) {
      // a room change in place, towards the room its series uses most: room stability is otherwise
      // mended only by the rare random proposal that names the same start and the right room
      const main = this.#mainRoom(session);
      if (main === room) return false;
      value = sp.cellOf(current) * sp.roomSlots + main;
      if (!sp.allows(series, value)) return false;
    }
    // a move to another start mostly keeps the session's room: a random room would nearly always
    // cost room stability, and the walk would spend most of its proposals on moves it then declines
    if (
      this.#keepRoom > 0 &&
      room !== this.#noRoom &&
      sp.roomOf(value) !== room &&
      sp.cellOf(value) !== sp.cellOf(current) &&
      this.#rng.next() < this.#keepRoom
    ) {
      const kept = sp.cellOf(value) * sp.roomSlots + room;
      if (sp.allows(series, kept)) value = kept;
    }
    const holder = this.#holder[value]!;
    if (holder >= 0 && holder !== variable) {
      if (this.#swapFits(variable, holder)) return this.#swap(variable, holder, accept);
      if (!this.#fallback) return false;
      // the room's holder cannot take this session's place: another free room at that start, if any
      value = this.#bestRoomAt(session, sp.cellOf(value));
      if (value < 0) return false;
    } else if (!sc.freeFor(session, value)) return false;
    const old = sc.valueOf(session);
    const d = sc.applyDelta(session, value);
    if (accept(d)) {
      this.#cost += d;
      this.#drop(variable, old);
      this.#take(variable, value);
      return true;
    }
    sc.set(session, old);
    return false;
  }

  trySwap(a: number, b: number, accept: (delta: number) => boolean): boolean {
    return !this.#passOver(a) && this.#swapFits(a, b) && this.#swap(a, b, accept);
  }

  /** True when the sessions of variables `a` and `b` may exchange their values without a clash. */
  #swapFits(a: number, b: number): boolean {
    const sa = this.#sessions[a]!;
    const sb = this.#sessions[b]!;
    const sp = this.#space;
    const serA = sp.sessionSeries[sa]!;
    const serB = sp.sessionSeries[sb]!;
    if (serA === serB) return false;
    const sc = this.#scorer;
    const va = sc.valueOf(sa);
    const vb = sc.valueOf(sb);
    if (va === vb) return false;
    if (!sp.allows(serA, vb) || !sp.allows(serB, va)) return false;
    // each fits where the other was once the other is gone, tested without moving; when the two new
    // places overlap in time, by plain moves (`a` out, `b` into its place, `a` where `b` was)
    const ca = sp.cellOf(va);
    const cb = sp.cellOf(vb);
    const la = lengthOf(sp, serA);
    const lb = lengthOf(sp, serB);
    if (cb < ca + lb && ca < cb + la) {
      sc.set(sa, -1);
      if (!sc.freeFor(sb, va)) {
        sc.set(sa, va);
        return false;
      }
      sc.set(sb, va);
      const fits = sc.freeFor(sa, vb);
      sc.set(sb, vb);
      sc.set(sa, va);
      return fits;
    }
    return sc.freeForExcept(sa, vb, sb) && sc.freeForExcept(sb, va, sa);
  }

  /** Prices the exchange `#swapFits` allowed and makes it when `accept` takes the price. */
  #swap(a: number, b: number, accept: (delta: number) => boolean): boolean {
    const sa = this.#sessions[a]!;
    const sb = this.#sessions[b]!;
    const sc = this.#scorer;
    const va = sc.valueOf(sa);
    const vb = sc.valueOf(sb);
    let d = sc.applyDelta(sa, -1);
    d += sc.applyDelta(sb, va);
    d += sc.applyDelta(sa, vb);
    if (accept(d)) {
      this.#cost += d;
      this.#drop(a, va);
      this.#drop(b, vb);
      this.#take(a, vb);
      this.#take(b, va);
      return true;
    }
    sc.set(sa, -1);
    sc.set(sb, vb);
    sc.set(sa, va);
    return false;
  }

  /**
   * A Kempe chain exchange between the variable's start cell and `value`'s: the session moves there,
   * every session starting there that shares an attendee with it moves the other way, and so on
   * until nothing clashes across the two cells. Each keeps its room when that is free at its new
   * start, else takes the first free room that fits. Refused when the chain mixes session lengths,
   * grows past 32 sessions, or some member finds no free room.
   */
  tryChain(variable: number, value: number, accept: (delta: number) => boolean): boolean {
    if (this.#passOver(variable)) return false;
    const sp = this.#space;
    const sc = this.#scorer;
    const req = sp.request;
    const first = sc.valueOf(this.#sessions[variable]!);
    const p1 = sp.cellOf(first);
    const p2 = sp.cellOf(value);
    if (p1 === p2) return false;
    const length = req.series[sp.sessionSeries[this.#sessions[variable]!]!]!.length;
    const stamp = ++this.#stamp;
    const members = this.#members;
    const side = this.#side;
    members[0] = variable;
    side[0] = 0;
    let n = 1;
    this.#mark[variable] = stamp;
    const C = req.cells.length;
    const who = this.#who;
    const olds = this.#olds;
    const ids = this.#ids;
    const cells = this.#cells;
    cells[0] = p1;
    cells[1] = p2;
    const RS = sp.roomSlots;
    let followed = 0;
    for (let pulls = 0; ; pulls++) {
      for (; followed < n; followed++) {
        const x = members[followed]!;
        const sx = this.#sessions[x]!;
        const xs = req.series[sp.sessionSeries[sx]!]!;
        const other = side[followed] === 0 ? p2 : p1;
        // whoever holds one of x's attendees at the other start (a plan without clashes has at most
        // one session per attendee and cell); a series without attendees only meets its own sessions
        const atts = xs.attendees;
        const sibling = atts.length === 0 ? sp.seriesFirst[sp.sessionSeries[sx]!]! : 0;
        const count = atts.length === 0 ? xs.sessions : atts.length;
        for (let i = 0; i < count; i++) {
          let y: number;
          if (atts.length > 0) {
            y = -1;
            for (let c = 0; c < length && y < 0; c++) y = who[atts[i]! * C + other + c]!;
          } else {
            y = this.#variableOf.get(sibling + i) ?? -1;
            if (y >= 0 && sp.cellOf(sc.valueOf(sibling + i)) !== other) y = -1;
          }
          if (y < 0 || this.#mark[y] === stamp) continue;
          const sy = this.#sessions[y]!;
          if (sp.cellOf(sc.valueOf(sy)) !== other) return false;
          if (req.series[sp.sessionSeries[sy]!]!.length !== length || n >= MAX_CHAIN) return false;
          this.#mark[y] = stamp;
          members[n] = y;
          side[n] = 1 - side[followed]!;
          n++;
        }
      }
      for (let k = 0; k < n; k++) {
        const session = this.#sessions[members[k]!]!;
        ids[k] = session;
        olds[k] = sc.valueOf(session);
      }
      // a member with no room it could take at its new start dooms the exchange: it is not priced
      let stuck = Math.abs(p1 - p2) >= length ? this.#roomless(n, p1, p2, stamp) : -1;
      if (stuck < 0) stuck = this.#exchange(n, p1, p2, accept);
      if (stuck === DONE) return true;
      if (stuck === DECLINED) return false;
      // a member found no free room: the session holding its own room at its new start joins the
      // chain the other way (and with it whoever that one clashes with), a few times at most
      const room = sp.roomOf(olds[stuck]!);
      if (pulls >= this.#roomPulls || room === this.#noRoom) return false;
      const z = this.#holder[(side[stuck] === 0 ? p2 : p1) * RS + room]!;
      if (z < 0 || this.#mark[z] === stamp || n >= MAX_CHAIN) return false;
      if (req.series[sp.sessionSeries[this.#sessions[z]!]!]!.length !== length) return false;
      this.#mark[z] = stamp;
      members[n] = z;
      side[n] = 1 - side[stuck]!;
      n++;
    }
  }

  /**
   * The first of the chain's `n` members (in `#ids`, their sides in `#side`) that has no room it
   * could take at its new start: every room of its series there is barred or held by a session
   * outside the chain (stamp `stamp`). -1 when each has one, though rooms two members both need may
   * still run out. Only for starts `p1` and `p2` at least a session's length apart.
   */
  #roomless(n: number, p1: number, p2: number, stamp: number): number {
    const sp = this.#space;
    const sc = this.#scorer;
    const RS = sp.roomSlots;
    for (let k = 0; k < n; k++) {
      const session = this.#ids[k]!;
      const s = sp.sessionSeries[session]!;
      const rooms = this.#roomsOf[s]!;
      if (rooms.length === 0) continue;
      const cell = this.#side[k] === 0 ? p2 : p1;
      let possible = false;
      for (let i = 0; i < rooms.length && !possible; i++) {
        const r = rooms[i]!;
        const w = cell * RS + r;
        if (!sp.allows(s, w)) continue;
        const h = this.#holder[w]!;
        possible = (h >= 0 && this.#mark[h] === stamp) || sc.roomFreeFor(session, r, cell);
      }
      if (!possible) return k;
    }
    return -1;
  }

  /**
   * The chain's exchange itself, priced by `touch` before and `touchedCost` after: DONE when made,
   * DECLINED when the walk declines its price, else the member that found no free room (undone).
   */
  #exchange(n: number, p1: number, p2: number, accept: (delta: number) => boolean): number {
    const sp = this.#space;
    const sc = this.#scorer;
    const RS = sp.roomSlots;
    const ids = this.#ids;
    const olds = this.#olds;
    const news = this.#news;
    const side = this.#side;
    const members = this.#members;
    // the cost of what the exchange touches (its series, and its attendees on the two days) now
    const before = sc.touch(ids, n, this.#cells);
    // then the exchange itself, by plain moves: every member out, then each into its new start in
    // a free room (members that can keep their room go first, so none of them loses it to one that
    // cannot); it is undone when some member finds no room or the walk declines its price
    for (let k = 0; k < n; k++) sc.set(ids[k]!, -1);
    let placed = 0;
    for (let k = 0; k < n; k++) {
      const session = ids[k]!;
      const own = (side[k] === 0 ? p2 : p1) * RS + sp.roomOf(olds[k]!);
      news[k] = -1;
      if (sp.allows(sp.sessionSeries[session]!, own) && sc.freeFor(session, own)) {
        sc.set(session, own);
        news[k] = own;
        placed++;
      }
    }
    let stuck = -1;
    for (let k = 0; k < n && placed < n; k++) {
      if (news[k]! >= 0) continue;
      const w = this.#bestRoomAt(ids[k]!, side[k] === 0 ? p2 : p1);
      if (w < 0) {
        stuck = k;
        break;
      }
      sc.set(ids[k]!, w);
      news[k] = w;
      placed++;
    }
    if (placed === n) {
      const d = sc.touchedCost(ids, n) - before;
      if (accept(d)) {
        this.#cost += d;
        for (let k = 0; k < n; k++) this.#drop(members[k]!, olds[k]!);
        for (let k = 0; k < n; k++) this.#take(members[k]!, news[k]!);
        return DONE;
      }
      for (let k = 0; k < n; k++) sc.set(ids[k]!, olds[k]!);
      return DECLINED;
    }
    for (let k = 0; k < n; k++) sc.set(ids[k]!, olds[k]!);
    return stuck;
  }

  /**
   * The free value for `session` starting at `cell` in the room that costs least (missing seats, and
   * a room its series does not use yet); -1 when no fitting room is free.
   */
  #bestRoomAt(session: number, cell: number): number {
    const sp = this.#space;
    const sc = this.#scorer;
    const s = sp.sessionSeries[session]!;
    const RS = sp.roomSlots;
    // the attendees once, then only the rooms
    const roomless = cell * RS + this.#noRoom;
    if (!sc.freeFor(session, roomless)) return -1;
    if (sp.request.series[s]!.room === undefined) return sp.allows(s, roomless) ? roomless : -1;
    let best = -1;
    let bestCost = Number.POSITIVE_INFINITY;
    for (const r of this.#roomsOf[s]!) {
      // rooms come by missing seats: once those alone cost as much as the best so far, no later room
      // can cost less
      if (sc.seatCost(s, r) >= bestCost) break;
      const w = cell * RS + r;
      if (!sp.allows(s, w) || !sc.roomFreeFor(session, r, cell)) continue;
      // (the start's own costs are the same in every room: only the room's part decides)
      const cost = sc.roomCost(s, r);
      if (cost < bestCost) {
        bestCost = cost;
        best = w;
      }
    }
    return best;
  }

  /** The room slot that most sessions of the session's series take (its present one on a tie). */
  #mainRoom(session: number): number {
    const sp = this.#space;
    const sc = this.#scorer;
    const s = sp.sessionSeries[session]!;
    let best = sp.roomOf(sc.valueOf(session));
    let most = sc.seriesInRoom(s, best);
    for (const r of this.#roomsOf[s]!) {
      const k = sc.seriesInRoom(s, r);
      if (k > most) {
        most = k;
        best = r;
      }
    }
    return best;
  }

  assign(values: ArrayLike<number>): void {
    const sc = this.#scorer;
    for (let v = 0; v < this.size; v++) sc.set(this.#sessions[v]!, -1);
    for (let v = 0; v < this.size; v++) sc.set(this.#sessions[v]!, values[v]!);
    this.#cost = sc.total();
    this.#hold();
  }
}

/** Options of a `WeekNeighbourhood`. */
export interface WeekNeighbourhoodOptions {
  /** Share of moves to another start that keep the session's room (where its series may take it). @default 0.8 */
  readonly keepRoomShare?: number;
  /** Share of changes turned into a move to the room the series uses most, at the same start. @default 0.1 */
  readonly roomMoveShare?: number;
  /** When a start's room is held by a session that cannot exchange places, try the cheapest free room there. @default true */
  readonly otherRoom?: boolean;
  /**
   * How many times a chain whose member finds no free room may take along the session that holds
   * that member's room at its new start (moving it the other way). @default 2
   */
  readonly roomPulls?: number;
  /**
   * Share of proposed moves turned down unpriced when the session they start from is settled (no
   * cost of its own a move could mend; see `WeekScorer.settled`). @default 0.5
   */
  readonly focusShare?: number;
  /** Seed of the neighbourhood's own choices. @default 0 */
  readonly seed?: number;
}

const DEFAULT_KEEP_ROOM = 0.8;
const DEFAULT_ROOM_MOVE = 0.1;
const DEFAULT_ROOM_PULLS = 2;
// At 60 s, seeds 1-8, two runs at a time, against focusShare 0 in the same build (means): comp02
// 38.9 against 40.6, comp07 13.5 against 14.4, comp06 42.6 against 42.6; the synthetic week at
// 10 s, seeds 1-3: 142/161/172.5 against 145.5/174.5/177. 0.65 was no better on comp07.
const DEFAULT_FOCUS = 0.5;

/** What `#exchange` returns for a chain made, and for one whose price the walk declined. */
const DONE = -2;
const DECLINED = -3;

/** Most sessions one chain move may take along. */
const MAX_CHAIN = 32;

/** Length in cells of a series' sessions. */
function lengthOf(space: WeekSpace, series: number): number {
  return space.request.series[series]!.length;
}
