import { describe, expect, it, vi } from 'vitest';
import {
  type PlacedSession,
  planWeek,
  syntheticWeek,
  type WeekRequest,
  WeekSpace,
  ZERO_WEIGHTS,
} from '../../../src/scheduling/week/index.ts';
import {
  WeekNeighbourhood,
  type WeekNeighbourhoodOptions,
} from '../../../src/scheduling/week/week-neighbourhood.ts';
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
  let chains = 0;
  for (let k = 0; k < steps; k++) {
    const v = rng.int(p.size);
    const before = Array.from(placed, (_, x) => p.value(x));
    let ok: boolean;
    const kind = rng.next();
    const dom = p.domain(v);
    const value = dom[rng.int(dom.length)]!;
    if (kind < 0.33) ok = p.tryChange(v, value, () => true);
    else if (kind < 0.66) ok = p.tryChain(v, value, () => rng.next() < 0.7);
    else ok = p.trySwap(v, rng.int(p.size), () => rng.next() < 0.5);
    if (ok) {
      taken++;
      if (kind >= 0.33 && kind < 0.66) chains++;
    } else {
      refused++;
      // a refused (or rejected) move leaves every session where it was
      expect(Array.from(placed, (_, x) => p.value(x))).toEqual(before);
    }
  }
  return { p, space, scorer, taken, refused, chains };
}

