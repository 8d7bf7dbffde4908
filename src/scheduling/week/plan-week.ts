import { improve, ModelBuilder, minimalConflict, solve } from '../../solver/index.ts';
import {
  buildImproveModel,
  buildPlaceModel,
  CHANNEL_GROUP,
  countViolations,
  ROOM_GROUP,
  type WeekModel,
} from './week-model.ts';
import type { PlacedSession, WeekRequest } from './week-request.ts';
import { type ScoreParts, WeekScorer } from './week-scorer.ts';
import { WeekSpace } from './week-space.ts';

/** What stops a series from being placed. */
export type WeekBlocker =
  | { readonly kind: 'attendee'; readonly id: string }
  | { readonly kind: 'series'; readonly id: string }
  | { readonly kind: 'rooms' }
  | { readonly kind: 'series-hours' };

/** Why a series is left out: no start fits it at all, it conflicts with placed series, or the search ran out of budget. */
export type UnplacedCode = 'no_free_start' | 'conflict' | 'budget';

/** A series the plan leaves out, with what blocks it (a minimal conflicting set where one was found). */
export interface UnplacedSeries {
  readonly series: string;
  readonly code: UnplacedCode;
  readonly blockers: readonly WeekBlocker[];
}

/** Progress of a running plan. */
export interface WeekProgress {
  readonly phase: 'place' | 'repair' | 'improve';
  readonly elapsedMs: number;
  /** Best preference cost so far (of the placed series). */
  readonly best: number;
  readonly unplaced: number;
}

/** Options of planWeek. */
export interface PlanWeekOptions {
  /** Milliseconds for the whole plan; needs `clock`. No time limit when absent. */
  readonly timeMs?: number;
  /** Clock in ms (inner layers never read the clock themselves). */
  readonly clock?: () => number;
  /** Local-search moves for the improvement phase (in rounds of `roundMoves`). @default 20000, or no limit when `timeMs` is set */
  readonly moves?: number;
  /** Moves per improvement round; each round starts from the best plan so far. @default 30000 */
  readonly roundMoves?: number;
  /** Node limit of each construction search. @default 200000 */
  readonly searchNodes?: number;
  /** Seed of every randomized step; same seed and move budget, same plan. @default 1 */
  readonly seed?: number;
  readonly onProgress?: (p: WeekProgress) => void;
}

/** Statistics of one planWeek run. */
export interface WeekPlanStats {
  readonly variables: number;
  readonly searchNodes: number;
  readonly moves: number;
  readonly rounds: number;
  readonly elapsedMs: number;
  /** Cost right after construction, before local search. */
  readonly initialCost: number;
}

/** A week plan: placed sessions, the series left out, the preference cost. */
export interface WeekPlan {
  readonly sessions: readonly PlacedSession[];
  /** Value per session (start cell x room slot), -1 when not placed. */
  readonly values: Int32Array;
  readonly unplaced: readonly UnplacedSeries[];
  readonly score: { readonly total: number; readonly parts: ScoreParts };
  /** Hard violations left (0 unless the search budget ran out mid-repair). */
  readonly violations: number;
  /** True when every series is placed. */
  readonly complete: boolean;
  readonly stats: WeekPlanStats;
}

// An attendee overlap costs far more than any preference a single move can gain.
const CLASH_WEIGHT = 1e5;

const DEFAULTS = {
  moves: 20_000,
  roundMoves: 30_000,
  searchNodes: 200_000,
  seed: 1,
} satisfies Partial<PlanWeekOptions>;

/**
 * Places every series of a week jointly: the hard layer by the engine's search (forward checking,
 * MRV, values ordered by their own cost), then the preference cost by rounds of the engine's local
 * search. Series that cannot fit are left out one by one, each with a minimal conflicting set.
 */
