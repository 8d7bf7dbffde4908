import type { NeighbourhoodProblem } from '../../solver/index.ts';
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
  /** Rooms each series may take (empty when it needs none). */
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
  readonly #days = new Int32Array(2);
  #cost: number;

  /** `sessions` are the session indexes to move; the scorer must hold a plan without clashes. */
  constructor(space: WeekSpace, scorer: WeekScorer, sessions: Int32Array) {
    this.#space = space;
    this.#scorer = scorer;
    this.#sessions = sessions;
    this.size = sessions.length;
    this.#holder = new Int32Array(space.request.cells.length * space.roomSlots).fill(-1);
    this.#noRoom = space.request.rooms.length;
    this.#who = new Int32Array(space.request.attendees.length * space.request.cells.length).fill(-1);
    this.#variableOf = new Map(Array.from(sessions, (session, v) => [session, v]));
    this.#roomsOf = space.request.series.map((_, s) => Int32Array.from(space.roomsFor(s)));
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
   * Moves a session to a start and room; when another session holds exactly that start and room, the
   * two exchange places instead (a plain move there could only clash).
   */
  tryChange(variable: number, value: number, accept: (delta: number) => boolean): boolean {
    const holder = this.#holder[value]!;
    if (holder >= 0 && holder !== variable) return this.trySwap(variable, holder, accept);
    const session = this.#sessions[variable]!;
    const sc = this.#scorer;
    if (!sc.freeFor(session, value)) return false;
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
    // feasibility first, without moving: each fits where the other was once the other is gone; when
    // the two new places overlap in time, by plain moves (`a` out, `b` into its place, `a` where `b` was)
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
      if (!fits) return false;
    } else if (!sc.freeForExcept(sa, vb, sb) || !sc.freeForExcept(sb, va, sa)) return false;
    // then the price, by the same three steps
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
    for (let k = 0; k < n; k++) {
      const x = members[k]!;
      const sx = this.#sessions[x]!;
      const xs = req.series[sp.sessionSeries[sx]!]!;
      const other = side[k] === 0 ? p2 : p1;
      // whoever holds one of x's attendees at the other start (a plan without clashes has at most one
      // session per attendee and cell); a series without attendees only meets its own sessions
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
        side[n] = 1 - side[k]!;
        n++;
      }
    }
    // the cost of what the exchange touches (its series, and its attendees on the two days) now
    const olds = this.#olds;
    const news = this.#news;
    const ids = this.#ids;
    for (let k = 0; k < n; k++) {
      const session = this.#sessions[members[k]!]!;
      ids[k] = session;
      olds[k] = sc.valueOf(session);
    }
    const days = this.#days;
    days[0] = req.cells[p1]!.day;
    days[1] = req.cells[p2]!.day;
    const before = sc.touch(ids, n, days, days[0] === days[1] ? 1 : 2);
    // then the exchange itself, by plain moves: every member out, then each into its new start in a
    // free room; it is undone when some member finds none or the walk declines its price
    for (let k = 0; k < n; k++) sc.set(ids[k]!, -1);
    let placed = 0;
    for (; placed < n; placed++) {
      const session = ids[placed]!;
      const w = this.#roomAt(session, side[placed] === 0 ? p2 : p1, sp.roomOf(olds[placed]!));
      if (w < 0) break;
      sc.set(session, w);
      news[placed] = w;
    }
    if (placed === n) {
      const d = sc.touchedCost(ids, n) - before;
      if (accept(d)) {
        this.#cost += d;
        for (let k = 0; k < n; k++) this.#drop(members[k]!, olds[k]!);
        for (let k = 0; k < n; k++) this.#take(members[k]!, news[k]!);
        return true;
      }
    }
    for (let k = 0; k < n; k++) sc.set(ids[k]!, olds[k]!);
    return false;
  }

  /** A free value for `session` starting at `cell`: its room `room` if possible, else the first that fits; -1 when none. */
  #roomAt(session: number, cell: number, room: number): number {
    const sp = this.#space;
    const sc = this.#scorer;
    const s = sp.sessionSeries[session]!;
    const RS = sp.roomSlots;
    const own = cell * RS + room;
    if (sp.allows(s, own) && sc.freeFor(session, own)) return own;
    if (room === this.#noRoom) return -1;
    for (const r of this.#roomsOf[s]!) {
      const w = cell * RS + r;
      if (r !== room && sp.allows(s, w) && sc.freeFor(session, w)) return w;
    }
    return -1;
  }

  assign(values: ArrayLike<number>): void {
    const sc = this.#scorer;
    for (let v = 0; v < this.size; v++) sc.set(this.#sessions[v]!, -1);
    for (let v = 0; v < this.size; v++) sc.set(this.#sessions[v]!, values[v]!);
    this.#cost = sc.total();
    this.#hold();
  }
}

/** Most sessions one chain move may take along. */
const MAX_CHAIN = 32;

/** Length in cells of a series' sessions. */
function lengthOf(space: WeekSpace, series: number): number {
  return space.request.series[series]!.length;
}