describe('WeekNeighbourhood (moves the annealing may make in a week plan)', () => {
  it('keeps a synthetic week free of clashes by an independent check, and its running cost exact', () => {
    const req = syntheticWeek({ series: 60, people: 40, rooms: 6, seed: 4 });
    const { p, space, scorer, taken, refused, chains } = walk(req, 4000, 4);
    expect(taken).toBeGreaterThan(100);
    expect(chains).toBeGreaterThan(20);
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

describe('WeekNeighbourhood chain moves', () => {
  // invented: one day of three one-hour cells, two people, no rooms
  const HOUR = 3_600_000;
  const req: WeekRequest = {
    cells: [0, 1, 2].map((c) => ({ start: c * HOUR, end: (c + 1) * HOUR, day: 0 })),
    days: 1,
    rooms: [],
    attendees: [{ id: 'p' }, { id: 'q' }],
    series: [
      { id: 'a', attendees: [0], sessions: 1, minDays: 1, length: 1 },
      { id: 'b', attendees: [0, 1], sessions: 1, minDays: 1, length: 1 },
      { id: 'c', attendees: [1], sessions: 1, minDays: 1, length: 1 },
    ],
    weights: { ...ZERO_WEIGHTS },
    seatsHard: true,
  };

  it('moves a session into a cell it clashes with by sending the clashing ones the other way', () => {
    const space = new WeekSpace(req);
    const scorer = new WeekScorer(space);
    // a at cell 0, b at cell 1, c at cell 0 (value = cell x room slots, one slot: no room)
    scorer.load([0, 1, 0]);
    // (no proposal passed over unpriced: the test names each move it wants made)
    const p = new WeekNeighbourhood(space, scorer, Int32Array.from([0, 1, 2]), { focusShare: 0 });
    // a plain move of a to cell 1 clashes with b (both have p)
    expect(p.tryChange(0, 1, () => true)).toBe(false);
    // the chain: a to 1, b (shares p with a) to 0, then c (shares q with b, at 0) to 1
    let seen = Number.NaN;
    expect(
      p.tryChain(0, 1, (d) => {
        seen = d;
        return true;
      }),
    ).toBe(true);
    expect([p.value(0), p.value(1), p.value(2)]).toEqual([1, 0, 1]);
    expect(seen).toBe(0);
    expect(planProblems(req, sessionsOf(space, scorer))).toEqual([]);
  });

  it('leaves everything in place when the acceptance says no', () => {
    const space = new WeekSpace(req);
    const scorer = new WeekScorer(space);
    scorer.load([0, 1, 0]);
    // (no proposal passed over unpriced: the test names each move it wants made)
    const p = new WeekNeighbourhood(space, scorer, Int32Array.from([0, 1, 2]), { focusShare: 0 });
    expect(p.tryChain(0, 1, () => false)).toBe(false);
    expect([p.value(0), p.value(1), p.value(2)]).toEqual([0, 1, 0]);
  });
});

describe('WeekScorer.touch and touchedCost', () => {
  it('price several sessions moved at once exactly as a fresh count of the plans before and after', () => {
    const req = syntheticWeek({ series: 50, people: 30, rooms: 5, seed: 12 });
    const start = planWeek(req, { moves: 0, seed: 12 });
    const space = new WeekSpace(req);
    const scorer = new WeekScorer(space);
    scorer.load(start.values);
    const rng = new Prng(12);
    const fresh = new WeekScorer(space);
    for (let round = 0; round < 40; round++) {
      const ids: number[] = [];
      const values: number[] = [];
      for (let k = 0; k < 1 + rng.int(6); k++) {
        const session = rng.int(space.sessionCount);
        if (ids.includes(session)) continue;
        const cand = space.candidates[space.sessionSeries[session]!]!;
        ids.push(session);
        // now and then a session is taken out of the plan
        values.push(rng.next() < 0.1 ? -1 : cand[rng.int(cand.length)]!);
      }
      fresh.load(Array.from({ length: space.sessionCount }, (_, i) => scorer.valueOf(i)));
      const before = fresh.total();
      // every start cell a session leaves or takes is touched
      const cells = new Set<number>();
      ids.forEach((session, k) => {
        for (const v of [scorer.valueOf(session), values[k]!]) if (v >= 0) cells.add(space.cellOf(v));
      });
      const priced = scorer.touch(ids, ids.length, [...cells]);
      for (let k = 0; k < ids.length; k++) scorer.set(ids[k]!, values[k]!);
      const d = scorer.touchedCost(ids, ids.length) - priced;
      fresh.load(Array.from({ length: space.sessionCount }, (_, i) => scorer.valueOf(i)));
      expect(d).toBeCloseTo(fresh.total() - before, 6);
    }
  });
});

describe('WeekNeighbourhood room choices', () => {
  // invented: one day of four one-hour cells, three rooms (two large, one small), two people
  const HOUR = 3_600_000;
  const base = {
    cells: [0, 1, 2, 3].map((c) => ({ start: c * HOUR, end: (c + 1) * HOUR, day: 0 })),
    days: 1,
    rooms: [
      { id: 'big', seats: 10, features: [] },
      { id: 'small', seats: 2, features: [] },
      { id: 'large', seats: 10, features: [] },
    ],
    attendees: [{ id: 'p' }, { id: 'q' }],
    weights: { ...ZERO_WEIGHTS, roomStability: 1, seats: 1 },
    seatsHard: false,
  };
  const need = { seats: 8, features: [] };
  const RS = 4; // three rooms and the "no room" slot
  const at = (cell: number, room: number) => cell * RS + room;
  const BIG = 0;
  const SMALL = 1;
  const LARGE = 2;
  /**
   * The moves over every session of the plan the scorer holds; no proposal is passed over unpriced
   * unless the options ask for it (the tests name each move they want made).
   */
  const movesOf = (space: WeekSpace, scorer: WeekScorer, options: WeekNeighbourhoodOptions = {}) =>
    new WeekNeighbourhood(
      space,
      scorer,
      Int32Array.from({ length: space.sessionCount }, (_, i) => i),
      { focusShare: 0, ...options },
    );

  it('a move to another start keeps the room when asked to, whatever room the proposal named', () => {
    const req: WeekRequest = {
      ...base,
      series: [{ id: 'a', attendees: [0], sessions: 2, minDays: 1, length: 1, room: need }],
    };
    const space = new WeekSpace(req);
    const scorer = new WeekScorer(space);
    scorer.load([at(0, BIG), at(1, BIG)]);
    const keep = movesOf(space, scorer, {
      keepRoomShare: 1,
      roomMoveShare: 0,
    });
    // proposed: cell 2 in small; made: cell 2 in big, so room stability stays whole
    expect(keep.tryChange(1, at(2, SMALL), () => true)).toBe(true);
    expect(keep.value(1)).toBe(at(2, BIG));
    expect(scorer.parts()).toMatchObject({ roomStability: 0, seats: 0 });
    // without keeping, the named room is taken
    const named = movesOf(space, scorer, {
      keepRoomShare: 0,
      roomMoveShare: 0,
    });
    expect(named.tryChange(1, at(3, SMALL), () => true)).toBe(true);
    expect(named.value(1)).toBe(at(3, SMALL));
    expect(scorer.parts()).toMatchObject({ roomStability: 1, seats: 6 });
  });

  it('a room move takes the room its series uses most, at the same start', () => {
    const req: WeekRequest = {
      ...base,
      series: [{ id: 'a', attendees: [0], sessions: 3, minDays: 1, length: 1, room: need }],
    };
    const space = new WeekSpace(req);
    const scorer = new WeekScorer(space);
    // two sessions in big, one in small
    scorer.load([at(0, BIG), at(1, SMALL), at(2, BIG)]);
    const p = movesOf(space, scorer, { roomMoveShare: 1 });
    let seen = Number.NaN;
    expect(
      p.tryChange(1, at(3, LARGE), (d) => {
        seen = d;
        return true;
      }),
    ).toBe(true);
    // still at cell 1, now in big: one room less and six missing seats less
    expect(p.value(1)).toBe(at(1, BIG));
    expect(seen).toBe(-7);
    // every session is in the series' main room now: a room move has nothing to do
    expect(p.tryChange(0, at(2, SMALL), () => true)).toBe(false);
    expect([p.value(0), p.value(1), p.value(2)]).toEqual([at(0, BIG), at(1, BIG), at(2, BIG)]);
  });

  it('refuses move settings outside their range, saying which', () => {
    const req: WeekRequest = {
      ...base,
      series: [{ id: 'a', attendees: [0], sessions: 1, minDays: 1, length: 1, room: need }],
    };
    const space = new WeekSpace(req);
    const scorer = new WeekScorer(space);
    scorer.load([at(0, BIG)]);
    const make = (options: WeekNeighbourhoodOptions) => movesOf(space, scorer, options);
    expect(() => make({ keepRoomShare: 1.5 })).toThrow(/keepRoomShare/);
    expect(() => make({ roomMoveShare: -0.1 })).toThrow(/roomMoveShare/);
    expect(() => make({ roomPulls: 1.5 })).toThrow(/roomPulls/);
    expect(() => make({ focusShare: 1 })).toThrow(/focusShare at least 0 and below 1/);
    expect(() => make({ focusShare: -0.5 })).toThrow(/focusShare/);
    expect(make({ keepRoomShare: 0, roomMoveShare: 1, roomPulls: 0 }).size).toBe(1);
  });

  // one room only; a (attended by p) and b (by q) share nobody
  const oneRoom: WeekRequest = {
    ...base,
    rooms: [{ id: 'only', seats: 10, features: [] }],
    series: [
      { id: 'a', attendees: [0], sessions: 1, minDays: 1, length: 1, room: need },
      { id: 'b', attendees: [1], sessions: 1, minDays: 1, length: 1, room: need },
    ],
  };

  it('a chain whose member finds no free room takes along the session holding its room', () => {
    const req = oneRoom;
    const space = new WeekSpace(req);
    const ONLY = 0;
    const slots = 2; // one room and the "no room" slot
    const scorer = new WeekScorer(space);
    // a (p) at cell 0 and b (q) at cell 1, both in the only room: nobody clashes, but a chain that
    // moves a to cell 1 finds its room taken
    scorer.load([0 * slots + ONLY, 1 * slots + ONLY]);
    const none = movesOf(space, scorer, { roomPulls: 0 });
    expect(none.tryChain(0, 1 * slots + ONLY, () => true)).toBe(false);
    expect([none.value(0), none.value(1)]).toEqual([0 * slots + ONLY, 1 * slots + ONLY]);
    const pull = movesOf(space, scorer);
    expect(pull.tryChain(0, 1 * slots + ONLY, () => true)).toBe(true);
    expect([pull.value(0), pull.value(1)]).toEqual([1 * slots + ONLY, 0 * slots + ONLY]);
    expect(planProblems(req, sessionsOf(space, scorer))).toEqual([]);
  });

  it('refuses a chain before pricing it when a member has no room it could take at its new start', () => {
    const space = new WeekSpace(oneRoom);
    const slots = 2; // one room and the "no room" slot
    const scorer = new WeekScorer(space);
    scorer.load([0 * slots, 2 * slots]);
    const touch = vi.spyOn(scorer, 'touch');
    const moves = movesOf(space, scorer, { roomPulls: 0 });
    let asked = 0;
    const accept = () => {
      asked++;
      return true;
    };
    // b holds the only room at cell 2 and shares nobody with a: a's chain to cell 2 cannot place a
    expect(moves.tryChain(0, 2 * slots, accept)).toBe(false);
    expect(touch).not.toHaveBeenCalled();
    expect(asked).toBe(0);
    expect([moves.value(0), moves.value(1)]).toEqual([0 * slots, 2 * slots]);
    // to cell 1, where the room is free, the chain is priced and made
    expect(moves.tryChain(0, 1 * slots, accept)).toBe(true);
    expect(touch).toHaveBeenCalledTimes(1);
    expect(asked).toBe(1);
    expect(moves.value(0)).toBe(1 * slots);
  });

  it("takes the cheapest free room when the kept room's holder cannot exchange places", () => {
    const req: WeekRequest = {
      ...base,
      series: [
        { id: 'a', attendees: [0], sessions: 1, minDays: 1, length: 1, room: need },
        { id: 'b', attendees: [1], sessions: 1, minDays: 1, length: 1, room: need },
        { id: 'd', attendees: [1], sessions: 1, minDays: 1, length: 1, room: need },
      ],
    };
    const space = new WeekSpace(req);
    // a at 0 in big, b at 1 in big, d at 0 in small: b cannot take a's place (q meets d there)
    const values = [at(0, BIG), at(1, BIG), at(0, SMALL)];
    const scorer = new WeekScorer(space);
    scorer.load(values);
    const refuse = movesOf(space, scorer, {
      keepRoomShare: 1,
      roomMoveShare: 0,
      otherRoom: false,
    });
    expect(refuse.tryChange(0, at(1, SMALL), () => true)).toBe(false);
    expect(refuse.value(0)).toBe(at(0, BIG));
    const fallBack = movesOf(space, scorer, {
      keepRoomShare: 1,
      roomMoveShare: 0,
    });
    // small would miss six seats, large none: large
    expect(fallBack.tryChange(0, at(1, SMALL), () => true)).toBe(true);
    expect([fallBack.value(0), fallBack.value(1), fallBack.value(2)]).toEqual([
      at(1, LARGE),
      at(1, BIG),
      at(0, SMALL),
    ]);
    expect(planProblems(req, sessionsOf(space, scorer))).toEqual([]);
  });
});

describe('WeekNeighbourhood focus on sessions that carry cost', () => {
  // invented: one day of four back-to-back hours; p and q opted in to compactness
  const HOUR = 3_600_000;
  const req: WeekRequest = {
    cells: [0, 1, 2, 3].map((c) => ({ start: c * HOUR, end: (c + 1) * HOUR, day: 0 })),
    days: 1,
    rooms: [],
    attendees: [
      { id: 'p', compact: true },
      { id: 'q', compact: true },
    ],
    series: [
      { id: 'a', attendees: [0], sessions: 1, minDays: 1, length: 1 },
      { id: 'b', attendees: [0], sessions: 1, minDays: 1, length: 1 },
      { id: 'c', attendees: [1], sessions: 1, minDays: 1, length: 1 },
    ],
    weights: { ...ZERO_WEIGHTS, isolated: 1 },
    seatsHard: true,
  };
  const RS = 1; // no rooms: only the "no room" slot

  /** How many of `tries` proposals from each session reach pricing, with the given focus share. */
  function priced(focusShare: number, tries: number): number[] {
    const space = new WeekSpace(req);
    const scorer = new WeekScorer(space);
    // a and b back to back (settled); c alone, so isolated (carries cost)
    scorer.load([0 * RS, 1 * RS, 3 * RS]);
    expect([0, 1, 2].map((s) => scorer.settled(s))).toEqual([true, true, false]);
    const moves = new WeekNeighbourhood(space, scorer, Int32Array.from([0, 1, 2]), { focusShare, seed: 5 });
    return [0, 1, 2].map((v) => {
      let count = 0;
      for (let i = 0; i < tries; i++)
        moves.tryChange(v, 2 * RS, () => {
          count++;
          return false;
        });
      return count;
    });
  }

  it('passes over about focusShare of the proposals from settled sessions, none from the others', () => {
    const [a, b, c] = priced(0.75, 400);
    // about a quarter of 400 priced for each settled session (binomial: 100 +- 9 for one sigma)
    expect(a).toBeGreaterThan(60);
    expect(a).toBeLessThan(140);
    expect(b).toBeGreaterThan(60);
    expect(b).toBeLessThan(140);
    expect(c).toBe(400);
    // with no focus every proposal is priced
    expect(priced(0, 400)).toEqual([400, 400, 400]);
  });
});
