import { describe, expect, it } from 'vitest';
import {
  type PlacedSession,
  planWeek,
  syntheticWeek,
  type WeekRequest,
  WeekSpace,
} from '../../../src/scheduling/week/index.ts';
import { WeekNeighbourhood } from '../../../src/scheduling/week/week-neighbourhood.ts';
import { WeekScorer } from '../../../src/scheduling/week/week-scorer.ts';
import { Prng } from '../../../src/solver/index.ts';
import { planProblems } from './plan-checker.ts';

function sessionsOf(space: WeekSpace, scorer: WeekScorer): PlacedSession[] {
  const req = space.request;
  const out: PlacedSession[] = [];
  for (let i = 0; i < space.sessionCount; i++) {
    const v = scorer.valueOf(i);
    if (v < 0) continue;
    const r = space.roomOf(v);
    out.push({
      series: req.series[space.sessionSeries[i]!]!.id,
      cell: space.cellOf(v),
      room: r === req.rooms.length ? null : req.rooms[r]!.id,
    });
  }
  return out;
}

/** Walks a plan with random moves that are all accepted when allowed (an infinitely hot walk). */
function walk(req: WeekRequest, steps: number, seed: number) {
  const start = planWeek(req, { moves: 0, seed });
  const space = new WeekSpace(req);
  const scorer = new WeekScorer(space);
  scorer.load(start.values);
  const placed = Int32Array.from(Array.from(start.values.keys()).filter((i) => start.values[i]! >= 0));
  const p = new WeekNeighbourhood(space, scorer, placed);
  const rng = new Prng(seed);
  let taken = 0;
  let refused = 0;
  for (let k = 0; k < steps; k++) {
    const v = rng.int(p.size);
    const before = Array.from(placed, (_, x) => p.value(x));
    let ok: boolean;
    if (rng.next() < 0.5) {
      const dom = p.domain(v);
      ok = p.tryChange(v, dom[rng.int(dom.length)]!, () => true);
    } else ok = p.trySwap(v, rng.int(p.size), () => rng.next() < 0.5);
    if (ok) taken++;
    else {
      refused++;
      // a refused (or rejected) move leaves every session where it was
      expect(Array.from(placed, (_, x) => p.value(x))).toEqual(before);
    }
  }
  return { p, space, scorer, taken, refused };
}

describe('WeekNeighbourhood (moves the annealing may make in a week plan)', () => {
  it('keeps a synthetic week free of clashes by an independent check, and its running cost exact', () => {
    const req = syntheticWeek({ series: 60, people: 40, rooms: 6, seed: 4 });
    const { p, space, scorer, taken, refused } = walk(req, 4000, 4);
    expect(taken).toBeGreaterThan(100);
    expect(refused).toBeGreaterThan(100);
    expect(planProblems(req, sessionsOf(space, scorer))).toEqual([]);
    // the cost carried move by move equals a fresh count of the same plan
    const fresh = new WeekScorer(space);
    fresh.load(Array.from({ length: space.sessionCount }, (_, i) => scorer.valueOf(i)));
    expect(p.cost()).toBeCloseTo(fresh.total(), 6);
  });

  it('never puts two sessions in one room at one time, even when moves aim at taken rooms', () => {
    // few rooms: most moves aim at a start and room someone holds and become exchanges
    const req = syntheticWeek({ series: 40, people: 60, rooms: 2, busyChance: 0.1, seed: 9 });
    const { space, scorer, taken } = walk(req, 3000, 9);
    expect(taken).toBeGreaterThan(50);
    expect(planProblems(req, sessionsOf(space, scorer))).toEqual([]);
  });
});
