// Public surface of src/solver: named exports only, no `export *`.
export { type ConflictOptions, minimalConflict } from './conflict.ts';
export { improve } from './local-search.ts';
export {
  type ConstraintInfo,
  type ConstraintKind,
  type ConstraintMeta,
  type Model,
  ModelBuilder,
} from './model.ts';
export {
  type AnnealOptions,
  type AnnealProgress,
  type AnnealResult,
  anneal,
  type NeighbourhoodProblem,
} from './neighbourhood.ts';
export { Prng } from './prng.ts';
export { countSolutions, solutions, solve } from './solve.ts';
export type {
  Budget,
  LocalSearchOptions,
  LocalSearchResult,
  SolveMode,
  SolveOptions,
  SolveResult,
  SolveStats,
  ValueScorer,
} from './types.ts';
