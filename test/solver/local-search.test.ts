import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { improve, ModelBuilder } from '../../src/solver/index.ts';
import { colouring, mycielski, queens } from './problems.ts';
import { buildProblem, problemArb, specCost, specViolations } from './random-csp.ts';

function attacks(s: readonly number[]): number {
  let count = 0;
  for (let i = 0; i < s.length; i++) {
    for (let j = i + 1; j < s.length; j++) {
      if (s[i] === s[j] || Math.abs(s[i]! - s[j]!) === j - i) count++;
    }
  }
  return count;
}

describe('improve', () => {
  it('min-conflicts solves 50-queens from all queens in column 0', () => {
    const n = 50;
    const r = improve(queens(n), new Array(n).fill(0), {
      method: 'min-conflicts',
      budget: { nodes: 20_000 },
      seed: 1,
    });
    expect(r.violations).toBe(0);
    expect(attacks(r.assignment)).toBe(0);
    expect(r.complete).toBe(true);
  });

  it('annealing with change and swap moves solves 20-queens from the identity permutation', () => {
    const n = 20;
    const r = improve(
      queens(n),
      Array.from({ length: n }, (_, i) => i),
      { method: 'annealing', moves: ['swap', 'change'], budget: { nodes: 200_000 }, seed: 2 },
    );
    expect(r.violations).toBe(0);
    expect(attacks(r.assignment)).toBe(0);
  });

  it('reaches a proper colouring of M4 with 4 colours from all-zero', () => {
    const g = mycielski(4);
    for (const method of ['min-conflicts', 'annealing'] as const) {
      const r = improve(colouring(g, 4).build(), new Array(g.vertices).fill(0), {
        method,
        budget: { nodes: 50_000 },
        seed: 5,
      });
      expect(r.violations).toBe(0);
      expect(g.edges.every(([a, b]) => r.assignment[a] !== r.assignment[b])).toBe(true);
    }
  });

  it('minimises the objective once feasible, using delta when given', () => {
    // Four tasks in eight slots, all different; the objective wants them early.
    const b = new ModelBuilder();
    const vars = [0, 1, 2, 3].map((i) => b.addVariable(`t${i}`, 8));
    b.addAllDifferent(vars, { name: 'one per slot' });
    const model = b.build();
    const objective = (a: readonly number[]): number => a.reduce((s, v) => s + v, 0);
    let deltaCalls = 0;
    const delta = (a: readonly number[], v: number, value: number): number => {
      deltaCalls++;
      return value - a[v]!;
    };
    for (const method of ['min-conflicts', 'annealing'] as const) {
      const r = improve(model, [7, 7, 7, 7], {
        method,
        objective,
        delta,
        moves: ['change', 'swap'],
        budget: { nodes: 20_000 },
        seed: 9,
      });
      expect(r.violations).toBe(0);
      // 0 + 1 + 2 + 3 is the optimum.
      expect(r.cost).toBe(6);
    }
    expect(deltaCalls).toBeGreaterThan(0);
  });

  it('re-evaluates the objective in full when no delta is given', () => {
    const b = new ModelBuilder();
    const vars = [0, 1, 2].map((i) => b.addVariable(`t${i}`, 5));
    b.addAllDifferent(vars, { name: 'one per slot' });
    let calls = 0;
    const objective = (a: readonly number[]): number => {
      calls++;
      return Math.abs(a[0]! - 4) + a[1]! + a[2]!;
    };
    const r = improve(b.build(), [0, 0, 0], {
      method: 'min-conflicts',
      objective,
      budget: { nodes: 2_000 },
      seed: 3,
    });
    expect(r.violations).toBe(0);
    // t0 = 4 and {t1, t2} = {0, 1} is the optimum, cost 1.
    expect(r.cost).toBe(1);
    expect(r.assignment[0]).toBe(4);
    expect(calls).toBeGreaterThan(10);
  });

  it('is deterministic for a seed and reports progress', () => {
    const progress: number[] = [];
    const run = () =>
      improve(queens(30), new Array(30).fill(0), {
        method: 'annealing',
        budget: { nodes: 3_000 },
        seed: 11,
        onProgress: (p) => progress.push(p.moves),
      });
    const a = run();
    const b = run();
    expect(a).toEqual(b);
    expect(progress.length).toBeGreaterThan(2);
  });

  it('stops on a fake-clock time budget (3-queens has no solution, so only the budget ends it)', () => {
    let now = 0;
    for (const method of ['min-conflicts', 'annealing'] as const) {
      const r = improve(queens(3), [0, 0, 0], { method, budget: { timeMs: 10, clock: () => now++ } });
      expect(r.complete).toBe(false);
      expect(r.violations).toBeGreaterThan(0);
      // The clock advances 1 ms per read and is read once per move (plus progress reports).
      expect(r.moves).toBeLessThanOrEqual(10);
      expect(r.moves).toBeGreaterThanOrEqual(3);
    }
  });

  it('never returns worse than its start (violations first, then cost)', () => {
    fc.assert(
      fc.property(
        problemArb(5, 4, true),
        fc.nat(),
        fc.constantFrom('min-conflicts', 'annealing'),
        (p, seed, method) => {
          const start = p.sizes.map((s, i) => (seed + i) % s);
          const r = improve(buildProblem(p), start, { method, budget: { nodes: 300 }, seed });
          const v0 = specViolations(p, start);
          const c0 = specCost(p, start);
          const v1 = specViolations(p, r.assignment);
          const c1 = specCost(p, r.assignment);
          expect(v1).toBe(r.violations);
          expect(c1).toBe(r.cost);
          expect(v1 < v0 || (v1 === v0 && c1 <= c0)).toBe(true);
        },
      ),
      { numRuns: 100, seed: 4 },
    );
  });

  it('refuses a start of the wrong length and a missing budget', () => {
    expect(() => improve(queens(4), [0, 0], { method: 'min-conflicts', budget: { nodes: 1 } })).toThrow(
      /start has 2 values, the model has 4 variables/,
    );
    expect(() => improve(queens(4), [0, 0, 0, 0], { method: 'annealing', budget: {} })).toThrow(
      /needs budget.nodes/,
    );
  });
});
