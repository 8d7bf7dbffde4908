import {
  type AnnealOptions,
  anneal,
  improve,
  ModelBuilder,
  minimalConflict,
  type SolveResult,
  solve,
} from '../../solver/index.ts';
import {
  buildImproveModel,
  buildPlaceModel,
  CHANNEL_GROUP,
  countViolations,
  ROOM_GROUP,
  type WeekModel,
} from './week-model.ts';
import { WeekNeighbourhood, type WeekNeighbourhoodOptions } from './week-neighbourhood.ts';
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
  /**
   * Annealing moves tried in the improvement phase; the temperature cools once over this budget (or
   * over the time left). @default 20000, or no limit when `timeMs` is set
   */
  readonly moves?: number;
  /**
   * Annealing settings passed to the engine (temperatures, round growth, shares of swaps and chain
   * moves). @default swapShare 0.3, chainShare 0.2 and endShare 0.04 (tuned on the benchmark weeks), the rest the engine's
   */
  readonly annealing?: Pick<
    AnnealOptions,
    'startTemperature' | 'endShare' | 'growth' | 'swapShare' | 'chainShare'
  >;
  /** Settings of the week's moves. @default the neighbourhood's */
  readonly neighbourhood?: WeekNeighbourhoodOptions;
  /** With `timeMs`, how long placing (before any improvement) may take at most, in ms, even past `timeMs`. @default 10000 */
  readonly placeMs?: number;
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
  /** Time from the start until the first plan without hard violations (construction and repair), ms. */
  readonly feasibleMs: number;
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
  searchNodes: 200_000,
  seed: 1,
  placeMs: 10_000,
} satisfies Partial<PlanWeekOptions>;

