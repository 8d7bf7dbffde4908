// Type tests of the public surface: the agreed signatures must not drift.
import { describe, expectTypeOf, it } from 'vitest';
import {
  type Budget,
  type ConstraintMeta,
  countSolutions,
  improve,
  type LocalSearchOptions,
  type LocalSearchResult,
  type Model,
  ModelBuilder,
  minimalConflict,
  type SolveOptions,
  type SolveResult,
  type SolveStats,
  solutions,
  solve,
  type ValueScorer,
} from '../../src/solver/index.ts';

describe('public solver API types', () => {
  it('keeps the agreed signatures', () => {
    expectTypeOf<ModelBuilder['addVariable']>().toEqualTypeOf<
      (name: string, size: number, initial?: Iterable<number>) => number
    >();
    expectTypeOf<ModelBuilder['addUnary']>().toEqualTypeOf<
      (v: number, allowed: (value: number) => boolean, meta: ConstraintMeta) => void
    >();
    expectTypeOf<ModelBuilder['addBinary']>().toEqualTypeOf<
      (x: number, y: number, allowed: (a: number, b: number) => boolean, meta: ConstraintMeta) => void
    >();
    expectTypeOf<ModelBuilder['addNotEqual']>().toEqualTypeOf<
      (x: number, y: number, meta: ConstraintMeta) => void
    >();
    expectTypeOf<ModelBuilder['addTable']>().toEqualTypeOf<
      (vars: readonly number[], tuples: readonly (readonly number[])[], meta: ConstraintMeta) => void
    >();
    expectTypeOf<ModelBuilder['addNary']>().toEqualTypeOf<
      (vars: readonly number[], allowed: (values: readonly number[]) => boolean, meta: ConstraintMeta) => void
    >();
    expectTypeOf<ModelBuilder['addAllDifferent']>().toEqualTypeOf<
      (vars: readonly number[], meta: ConstraintMeta) => void
    >();
    expectTypeOf<ModelBuilder['addUnaryCost']>().toEqualTypeOf<
      (v: number, cost: (value: number) => number) => void
    >();
    expectTypeOf<ModelBuilder['addBinaryCost']>().toEqualTypeOf<
      (x: number, y: number, cost: (a: number, b: number) => number) => void
    >();
    expectTypeOf<ModelBuilder['build']>().toEqualTypeOf<() => Model>();
    expectTypeOf<Model['variableCount']>().toEqualTypeOf<number>();
    expectTypeOf<Model['groups']>().toEqualTypeOf<readonly string[]>();
    expectTypeOf(solve).toEqualTypeOf<(model: Model, options?: SolveOptions) => SolveResult>();
    expectTypeOf(solutions).toEqualTypeOf<
      (model: Model, options?: Omit<SolveOptions, 'mode'>) => Generator<readonly number[]>
    >();
    expectTypeOf(countSolutions).toEqualTypeOf<
      (model: Model, options?: Omit<SolveOptions, 'mode'>) => { count: number; complete: boolean }
    >();
    const model = new ModelBuilder().build();
    const budget: Budget = { nodes: 5 };
    expectTypeOf(minimalConflict).toBeCallableWith(model);
    expectTypeOf(minimalConflict).toBeCallableWith(model, ['group'], { budget });
    expectTypeOf(minimalConflict).returns.toEqualTypeOf<readonly string[] | null>();
    expectTypeOf(improve).toEqualTypeOf<
      (model: Model, start: readonly number[], options: LocalSearchOptions) => LocalSearchResult
    >();
    expectTypeOf<SolveResult['status']>().toEqualTypeOf<'solved' | 'unsatisfiable' | 'incomplete'>();
    expectTypeOf<SolveResult['solutions']>().toEqualTypeOf<readonly (readonly number[])[]>();
    expectTypeOf<SolveStats>().toEqualTypeOf<{
      nodes: number;
      backtracks: number;
      pruned: number;
      propagations: number;
      elapsedMs: number;
    }>();
    expectTypeOf<ValueScorer>().toEqualTypeOf<(variable: number, value: number) => number>();
    expectTypeOf<NonNullable<SolveOptions['mode']>>().toEqualTypeOf<
      { kind: 'first' } | { kind: 'all'; limit?: number } | { kind: 'best'; k: number }
    >();
    expectTypeOf<LocalSearchResult>().toEqualTypeOf<{
      readonly assignment: readonly number[];
      readonly violations: number;
      readonly cost: number;
      readonly complete: boolean;
      readonly moves: number;
    }>();
  });
});