export function planWeek(request: WeekRequest, options: PlanWeekOptions = {}): WeekPlan {
  const o = {
    ...DEFAULTS,
    // with a time limit and no move limit, the clock alone ends the search
    ...(options.timeMs !== undefined && options.moves === undefined
      ? { moves: Number.POSITIVE_INFINITY }
      : {}),
    ...options,
  };
  const clock = o.clock;
  const t0 = clock?.() ?? 0;
  const elapsed = (): number => (clock === undefined ? 0 : clock() - t0);
  const deadline = o.timeMs;
  const remaining = (): number | undefined =>
    deadline === undefined ? undefined : Math.max(0, deadline - elapsed());
  const space = new WeekSpace(request);
  const scorer = new WeekScorer(space);
  const n = space.sessionCount;
  const values = new Int32Array(n).fill(-1);
  const unplaced: UnplacedSeries[] = [];
  let searchNodes = 0;
  const report = (phase: WeekProgress['phase'], best: number) =>
    o.onProgress?.({ phase, elapsedMs: elapsed(), best, unplaced: unplaced.length });

  const timeBudget = (share: number) => {
    const r = remaining();
    return r === undefined || clock === undefined ? {} : { timeMs: Math.max(1, r * share), clock };
  };

  // 1. series with no free start at all
  let active: number[] = [];
  request.series.forEach((s, i) => {
    if (space.candidates[i]!.length === 0)
      unplaced.push({ series: s.id, code: 'no_free_start', blockers: explainNoStart(space, i) });
    else active.push(i);
  });

  const R = request.rooms.length;
  const RS = space.roomSlots;
  const toValues = (model: WeekModel, solution: readonly number[]): Int32Array => {
    const out = new Int32Array(n).fill(-1);
    model.sessions.forEach((session, v) => {
      const x = solution[v]!;
      if (model.isStart[v] === 1) {
        if (out[session] === -1) out[session] = x * RS + R;
      } else out[session] = x;
    });
    return out;
  };
  const trySolve = (
    series: readonly number[],
    share: number,
  ): { model: WeekModel; values: Int32Array | null; proven: boolean } => {
    const model = buildPlaceModel(space, series);
    const res = solve(model.model, {
      propagation: 'forward',
      variableOrder: 'mrv',
      // least-constraining values first: ordering by preference cost thrashes on tight weeks
      valueOrder: 'lcv',
      budget: { nodes: o.searchNodes, ...timeBudget(share) },
      seed: o.seed,
    });
    searchNodes += res.stats.nodes;
    const sol = res.solutions[0];
    return {
      model,
      values: sol === undefined ? null : toValues(model, sol),
      proven: res.status === 'unsatisfiable',
    };
  };

  // 2. the whole week at once
  let placed = trySolve(active, 0.3);
  report('place', Number.NaN);
  if (placed.values === null && !placed.proven) {
    // the search ran out of budget: repair a greedy start by local search
    const repaired = repair(space, scorer, active, o.seed, timeBudget(0.3), Math.min(o.moves, 1_000_000));
    if (repaired !== null) placed = { ...placed, values: repaired };
    report('repair', Number.NaN);
  }
  if (placed.values === null) {
    // 3. add series one at a time, hardest first, and leave out those that do not fit
    const order = [...active].sort(
      (a, b) =>
        space.candidates[a]!.length / request.series[a]!.sessions -
          space.candidates[b]!.length / request.series[b]!.sessions || a - b,
    );
    const kept: number[] = [];
    let last: Int32Array = new Int32Array(n).fill(-1);
    for (const s of order) {
      const attempt = trySolve([...kept, s], 0.05);
      if (attempt.values !== null) {
        kept.push(s);
        last = attempt.values;
        continue;
      }
      unplaced.push({
        series: request.series[s]!.id,
        code: attempt.proven ? 'conflict' : 'budget',
        blockers: attempt.proven ? explainConflict(space, attempt.model, s, timeBudget(0.05)) : [],
      });
      report('place', Number.NaN);
    }
    active = kept;
    placed = { ...placed, values: last };
  }
  values.set(placed.values!);
  active.sort((a, b) => a - b);
  const model = buildImproveModel(space, active);
  scorer.load(values);
  const initialCost = scorer.total();
  let best = initialCost;
  report('improve', best);

  // 4. improve the preference cost in rounds, each from the best plan so far
  let moves = 0;
  let rounds = 0;
  const known = new Int32Array(n).fill(-1);
  const sync = (assignment: readonly number[]) => {
    // the engine hands us whole assignments; keep the counters in step with the one it asks about
    for (let v = 0; v < assignment.length; v++) {
      const session = model.sessions[v]!;
      const value = assignment[v]!;
      if (known[session] !== value) {
        scorer.set(session, value);
        known[session] = value;
      }
    }
  };
  let assignment = Array.from(model.sessions, (session) => values[session]!);
  while (model.model.variableCount > 0 && moves < o.moves) {
    const r = remaining();
    if (r !== undefined && r <= 0) break;
    const roundMoves = Math.min(o.roundMoves, o.moves - moves);
    known.set(values);
    scorer.load(values);
    const res = improve(model.model, assignment, {
      method: 'annealing',
      objective: (a) => {
        sync(a);
        return scorer.total();
      },
      delta: (a, variable, value) => {
        sync(a);
        return scorer.delta(model.sessions[variable]!, value);
      },
      moves: ['change', 'swap'],
      budget: { nodes: roundMoves, ...(r === undefined || clock === undefined ? {} : { timeMs: r, clock }) },
      seed: o.seed + rounds * 7919,
    });
    moves += res.moves;
    rounds++;
    if (res.violations === 0 && res.moves > 0) {
      const candidate = new Int32Array(values);
      model.sessions.forEach((session, v) => {
        candidate[session] = res.assignment[v]!;
      });
      scorer.load(candidate);
      const cost = scorer.total();
      if (cost < best - 1e-9 && scorer.clashes() === 0 && countViolations(space, candidate) === 0) {
        best = cost;
        values.set(candidate);
        assignment = [...res.assignment];
      }
    }
    report('improve', best);
    if (res.moves === 0) break;
  }
  scorer.load(values);
  const parts = scorer.parts();
  const sessions: PlacedSession[] = [];
  for (let i = 0; i < n; i++) {
    const v = values[i]!;
    if (v < 0) continue;
    const r = space.roomOf(v);
    sessions.push({
      series: request.series[space.sessionSeries[i]!]!.id,
      cell: space.cellOf(v),
      room: r === request.rooms.length ? null : request.rooms[r]!.id,
    });
  }
  return {
    sessions,
    values,
    unplaced,
    score: { total: scorer.total(), parts },
    violations: countViolations(space, values),
    complete: unplaced.length === 0,
    stats: {
      variables: model.model.variableCount,
      searchNodes,
      moves,
      rounds,
      elapsedMs: elapsed(),
      initialCost,
    },
  };
}