/**
 * Places every series of a week jointly: the hard layer by the engine's search (forward checking,
 * MRV, three value orders in turn, min-conflicts repair when they run out), then the preference cost
 * by the engine's annealing over moves that keep the hard layer whole. Series that cannot fit are
 * left out, each with a minimal conflicting set.
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

  // Placing comes first and may run past a short time limit (up to `placeMs`): a plan that leaves
  // series out only because the clock ran out would be worse than a late one.
  const placeDeadline = deadline === undefined ? undefined : Math.max(deadline, o.placeMs);
  const timeBudget = (share: number) => {
    if (placeDeadline === undefined || clock === undefined) return {};
    return { timeMs: Math.max(1, Math.max(0, placeDeadline - elapsed()) * share), clock };
  };

  // 1. series that cannot fit even alone
  let active: number[] = [];
  request.series.forEach((s, i) => {
    const alone = explainAlone(space, i);
    if (alone !== null) unplaced.push({ series: s.id, code: 'no_free_start', blockers: alone });
    else active.push(i);
  });

  const R = request.rooms.length;
  const RS = space.roomSlots;
  // expected sessions wanting each cell, spread evenly over each series' candidate cells
  const demand = new Float64Array(request.cells.length);
  request.series.forEach((s, i) => {
    const cells = new Set(Array.from(space.candidates[i]!, (v) => space.cellOf(v)));
    for (const c of cells) demand[c]! += s.sessions / cells.size;
  });
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
    // Three value orders, each with a node budget, first success wins: cheapest-first (own cost, then
    // least-demanded cells) gives the best starts when it does not thrash; grid order places roomy
    // weeks without backtracking; least-constraining values are the fallback for tight weeks.
    const cheapFirst = (variable: number, value: number): number => {
      const session = model.sessions[variable]!;
      if (model.isStart[variable] === 0)
        return scorer.unaryCost(session, value) * 100 + demand[space.cellOf(value)]!;
      const ser = request.series[space.sessionSeries[session]!]!;
      return demand[value]! + (ser.room === undefined ? scorer.unaryCost(session, value * RS + R) * 100 : 0);
    };
    const vars = model.model.variableCount;
    const attempts = [
      { valueOrder: cheapFirst, nodes: 20 * vars + 1000, share: 0.5 },
      { valueOrder: 'natural' as const, nodes: 2 * vars + 100, share: 0.5 },
      { valueOrder: 'lcv' as const, nodes: o.searchNodes, share },
    ];
    let res: SolveResult | undefined;
    for (const a of attempts) {
      res = solve(model.model, {
        propagation: 'forward',
        variableOrder: 'mrv',
        valueOrder: a.valueOrder,
        budget: { nodes: a.nodes, ...timeBudget(a.share) },
        seed: o.seed,
      });
      searchNodes += res.stats.nodes;
      if (res.status !== 'incomplete') break;
    }
    const sol = res?.solutions[0];
    return {
      model,
      values: sol === undefined ? null : toValues(model, sol),
      proven: res?.status === 'unsatisfiable',
    };
  };

  // 2. the whole week at once
  let placed = trySolve(active, 0.8);
  report('place', Number.NaN);
  if (placed.values === null && !placed.proven) {
    // the search ran out of budget: repair a greedy start by local search
    const repaired = repair(space, scorer, active, o.seed, timeBudget(0.8), Math.min(o.moves, 1_000_000));
    if (repaired !== null) placed = { ...placed, values: repaired };
    report('repair', Number.NaN);
  }
  if (placed.values === null) {
    // 3. add series hardest first, in halving chunks: a chunk that fits is kept whole, one that does
    // not is split until the single series that does not fit are found and left out
    const order = [...active].sort(
      (a, b) =>
        space.candidates[a]!.length / request.series[a]!.sessions -
          space.candidates[b]!.length / request.series[b]!.sessions || a - b,
    );
    const kept: number[] = [];
    let last: Int32Array = new Int32Array(n).fill(-1);
    const add = (chunk: readonly number[]): void => {
      if (chunk.length === 0) return;
      const attempt = trySolve([...kept, ...chunk], 0.05);
      if (attempt.values !== null) {
        kept.push(...chunk);
        last = attempt.values;
        return;
      }
      if (chunk.length > 1) {
        const half = Math.ceil(chunk.length / 2);
        add(chunk.slice(0, half));
        add(chunk.slice(half));
        return;
      }
      const s = chunk[0]!;
      unplaced.push({
        series: request.series[s]!.id,
        code: attempt.proven ? 'conflict' : 'budget',
        blockers: attempt.proven ? explainConflict(space, kept, s, timeBudget(0.05)) : [],
      });
      report('place', Number.NaN);
    };
    add(order);
    active = kept;
    placed = { ...placed, values: last };
  }
  values.set(placed.values!);
  const feasibleMs = elapsed();
  active.sort((a, b) => a - b);
  const sessionsOf = Int32Array.from(
    active.flatMap((s) => {
      const out: number[] = [];
      for (let i = space.seriesFirst[s]!; i < space.seriesFirst[s + 1]!; i++) out.push(i);
      return out;
    }),
  );
  scorer.load(values);
  const initialCost = scorer.total();
  let best = initialCost;
  report('improve', best);

  // 4. improve the preference cost by the engine's annealing, moving sessions only where the hard
  // layer stays whole (the neighbourhood refuses any move that makes a clash)
  let moves = 0;
  let rounds = 0;
  const r = remaining();
  const timed = r !== undefined && clock !== undefined;
  if (sessionsOf.length > 0 && o.moves > 0 && (r === undefined || r > 0)) {
    const problem = new WeekNeighbourhood(space, scorer, sessionsOf, { seed: o.seed, ...o.neighbourhood });
    const res = anneal(problem, {
      budget: {
        ...(Number.isFinite(o.moves) ? { nodes: o.moves } : {}),
        ...(timed ? { timeMs: r, clock } : {}),
      },
      seed: o.seed,
      // preference costs are never negative: a plan at 0 cannot be beaten
      lowerBound: 0,
      swapShare: 0.3,
      chainShare: 0.2,
      // the cooling ends at 4% of its start: with the engine's 1%, a 60 s benchmark run found no
      // better plan in its last third, where the walk took almost no worsening move
      endShare: 0.04,
      ...o.annealing,
      onProgress: (p) => report('improve', Math.min(best, p.best)),
    });
    moves = res.moves;
    rounds = res.rounds;
    const candidate = new Int32Array(values);
    sessionsOf.forEach((session, v) => {
      candidate[session] = res.values[v]!;
    });
    scorer.load(candidate);
    const cost = scorer.total();
    if (
      cost < best - 1e-9 &&
      scorer.clashes() === 0 &&
      scorer.roomClashes() === 0 &&
      countViolations(space, candidate) === 0
    ) {
      best = cost;
      values.set(candidate);
    }
    report('improve', best);
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
      variables: sessionsOf.length,
      searchNodes,
      moves,
      rounds,
      elapsedMs: elapsed(),
      initialCost,
      feasibleMs,
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

/**
 * Checks one series alone: its sessions need distinct, non-overlapping starts where every attendee
 * is free, the series' hours allow and a fitting room is free. Null when it fits alone; otherwise a
 * minimal set of what blocks it (attendees' availability, its hours, the rooms).
 */
