// Graph colouring proofs with published chromatic numbers, through each look-ahead of the engine.
import { describe, expect, it } from 'vitest';
import { ModelBuilder, solve } from '../../src/solver/index.ts';
import { colouring, type Graph, mycielski, queenGraph } from './problems.ts';

function isProperColouring(g: Graph, colours: readonly number[], k: number): boolean {
  return colours.every((c) => c >= 0 && c < k) && g.edges.every(([a, b]) => colours[a] !== colours[b]);
}

describe('Mycielski graphs (Mycielski, 1955: M_k is triangle-free with chromatic number k)', () => {
  for (let k = 2; k <= 5; k++) {
    const g = mycielski(k);
    it(`M${k} has a ${k}-colouring and no ${k - 1}-colouring`, () => {
      // Vertex counts 2, 5, 11, 23 and edge counts 1, 5, 20, 71 follow from the construction.
      expect([g.vertices, g.edges.length]).toEqual(
        [
          [2, 1],
          [5, 5],
          [11, 20],
          [23, 71],
        ][k - 2],
      );
      for (const propagation of ['forward', 'arc'] as const) {
        const yes = solve(colouring(g, k).build(), { propagation });
        expect(yes.status).toBe('solved');
        expect(isProperColouring(g, yes.solutions[0]!, k)).toBe(true);
        // Symmetry breaking: the two ends of the first edge take colours 0 and 1.
        const fixed = k - 1 >= 2 ? new Map([...g.edges[0]!].map((v, i) => [v, i] as const)) : new Map();
        const no = solve(colouring(g, k - 1, fixed).build(), { propagation, budget: { nodes: 2_000_000 } });
        expect(no.status).toBe('unsatisfiable');
      }
    });
  }
});

describe('DIMACS queen graphs (published chromatic numbers: queen5_5 = 5, queen6_6 = 7)', () => {
  // Squares are adjacent when they share a row, column or diagonal. The first row is a clique, so
  // fixing its colours to 0..n-1 removes colour-permutation symmetry without losing any answer.
  const firstRow = (n: number, k: number) =>
    new Map(Array.from({ length: Math.min(n, k) }, (_, c) => [c, c] as const));

  it('queen5_5 has 160 edges, a 5-colouring and no 4-colouring', () => {
    const g = queenGraph(5);
    expect(g.edges.length).toBe(160);
    const yes = solve(colouring(g, 5, firstRow(5, 5)).build());
    expect(yes.status).toBe('solved');
    expect(isProperColouring(g, yes.solutions[0]!, 5)).toBe(true);
    expect(solve(colouring(g, 4).build(), { propagation: 'arc' }).status).toBe('unsatisfiable');
  });

  it('queen6_6 has 290 edges, a 7-colouring and no 6-colouring', () => {
    const g = queenGraph(6);
    expect(g.edges.length).toBe(290);
    const yes = solve(colouring(g, 7, firstRow(6, 7)).build(), { propagation: 'arc' });
    expect(yes.status).toBe('solved');
    expect(isProperColouring(g, yes.solutions[0]!, 7)).toBe(true);
    for (const propagation of ['forward', 'arc'] as const) {
      const no = solve(colouring(g, 6, firstRow(6, 6)).build(), { propagation, budget: { nodes: 200_000 } });
      expect(no.status).toBe('unsatisfiable');
    }
  });

  it('queen6_6 with 6 colours as rows, columns and diagonals of all-different is refuted too', () => {
    const n = 6;
    const b = new ModelBuilder();
    for (let s = 0; s < n * n; s++) b.addVariable(`sq${s}`, n, s < n ? [s] : undefined);
    const lines = new Map<string, number[]>();
    for (let s = 0; s < n * n; s++) {
      const r = Math.floor(s / n);
      const c = s % n;
      for (const k of [`r${r}`, `c${c}`, `d${r - c}`, `a${r + c}`])
        lines.set(k, [...(lines.get(k) ?? []), s]);
    }
    for (const [name, vars] of lines) if (vars.length > 1) b.addAllDifferent(vars, { name });
    const r = solve(b.build(), { propagation: 'arc', budget: { nodes: 200_000 } });
    expect(r.status).toBe('unsatisfiable');
  });
});

