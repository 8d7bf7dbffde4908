import type { WeekRequest } from './week-request.ts';

/**
 * The search space of a week plan: one variable per session, each value a start cell times a room
 * slot (`value = cell * roomSlots + room`, with room slot `rooms.length` meaning "no room").
 */
export class WeekSpace {
  /** The request this space was built from. */
  readonly request: WeekRequest;
  /** Number of room slots: the rooms plus one "no room" slot. */
  readonly roomSlots: number;
  /** Series index of each session. */
  readonly sessionSeries: Int32Array;
  /** First session index of each series (its sessions are consecutive). */
  readonly seriesFirst: Int32Array;
  /** Index of the first and one-past-last cell of each day. */
  readonly dayFirst: Int32Array;
  readonly dayEnd: Int32Array;
  /** Candidate values of each series (same for all its sessions), ascending. */
  readonly candidates: readonly Int32Array[];
  /** Per cell: true when the cell directly continues the previous one (same day, no gap). */
  readonly continues: Uint8Array;
  /** Per series x value: 1 when the value is one of the series' candidates. */
  readonly #allowed: Uint8Array;
  readonly #valueCount: number;

  constructor(request: WeekRequest) {
    this.request = request;
    const R = request.rooms.length;
    this.roomSlots = R + 1;
    const C = request.cells.length;
    let n = 0;
    this.seriesFirst = new Int32Array(request.series.length + 1);
    request.series.forEach((s, i) => {
      this.seriesFirst[i] = n;
      n += s.sessions;
    });
    this.seriesFirst[request.series.length] = n;
    this.sessionSeries = new Int32Array(n);
    request.series.forEach((s, i) => {
      this.sessionSeries.fill(i, this.seriesFirst[i]!, this.seriesFirst[i]! + s.sessions);
    });
    this.dayFirst = new Int32Array(request.days).fill(C);
    this.dayEnd = new Int32Array(request.days);
    this.continues = new Uint8Array(C);
    request.cells.forEach((c, i) => {
      if (c.day < 0 || c.day >= request.days)
        throw new RangeError(`cell ${i} has day ${c.day} outside 0..${request.days - 1}`);
      if (i < this.dayFirst[c.day]!) this.dayFirst[c.day] = i;
      this.dayEnd[c.day] = i + 1;
      const prev = request.cells[i - 1];
      this.continues[i] = prev !== undefined && prev.day === c.day && prev.end === c.start ? 1 : 0;
    });
    this.candidates = request.series.map((_, s) => this.#candidatesOf(s));
    this.#valueCount = C * this.roomSlots;
    this.#allowed = new Uint8Array(request.series.length * this.#valueCount);
    this.candidates.forEach((cand, s) => {
      for (const v of cand) this.#allowed[s * this.#valueCount + v] = 1;
    });
  }

  /** True when `value` is one of the candidates of `series`. */
  allows(series: number, value: number): boolean {
    return value >= 0 && value < this.#valueCount && this.#allowed[series * this.#valueCount + value] === 1;
  }

  /** Start cell of a value. */
  cellOf(value: number): number {
    return Math.floor(value / this.roomSlots);
  }

  /** Room slot of a value (`rooms.length` = no room). */
  roomOf(value: number): number {
    return value % this.roomSlots;
  }

  /** Number of sessions. */
  get sessionCount(): number {
    return this.sessionSeries.length;
  }

  /** Rooms a series may take (empty when it needs none), ignoring busy time. */
  roomsFor(series: number): number[] {
    const s = this.request.series[series]!;
    if (s.room === undefined) return [];
    const need = s.room;
    const out: number[] = [];
    this.request.rooms.forEach((r, i) => {
      if (this.request.seatsHard && r.seats < need.seats) return;
      if (need.only !== undefined && !need.only.includes(r.id)) return;
      if (need.features.every((f) => r.features.includes(f))) out.push(i);
    });
    return out;
  }

  /** True when a session of `length` cells can start at `cell` without crossing a day or a gap. */
  fits(cell: number, length: number): boolean {
    const C = this.request.cells.length;
    if (cell + length > C) return false;
    for (let k = 1; k < length; k++) if (this.continues[cell + k] === 0) return false;
    return true;
  }

  #candidatesOf(series: number): Int32Array {
    const req = this.request;
    const s = req.series[series]!;
    const rooms = this.roomsFor(series);
    const out: number[] = [];
    for (let c = 0; c < req.cells.length; c++) {
      if (s.allowed !== undefined && s.allowed[c] !== true) continue;
      if (!this.fits(c, s.length)) continue;
      let ok = true;
      for (const a of s.attendees) {
        const free = req.attendees[a]!.free;
        if (free === undefined) continue;
        for (let k = 0; k < s.length && ok; k++) if (free[c + k] !== true) ok = false;
        if (!ok) break;
      }
      if (!ok) continue;
      if (s.room === undefined) {
        out.push(c * this.roomSlots + req.rooms.length);
        continue;
      }
      for (const r of rooms) {
        const free = req.rooms[r]!.free;
        let roomOk = true;
        if (free !== undefined)
          for (let k = 0; k < s.length && roomOk; k++) if (free[c + k] !== true) roomOk = false;
        if (roomOk) out.push(c * this.roomSlots + r);
      }
    }
    return Int32Array.from(out);
  }
}
