// Public surface of src/scheduling: named exports only, no `export *`.
export {
  type AttendedSession,
  countOffHours,
  type FairnessWeightOptions,
  isOffHours,
  isoWeekOf,
  mondayOfIsoWeek,
  type OffHoursTally,
  offHoursWeights,
  type UsualHours,
  weeksBefore,
} from './fairness.ts';
export { buildMeetModel, findOptions, type MeetModel, STANDARD_LENGTHS, WIDEN_DAYS } from './find-options.ts';
export {
  type Attendance,
  type AttendeeView,
  type HardLayer,
  type Prepared,
  type PrepareOptions,
  prepare,
  type RoomView,
  resolveAttendees,
} from './prepare.ts';
export { costOf, roomParts, scoreOf, startParts } from './score.ts';
export type {
  Blocker,
  MeetOption,
  MeetOutcome,
  MeetRequest,
  Relaxation,
  SchedulingContext,
  SchedulingPerson,
  SchedulingRoom,
  ScorePart,
} from './types.ts';
export {
  type PastSession,
  type PlacedSession,
  type PlanWeekOptions,
  planWeek,
  type ScoreParts,
  type UnplacedSeries,
  type WeekBlocker,
  type WeekPlan,
  type WeekProgress,
  type WeekRequest,
  type WorkspaceWeek,
  workspaceWeek,
} from './week/index.ts';
