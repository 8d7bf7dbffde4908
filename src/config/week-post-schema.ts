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

/** The `post` field: a weekday and a 24-hour time. */
export const weekPostTimeSchema = z
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
  .describe('When next week\'s plan is posted, e.g. "fri 14:00", on the clock of `zone`.');

/** The `channel` field: a chat channel id. */
export const weekPostChannelSchema = z
  .string()
  .regex(/^[A-Z0-9]{5,}$/, { message: 'a channel id such as C0123ABCD (the id, not the #name)' })
  .describe('Chat channel id the plan is posted to.');

/** The `zone` field: the IANA zone the post time is read on. */
export const weekPostZoneSchema = z
  .string()
  .refine(isValidZone, { message: 'an IANA zone such as Europe/Lisbon' })
  .describe('IANA zone whose wall clock the post time is read on.');

/** `weekPlan` post settings of a workspace: when, in which channel, on which clock. */
export const weekPostSettingsSchema = z
  .object({ post: weekPostTimeSchema, channel: weekPostChannelSchema, zone: weekPostZoneSchema })
  .strict();

/** Validated week-plan post settings. */
export type WeekPostSettings = z.infer<typeof weekPostSettingsSchema>;