/**
 * Greedy start (each session at its least-clashing candidate, sampled), then min-conflicts local
 * search; returns per-session values, or null when violations remain.
 */
function repair(
  space: WeekSpace,
  scorer: WeekScorer,
  series: readonly number[],
  seed: number,
  time: { timeMs?: number; clock?: () => number },
  moves: number,
): Int32Array | null {
  const model = buildImproveModel(space, series);
  const vals = new Int32Array(space.sessionCount).fill(-1);
  scorer.load(vals);
  const roomUse = new Uint16Array(space.request.cells.length * space.roomSlots);
  const R = space.request.rooms.length;
  for (const session of model.sessions) {
    const cand = space.candidates[space.sessionSeries[session]!]!;
    let bestValue = cand[0]!;
    let bestCost = Number.POSITIVE_INFINITY;
    const step = Math.max(1, Math.floor(cand.length / 256));
    for (let k = (session * 7) % step; k < cand.length; k += step) {
      const v = cand[k]!;
      const cost =
        scorer.delta(session, v, CLASH_WEIGHT) +
        (v % space.roomSlots !== R && roomUse[v]! > 0 ? CLASH_WEIGHT : 0);
      if (cost < bestCost) {
        bestCost = cost;
        bestValue = v;
      }
    }
    scorer.set(session, bestValue);
    vals[session] = bestValue;
    roomUse[bestValue]!++;
  }
  const res = improve(
    model.model,
    Array.from(model.sessions, (session) => vals[session]!),
    { method: 'min-conflicts', moves: ['change'], budget: { nodes: moves, ...time }, seed },
  );
  const out = new Int32Array(space.sessionCount).fill(-1);
  model.sessions.forEach((session, v) => {
    out[session] = res.assignment[v]!;
  });
  return res.violations === 0 && countViolations(space, out) === 0 ? out : null;
}

