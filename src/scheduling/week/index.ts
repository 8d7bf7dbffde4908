// Public surface of src/scheduling/week: named exports only, no `export *`.
export {
  CBCTT_WEIGHTS,
  type CbcttInstance,
  cbcttToWeekRequest,
  formatCbcttSolution,
  parseCbctt,
} from './cbctt.ts';
export {
  type PlanWeekOptions,
  planWeek,
  type UnplacedCode,
  type UnplacedSeries,
  type WeekBlocker,
  type WeekPlan,
  type WeekPlanStats,
  type WeekProgress,
} from './plan-week.ts';
export { SYNTHETIC_WEIGHTS, type SyntheticWeekOptions, syntheticWeek } from './synthetic-week.ts';
export { buildImproveModel, buildPlaceModel, countViolations, type WeekModel } from './week-model.ts';
export { WeekNeighbourhood, type WeekNeighbourhoodOptions } from './week-neighbourhood.ts';
export type {
  PlacedSession,
  WeekAttendee,
  WeekCell,
  WeekRequest,
  WeekRoom,
  WeekSeries,
  WeekWeights,
} from './week-request.ts';
export { ZERO_WEIGHTS } from './week-request.ts';
export { SCORE_PART_NAMES, type ScoreParts, WeekScorer } from './week-scorer.ts';
export { WeekSpace } from './week-space.ts';
export {
  type PastSession,
  type WorkspaceWeek,
  type WorkspaceWeekInput,
  workspaceWeek,
} from './workspace-week.ts';
