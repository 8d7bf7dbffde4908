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
