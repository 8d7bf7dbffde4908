import { describe, expect, it } from 'vitest';
import { countSolutions, ModelBuilder, type SolveOptions, solutions, solve } from '../../src/solver/index.ts';
import { queens } from './problems.ts';

// OEIS A000170: number of ways to place n non-attacking queens on an n x n board, n = 1..10.
const A000170 = [1, 0, 0, 2, 10, 4, 40, 92, 352, 724];

const VARIANTS: readonly (Omit<SolveOptions, 'mode'> & { label: string })[] = [
  { label: 'forward + static', propagation: 'forward', variableOrder: 'static' },
  { label: 'forward + mrv', propagation: 'forward', variableOrder: 'mrv' },
  { label: 'forward + mrv + lcv', propagation: 'forward', variableOrder: 'mrv', valueOrder: 'lcv' },
  { label: 'arc + mrv', propagation: 'arc', variableOrder: 'mrv' },
  { label: 'arc + static + lcv', propagation: 'arc', variableOrder: 'static', valueOrder: 'lcv' },
];

describe('n-queens solution counts (OEIS A000170)', () => {
  for (const v of VARIANTS) {
    it(`${v.label}: n = 1..10`, () => {
      const counts = A000170.map((_, i) => countSolutions(queens(i + 1), v));
      expect(counts.map((c) => c.count)).toEqual(A000170);
      expect(counts.every((c) => c.complete)).toBe(true);
    });
  }

  it('plain backtracking agrees for n = 1..8', () => {
    const counts = A000170.slice(0, 8).map(
      (_, i) => countSolutions(queens(i + 1), { propagation: 'none', variableOrder: 'static' }).count,
    );
    expect(counts).toEqual(A000170.slice(0, 8));
  });

  it('every solution of 6-queens from the lazy generator is distinct and non-attacking', () => {
    const all = [...solutions(queens(6))];
    expect(all).toHaveLength(4);
    expect(new Set(all.map((s) => s.join(','))).size).toBe(4);
    for (const s of all) {
      for (let i = 0; i < 6; i++) {
        for (let j = i + 1; j < 6; j++) {
          expect(s[i]).not.toBe(s[j]);
          expect(Math.abs(s[i]! - s[j]!)).not.toBe(j - i);
        }
      }
    }
  });

  it('forward checking with MRV and restarts places 200 queens', () => {
    const r = solve(queens(200));
    expect(r.status).toBe('solved');
    const s = r.solutions[0]!;
    expect(new Set(s).size).toBe(200);
    expect(new Set(s.map((c, row) => c - row)).size).toBe(200);
    expect(new Set(s.map((c, row) => c + row)).size).toBe(200);
    expect(r.stats.nodes).toBeLessThan(20_000);
  });
});

describe('budgets', () => {
  it('a node budget stops the search and marks the result incomplete', () => {
    const r = solve(queens(10), { mode: { kind: 'all' }, budget: { nodes: 50 } });
    expect(r.status).toBe('incomplete');
    expect(r.complete).toBe(false);
    expect(r.stats.nodes).toBe(50);
    const c = countSolutions(queens(10), { budget: { nodes: 100 } });
    expect(c.complete).toBe(false);
    expect(c.count).toBeLessThan(724);
  });

  it('a time budget with a fake clock stops the search', () => {
    let now = 1000;
    // Each clock read advances 1 ms; the meter reads it once per node.
    const clock = (): number => now++;
    const r = solve(queens(12), { mode: { kind: 'all' }, budget: { timeMs: 3, clock } });
    expect(r.status).toBe('incomplete');
    expect(r.stats.elapsedMs).toBeGreaterThanOrEqual(3);
    expect(r.stats.nodes).toBeLessThanOrEqual(3);
    expect(r.stats.nodes).toBeGreaterThanOrEqual(1);
  });

  it('best mode under a node budget returns the best found so far as incomplete', () => {
    const b = new ModelBuilder();
    const n = 12;
    for (let i = 0; i < n; i++) b.addVariable(`row${i}`, n);
    for (let i = 0; i < n; i++) {
      for (let j = i + 1; j < n; j++) {
        b.addNotEqual(i, j, { name: 'columns' });
        b.addNotEqualOffset(i, j, j - i, { name: 'diagonals' });
        b.addNotEqualOffset(i, j, i - j, { name: 'diagonals' });
      }
      b.addUnaryCost(i, (c) => (c * (i + 1)) % 7);
    }
    const model = b.build();
    const r = solve(model, { mode: { kind: 'best', k: 1 }, budget: { nodes: 400 } });
    expect(r.status).toBe('incomplete');
    expect(r.solutions).toHaveLength(1);
    const full = solve(model, { mode: { kind: 'best', k: 1 } });
    expect(full.status).toBe('solved');
    expect(full.costs[0]).toBeLessThanOrEqual(r.costs[0]!);
    expect(full.stats.nodes).toBeGreaterThan(400);
  });

  it('an aborted signal stops before any node', () => {
    const ac = new AbortController();
    ac.abort();
    const r = solve(queens(8), { budget: { signal: ac.signal } });
    expect(r.status).toBe('incomplete');
    expect(r.stats.nodes).toBe(0);
  });

  it('a time budget without a clock is refused with a clear reason', () => {
    expect(() => solve(queens(4), { budget: { timeMs: 10 } })).toThrow(/needs budget.clock/);
  });
});

describe('modes', () => {
  it('best k returns the cheapest solutions in cost order', () => {
    const b = new ModelBuilder();
    const x = b.addVariable('x', 5);
    const y = b.addVariable('y', 5);
    b.addNotEqual(x, y, { name: 'differ' });
    b.addUnaryCost(x, (a) => (a - 2) ** 2);
    b.addUnaryCost(y, (a) => (a - 2) ** 2);
    const r = solve(b.build(), { mode: { kind: 'best', k: 3 } });
    expect(r.status).toBe('solved');
    expect(r.costs).toEqual([1, 1, 1]);
    for (const s of r.solutions) expect(s[0]).not.toBe(s[1]);
  });

  it('an unsatisfiable model says so and returns no solutions', () => {
    const r = solve(queens(3));
    expect(r.status).toBe('unsatisfiable');
    expect(r.complete).toBe(true);
    expect(r.solutions).toEqual([]);
  });

  it('all with a limit stops at the limit and is complete', () => {
    const r = solve(queens(8), { mode: { kind: 'all', limit: 5 } });
    expect(r.solutions).toHaveLength(5);
    expect(r.status).toBe('solved');
  });
});
