import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { type WeekRequest, ZERO_WEIGHTS } from '../../../src/scheduling/week/week-request.ts';
import { WeekScorer } from '../../../src/scheduling/week/week-scorer.ts';
import { WeekSpace } from '../../../src/scheduling/week/week-space.ts';

// Hand-computed costs on tiny weeks: 3 days x 4 contiguous one-hour cells (cell = day * 4 + hour).
const HOUR = 3_600_000;
const cells = Array.from({ length: 12 }, (_, c) => ({
  start: Math.floor(c / 4) * 24 * HOUR + (c % 4) * HOUR,
  end: Math.floor(c / 4) * 24 * HOUR + ((c % 4) + 1) * HOUR,
  day: Math.floor(c / 4),
}));
const rooms = [
  { id: 'small', seats: 2, features: [] },
  { id: 'large', seats: 4, features: ['screen'] },
];
const NONE = rooms.length; // room slot "no room"
const RS = rooms.length + 1;
const v = (cell: number, room: number = NONE) => cell * RS + room;

function request(over: Partial<WeekRequest>): WeekRequest {
  return {
    cells,
    days: 3,
    rooms,
    attendees: [{ id: 'a', compact: true }, { id: 'b' }],
    series: [],
    weights: ZERO_WEIGHTS,
    seatsHard: true,
    ...over,
  };
}

function score(req: WeekRequest, values: number[]) {
  const scorer = new WeekScorer(new WeekSpace(req));
  scorer.load(values);
  return { parts: scorer.parts(), total: scorer.total(), clashes: scorer.clashes() };
}

