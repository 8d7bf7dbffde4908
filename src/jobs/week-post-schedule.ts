import { Temporal } from 'temporal-polyfill';
import type { WeekPostTime } from '../config/week-post-schema.ts';

// The pure schema and parser live with the workspace config; the job keeps exporting them.
export {
  parseWeekPostTime,
  type WeekPostSettings,
  type WeekPostTime,
  weekPostSettingsSchema,
} from '../config/week-post-schema.ts';

/** The 5-field cron expression node-cron runs for a post time ("0 14 * * 5" for Friday 14:00). */
export function weekPostCron(time: WeekPostTime): string {
  // cron counts Sunday as 0; ISO as 7.
  return `${time.minutes % 60} ${Math.floor(time.minutes / 60)} * * ${time.weekday % 7}`;
}

/**
 * The next `count` instants (UTC epoch ms) after `after` at which the post is due, read on the zone's
 * wall clock with Temporal. A local time that a daylight-saving gap skips moves forward by the gap and
 * a repeated one is taken once, at its first occurrence (Temporal's 'compatible', as RFC 5545 section
 * 3.3.5 asks of local times).
 */
export function nextWeekPostTimes(time: WeekPostTime, zone: string, after: number, count: number): number[] {
  const out: number[] = [];
  const start = Temporal.Instant.fromEpochMilliseconds(after).toZonedDateTimeISO(zone).toPlainDate();
  let date = start.subtract({ days: 1 });
  while (out.length < count) {
    if (date.dayOfWeek === time.weekday) {
      const at = date
        .toPlainDateTime({ hour: Math.floor(time.minutes / 60), minute: time.minutes % 60 })
        .toZonedDateTime(zone, { disambiguation: 'compatible' }).epochMilliseconds;
      if (at > after) out.push(at);
    }
    date = date.add({ days: 1 });
  }
  return out;
}

/** The ISO week (`YYYY-Www`) and its Monday that a post fired at `firedAt` announces: the next week. */
export function weekAnnouncedAt(firedAt: number, zone: string): { isoWeek: string; weekStart: string } {
  const today = Temporal.Instant.fromEpochMilliseconds(firedAt).toZonedDateTimeISO(zone).toPlainDate();
  const monday = today.subtract({ days: today.dayOfWeek - 1 }).add({ weeks: 1 });
  return {
    isoWeek: `${monday.yearOfWeek}-W${String(monday.weekOfYear).padStart(2, '0')}`,
    weekStart: monday.toString(),
  };
}
