// Public surface of src/app: named exports only, no `export *`.

export {
  type BookedValue,
  type BookingDeps,
  type BookingIssue,
  type BookingOptions,
  type BookingResult,
  BookingService,
  type BusyOf,
  type DirectChoice,
  directKey,
  type InviteSettings,
  LOCAL_OPERATOR,
  type OptionChoice,
  optionKey,
} from './book.ts';
export {
  type FairnessOptions,
  fairnessWeightsFor,
  InMemoryFairnessLedger,
  recordWeekOffHours,
} from './fairness.ts';
export {
  busyByOwner,
  type FeedFreshness,
  type FeedSpec,
  type FeedsDeps,
  type OwnerBusy,
  refreshFeeds,
} from './feeds.ts';
export { InMemoryRuleStore } from './in-memory-rule-store.ts';
export { type MeetAsk, type MeetUseCaseOptions, meet } from './meet.ts';
export type { FairnessLedger, FeedStateStore, RuleStore, StoredRule } from './ports.ts';
export {
  forgetRule,
  listRules,
  previewRule,
  type RuleActor,
  type RuleDeps,
  type RulePreviewData,
  type RuleResult,
  ruleOwnerId,
  saveRule,
} from './rules.ts';
export {
  describeWeekLock,
  type LockedSession,
  type LockedWeek,
  lockWeek,
  type MovedSession,
  type PendingSession,
  type WeekInvite,
  type WeekLockDeps,
  type WeekLockOptions,
  type WeekLockOutcome,
} from './week-lock.ts';
export {
  createWeekPlanPoster,
  restSettingsOf,
  startWeekPlanPosting,
  usualHoursOf,
  type WeekPostCoordination,
  type WeekPostDeps,
  type WeekPostMessage,
  weekPlanMessage,
  withWorkspaceRest,
} from './week-post.ts';
export {
  fileBusy,
  type StaleFeed,
  type WorkspaceContextOptions,
  workspaceContext,
  workspaceRules,
} from './workspace.ts';