describe('WeekScorer, hand-computed costs per preference kind', () => {
  it('isolated meetings of an attendee who opted in cost one weight each', () => {
    const req = request({
      weights: { ...ZERO_WEIGHTS, isolated: 2 },
      series: [
        { id: 'x', attendees: [0, 1], sessions: 1, minDays: 1, length: 1 },
        { id: 'y', attendees: [0], sessions: 1, minDays: 1, length: 2 },
      ],
    });
    // x at 0, y at 2-3 on day 0: a has two runs of one meeting each -> 2 x 2 = 4; b did not opt in
    expect(score(req, [v(0), v(2)]).parts.isolated).toBe(4);
    // y right after x (cells 1-2): one run holding two meetings -> 0
    expect(score(req, [v(0), v(1)]).parts.isolated).toBe(0);
    // different days -> both isolated again
    expect(score(req, [v(0), v(5)]).parts.isolated).toBe(4);
    // days do not join: x at the last cell of day 0, y at the first of day 1
    expect(score(req, [v(3), v(4)]).parts.isolated).toBe(4);
  });

  it('spread costs its weight per day missing below minDays', () => {
    const req = request({
      weights: { ...ZERO_WEIGHTS, spread: 5 },
      series: [{ id: 'x', attendees: [0], sessions: 3, minDays: 3, length: 1 }],
    });
    expect(score(req, [v(0), v(1), v(2)]).parts.spread).toBe(10); // 1 day of 3
    expect(score(req, [v(0), v(1), v(4)]).parts.spread).toBe(5); // 2 days
    expect(score(req, [v(0), v(4), v(8)]).parts.spread).toBe(0);
  });

  it('room stability costs its weight per room beyond the first', () => {
    const req = request({
      weights: { ...ZERO_WEIGHTS, roomStability: 1 },
      series: [
        { id: 'x', attendees: [0], sessions: 3, minDays: 1, length: 1, room: { seats: 1, features: [] } },
      ],
    });
    expect(score(req, [v(0, 0), v(4, 0), v(8, 0)]).parts.roomStability).toBe(0);
    expect(score(req, [v(0, 0), v(4, 1), v(8, 0)]).parts.roomStability).toBe(1);
  });

  it('preferred days and hours cost their weights per session outside them', () => {
    const req = request({
      weights: { ...ZERO_WEIGHTS, preferredDays: 3, preferredHours: 7 },
      series: [
        {
          id: 'x',
          attendees: [0],
          sessions: 2,
          minDays: 1,
          length: 1,
          preferredDays: [true, false, false],
          preferredStarts: cells.map((_, c) => c % 4 < 2),
        },
      ],
    });
    // cell 0: preferred day and hour; cell 6: day 1 (not preferred), hour 2 (not preferred)
    const r = score(req, [v(0), v(6)]);
    expect(r.parts.preferredDays).toBe(3);
    expect(r.parts.preferredHours).toBe(7);
    expect(r.total).toBe(10);
  });

  it('usual hours cost weight x hours x the attendee weight, per attendee', () => {
    const offHours = cells.map((_, c) => (c % 4 === 3 ? 1 : 0));
    const req = request({
      weights: { ...ZERO_WEIGHTS, usualHours: 1.5 },
      attendees: [
        { id: 'a', offHours, offHoursWeight: 2 },
        { id: 'b', offHours },
      ],
      series: [{ id: 'x', attendees: [0, 1], sessions: 1, minDays: 1, length: 2 }],
    });
    // cells 2-3: one off-hours hour for a (weight 2) and for b (weight 1): 1.5 x (2 + 1) = 4.5
    expect(score(req, [v(2)]).parts.usualHours).toBe(4.5);
    expect(score(req, [v(1)]).parts.usualHours).toBe(0);
  });

  it('moves cost their weight per session not at last week start and room', () => {
    const req = request({
      weights: { ...ZERO_WEIGHTS, moves: 4 },
      series: [
        { id: 'x', attendees: [0], sessions: 2, minDays: 1, length: 1, room: { seats: 1, features: [] } },
      ],
      lastWeek: [
        { series: 'x', cell: 0, room: 'small' },
        { series: 'x', cell: 4, room: 'small' },
      ],
    });
    expect(score(req, [v(4, 0), v(0, 0)]).parts.moves).toBe(0);
    expect(score(req, [v(0, 0), v(5, 0)]).parts.moves).toBe(4); // one moved in time
    expect(score(req, [v(0, 1), v(4, 1)]).parts.moves).toBe(8); // both moved to another room
  });

  it('missing seats cost their weight per seat when seats are soft', () => {
    const req = request({
      weights: { ...ZERO_WEIGHTS, seats: 1 },
      seatsHard: false,
      series: [
        { id: 'x', attendees: [0, 1], sessions: 1, minDays: 1, length: 1, room: { seats: 5, features: [] } },
      ],
    });
    expect(score(req, [v(0, 0)]).parts.seats).toBe(3);
    expect(score(req, [v(0, 1)]).parts.seats).toBe(1);
  });

  it('counts clashes of an attendee per cell and extra session', () => {
    const req = request({
      series: [
        { id: 'x', attendees: [0], sessions: 1, minDays: 1, length: 2 },
        { id: 'y', attendees: [0, 1], sessions: 1, minDays: 1, length: 2 },
      ],
    });
    expect(score(req, [v(0), v(1)]).clashes).toBe(1);
    expect(score(req, [v(0), v(0)]).clashes).toBe(2);
    expect(score(req, [v(0), v(2)]).clashes).toBe(0);
  });

  it('counts room double-bookings per room-cell and extra session, never for "no room"', () => {
    const req = request({
      series: [
        { id: 'x', attendees: [0], sessions: 1, minDays: 1, length: 2, room: { seats: 1, features: [] } },
        { id: 'y', attendees: [1], sessions: 1, minDays: 1, length: 1, room: { seats: 1, features: [] } },
        { id: 'z', attendees: [1], sessions: 1, minDays: 1, length: 1 },
      ],
    });
    const scorer = new WeekScorer(new WeekSpace(req));
    scorer.load([v(0, 0), v(1, 0), v(5)]);
    expect(scorer.roomClashes()).toBe(1);
    scorer.load([v(0, 0), v(1, 1), v(5)]);
    expect(scorer.roomClashes()).toBe(0);
    // delta with a room-clash weight sees the clash it would add
    expect(scorer.delta(1, v(1, 0), 0, 100)).toBe(100);
  });
});

