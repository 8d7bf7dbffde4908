import { describe, expect, it } from 'vitest';
import { kBestOfSum } from '../../src/solver/components.ts';
import { countSolutions, ModelBuilder, solutions, solve } from '../../src/solver/index.ts';

/** Two copies of 8-queens side by side: variables 0..7 and 8..15 share no constraint. */
function twoBoards(): ModelBuilder {
  const b = new ModelBuilder();
  for (let board = 0; board < 2; board++) {
    const base = board * 8;
    for (let i = 0; i < 8; i++) b.addVariable(`b${board}r${i}`, 8);
    for (let i = 0; i < 8; i++) {
      for (let j = i + 1; j < 8; j++) {
        b.addNotEqual(base + i, base + j, { name: 'col' });
        b.addNotEqualOffset(base + i, base + j, j - i, { name: 'diag' });
        b.addNotEqualOffset(base + i, base + j, i - j, { name: 'diag' });
      }
    }
  }
  return b;
}

describe('independent components', () => {
  it('counts a product without enumerating it: 92 x 92 for two 8-queens boards', () => {
    const m = twoBoards().build();
    const apart = countSolutions(m);
    expect(apart).toEqual({ count: 92 * 92, complete: true });
    const together = countSolutions(m, { decompose: false, budget: { nodes: 50_000 } });
    // Solving the boards together walks every combination; apart it walks each board once.
    expect(together.complete).toBe(false);
  });

  it('yields the product lazily', () => {
    const gen = solutions(twoBoards().build());
    const firstThree = [gen.next().value, gen.next().value, gen.next().value];
    expect(firstThree.every((s) => s !== undefined && s.length === 16)).toBe(true);
    expect(new Set(firstThree.map((s) => s!.join(','))).size).toBe(3);
  });

  it('best k across components equals best k of the whole', () => {
    const b = twoBoards();
    for (let v = 0; v < 16; v++) b.addUnaryCost(v, (a) => (v % 3 === 0 ? a : 7 - a));
    const m = b.build();
    const apart = solve(m, { mode: { kind: 'best', k: 4 } });
    const together = solve(m, { mode: { kind: 'best', k: 4 }, decompose: false });
    expect(apart.costs).toEqual(together.costs);
    expect(apart.costs).toHaveLength(4);
  });
});

describe('kBestOfSum', () => {
  it('takes the k smallest sums, one entry per list', () => {
    const a = [0, 1, 5].map((cost) => ({ cost, item: `a${cost}` }));
    const b = [0, 2, 3].map((cost) => ({ cost, item: `b${cost}` }));
    const got = kBestOfSum([a, b], 4);
    // All sums: 0 2 3 1 3 4 5 7 8; the four smallest are 0 1 2 3.
    expect(got.map((s) => s.cost)).toEqual([0, 1, 2, 3]);
    expect(got[0]!.parts).toEqual(['a0', 'b0']);
    expect(kBestOfSum([a, []], 3)).toEqual([]);
  });
});
