import type { WeekSpace } from './week-space.ts';

/** The preference cost of a plan, split by kind. */
export interface ScoreParts {
  readonly spread: number;
  readonly isolated: number;
  readonly roomStability: number;
  readonly preferredDays: number;
  readonly preferredHours: number;
  readonly usualHours: number;
  readonly moves: number;
  readonly seats: number;
  readonly rules: number;
}

/** Names of the score parts, in report order. */
export const SCORE_PART_NAMES: readonly (keyof ScoreParts)[] = [
  'spread',
  'isolated',
  'roomStability',
  'preferredDays',
  'preferredHours',
  'usualHours',
  'moves',
  'seats',
  'rules',
];

type SeriesWeight = 'spread' | 'roomStability' | 'preferredDays' | 'preferredHours' | 'usualHours' | 'moves';
/**
 * In a week whose days have at most this many cells, isolated meetings are counted over the whole
 * day; with longer days, only in the runs around the cells a move changes. Measured over 3 M moves,
 * five alternating runs each in one process: the runs made the synthetic week's annealing (48-cell
 * days) 12-24% faster and 5-cell days (comp02) some 5% slower, which whole days avoid.
 */
const WHOLE_DAY_CELLS = 12;

const SERIES_WEIGHTS: readonly SeriesWeight[] = [
  'spread',
  'roomStability',
  'preferredDays',
  'preferredHours',
  'usualHours',
  'moves',
];
const WEIGHT_SLOT: Readonly<Record<SeriesWeight, number>> = {
  spread: 0,
  roomStability: 1,
  preferredDays: 2,
  preferredHours: 3,
  usualHours: 4,
  moves: 5,
};

/**
 * Scores week plans with occupancy counters per attendee, room slot and series kept in typed arrays,
 * so the cost change of moving one session touches only that session's series and attendees.
 * A value of -1 marks a session left out of the plan.
 */
export class WeekScorer {
  readonly #space: WeekSpace;
  readonly #C: number;
  readonly #D: number;
  readonly #RS: number;
  /** Current value of each session (-1 = not placed). */
  readonly #value: Int32Array;
  /** Sessions covering each attendee x cell. */
  readonly #occ: Uint16Array;
  /** Sessions starting at each attendee x cell. */
  readonly #starts: Uint16Array;
  /** Sessions of each series x day. */
  readonly #seriesDay: Uint16Array;
  /** Sessions of each series x room slot. */
  readonly #seriesRoom: Uint16Array;
  /** Per series: placed sessions, distinct days and distinct room slots in use. */
  readonly #seriesPlaced: Int32Array;
  readonly #seriesDays: Int32Array;
  readonly #seriesRooms: Int32Array;
  /** Per series x start cell: day, hour, usual-hours and rule costs. */
  readonly #prefDays: Float64Array;
  readonly #prefHours: Float64Array;
  readonly #usual: Float64Array;
  readonly #rules: Float64Array;
  /** Per series x room slot: missing-seat cost. */
  readonly #seats: Float64Array;
  /** Per series: last week's values (one entry per session). */
  readonly #last: readonly Int32Array[];
  readonly #weights: Float64Array;
  readonly #isolatedWeight: number;
  /** Attendee-cells with more than one session (each extra session counts once). */
  #clashes = 0;
  /** Sessions covering each room slot x cell (the "no room" slot is not counted). */
  readonly #roomOcc: Uint16Array;
  /** Room-cells with more than one session (each extra session counts once). */
  #roomClashes = 0;
  /** Scratch of touch: marks per series and attendee, and the touched ones. */
  #stamp = 0;
  readonly #seriesMark: Int32Array;
  readonly #attendeeMark: Int32Array;
  // (typed arrays with counts: emptying a plain array by its length is a slow builtin call)
  readonly #touchedSeries: Int32Array;
  #seriesCount = 0;
  readonly #touchedAttendees: Int32Array;
  #attendeeCount = 0;
  readonly #touchedDays: Int32Array;
  #dayCount = 0;
  /** Per day: the touch's stamp, and the span of the cells the touched sessions leave or take there. */
  readonly #dayMark: Int32Array;
  readonly #dayLo: Int32Array;
  readonly #dayHi: Int32Array;
  /** True when no day has more than WHOLE_DAY_CELLS cells: isolated meetings are counted per whole day. */
  readonly #shortDays: boolean;
  // Flat copies of what the hot paths read per move (typed arrays instead of request objects).
  /** Plan day of each cell. */
  readonly #cellDay: Int32Array;
  /** Per series: length in cells, min days, spread and room-stability weights (0 without a room). */
  readonly #len: Int32Array;
  readonly #minDays: Int32Array;
  readonly #spreadW: Float64Array;
  readonly #stabW: Float64Array;
  /** Attendees of series s: #attList[#attFirst[s] .. #attFirst[s + 1]). */
  readonly #attFirst: Int32Array;
  readonly #attList: Int32Array;
  /** Attendees of series s who opted in to compactness: #compList[#compFirst[s] .. #compFirst[s + 1]). */
  readonly #compFirst: Int32Array;
  readonly #compList: Int32Array;

