/**
 * The weekly post settings of `weekPlan:` (post, channel, zone). The schema and parser are pure and
 * are kept beside the job that runs them (src/jobs/week-post-schedule.ts); the jobs layer may not
 * import config, so config reads them from there.
 */
import {
  parseWeekPostTime,
  type WeekPostSettings,
  type WeekPostTime,
  weekPostSettingsSchema,
} from '../jobs/week-post-schedule.ts';

export { parseWeekPostTime, type WeekPostSettings, type WeekPostTime, weekPostSettingsSchema };

/** The `post` field: a weekday and a 24-hour time ("fri 14:00"). */
export const weekPostTimeSchema = weekPostSettingsSchema.shape.post;
/** The `channel` field: a chat channel id. */
export const weekPostChannelSchema = weekPostSettingsSchema.shape.channel;
/** The `zone` field: the IANA zone the post time is read on. */
export const weekPostZoneSchema = weekPostSettingsSchema.shape.zone;