describe('WeekScorer.delta', () => {
  it('equals the change of the full cost for random plans and moves', () => {
    const req = request({
      weights: {
        spread: 5,
        isolated: 2,
        roomStability: 1,
        preferredDays: 3,
        preferredHours: 2,
        usualHours: 1,
        moves: 4,
        seats: 1,
        rules: 1,
      },
      seatsHard: false,
      attendees: [
        { id: 'a', compact: true, offHours: cells.map((_, c) => (c % 4 === 0 ? 1 : 0)) },
        { id: 'b', compact: true, ruleCost: cells.map((_, c) => c % 3) },
        { id: 'c' },
      ],
      series: [
        { id: 'x', attendees: [0, 1], sessions: 2, minDays: 2, length: 1, room: { seats: 3, features: [] } },
        {
          id: 'y',
          attendees: [0, 2],
          sessions: 2,
          minDays: 2,
          length: 2,
          preferredDays: [false, true, true],
        },
        {
          id: 'z',
          attendees: [1, 2],
          sessions: 1,
          minDays: 1,
          length: 1,
          preferredStarts: cells.map((_, c) => c % 2 === 0),
        },
      ],
      lastWeek: [
        { series: 'x', cell: 1, room: 'small' },
        { series: 'y', cell: 4, room: null },
      ],
    });
    const space = new WeekSpace(req);
    const cand = space.candidates;
    const pick = (s: number) => fc.integer({ min: 0, max: cand[s]!.length - 1 }).map((k) => cand[s]![k]!);
    fc.assert(
      fc.property(
        fc.tuple(pick(0), pick(0), pick(1), pick(1), pick(2)),
        fc.integer({ min: 0, max: 4 }),
        fc.integer({ min: 0, max: 1000 }),
        (plan, session, k) => {
          const s = space.sessionSeries[session]!;
          const next = cand[s]![k % cand[s]!.length]!;
          const scorer = new WeekScorer(space);
          scorer.load(plan);
          const before = scorer.total() + scorer.clashes() * 100;
          const d = scorer.delta(session, next, 100);
          // delta leaves the state unchanged
          expect(scorer.total() + scorer.clashes() * 100).toBeCloseTo(before, 9);
          const moved = [...plan];
          moved[session] = next;
          scorer.load(moved);
          expect(scorer.total() + scorer.clashes() * 100 - before).toBeCloseTo(d, 9);
        },
      ),
      { numRuns: 300, seed: 42 },
    );
  });
});