  constructor(space: WeekSpace) {
    this.#space = space;
    const req = space.request;
    const C = req.cells.length;
    const S = req.series.length;
    const A = req.attendees.length;
    const R = req.rooms.length;
    const RS = space.roomSlots;
    this.#C = C;
    this.#D = req.days;
    this.#RS = RS;
    this.#value = new Int32Array(space.sessionCount).fill(-1);
    this.#occ = new Uint16Array(A * C);
    this.#starts = new Uint16Array(A * C);
    this.#seriesDay = new Uint16Array(S * req.days);
    this.#seriesRoom = new Uint16Array(S * RS);
    this.#roomOcc = new Uint16Array(RS * C);
    this.#seriesMark = new Int32Array(S);
    this.#seriesPlaced = new Int32Array(S);
    this.#seriesDays = new Int32Array(S);
    this.#seriesRooms = new Int32Array(S);
    this.#attendeeMark = new Int32Array(A);
    this.#touchedSeries = new Int32Array(S);
    this.#touchedAttendees = new Int32Array(A);
    this.#touchedDays = new Int32Array(req.days);
    this.#dayMark = new Int32Array(req.days);
    this.#dayLo = new Int32Array(req.days);
    this.#dayHi = new Int32Array(req.days);
    let longest = 0;
    for (let d = 0; d < req.days; d++) longest = Math.max(longest, space.dayEnd[d]! - space.dayFirst[d]!);
    this.#shortDays = longest <= WHOLE_DAY_CELLS;
    this.#prefDays = new Float64Array(S * C);
    this.#prefHours = new Float64Array(S * C);
    this.#usual = new Float64Array(S * C);
    this.#rules = new Float64Array(S * C);
    this.#seats = new Float64Array(S * RS);
    this.#cellDay = Int32Array.from(req.cells, (c) => c.day);
    this.#len = new Int32Array(S);
    this.#minDays = new Int32Array(S);
    this.#spreadW = new Float64Array(S);
    this.#stabW = new Float64Array(S);
    this.#attFirst = new Int32Array(S + 1);
    req.series.forEach((ser, si) => {
      this.#attFirst[si + 1] = this.#attFirst[si]! + ser.attendees.length;
    });
    this.#attList = Int32Array.from(req.series.flatMap((ser) => ser.attendees));
    const names = SERIES_WEIGHTS;
    this.#weights = new Float64Array(S * names.length);
    this.#isolatedWeight = req.weights.isolated;
    const roomIndex = new Map(req.rooms.map((r, i) => [r.id, i]));
    const last: Int32Array[] = req.series.map(() => new Int32Array(0));
    const lastLists: number[][] = req.series.map(() => []);
    const seriesIndex = new Map(req.series.map((s, i) => [s.id, i]));
    for (const p of req.lastWeek ?? []) {
      const s = seriesIndex.get(p.series);
      if (s === undefined) continue;
      // a room that is gone can never be matched: encode it out of range
      const r = p.room === null ? R : (roomIndex.get(p.room) ?? -1);
      lastLists[s]!.push(r < 0 ? -1 : p.cell * RS + r);
    }
    lastLists.forEach((l, s) => {
      last[s] = Int32Array.from(l);
    });
    this.#last = last;
    const compact = req.series.map((s) => s.attendees.filter((a) => req.attendees[a]!.compact === true));
    this.#compFirst = new Int32Array(S + 1);
    compact.forEach((list, si) => {
      this.#compFirst[si + 1] = this.#compFirst[si]! + list.length;
    });
    this.#compList = Int32Array.from(compact.flat());
    req.series.forEach((s, si) => {
      names.forEach((n, k) => {
        this.#weights[si * names.length + k] = s.weights?.[n] ?? req.weights[n];
      });
      const wDays = this.#w(si, 'preferredDays');
      const wHours = this.#w(si, 'preferredHours');
      const wUsual = this.#w(si, 'usualHours');
      for (let c = 0; c < C; c++) {
        const cell = req.cells[c]!;
        if (s.preferredDays !== undefined && s.preferredDays[cell.day] !== true)
          this.#prefDays[si * C + c] = wDays;
        if (s.preferredStarts !== undefined && s.preferredStarts[c] !== true)
          this.#prefHours[si * C + c] = wHours;
        let usual = 0;
        let rules = 0;
        for (const a of s.attendees) {
          const att = req.attendees[a]!;
          for (let k = 0; k < s.length && c + k < C; k++) {
            const hours = (req.cells[c + k]!.end - req.cells[c + k]!.start) / 3_600_000;
            usual += (att.offHours?.[c + k] ?? 0) * hours * (att.offHoursWeight ?? 1);
            rules += att.ruleCost?.[c + k] ?? 0;
          }
        }
        this.#usual[si * C + c] = usual * wUsual;
        this.#rules[si * C + c] = rules * req.weights.rules;
      }
      this.#len[si] = s.length;
      this.#minDays[si] = s.minDays;
      this.#spreadW[si] = this.#w(si, 'spread');
      this.#stabW[si] = s.room === undefined ? 0 : this.#w(si, 'roomStability');
      if (s.room !== undefined && !req.seatsHard)
        req.rooms.forEach((r, ri) => {
          this.#seats[si * RS + ri] = Math.max(0, s.room!.seats - r.seats) * req.weights.seats;
        });
    });
  }