/** Names what leaves a series with no free start: a minimal set of attendees' availability, its hours, rooms. */
function explainNoStart(space: WeekSpace, series: number): WeekBlocker[] {
  const req = space.request;
  const s = req.series[series]!;
  const RS = space.roomSlots;
  const R = req.rooms.length;
  const b = new ModelBuilder();
  const v = b.addVariable(s.id, req.cells.length * RS);
  const cellOf = (x: number) => Math.floor(x / RS);
  b.addUnary(
    v,
    (x) => space.fits(cellOf(x), s.length) && (s.room === undefined ? x % RS === R : x % RS !== R),
    {
      name: 'shape',
    },
  );
  for (const a of new Set(s.attendees)) {
    const free = req.attendees[a]!.free;
    if (free === undefined) continue;
    b.addUnary(
      v,
      (x) => {
        const c = cellOf(x);
        for (let k = 0; k < s.length; k++) if (free[c + k] !== true) return false;
        return true;
      },
      { name: `attendee:${req.attendees[a]!.id}` },
    );
  }
  if (s.allowed !== undefined) {
    const allowed = s.allowed;
    b.addUnary(v, (x) => allowed[cellOf(x)] === true, { name: 'series-hours' });
  }
  if (s.room !== undefined) {
    const rooms = new Set(space.roomsFor(series));
    b.addUnary(
      v,
      (x) => {
        const r = x % RS;
        if (!rooms.has(r)) return false;
        const free = req.rooms[r]!.free;
        if (free === undefined) return true;
        const c = cellOf(x);
        for (let k = 0; k < s.length; k++) if (free[c + k] !== true) return false;
        return true;
      },
      { name: ROOM_GROUP },
    );
  }
  const model = b.build();
  const blame = model.groups.filter((g) => g !== 'shape');
  const conflict = minimalConflict(model, blame) ?? blame;
  return conflict.map(groupToBlocker).filter((x): x is WeekBlocker => x !== null);
}

/** Names a minimal set of series (and rooms) that together leave no place for `series`. */
function explainConflict(
  space: WeekSpace,
  model: WeekModel,
  series: number,
  time: { timeMs?: number; clock?: () => number },
): WeekBlocker[] {
  const blame = model.model.groups.filter((g) => g !== CHANNEL_GROUP);
  const conflict = minimalConflict(model.model, blame, { budget: { nodes: 200_000, ...time } });
  if (conflict === null) return [];
  const id = space.request.series[series]!.id;
  const out: WeekBlocker[] = [];
  const seen = new Set<string>();
  const push = (b: WeekBlocker) => {
    const key = JSON.stringify(b);
    if (!seen.has(key)) {
      seen.add(key);
      out.push(b);
    }
  };
  for (const g of conflict) {
    if (g.startsWith('with:')) {
      for (const other of g.slice(5).split('+')) if (other !== id) push({ kind: 'series', id: other });
      const [x, y] = g.slice(5).split('+');
      const req = space.request;
      const sx = req.series.find((s) => s.id === x);
      const sy = req.series.find((s) => s.id === y);
      if (sx !== undefined && sy !== undefined)
        for (const a of sx.attendees)
          if (sy.attendees.includes(a)) push({ kind: 'attendee', id: req.attendees[a]!.id });
    } else {
      const b = groupToBlocker(g);
      if (b !== null) push(b);
    }
  }
  return out;
}

function groupToBlocker(g: string): WeekBlocker | null {
  if (g.startsWith('attendee:')) return { kind: 'attendee', id: g.slice(9) };
  if (g === ROOM_GROUP) return { kind: 'rooms' };
  if (g === 'series-hours') return { kind: 'series-hours' };
  if (g.startsWith('self:')) return { kind: 'series', id: g.slice(5) };
  return null;
}
