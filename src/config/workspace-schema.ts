import { z } from 'zod';
import { restSettingsSchema } from '../rules/rest-settings.ts';
import { isKnownHolidayRegion } from '../time/holidays.ts';
import { type DailyRange, parseDailyRange, WEEKDAY_KEYS, type WeekdayKey } from '../time/working-hours.ts';
import { isValidZone } from '../time/zoned.ts';
import { seriesListSchema, weekPlanSettingsSchema } from './series-schema.ts';
import { weekPostChannelSchema, weekPostTimeSchema, weekPostZoneSchema } from './week-post-schema.ts';

const idSchema = z.string().regex(/^[a-z0-9-]+$/, {
  message: 'expected an id of lower-case letters, digits and dashes, for example "ana" or "chart-room"',
});

const zoneSchema = z.string().refine(isValidZone, {
  error: (issue) =>
    `expected an IANA time zone such as "Europe/Lisbon" or "America/Halifax", got '${String(issue.input)}'`,
});

const dailyRangeSchema = z.string().transform((text, ctx): DailyRange => {
  const r = parseDailyRange(text);
  if (!r.ok) {
    ctx.addIssue({ code: 'custom', message: r.message });
    return z.NEVER;
  }
  return r.range;
});

/** Weekly hours as written: `{mon: ["09:00-17:00"], ...}`; days left out have no working hours. */
export const weeklyHoursSchema = z.strictObject(
  Object.fromEntries(WEEKDAY_KEYS.map((d) => [d, z.array(dailyRangeSchema).optional()])) as Record<
    WeekdayKey,
    z.ZodOptional<z.ZodArray<typeof dailyRangeSchema>>
  >,
);

const feedSchema = z.string().superRefine((ref, ctx) => {
  if (/^[a-z][a-z0-9+.-]*:/i.test(ref)) {
    if (!/^https:\/\/[^\s/]+/i.test(ref))
      ctx.addIssue({
        code: 'custom',
        message: `a feed is a path inside the workspace folder or an https:// URL, got '${ref}'`,
      });
    return;
  }
  const parts = ref.split(/[\\/]/);
  if (ref.startsWith('/') || ref.startsWith('\\') || parts.includes('..') || ref.trim() === '')
    ctx.addIssue({
      code: 'custom',
      message: `a feed path must stay inside the workspace folder (relative, without '..'), got '${ref}'`,
    });
});

const holidayRegionSchema = z.string().refine(isKnownHolidayRegion, {
  error: (issue) =>
    `expected a holiday region of the date-holidays data: a country code such as "PT" or "NZ", or country-state such as "CA-NS"; got '${String(issue.input)}'`,
});

const ruleListSchema = z.array(z.string().trim().min(1, { message: 'a rule cannot be empty' })).default([]);

/** One person as written under `people:`. */
export const personSchema = z.strictObject({
  id: idSchema,
  name: z.string().min(1),
  email: z.email({ message: 'expected an email address such as "ana@example.org"' }).optional(),
  chat: z.string().min(1).optional(),
  zone: zoneSchema.optional(),
  workingHours: weeklyHoursSchema.optional(),
  holidays: holidayRegionSchema.optional(),
  feeds: z.array(feedSchema).default([]),
  rules: ruleListSchema,
  /** Rest between days for this person; wins over the workspace's. @default the workspace's */
  rest: restSettingsSchema.optional(),
});

/** One room as written under `rooms:`. */
export const roomSchema = z.strictObject({
  id: idSchema,
  name: z.string().min(1),
  capacity: z.number().int().min(1, { message: 'a room seats at least one person' }),
  features: z.array(z.string().min(1)).default([]),
  zone: zoneSchema.optional(),
  feeds: z.array(feedSchema).default([]),
  rules: ruleListSchema,
});

/** One group as written under `groups:`; members are person ids. */
export const groupSchema = z.strictObject({
  id: idSchema,
  name: z.string().min(1).optional(),
  members: z.array(idSchema).min(1, { message: 'a group needs at least one member' }),
});