function explainAlone(space: WeekSpace, series: number): WeekBlocker[] | null {
  const req = space.request;
  const s = req.series[series]!;
  // fast path: earliest-first packing of candidate starts finds `sessions` non-overlapping ones
  let found = 0;
  let nextFree = -1;
  for (const v of space.candidates[series]!) {
    const c = space.cellOf(v);
    if (c < nextFree) continue;
    found++;
    nextFree = c + s.length;
    if (found >= s.sessions) return null;
  }
  const C = req.cells.length;
  const b = new ModelBuilder();
  const vars = Array.from({ length: s.sessions }, (_, k) => b.addVariable(`${s.id}#${k}`, C));
  const rooms = s.room === undefined ? [] : space.roomsFor(series);
  for (const v of vars) {
    b.addUnary(v, (c) => space.fits(c, s.length), { name: 'shape' });
    for (const a of new Set(s.attendees)) {
      const free = req.attendees[a]!.free;
      if (free === undefined) continue;
      b.addUnary(
        v,
        (c) => {
          for (let k = 0; k < s.length; k++) if (free[c + k] !== true) return false;
          return true;
        },
        { name: `attendee:${req.attendees[a]!.id}` },
      );
    }
    if (s.allowed !== undefined) {
      const allowed = s.allowed;
      b.addUnary(v, (c) => allowed[c] === true, { name: 'series-hours' });
    }
    if (s.room !== undefined)
      b.addUnary(
        v,
        (c) =>
          rooms.some((r) => {
            const free = req.rooms[r]!.free;
            if (free === undefined) return true;
            for (let k = 0; k < s.length; k++) if (free[c + k] !== true) return false;
            return true;
          }),
        { name: ROOM_GROUP },
      );
  }
  for (let x = 0; x < vars.length; x++)
    for (let y = x + 1; y < vars.length; y++)
      for (let k = -(s.length - 1); k <= s.length - 1; k++)
        b.addNotEqualOffset(vars[x]!, vars[y]!, k, { name: 'shape' });
  const model = b.build();
  const blame = model.groups.filter((g) => g !== 'shape');
  const res = solve(model, { budget: { nodes: 20_000 } });
  if (res.status !== 'unsatisfiable') return null;
  const conflict = minimalConflict(model, blame, { budget: { nodes: 20_000 } }) ?? blame;
  return conflict.map(groupToBlocker).filter((x): x is WeekBlocker => x !== null);
}

/**
 * Names a minimal set of series (and rooms) that, placed, leave no place for `series`: the conflict
 * is searched in the model of `series` and the kept series that share an attendee or a room with it.
 */
function explainConflict(
  space: WeekSpace,
  kept: readonly number[],
  series: number,
  time: { timeMs?: number; clock?: () => number },
): WeekBlocker[] {
  const req = space.request;
  const mine = new Set(req.series[series]!.attendees);
  const rooms = new Set(space.roomsFor(series));
  const near = kept.filter(
    (k) => req.series[k]!.attendees.some((a) => mine.has(a)) || space.roomsFor(k).some((r) => rooms.has(r)),
  );
  const model = buildPlaceModel(space, [...near, series]);
  const blame = model.model.groups.filter((g) => g !== CHANNEL_GROUP);
  const conflict = minimalConflict(model.model, blame, { budget: { nodes: 20_000, ...time } });
  if (conflict === null) return [];
  const id = req.series[series]!.id;
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