describe('WeekScorer on long days (isolated meetings counted only around a move)', () => {
  // invented: two days of 20 half-hour cells, with a break between cells 9 and 10 of each day (the
  // 10th cell does not continue the 9th), so runs end at the break and at the day's edges
  const HALF = 1_800_000;
  const longCells = Array.from({ length: 40 }, (_, c) => {
    const day = Math.floor(c / 20);
    const slot = c % 20;
    const start = day * 48 * HALF + (slot + (slot >= 10 ? 1 : 0)) * HALF;
    return { start, end: start + HALF, day };
  });
  const req: WeekRequest = {
    cells: longCells,
    days: 2,
    rooms,
    attendees: [{ id: 'a', compact: true }, { id: 'b', compact: true }, { id: 'c' }],
    series: [
      { id: 'one', attendees: [0, 1], sessions: 3, minDays: 1, length: 1 },
      { id: 'two', attendees: [0, 2], sessions: 2, minDays: 1, length: 2 },
      { id: 'three', attendees: [1], sessions: 2, minDays: 1, length: 3 },
      { id: 'four', attendees: [0], sessions: 3, minDays: 2, length: 1 },
    ],
    weights: { ...ZERO_WEIGHTS, isolated: 2, spread: 5 },
    seatsHard: true,
  };
  const space = new WeekSpace(req);
  const cand = space.candidates;
  const n = space.sessionCount;
  const plans = fc.tuple(
    ...Array.from({ length: n }, (_, i) => {
      const c = cand[space.sessionSeries[i]!]!;
      return fc.integer({ min: 0, max: c.length - 1 }).map((k) => c[k]!);
    }),
  );

  it('applyDelta equals the change of the full cost, runs merging and splitting included', () => {
    fc.assert(
      fc.property(
        plans,
        fc.integer({ min: 0, max: n - 1 }),
        fc.integer({ min: 0, max: 10_000 }),
        (plan, session, k) => {
          const c = cand[space.sessionSeries[session]!]!;
          const next = k % 7 === 0 ? -1 : c[k % c.length]!;
          const scorer = new WeekScorer(space);
          scorer.load(plan);
          const before = scorer.total();
          const d = scorer.applyDelta(session, next);
          const fresh = new WeekScorer(space);
          fresh.load(plan.map((v, i) => (i === session ? next : v)));
          expect(d).toBeCloseTo(fresh.total() - before, 9);
          // and the scorer's own total agrees with a fresh count of the new plan
          expect(scorer.total()).toBeCloseTo(fresh.total(), 9);
        },
      ),
      { numRuns: 400, seed: 7 },
    );
  });

  it('touch and touchedCost price several sessions moved at once as a fresh count does', () => {
    fc.assert(
      fc.property(plans, plans, fc.integer({ min: 1, max: (1 << n) - 1 }), (plan, other, mask) => {
        const ids: number[] = [];
        for (let i = 0; i < n; i++) if ((mask >> i) & 1) ids.push(i);
        const scorer = new WeekScorer(space);
        scorer.load(plan);
        const before = scorer.total();
        const cells = new Set<number>();
        for (const i of ids) for (const v of [plan[i]!, other[i]!]) cells.add(space.cellOf(v));
        const priced = scorer.touch(ids, ids.length, [...cells]);
        for (const i of ids) scorer.set(i, other[i]!);
        const d = scorer.touchedCost(ids, ids.length) - priced;
        const fresh = new WeekScorer(space);
        fresh.load(plan.map((v, i) => (ids.includes(i) ? other[i]! : v)));
        expect(d).toBeCloseTo(fresh.total() - before, 9);
      }),
      { numRuns: 400, seed: 8 },
    );
  });
});