  #w(series: number, name: SeriesWeight): number {
    return this.#weights[series * SERIES_WEIGHTS.length + WEIGHT_SLOT[name]]!;
  }

  /** Sets every session's value (-1 = not placed) and rebuilds the counters. */
  load(values: ArrayLike<number>): void {
    this.#occ.fill(0);
    this.#starts.fill(0);
    this.#seriesDay.fill(0);
    this.#seriesRoom.fill(0);
    this.#seriesPlaced.fill(0);
    this.#seriesDays.fill(0);
    this.#seriesRooms.fill(0);
    this.#value.fill(-1);
    this.#clashes = 0;
    this.#roomOcc.fill(0);
    this.#roomClashes = 0;
    for (let i = 0; i < this.#value.length; i++) {
      const v = values[i] ?? -1;
      if (v >= 0) this.#add(i, v);
    }
  }

  /** Current value of a session (-1 = not placed). */
  valueOf(session: number): number {
    return this.#value[session]!;
  }

  /** Moves one session to `value` (-1 takes it out). */
  set(session: number, value: number): void {
    if (this.#value[session]! >= 0) this.#remove(session);
    if (value >= 0) this.#add(session, value);
  }

  #add(i: number, v: number): void {
    const sp = this.#space;
    const s = sp.sessionSeries[i]!;
    const RS = this.#RS;
    const c = sp.cellOf(v);
    const r = sp.roomOf(v);
    const C = this.#C;
    const L = this.#len[s]!;
    const occ = this.#occ;
    const list = this.#attList;
    for (let j = this.#attFirst[s]!, end = this.#attFirst[s + 1]!; j < end; j++) {
      const at = list[j]! * C + c;
      this.#starts[at]!++;
      for (let k = 0; k < L; k++) if (occ[at + k]!++ > 0) this.#clashes++;
    }
    if (this.#seriesDay[s * this.#D + this.#cellDay[c]!]!++ === 0) this.#seriesDays[s]!++;
    if (this.#seriesRoom[s * RS + r]!++ === 0) this.#seriesRooms[s]!++;
    this.#seriesPlaced[s]!++;
    if (r !== RS - 1)
      for (let k = 0; k < L; k++) if (this.#roomOcc[r * C + c + k]!++ > 0) this.#roomClashes++;
    this.#value[i] = v;
  }

  #remove(i: number): void {
    const sp = this.#space;
    const v = this.#value[i]!;
    const s = sp.sessionSeries[i]!;
    const RS = this.#RS;
    const c = sp.cellOf(v);
    const r = sp.roomOf(v);
    const C = this.#C;
    const L = this.#len[s]!;
    const occ = this.#occ;
    const list = this.#attList;
    for (let j = this.#attFirst[s]!, end = this.#attFirst[s + 1]!; j < end; j++) {
      const at = list[j]! * C + c;
      this.#starts[at]!--;
      for (let k = 0; k < L; k++) if (--occ[at + k]! > 0) this.#clashes--;
    }
    if (--this.#seriesDay[s * this.#D + this.#cellDay[c]!]! === 0) this.#seriesDays[s]!--;
    if (--this.#seriesRoom[s * RS + r]! === 0) this.#seriesRooms[s]!--;
    this.#seriesPlaced[s]!--;
    if (r !== RS - 1)
      for (let k = 0; k < L; k++) if (--this.#roomOcc[r * C + c + k]! > 0) this.#roomClashes--;
    this.#value[i] = -1;
  }

  /** Cost of isolated meetings of one attendee on one day, by runs of back-to-back cells. */
  #isolatedOn(a: number, day: number): number {
    const sp = this.#space;
    return this.#isolatedIn(a * this.#C, sp.dayFirst[day]!, sp.dayEnd[day]!);
  }

  /**
   * Cost of isolated meetings of attendee `a` in the runs of back-to-back cells of `day` that hold or
   * adjoin cells `lo`..`hi - 1`: a change inside those cells alters no other run of the day, so the
   * change of this cost is the change of the day's, without a scan of the whole day (a day of
   * half-hour cells has 48 of them).
   */
  #isolatedNear(a: number, day: number, lo: number, hi: number): number {
    const sp = this.#space;
    const base = a * this.#C;
    const first = sp.dayFirst[day]!;
    const last = sp.dayEnd[day]!;
    const occ = this.#occ;
    const continues = sp.continues;
    // widen to run boundaries, reading only cells outside lo..hi-1 (the same before and after)
    let from = lo;
    while (from > first && continues[from] === 1 && occ[base + from - 1]! > 0) from--;
    let to = Math.min(hi, last);
    while (to < last && continues[to] === 1 && occ[base + to]! > 0) to++;
    return this.#isolatedIn(base, from, to);
  }

  /** Cost of isolated meetings in the runs of cells `from`..`to - 1` of the attendee at `base`, which start and end runs. */
  #isolatedIn(base: number, from: number, to: number): number {
    const occ = this.#occ;
    const starts = this.#starts;
    const continues = this.#space.continues;
    const end = base + to;
    let cost = 0;
    let runStarts = 0;
    let inRun = false;
    for (let i = base + from; i < end; i++) {
      const o = occ[i]!;
      if (o > 0 && inRun && continues[i - base] === 1) {
        runStarts += starts[i]!;
        continue;
      }
      if (inRun && runStarts === 1) cost++;
      inRun = o > 0;
      runStarts = inRun ? starts[i]! : 0;
    }
    if (inRun && runStarts === 1) cost++;
    return cost * this.#isolatedWeight;
  }

  #spreadOf(s: number): number {
    if (this.#seriesPlaced[s] === 0) return 0;
    return Math.max(0, this.#minDays[s]! - this.#seriesDays[s]!) * this.#spreadW[s]!;
  }

  #roomStabilityOf(s: number): number {
    return Math.max(0, this.#seriesRooms[s]! - 1) * this.#stabW[s]!;
  }

  #movesOf(s: number): number {
    const last = this.#last[s]!;
    if (last.length === 0) return 0;
    const first = this.#space.seriesFirst[s]!;
    const end = this.#space.seriesFirst[s + 1]!;
    // matched = sum over distinct keys of min(this week's count, last week's count)
    let matched = 0;
    let placed = 0;
    for (let i = first; i < end; i++) if (this.#value[i]! >= 0) placed++;
    for (let k = 0; k < last.length; k++) {
      const key = last[k]!;
      if (key < 0 || last.indexOf(key) !== k) continue;
      let lastCount = 0;
      for (let j = k; j < last.length; j++) if (last[j] === key) lastCount++;
      let now = 0;
      for (let i = first; i < end; i++) if (this.#value[i] === key) now++;
      matched += Math.min(now, lastCount);
    }
    return (Math.min(placed, last.length) - matched) * this.#w(s, 'moves');
  }

  #unaryOf(s: number, v: number): number {
    const c = this.#space.cellOf(v);
    const k = s * this.#C + c;
    return (
      this.#prefDays[k]! +
      this.#prefHours[k]! +
      this.#usual[k]! +
      this.#rules[k]! +
      this.#seats[s * this.#RS + this.#space.roomOf(v)]!
    );
  }

  /** Cost a session would carry on its own at `value` (day, hour, usual-hours, rule and seat costs). */
  unaryCost(session: number, value: number): number {
    return this.#unaryOf(this.#space.sessionSeries[session]!, value);
  }

  /**
   * Isolated meetings of attendee `a` on `day` that a move inside the day's touched span can change:
   * the whole day's in a week of short days, else those in the runs around the span.
   */
  #isolatedAround(a: number, day: number): number {
    return this.#shortDays
      ? this.#isolatedOn(a, day)
      : this.#isolatedNear(a, day, this.#dayLo[day]!, this.#dayHi[day]!);
  }

  /** Series costs of `s` plus its compact attendees' isolated meetings on days `d0` and `d1` (-1 = none). */
  #localOf(s: number, d0: number, d1: number): number {
    let cost = this.#spreadOf(s) + this.#roomStabilityOf(s) + this.#movesOf(s);
    if (this.#isolatedWeight > 0) {
      const list = this.#compList;
      for (let j = this.#compFirst[s]!, end = this.#compFirst[s + 1]!; j < end; j++) {
        const a = list[j]!;
        if (d0 >= 0) cost += this.#isolatedAround(a, d0);
        if (d1 >= 0 && d1 !== d0) cost += this.#isolatedAround(a, d1);
      }
    }
    return cost;
  }

  /**
   * True when a placed session carries none of the costs a move of it could mend: nothing of its
   * own at its start (day, hour, usual hours, rules, seats), its series on enough days, in one room
   * and where it was last week, and every attendee who opted in to compactness with another meeting
   * right before or after it the same day.
   */
  settled(session: number): boolean {
    const v = this.#value[session]!;
    if (v < 0) return false;
    const s = this.#space.sessionSeries[session]!;
    if (this.#unaryOf(s, v) > 0) return false;
    if (this.#spreadOf(s) > 0 || this.#roomStabilityOf(s) > 0) return false;
    if (this.#last[s]!.length > 0 && this.#movesOf(s) > 0) return false;
    if (this.#isolatedWeight === 0) return true;
    // a meeting is isolated when the run of back-to-back cells holding it holds no other meeting
    const C = this.#C;
    const continues = this.#space.continues;
    const c = this.#space.cellOf(v);
    const before = c - 1;
    const after = c + this.#len[s]!;
    const hasBefore = continues[c] === 1;
    const hasAfter = after < C && continues[after] === 1;
    const list = this.#compList;
    for (let j = this.#compFirst[s]!, end = this.#compFirst[s + 1]!; j < end; j++) {
      const base = list[j]! * C;
      if (!(hasBefore && this.#occ[base + before]! > 0) && !(hasAfter && this.#occ[base + after]! > 0))
        return false;
    }
    return true;
  }

  /** Placed sessions of `series` in room slot `room`. */
  seriesInRoom(series: number, room: number): number {
    return this.#seriesRoom[series * this.#RS + room]!;
  }

  /**
   * What room slot `room` would cost a further session of `series` on its own: its missing seats,
   * plus the room-stability weight when the series does not use that room yet.
   */
  roomCost(series: number, room: number): number {
    const k = series * this.#RS + room;
    return this.#seats[k]! + (this.#seriesRoom[k]! > 0 ? 0 : this.#stabW[series]!);
  }

  /** Missing seats of room slot `room` for a session of `series`, priced (the static half of `roomCost`). */
  seatCost(series: number, room: number): number {
    return this.#seats[series * this.#RS + room]!;
  }

  /** Overlapping sessions of one attendee, counted per attendee-cell and extra session. */
  clashes(): number {
    return this.#clashes;
  }

  /** Room double-bookings, counted per room-cell and extra session. */
  roomClashes(): number {
    return this.#roomClashes;
  }

  /**
   * Change of the total cost if `session` took `value` (-1 = out), plus `clashWeight` per attendee
   * clash and `roomClashWeight` per room clash added; the state is left as it was.
   */
  delta(session: number, value: number, clashWeight = 0, roomClashWeight = 0): number {
    const old = this.#value[session]!;
    if (old === value) return 0;
    const clashes = this.#clashes;
    const roomClashes = this.#roomClashes;
    const d =
      this.applyDelta(session, value) +
      (this.#clashes - clashes) * clashWeight +
      (this.#roomClashes - roomClashes) * roomClashWeight;
    this.set(session, old);
    return d;
  }

  /**
   * Moves `session` to `value` (-1 = out) and returns the change of the preference cost; clashes are
   * not priced (see `clashes` and `roomClashes`).
   */
  applyDelta(session: number, value: number): number {
    const old = this.#value[session]!;
    if (old === value) return 0;
    const sp = this.#space;
    const s = sp.sessionSeries[session]!;
    const c0 = old >= 0 ? sp.cellOf(old) : -1;
    const c1 = value >= 0 ? sp.cellOf(value) : -1;
    const d0 = c0 >= 0 ? this.#cellDay[c0]! : -1;
    const d1 = c1 >= 0 ? this.#cellDay[c1]! : -1;
    if (!this.#shortDays) {
      // the touched span of each day: the cells the session leaves, and the ones it takes
      const L = this.#len[s]!;
      if (d1 >= 0) {
        this.#dayLo[d1] = c1;
        this.#dayHi[d1] = c1 + L;
      }
      if (d0 >= 0) {
        this.#dayLo[d0] = d0 === d1 ? Math.min(c0, c1) : c0;
        this.#dayHi[d0] = d0 === d1 ? Math.max(c0, c1) + L : c0 + L;
      }
    }
    const before = this.#localOf(s, d0, d1) + (old >= 0 ? this.#unaryOf(s, old) : 0);
    this.set(session, value);
    return this.#localOf(s, d0, d1) + (value >= 0 ? this.#unaryOf(s, value) : 0) - before;
  }

  /**
   * Starts pricing a compound move: the series of `count` sessions, their attendees who opted in to
   * compactness, and `cells` (every start cell a session leaves or takes) become the touched parts,
   * and their present cost is returned (see `touchedCost`). Move the sessions with `set`, then
   * `touchedCost` minus this is the change of the preference cost (with no `applyDelta` in between:
   * it moves the days' touched spans).
   */
  touch(sessions: ArrayLike<number>, count: number, cells: ArrayLike<number>): number {
    const sp = this.#space;
    const stamp = ++this.#stamp;
    const series = this.#touchedSeries;
    const atts = this.#touchedAttendees;
    let ns = 0;
    let na = 0;
    let span = 1;
    for (let k = 0; k < count; k++) {
      const s = sp.sessionSeries[sessions[k]!]!;
      if (this.#seriesMark[s] === stamp) continue;
      this.#seriesMark[s] = stamp;
      span = Math.max(span, this.#len[s]!);
      series[ns++] = s;
      if (this.#isolatedWeight > 0) {
        const compact = this.#compList;
        for (let i = this.#compFirst[s]!, end = this.#compFirst[s + 1]!; i < end; i++) {
          const a = compact[i]!;
          if (this.#attendeeMark[a] !== stamp) {
            this.#attendeeMark[a] = stamp;
            atts[na++] = a;
          }
        }
      }
    }
    // per day, the span from the first touched start to the end of the longest session from the last
    let nd = 0;
    for (let j = 0; j < cells.length; j++) {
      const c = cells[j]!;
      const d = this.#cellDay[c]!;
      if (this.#dayMark[d] !== stamp) {
        this.#dayMark[d] = stamp;
        this.#touchedDays[nd++] = d;
        this.#dayLo[d] = c;
        this.#dayHi[d] = c + span;
      } else {
        this.#dayLo[d] = Math.min(this.#dayLo[d]!, c);
        this.#dayHi[d] = Math.max(this.#dayHi[d]!, c + span);
      }
    }
    this.#dayCount = nd;
    this.#seriesCount = ns;
    this.#attendeeCount = na;
    return this.touchedCost(sessions, count);
  }

  /**
   * Cost of the parts the last `touch` marked (series costs, isolated meetings of the touched
   * attendees near the touched cells) plus the `count` sessions' own costs at their present values.
   */
  touchedCost(sessions: ArrayLike<number>, count: number): number {
    const sp = this.#space;
    let c = 0;
    const series = this.#touchedSeries;
    const atts = this.#touchedAttendees;
    const days = this.#touchedDays;
    const nd = this.#dayCount;
    for (let i = 0; i < this.#seriesCount; i++) {
      const s = series[i]!;
      c += this.#spreadOf(s) + this.#roomStabilityOf(s) + this.#movesOf(s);
    }
    for (let i = 0; i < this.#attendeeCount; i++)
      for (let j = 0; j < nd; j++) c += this.#isolatedAround(atts[i]!, days[j]!);
    for (let k = 0; k < count; k++) {
      const session = sessions[k]!;
      const v = this.#value[session]!;
      if (v >= 0) c += this.#unaryOf(sp.sessionSeries[session]!, v);
    }
    return c;
  }

  /**
   * True when `session` could take `value` with `other` gone from its present place: the test half
   * of exchanging two sessions, made without moving either.
   */
  freeForExcept(session: number, value: number, other: number): boolean {
    return this.#fits(session, value, other);
  }

  /**
   * True when `session` could take `value` without overlapping another session of one of its
   * attendees, of its room, or of its own series (its own present place does not count).
   */
  freeFor(session: number, value: number): boolean {
    return this.#fits(session, value, -1);
  }

  /**
   * True when room slot `room` holds no session over the session's length from `cell`, apart from
   * `session` itself: the room half of `freeFor`, for trying several rooms at one start.
   */
  roomFreeFor(session: number, room: number, cell: number): boolean {
    if (room === this.#RS - 1) return true;
    const sp = this.#space;
    const length = this.#len[sp.sessionSeries[session]!]!;
    const old = this.#value[session]!;
    const mine = old >= 0 && sp.roomOf(old) === room ? sp.cellOf(old) : -1;
    const base = room * this.#C;
    for (let k = 0; k < length; k++) {
      const c = cell + k;
      const own = mine >= 0 && c >= mine && c < mine + length ? 1 : 0;
      if (this.#roomOcc[base + c]! - own > 0) return false;
    }
    return true;
  }

  /** The check of `freeFor`, with `other` (when >= 0) also left out of the count. */
  #fits(session: number, value: number, other: number): boolean {
    const sp = this.#space;
    const s = sp.sessionSeries[session]!;
    const L = this.#len[s]!;
    const C = this.#C;
    const c = sp.cellOf(value);
    const r = sp.roomOf(value);
    const old = this.#value[session]!;
    const oc = old >= 0 ? sp.cellOf(old) : -1;
    const or = old >= 0 ? sp.roomOf(old) : -1;
    const ov = other >= 0 ? this.#value[other]! : -1;
    const os = ov >= 0 ? sp.sessionSeries[other]! : -1;
    const tc = ov >= 0 ? sp.cellOf(ov) : -1;
    const tr = ov >= 0 ? sp.roomOf(ov) : -1;
    const OL = os >= 0 ? this.#len[os]! : 0;
    const list = this.#attList;
    const first = this.#attFirst[s]!;
    const end = this.#attFirst[s + 1]!;
    const occ = this.#occ;
    for (let k = 0; k < L; k++) {
      const cell = c + k;
      const mine = oc >= 0 && cell >= oc && cell < oc + L ? 1 : 0;
      const theirs = tc >= 0 && cell >= tc && cell < tc + OL ? 1 : 0;
      for (let i = first; i < end; i++) {
        const a = list[i]!;
        const held = occ[a * C + cell]! - mine;
        // taken, unless the one session left there is `other`'s
        if (held > 0 && !(held === 1 && theirs === 1 && this.#attends(os, a))) return false;
      }
      if (r !== this.#RS - 1) {
        const held = this.#roomOcc[r * C + cell]! - (or === r ? mine : 0) - (tr === r ? theirs : 0);
        if (held > 0) return false;
      }
    }
    if (first === end) {
      for (let j = sp.seriesFirst[s]!; j < sp.seriesFirst[s + 1]!; j++) {
        const w = this.#value[j]!;
        if (j === session || j === other || w < 0) continue;
        const wc = sp.cellOf(w);
        if (wc < c + L && c < wc + L) return false;
      }
    }
    return true;
  }

  /** True when attendee `a` attends series `s`. */
  #attends(s: number, a: number): boolean {
    const list = this.#attList;
    for (let i = this.#attFirst[s]!, end = this.#attFirst[s + 1]!; i < end; i++)
      if (list[i] === a) return true;
    return false;
  }

  /** The cost of the current plan by kind, computed from the counters. */
  parts(): ScoreParts {
    const sp = this.#space;
    const req = sp.request;
    let spread = 0;
    let roomStability = 0;
    let moves = 0;
    let preferredDays = 0;
    let preferredHours = 0;
    let usualHours = 0;
    let rules = 0;
    let seats = 0;
    let isolated = 0;
    req.series.forEach((_, s) => {
      spread += this.#spreadOf(s);
      roomStability += this.#roomStabilityOf(s);
      moves += this.#movesOf(s);
    });
    for (let i = 0; i < this.#value.length; i++) {
      const v = this.#value[i]!;
      if (v < 0) continue;
      const s = sp.sessionSeries[i]!;
      const k = s * this.#C + sp.cellOf(v);
      preferredDays += this.#prefDays[k]!;
      preferredHours += this.#prefHours[k]!;
      usualHours += this.#usual[k]!;
      rules += this.#rules[k]!;
      seats += this.#seats[s * this.#RS + sp.roomOf(v)]!;
    }
    if (this.#isolatedWeight > 0)
      req.attendees.forEach((a, ai) => {
        if (a.compact !== true) return;
        for (let d = 0; d < this.#D; d++) isolated += this.#isolatedOn(ai, d);
      });
    return {
      spread,
      isolated,
      roomStability,
      preferredDays,
      preferredHours,
      usualHours,
      moves,
      seats,
      rules,
    };
  }

  /** Total preference cost of the current plan. */
  total(): number {
    const p = this.parts();
    return SCORE_PART_NAMES.reduce((sum, n) => sum + p[n], 0);
  }
}
