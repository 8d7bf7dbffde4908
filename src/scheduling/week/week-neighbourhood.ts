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
  /** Per series x value: 1 when the value is one of the series' candidates. */
  readonly #allowed: Uint8Array;
  readonly #values: number;
  /** Per value with a room: the variable holding it, or -1. */
  readonly #holder: Int32Array;
  readonly #noRoom: number;
  #cost: number;

  /** `sessions` are the session indexes to move; the scorer must hold a plan without clashes. */
  constructor(space: WeekSpace, scorer: WeekScorer, sessions: Int32Array) {
    this.#space = space;
    this.#scorer = scorer;
    this.#sessions = sessions;
    this.size = sessions.length;
    this.#values = space.request.cells.length * space.roomSlots;
    this.#allowed = new Uint8Array(space.request.series.length * this.#values);
    space.candidates.forEach((cand, s) => {
      for (const v of cand) this.#allowed[s * this.#values + v] = 1;
    });
    this.#holder = new Int32Array(this.#values).fill(-1);
    this.#noRoom = space.request.rooms.length;
    this.#cost = scorer.total();
    this.#hold();
  }

  #hold(): void {
    this.#holder.fill(-1);
    for (let v = 0; v < this.size; v++) this.#take(v, this.value(v));
  }

  #take(variable: number, value: number): void {
    if (value >= 0 && this.#space.roomOf(value) !== this.#noRoom) this.#holder[value] = variable;
  }

  #drop(variable: number, value: number): void {
    if (value >= 0 && this.#holder[value] === variable) this.#holder[value] = -1;
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
    if (this.#allowed[serA * this.#values + vb] !== 1 || this.#allowed[serB * this.#values + va] !== 1)
      return false;
    // feasibility first, with plain moves: `a` out, `b` into its place, `a` where `b` was
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

  assign(values: ArrayLike<number>): void {
    const sc = this.#scorer;
    for (let v = 0; v < this.size; v++) sc.set(this.#sessions[v]!, -1);
    for (let v = 0; v < this.size; v++) sc.set(this.#sessions[v]!, values[v]!);
    this.#cost = sc.total();
    this.#hold();
  }
}