describe('WeekScorer.settled (a session with no cost a move of it could mend)', () => {
  // invented: two days of 8 one-hour cells with a break between the 4th and 5th cell of each day
  const cellsWithBreak = Array.from({ length: 16 }, (_, c) => {
    const day = Math.floor(c / 8);
    const slot = c % 8;
    const start = day * 24 * HOUR + (slot + (slot >= 4 ? 1 : 0)) * HOUR;
    return { start, end: start + HOUR, day };
  });
  const req: WeekRequest = {
    cells: cellsWithBreak,
    days: 2,
    rooms,
    attendees: [{ id: 'a', compact: true }, { id: 'b', compact: true }, { id: 'c' }],
    series: [
      { id: 'x', attendees: [0, 1], sessions: 2, minDays: 2, length: 1, room: { seats: 3, features: [] } },
      { id: 'y', attendees: [0, 2], sessions: 2, minDays: 1, length: 2, preferredDays: [true, false] },
      { id: 'z', attendees: [1], sessions: 2, minDays: 1, length: 1 },
      { id: 'w', attendees: [2], sessions: 1, minDays: 1, length: 1 },
    ],
    weights: {
      ...ZERO_WEIGHTS,
      isolated: 2,
      spread: 5,
      roomStability: 1,
      preferredDays: 3,
      moves: 4,
      seats: 1,
    },
    seatsHard: false,
    lastWeek: [{ series: 'y', cell: 1, room: null }],
  };
  const space = new WeekSpace(req);
  const cand = space.candidates;
  const n = space.sessionCount;

  /** The definition, by hand from the request and the values alone. */
  function settledByHand(values: readonly number[], session: number): boolean {
    const val = values[session]!;
    if (val < 0) return false;
    const s = space.sessionSeries[session]!;
    const ser = req.series[s]!;
    const cell = Math.floor(val / RS);
    const room = val % RS;
    const day = cellsWithBreak[cell]!.day;
    const mine = Array.from({ length: n }, (_, i) => i).filter(
      (i) => space.sessionSeries[i] === s && values[i]! >= 0,
    );
    if (ser.preferredDays !== undefined && !ser.preferredDays[day]) return false;
    if (ser.room !== undefined && room !== NONE && rooms[room]!.seats < ser.room.seats) return false;
    const days = new Set(mine.map((i) => cellsWithBreak[Math.floor(values[i]! / RS)]!.day));
    if (days.size < ser.minDays) return false;
    const used = new Set(mine.map((i) => values[i]! % RS).filter((r) => r !== NONE));
    if (used.size > 1) return false;
    const last = (req.lastWeek ?? []).filter((p) => p.series === ser.id).map((p) => p.cell * RS + NONE);
    if (last.length > 0) {
      const left = [...last];
      let matched = 0;
      for (const i of mine) {
        const k = left.indexOf(values[i]!);
        if (k >= 0) {
          left.splice(k, 1);
          matched++;
        }
      }
      if (matched < Math.min(mine.length, last.length)) return false;
    }
    // every compact attendee has another meeting in a cell right before or after it, back to back
    const backToBack = (p: number, q: number) =>
      cellsWithBreak[p]!.day === cellsWithBreak[q]!.day &&
      cellsWithBreak[p]!.end === cellsWithBreak[q]!.start;
    const end = cell + ser.length - 1;
    for (const a of ser.attendees) {
      if (req.attendees[a]!.compact !== true) continue;
      const neighbour = Array.from({ length: n }, (_, i) => i).some((i) => {
        if (i === session || values[i]! < 0) return false;
        const t = req.series[space.sessionSeries[i]!]!;
        if (!t.attendees.includes(a)) return false;
        const from = Math.floor(values[i]! / RS);
        const to = from + t.length - 1;
        return (
          (cell > 0 && from <= cell - 1 && cell - 1 <= to && backToBack(cell - 1, cell)) ||
          (end + 1 < cellsWithBreak.length && from <= end + 1 && end + 1 <= to && backToBack(end, end + 1))
        );
      });
      if (!neighbour) return false;
    }
    return true;
  }

  it('agrees with the definition worked out by hand on random plans, breaks and unplaced sessions included', () => {
    const plans = fc.tuple(
      ...Array.from({ length: n }, (_, i) => {
        const c = cand[space.sessionSeries[i]!]!;
        // one value in eight leaves the session out
        return fc
          .integer({ min: -Math.ceil(c.length / 7), max: c.length - 1 })
          .map((k) => (k < 0 ? -1 : c[k]!));
      }),
    );
    let settled = 0;
    let unsettled = 0;
    fc.assert(
      fc.property(plans, (plan) => {
        const scorer = new WeekScorer(space);
        scorer.load(plan);
        for (let i = 0; i < n; i++) {
          const got = scorer.settled(i);
          expect(got).toBe(settledByHand(plan, i));
          if (got) settled++;
          else unsettled++;
        }
      }),
      { numRuns: 500, seed: 11 },
    );
    // both answers occur, so neither a constant true nor a constant false would pass
    expect(settled).toBeGreaterThan(50);
    expect(unsettled).toBeGreaterThan(50);
  });

  it('sees a meeting across a break as isolated, and one back to back as not', () => {
    const scorer = new WeekScorer(space);
    const at = (cell: number, room = NONE) => cell * RS + room;
    // z (b only) at cells 3 and 4: the break lies between them, so each is alone in its run; w is
    // attended by c, who did not opt in, and never isolated
    scorer.load([-1, -1, -1, -1, at(3), at(4), at(6)]);
    expect(scorer.settled(4)).toBe(false);
    expect(scorer.settled(5)).toBe(false);
    expect(scorer.settled(6)).toBe(true);
    scorer.load([-1, -1, -1, -1, at(2), at(3), at(6)]);
    expect(scorer.settled(4)).toBe(true);
    expect(scorer.settled(5)).toBe(true);
  });
});
