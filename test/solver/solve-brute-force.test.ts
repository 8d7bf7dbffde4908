// Property tests: the engine against plain enumeration of random small problems.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { type SolveOptions, solutions, solve } from '../../src/solver/index.ts';
import { bruteForce, buildProblem, problemArb, specCost, specHolds } from './random-csp.ts';

const key = (s: readonly number[]): string => s.join(',');
const sorted = (list: readonly (readonly number[])[]): string[] => list.map(key).sort();

const PROPAGATION = ['none', 'forward', 'arc'] as const;
const VARIABLE_ORDER = ['static', 'mrv'] as const;
// A scorer that prefers high values, so ordering differs from natural and lcv.
const VALUE_ORDER = ['natural', 'lcv', (_v: number, a: number) => -a] as const;
const DECOMPOSE = [true, false] as const;

const COMBINATIONS: Omit<SolveOptions, 'mode'>[] = [];
for (const propagation of PROPAGATION) {
  for (const variableOrder of VARIABLE_ORDER) {
    for (const valueOrder of VALUE_ORDER) {
      for (const decompose of DECOMPOSE)
        COMBINATIONS.push({ propagation, variableOrder, valueOrder, decompose });
    }
  }
}

describe('solution sets equal brute-force enumeration', () => {
  it(`for every combination of options (${COMBINATIONS.length} combinations)`, () => {
    fc.assert(
      fc.property(problemArb(5, 4), (p) => {
        const model = buildProblem(p);
        const expected = sorted(bruteForce(p));
        for (const options of COMBINATIONS) {
          const got = solve(model, { ...options, mode: { kind: 'all' } });
          expect(got.complete).toBe(true);
          expect(sorted(got.solutions)).toEqual(expected);
          expect(got.status).toBe(expected.length > 0 ? 'solved' : 'unsatisfiable');
          const first = solve(model, options);
          if (expected.length === 0) expect(first.status).toBe('unsatisfiable');
          else expect(expected).toContain(key(first.solutions[0]!));
        }
        expect(sorted([...solutions(model)])).toEqual(expected);
      }),
      { numRuns: 80, seed: 20261201 },
    );
  });
});

describe('best-k equals brute force', () => {
  it('returns the k smallest costs, each a real solution at its reported cost', () => {
    fc.assert(
      fc.property(problemArb(5, 4, true), fc.integer({ min: 1, max: 6 }), (p, k) => {
        const model = buildProblem(p);
        const all = bruteForce(p);
        const expected = all
          .map((s) => specCost(p, s))
          .sort((a, b) => a - b)
          .slice(0, k);
        for (const propagation of PROPAGATION) {
          for (const decompose of DECOMPOSE) {
            const r = solve(model, { propagation, decompose, mode: { kind: 'best', k } });
            expect(r.costs).toEqual(expected);
            expect(new Set(r.solutions.map(key)).size).toBe(r.solutions.length);
            r.solutions.forEach((s, i) => {
              expect(p.constraints.every((c) => specHolds(c, s))).toBe(true);
              expect(specCost(p, s)).toBe(r.costs[i]);
            });
          }
        }
      }),
      { numRuns: 80, seed: 7 },
    );
  });
});