describe('look-ahead strength', () => {
  it('arc consistency prunes at the root what forward checking leaves to search', () => {
    // x < y < z over 0..2 has one solution; AC-3 fixes it without a failed node.
    const b = new ModelBuilder();
    const [x, y, z] = [b.addVariable('x', 3), b.addVariable('y', 3), b.addVariable('z', 3)];
    b.addBinary(x, y, (a, c) => a < c, { name: 'x<y' });
    b.addBinary(y, z, (a, c) => a < c, { name: 'y<z' });
    const model = b.build();
    const arc = solve(model, { propagation: 'arc', variableOrder: 'static' });
    const fwd = solve(model, { propagation: 'forward', variableOrder: 'static' });
    const none = solve(model, { propagation: 'none', variableOrder: 'static' });
    for (const r of [arc, fwd, none]) expect(r.solutions).toEqual([[0, 1, 2]]);
    expect(arc.stats.backtracks).toBe(0);
    expect(arc.stats.nodes).toBe(3);
    expect(none.stats.nodes).toBeGreaterThan(fwd.stats.nodes);
  });

  it('all-different with arc propagation fails on too few values (pigeonhole) before search', () => {
    const b = new ModelBuilder();
    const vars = [0, 1, 2, 3].map((i) => b.addVariable(`v${i}`, 3));
    b.addAllDifferent(vars, { name: 'four into three' });
    const r = solve(b.build(), { propagation: 'arc' });
    expect(r.status).toBe('unsatisfiable');
    expect(r.stats.nodes).toBe(0);
  });

  it('all-different with arc propagation finds a Hall set the total count misses', () => {
    // Three members share two values while a fourth has ten: ten values in all, yet no matching.
    const b = new ModelBuilder();
    const vars = [0, 1, 2].map((i) => b.addVariable(`tight${i}`, 10, [0, 1]));
    vars.push(b.addVariable('loose', 10));
    b.addAllDifferent(vars, { name: 'Hall' });
    const model = b.build();
    const arc = solve(model, { propagation: 'arc' });
    expect(arc.status).toBe('unsatisfiable');
    expect(arc.stats.nodes).toBe(0);
    const fwd = solve(model, { propagation: 'forward' });
    expect(fwd.status).toBe('unsatisfiable');
    expect(fwd.stats.nodes).toBeGreaterThan(0);
  });

  it('least-constraining-value order matches counts made by hand, across word boundaries', () => {
    // x has 70 values (three words); each neighbour y_i forbids y_i = x + shift_i, so value a of x
    // costs y_i one value exactly when a + shift_i is in D(y_i).
    const neighbours: { shift: number; values: number[] }[] = [
      { shift: 0, values: [1, 40] },
      { shift: 33, values: [33, 35, 99] },
      { shift: -5, values: [0, 7, 31] },
      { shift: 31, values: [31, 63] },
      { shift: 64, values: [64, 66, 130] },
    ];
    const b = new ModelBuilder();
    const x = b.addVariable('x', 70);
    for (const [i, nb] of neighbours.entries()) {
      const y = b.addVariable(`y${i}`, 140, nb.values);
      b.addNotEqualOffset(x, y, nb.shift, { name: `n${i}` });
    }
    const score = (a: number): number => neighbours.filter((nb) => nb.values.includes(a + nb.shift)).length;
    const expected = Array.from({ length: 70 }, (_, a) => a).sort((p, q) => score(p) - score(q) || p - q);
    const seen: number[] = [];
    for (const s of solve(b.build(), { variableOrder: 'static', valueOrder: 'lcv', mode: { kind: 'all' } })
      .solutions) {
      if (seen[seen.length - 1] !== s[0]) seen.push(s[0]!);
    }
    expect(seen).toEqual(expected);
    // Value 0 meets y1 (33), y3 (31) and y4 (64), so it is tried last.
    expect(expected[expected.length - 1]).toBe(0);
    expect(score(0)).toBe(3);
  });

  it('wide binary predicates beyond the row cache are evaluated and still correct', () => {
    // 10000 x 10000 values exceeds the cached-row limit, so the predicate is evaluated.
    const b = new ModelBuilder();
    const x = b.addVariable('x', 10_000, [9_990, 9_995]);
    const y = b.addVariable('y', 10_000, [3, 9_992, 9_999]);
    b.addBinary(x, y, (a, c) => c - a >= 4, { name: 'gap' });
    const model = b.build();
    for (const propagation of ['none', 'forward', 'arc'] as const) {
      const r = solve(model, { propagation, mode: { kind: 'all' } });
      expect([...r.solutions].sort((p, q) => p[0]! - q[0]!)).toEqual([
        [9_990, 9_999],
        [9_995, 9_999],
      ]);
    }
  });
});
