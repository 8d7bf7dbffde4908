import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ModelBuilder, minimalConflict } from '../../src/solver/index.ts';
import { queens } from './problems.ts';
import { bruteForce, buildProblem, problemArb } from './random-csp.ts';

describe('minimalConflict', () => {
  it('returns null for a satisfiable model', () => {
    expect(minimalConflict(queens(6))).toBeNull();
  });

  it('names the groups that clash and leaves out the innocent ones', () => {
    const b = new ModelBuilder();
    const alice = b.addVariable('alice', 10);
    const bob = b.addVariable('bob', 10);
    const room = b.addVariable('room', 3);
    b.addUnary(alice, (t) => t < 4, { name: 'alice mornings' });
    b.addUnary(bob, (t) => t >= 6, { name: 'bob afternoons' });
    b.addBinary(alice, bob, (a, c) => a === c, { name: 'same time' });
    b.addUnary(room, (r) => r !== 1, { name: 'room 1 closed' });
    b.addNotEqual(alice, room, { name: 'unrelated' });
    const model = b.build();
    expect(minimalConflict(model)).toEqual(['alice mornings', 'bob afternoons', 'same time']);
    // With the hard rules kept, only the blameable groups are named.
    expect(minimalConflict(model, ['same time', 'room 1 closed'])).toEqual(['same time']);
    // Nothing blameable: the kept groups conflict on their own.
    expect(minimalConflict(model, ['room 1 closed'])).toEqual([]);
  });

  it('says when even the first check cannot finish within the budget', () => {
    const b = new ModelBuilder();
    const vars = Array.from({ length: 9 }, (_, i) => b.addVariable(`v${i}`, 8));
    b.addAllDifferent(vars, { name: 'nine into eight' });
    // The all-different pigeonhole check refutes this at the root, without a single node.
    expect(minimalConflict(b.build(), undefined, { budget: { nodes: 1 } })).toEqual(['nine into eight']);
    // Nine queens on nine rows of eight columns: pairwise not-equal needs search to refute.
    const hard = new ModelBuilder();
    const n = 9;
    for (let i = 0; i < n; i++) hard.addVariable(`r${i}`, n - 1);
    for (let i = 0; i < n; i++) {
      for (let j = i + 1; j < n; j++) {
        hard.addNotEqualOffset(i, j, j - i, { name: 'diagonals' });
        hard.addNotEqualOffset(i, j, i - j, { name: 'diagonals' });
        hard.addNotEqual(i, j, { name: `column ${i}-${j}`, group: 'columns' });
      }
    }
    expect(() => minimalConflict(hard.build(), undefined, { budget: { nodes: 1 } })).toThrow(
      /could not decide whether the model has a solution within the budget/,
    );
  });

  it('refuses unknown group names with the list of known ones', () => {
    expect(() => minimalConflict(queens(3), ['no such'])).toThrow(/no constraint group named "no such"/);
  });

  it('random unsatisfiable problems: the answer is unsatisfiable and every proper subset satisfiable', () => {
    let checked = 0;
    fc.assert(
      fc.property(problemArb(4, 3), (p) => {
        if (bruteForce(p).length > 0) {
          expect(minimalConflict(buildProblem(p))).toBeNull();
          return;
        }
        checked++;
        const answer = minimalConflict(buildProblem(p));
        expect(answer).not.toBeNull();
        const set = new Set(answer);
        expect(bruteForce(p, (g) => set.has(g))).toEqual([]);
        for (const g of set) {
          expect(bruteForce(p, (h) => set.has(h) && h !== g).length).toBeGreaterThan(0);
        }
      }),
      { numRuns: 150, seed: 3 },
    );
    expect(checked).toBeGreaterThan(10);
  });
});