const POST_KEYS = ['post', 'channel', 'zone'] as const;

/**
 * `weekPlan:` as written: the engine's settings plus the optional weekly post (`post`, `channel`,
 * `zone`), which come together or not at all.
 */
export const weekPlanSectionSchema = weekPlanSettingsSchema
  .unwrap()
  .extend({
    post: weekPostTimeSchema.optional(),
    channel: weekPostChannelSchema.optional(),
    zone: weekPostZoneSchema.optional(),
  })
  .superRefine((w, ctx) => {
    const given = POST_KEYS.filter((k) => w[k] !== undefined);
    if (given.length === 0 || given.length === POST_KEYS.length) return;
    for (const k of POST_KEYS.filter((x) => w[x] === undefined))
      ctx.addIssue({
        code: 'custom',
        path: [k],
        message: `the weekly post needs post, channel and zone together (got ${given.join(', ')}); add ${k} or remove the others`,
      });
  })
  .prefault({});

/** Minutes between candidate starts must divide an hour, so every hour starts on a tick. */
const GRID_CHOICES = [1, 2, 3, 4, 5, 6, 10, 12, 15, 20, 30, 60] as const;

/** The whole workspace.yaml. Unknown top-level keys are kept out and reported as warnings by the loader. */
export const workspaceSchema = z
  .object({
    name: z.string().min(1).optional(),
    zone: zoneSchema,
    grid: z
      .number()
      .int()
      .refine((n) => (GRID_CHOICES as readonly number[]).includes(n), {
        message: `expected minutes that divide an hour: ${GRID_CHOICES.join(', ')}`,
      })
      .default(5),
    horizon: z.number().int().min(1).max(366).default(14),
    workingHours: weeklyHoursSchema.optional(),
    tentative: z.enum(['penalty', 'hard']).default('penalty'),
    admins: z.array(idSchema).default([]),
    people: z.array(personSchema).default([]),
    rooms: z.array(roomSchema).default([]),
    groups: z.array(groupSchema).default([]),
    series: seriesListSchema,
    weekPlan: weekPlanSectionSchema,
    /** Rest between days for everyone (a person's own `rest` wins). @default none */
    rest: restSettingsSchema.optional(),
  })
  .superRefine((ws, ctx) => {
    const owner = new Map<string, string>();
    const claim = (id: string, what: string, path: (string | number)[]) => {
      const before = owner.get(id);
      if (before !== undefined)
        ctx.addIssue({
          code: 'custom',
          path,
          message: `id '${id}' is already used by ${before}; people, rooms and groups each need their own id`,
        });
      else owner.set(id, what);
    };
    for (const [i, p] of ws.people.entries())
      claim(p.id, `person ${i + 1} (people[${i}])`, ['people', i, 'id']);
    for (const [i, r] of ws.rooms.entries()) claim(r.id, `room ${i + 1} (rooms[${i}])`, ['rooms', i, 'id']);
    for (const [i, g] of ws.groups.entries())
      claim(g.id, `group ${i + 1} (groups[${i}])`, ['groups', i, 'id']);
    const people = new Set(ws.people.map((p) => p.id));
    for (const [i, g] of ws.groups.entries()) {
      for (const [j, m] of g.members.entries()) {
        if (!people.has(m))
          ctx.addIssue({
            code: 'custom',
            path: ['groups', i, 'members', j],
            message: `group '${g.id}' names '${m}', who is not under people:; add them or fix the id`,
          });
      }
    }
    ws.admins.forEach((a, i) => {
      if (!people.has(a))
        ctx.addIssue({
          code: 'custom',
          path: ['admins', i],
          message: `admin '${a}' is not under people:; add them or fix the id`,
        });
    });
  });

/** The workspace as written, before defaults. */
export type WorkspaceInput = z.input<typeof workspaceSchema>;
/** Top-level keys the schema knows. */
export const WORKSPACE_KEYS: readonly string[] = Object.keys(workspaceSchema.shape);
