import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  cbcttToWeekRequest,
  countViolations,
  formatCbcttSolution,
  parseCbctt,
  planWeek,
  WeekScorer,
  WeekSpace,
} from '../../../src/scheduling/week/index.ts';
import { checkCbctt } from './cbctt-checker.ts';
import { planProblems } from './plan-checker.ts';

const DATA = join(import.meta.dirname, '..', '..', '..', 'bench', 'data', 'cbctt');
const read = (name: string) => readFileSync(join(DATA, `${name}.ctt`), 'utf8');

// A hand-made instance in the ITC-2007 track 3 format (bench/data/cbctt/README.md).
const TINY = `Name: Tiny
Courses: 2
Rooms: 2
Days: 2
Periods_per_day: 3
Curricula: 1
Constraints: 1

COURSES:
a t1 2 2 30
b t2 1 1 10

ROOMS:
R1 20
R2 40

CURRICULA:
q1 2 a b

UNAVAILABILITY_CONSTRAINTS:
a 1 2

END.
`;

/** Our scorer's view of a solution text: hard violations and cost parts. */
function ours(text: string, solution: string) {
  const inst = parseCbctt(text);
  const req = cbcttToWeekRequest(inst);
  const space = new WeekSpace(req);
  const values = new Int32Array(space.sessionCount).fill(-1);
  const next = new Map(req.series.map((s, i) => [s.id, space.seriesFirst[i]!]));
  const roomIndex = new Map(req.rooms.map((r, i) => [r.id, i]));
  for (const line of solution.trim().split('\n')) {
    const [course, room, day, period] = line.split(' ');
    const i = next.get(course!)!;
    next.set(course!, i + 1);
    values[i] = (Number(day) * inst.periodsPerDay + Number(period)) * space.roomSlots + roomIndex.get(room!)!;
  }
  const scorer = new WeekScorer(space);
  scorer.load(values);
  return { hard: countViolations(space, values), parts: scorer.parts(), total: scorer.total() };
}

describe('cbctt instances', () => {
  it('parses the header counts of every instance', () => {
    // each file states its own counts in its header (the format of bench/data/cbctt/README.md)
    for (const name of ['comp01', 'comp02', 'comp03', 'comp04', 'comp05', 'comp06', 'comp07']) {
      const text = read(name);
      const inst = parseCbctt(text);
      const header = (k: string) => Number(new RegExp(`^${k}:\\s*(\\d+)`, 'm').exec(text)![1]);
      expect([
        inst.courses.length,
        inst.rooms.length,
        inst.curricula.length,
        inst.unavailable.length,
      ]).toEqual([header('Courses'), header('Rooms'), header('Curricula'), header('Constraints')]);
      expect([inst.days, inst.periodsPerDay]).toEqual([header('Days'), header('Periods_per_day')]);
    }
    // comp01 is Fis0506-1: 30 courses, 6 rooms, 5 days of 6 periods (its own header)
    expect(parseCbctt(read('comp01')).name).toBe('Fis0506-1');
  });

  it('names the line of a malformed instance', () => {
    expect(() => parseCbctt(TINY.replace('a t1 2 2 30', 'a t1 two 2 30'))).toThrow(
      /line 10: expected a whole number/,
    );
  });

  it('scores a hand-computed solution exactly as the independent checker does', () => {
    // a: R1 (20 seats for 30 students: 10 points), R2 (0); b: R1 (0) -> capacity 10
    // a meets on day 0 only but needs 2 days -> 1 day short x 5 = 5
    // q1: a@0/0 and a@0/1 are adjacent; b@1/0 is alone -> 1 isolated x 2 = 2
    // a uses two rooms -> stability 1.  Total 18.
    const solution = 'a R1 0 0\na R2 0 1\nb R1 1 0\n';
    expect(checkCbctt(TINY, solution)).toEqual({
      missing: 0,
      roomClashes: 0,
      conflicts: 0,
      unavailable: 0,
      hard: 0,
      capacity: 10,
      minDays: 5,
      compactness: 2,
      stability: 1,
      soft: 18,
    });
    const o = ours(TINY, solution);
    expect(o.hard).toBe(0);
    expect([o.parts.seats, o.parts.spread, o.parts.isolated, o.parts.roomStability, o.total]).toEqual([
      10, 5, 2, 1, 18,
    ]);
  });

  it('sees the same hard violations as the checker', () => {
    // b in a's period (shared curriculum), and a in its unavailable period 1/2
    const clash = 'a R1 0 0\na R2 1 2\nb R2 0 0\n';
    const v = checkCbctt(TINY, clash);
    expect([v.conflicts, v.unavailable]).toEqual([1, 1]);
    expect(ours(TINY, clash).hard).toBe(2);
    // two lectures in one room and period
    expect(checkCbctt(TINY, 'a R1 0 0\na R1 0 1\nb R1 0 1\n').roomClashes).toBe(1);
    expect(ours(TINY, 'a R1 0 0\na R1 0 1\nb R1 0 1\n').hard).toBeGreaterThan(0);
  });

  for (const name of ['comp01', 'comp04', 'comp05']) {
    it(`${name}: the plan has no hard violation and our cost equals the checker's`, () => {
      const text = read(name);
      const inst = parseCbctt(text);
      const req = cbcttToWeekRequest(inst);
      const plan = planWeek(req, { moves: 3000, seed: 1 });
      expect(plan.unplaced).toEqual([]);
      expect(planProblems(req, plan.sessions)).toEqual([]);
      const verdict = checkCbctt(text, formatCbcttSolution(inst, plan.sessions));
      expect(verdict.hard).toBe(0);
      expect(plan.score.total).toBe(verdict.soft);
      expect([
        plan.score.parts.seats,
        plan.score.parts.spread,
        plan.score.parts.isolated,
        plan.score.parts.roomStability,
      ]).toEqual([verdict.capacity, verdict.minDays, verdict.compactness, verdict.stability]);
    });
  }

  it('comp01: same seed and budget give the same plan; four times the moves never do worse', () => {
    const req = cbcttToWeekRequest(parseCbctt(read('comp01')));
    const a = planWeek(req, { moves: 4000, seed: 5 });
    const b = planWeek(req, { moves: 4000, seed: 5 });
    expect(Array.from(a.values)).toEqual(Array.from(b.values));
    expect(a.stats.moves).toBe(4000);
    // the cooling spans the budget, so a longer run is not a prefix of a shorter one; these seeds
    // are a check of the schedule, which must turn more moves into a plan at least as good
    for (const seed of [5, 6, 7]) {
      const short = planWeek(req, { moves: 4000, seed });
      const long = planWeek(req, { moves: 16_000, seed });
      expect(long.score.total).toBeLessThanOrEqual(short.score.total);
      expect(long.score.total).toBeLessThan(long.stats.initialCost);
    }
  });
});
