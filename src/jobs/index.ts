// Public surface of src/jobs: named exports only, no `export *`.
export {
  FEED_REFRESH_JOB,
  type FeedRefreshJob,
  type FeedRefreshJobOptions,
  startFeedRefreshJob,
} from './feed-refresh.ts';
export {
  type HoldReleaser,
  type HoldSweeper,
  type HoldSweeperOptions,
  startHoldSweeper,
} from './hold-sweeper.ts';
export {
  advisoryKey,
  type CronSlotTables,
  type JobRunTables,
  PgCronRunCoordinator,
  PgRunOnceCoordinator,
  type PgRunOnceOptions,
  type RunOnceCoordinator,
  type RunOnceOutcome,
  SingleProcessCoordinator,
} from './run-once.ts';
export {
  startWeekPostJob,
  WEEK_POST_JOB,
  type WeekPlanPoster,
  type WeekPostJob,
  type WeekPostJobOptions,
  type WeekPostRequest,
} from './week-post.ts';
export {
  nextWeekPostTimes,
  parseWeekPostTime,
  type WeekPostSettings,
  type WeekPostTime,
  weekAnnouncedAt,
  weekPostCron,
  weekPostSettingsSchema,
} from './week-post-schedule.ts';
