// Classic problems built from their definitions, shared by the solver tests.
import { type Model, ModelBuilder } from '../../src/solver/index.ts';

/** n-queens: one variable per row (value = column), pairwise column and diagonal constraints. */
export function queens(n: number): Model {
  const b = new ModelBuilder();
  for (let i = 0; i < n; i++) b.addVariable(`row${i}`, n);
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      b.addNotEqual(i, j, { name: `column ${i}-${j}`, group: 'columns' });
      b.addNotEqualOffset(i, j, j - i, { name: `diagonal ${i}-${j}`, group: 'diagonals' });
      b.addNotEqualOffset(i, j, i - j, { name: `anti-diagonal ${i}-${j}`, group: 'diagonals' });
    }
  }
  return b.build();
}

/** An undirected graph as a vertex count and an edge list. */
export interface Graph {
  readonly vertices: number;
  readonly edges: readonly (readonly [number, number])[];
}

/**
 * Mycielski's construction (Mycielski, 1955): from G with vertices v_i build v_i, u_i (copies) and w;
 * u_i joins the neighbours of v_i, and w joins every u_i. M2 = K2, M3 = C5 (Groetzsch is M4).
 */
export function mycielski(k: number): Graph {
  let g: Graph = { vertices: 2, edges: [[0, 1]] };
  for (let step = 2; step < k; step++) {
    const n = g.vertices;
    const edges: [number, number][] = g.edges.map(([a, b]) => [a, b]);
    for (const [a, b] of g.edges) {
      edges.push([a, n + b]);
      edges.push([b, n + a]);
    }
    for (let i = 0; i < n; i++) edges.push([n + i, 2 * n]);
    g = { vertices: 2 * n + 1, edges };
  }
  return g;
}

/** The queen graph on an n x n board: squares adjacent when on one row, column or diagonal. */
export function queenGraph(n: number): Graph {
  const edges: [number, number][] = [];
  for (let a = 0; a < n * n; a++) {
    for (let b = a + 1; b < n * n; b++) {
      const ra = Math.floor(a / n);
      const ca = a % n;
      const rb = Math.floor(b / n);
      const cb = b % n;
      if (ra === rb || ca === cb || Math.abs(ra - rb) === Math.abs(ca - cb)) edges.push([a, b]);
    }
  }
  return { vertices: n * n, edges };
}

/** Graph k-colouring as a CSP; `fixed` pins some vertices to colours (symmetry breaking). */
export function colouring(g: Graph, k: number, fixed: ReadonlyMap<number, number> = new Map()): ModelBuilder {
  const b = new ModelBuilder();
  for (let v = 0; v < g.vertices; v++) {
    const f = fixed.get(v);
    b.addVariable(`v${v}`, k, f === undefined ? undefined : [f]);
  }
  for (const [x, y] of g.edges) b.addNotEqual(x, y, { name: `edge ${x}-${y}` });
  return b;
}
