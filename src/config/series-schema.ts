import { z } from 'zod';

// A series is a recurring meeting definition: how many sessions per week, spread over how many days,
// where and when it may go. The week plan places every series of one week jointly.

const idPattern = /^[a-z0-9][a-z0-9-]*$/;
const weekdayNames = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;
/** A weekday name as written in workspace.yaml. */
export const weekdaySchema = z.enum(weekdayNames);

/** A local time range "HH:MM-HH:MM" (end after start, end may be 24:00). */
export const hourRangeSchema = z
  .string()
  .regex(/^([01]\d|2[0-3]):[0-5]\d-(([01]\d|2[0-3]):[0-5]\d|24:00)$/, {
    message: 'write an hour range as "HH:MM-HH:MM", for example "09:00-12:00"',
  })
  .refine(
    (s) => {
      const [a, b] = s.split('-') as [string, string];
      const m = (t: string) => Number(t.slice(0, 2)) * 60 + Number(t.slice(3, 5));
      return m(b) > m(a);
    },
    { message: 'the end of an hour range must come after its start' },
  );

const weightSchema = z.number().finite().nonnegative();

/** Preference weights of one series; each overrides the workspace's week-plan weight of that name. */
export const seriesWeightsSchema = z
  .object({
    /** Per day missing below `minDays`. */
    spread: weightSchema.optional(),
    /** Per session outside the preferred days. */
    preferredDays: weightSchema.optional(),
    /** Per session outside the preferred hours. */
    preferredHours: weightSchema.optional(),
    /** Per extra room used by the series' sessions. */
    roomStability: weightSchema.optional(),
    /** Per session moved against last week's plan. */
    moves: weightSchema.optional(),
    /** Per attendee-hour outside the attendee's usual hours. */
    usualHours: weightSchema.optional(),
  })
  .strict();

/** One series as written under `series:` in workspace.yaml. */
export const seriesSchema = z
  .object({
    id: z.string().regex(idPattern, {
      message: 'a series id is lower-case letters, digits and dashes, for example "data-sync"',
    }),
    name: z.string().min(1),
    /** Person ids and group ids; groups expand to their members. */
    attendees: z.array(z.string().min(1)).min(1, { message: 'a series needs at least one attendee' }),
    /** Length of each session in minutes. */
    minutes: z
      .number()
      .int()
      .min(5)
      .max(24 * 60),
    /** Sessions per week. @default 1 */
    sessions: z.number().int().min(1).max(20).default(1),
    /** Sessions should spread over at least this many distinct days (a preference). @default sessions */
    minDays: z.number().int().min(1).max(7).optional(),
    /** Days a session may take; all working days when absent. */
    days: z.array(weekdaySchema).min(1).optional(),
    /** Days a session would like to take. */
    preferredDays: z.array(weekdaySchema).min(1).optional(),
    /** Local hour ranges (workspace zone unless `zone` is set) a session must lie in. */
    hours: z.array(hourRangeSchema).min(1).optional(),
    /** Local hour ranges a session would like to lie in. */
    preferredHours: z.array(hourRangeSchema).min(1).optional(),
    /** Zone of `hours` and `preferredHours`; the workspace zone when absent. */
    zone: z.string().min(1).optional(),
    /** Room needs; no room is booked when absent. */
    room: z
      .object({
        /** Seats needed; the attendee count when absent. */
        seats: z.number().int().min(1).optional(),
        features: z.array(z.string().min(1)).default([]),
        /** Only these rooms (ids), e.g. the rooms of the attendees' office; any room when absent. */
        only: z.array(z.string().min(1)).min(1).optional(),
      })
      .strict()
      .optional(),
    weights: seriesWeightsSchema.optional(),
  })
  .strict()
  .refine((s) => s.minDays === undefined || s.minDays <= s.sessions, {
    message: 'minDays cannot exceed sessions (a day holds at least one session)',
    path: ['minDays'],
  });

/** The `series:` list of a workspace; ids must be unique. */
export const seriesListSchema = z
  .array(seriesSchema)
  .default([])
  .superRefine((list, ctx) => {
    const seen = new Set<string>();
    list.forEach((s, i) => {
      if (seen.has(s.id))
        ctx.addIssue({
          code: 'custom',
          message: `series id '${s.id}' is used twice; give each series its own id`,
          path: [i, 'id'],
        });
      seen.add(s.id);
    });
  });

/** A validated series. */
export type SeriesConfig = z.infer<typeof seriesSchema>;
/** A series as written, before defaults are applied. */
export type SeriesInput = z.input<typeof seriesSchema>;

/** Workspace-wide week-plan settings (`weekPlan:` in workspace.yaml): weights and opt-ins. */
export const weekPlanSettingsSchema = z
  .object({
    /** Minutes between candidate session starts. @default 30 */
    step: z.number().int().min(5).max(240).default(30),
    /** Whether too few seats is a hard rule; when false, each missing seat costs `weights.seats`. @default true */
    seatsHard: z.boolean().default(true),
    /** Minutes at each end of a working day that count as outside someone's usual hours. @default 60 */
    usualEdgeMinutes: z.number().int().min(0).max(240).default(60),
    /** People and groups who would like their meetings of a day back to back (no isolated ones). @default [] */
    compact: z.array(z.string().min(1)).default([]),
    weights: z
      .object({
        spread: weightSchema.default(5),
        isolated: weightSchema.default(2),
        roomStability: weightSchema.default(1),
        preferredDays: weightSchema.default(2),
        preferredHours: weightSchema.default(2),
        usualHours: weightSchema.default(1),
        moves: weightSchema.default(3),
        seats: weightSchema.default(1),
      })
      .strict()
      .prefault({}),
  })
  .strict()
  .prefault({});

/** Validated week-plan settings. */
export type WeekPlanSettings = z.infer<typeof weekPlanSettingsSchema>;
