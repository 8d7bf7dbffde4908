import { Temporal } from 'temporal-polyfill';
import { z } from 'zod';
import { SlotwrightError } from '../errors.ts';
import { isValidZone } from '../time/zoned.ts';

/** When the week plan is posted: an ISO weekday and a local clock time. */
export interface WeekPostTime {
  /** ISO weekday, 1 = Monday .. 7 = Sunday. */
  readonly weekday: number;
  /** Minutes since local midnight. */
  readonly minutes: number;
}

const DAYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;

/** Reads "fri 14:00" (a weekday name and a 24-hour time); throws a config error naming the fix. */
export function parseWeekPostTime(text: string): WeekPostTime {
  const m = /^\s*(mon|tue|wed|thu|fri|sat|sun)[a-z]*\s+([01]\d|2[0-3]):([0-5]\d)\s*$/i.exec(text);
  const day = m === null ? -1 : DAYS.indexOf(m[1]!.toLowerCase() as (typeof DAYS)[number]);
  if (m === null || day < 0) {
    throw new SlotwrightError(
      'config_invalid',
      `weekPlan.post '${text}' is not a weekday and a time; write it like "fri 14:00"`,
    );
  }
  return { weekday: day + 1, minutes: Number(m[2]) * 60 + Number(m[3]) };
}

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

/** `weekPlan` post settings of a workspace: when, in which channel, on which clock. */
export const weekPostSettingsSchema = z
  .object({
    post: z
      .string()
      .refine(
        (s) => {
          try {
            parseWeekPostTime(s);
            return true;
          } catch {
            return false;
          }
        },
        { message: 'write the post time as a weekday and a 24-hour time, for example "fri 14:00"' },
      )
      .describe('When next week\'s plan is posted, e.g. "fri 14:00", on the clock of `zone`.'),
    channel: z
      .string()
      .regex(/^[A-Z0-9]{5,}$/, { message: 'a channel id such as C0123ABCD (the id, not the #name)' })
      .describe('Chat channel id the plan is posted to.'),
    zone: z
      .string()
      .refine(isValidZone, { message: 'an IANA zone such as Europe/Lisbon' })
      .describe('IANA zone whose wall clock the post time is read on.'),
  })
  .strict();

/** Validated week-plan post settings. */
export type WeekPostSettings = z.infer<typeof weekPostSettingsSchema>;
