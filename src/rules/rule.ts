import { z } from 'zod';

/** Named parts of the day a rule can mention; their clock bands are configurable (see `DayParts`). */
export const dayPartSchema = z.enum(['morning', 'afternoon', 'evening']);
/** A named part of the day. */
export type DayPart = z.infer<typeof dayPartSchema>;

/** Clock bands of the day parts, in minutes since local midnight, half-open [from, to). */
export type DayParts = Readonly<Record<DayPart, { readonly from: number; readonly to: number }>>;

/** Default day parts: morning 08:00-12:00, afternoon 12:00-17:00, evening 17:00-21:00 (common practice). */
export const DEFAULT_DAY_PARTS: DayParts = {
  morning: { from: 480, to: 720 },
  afternoon: { from: 720, to: 1020 },
  evening: { from: 1020, to: 1260 },
};

const minuteOfDay = z.number().int().min(0).max(1440);
const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'a date as YYYY-MM-DD');
const weekdays = z.array(z.number().int().min(1).max(7)).min(1).readonly();

/** A stretch of each local day: a named part, or a clock range [from, to) in minutes since midnight. */
export const timeSpanSchema = z.union([
  z.object({ part: dayPartSchema }).strict(),
  z
    .object({ from: minuteOfDay, to: minuteOfDay })
    .strict()
    .refine((s) => s.from < s.to, 'a clock range must start before it ends'),
]);
/** A stretch of each local day. */
export type TimeSpan = z.infer<typeof timeSpanSchema>;

/** Whom a rule binds: the person who said it, a named person, a room or a group. */
export const ruleSubjectSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('speaker') }).strict(),
  z.object({ kind: z.literal('person'), id: z.string().min(1) }).strict(),
  z.object({ kind: z.literal('room'), id: z.string().min(1) }).strict(),
  z.object({ kind: z.literal('group'), id: z.string().min(1) }).strict(),
]);
/** Whom a rule binds. */
export type RuleSubject = z.infer<typeof ruleSubjectSchema>;

/** `avoid`: meetings should stay out of the described time; `only`: meetings should stay inside it. */
export const ruleModeSchema = z.enum(['avoid', 'only']);

/** What a rule says. Each kind is one member of this union; see DEVELOPERS.md "how to add a rule kind". */
export const ruleBodySchema = z
  .discriminatedUnion('kind', [
    z
      .object({
        kind: z.literal('window'),
        mode: ruleModeSchema,
        weekdays: weekdays.optional(),
        times: timeSpanSchema.optional(),
        zone: z.string().min(1).optional(),
      })
      .strict(),
    z
      .object({
        kind: z.literal('dates'),
        mode: ruleModeSchema,
        from: isoDate,
        to: isoDate,
        times: timeSpanSchema.optional(),
        zone: z.string().min(1).optional(),
      })
      .strict(),
    z
      .object({
        kind: z.literal('keep-free'),
        weekdays: weekdays.optional(),
        times: timeSpanSchema.optional(),
        zone: z.string().min(1).optional(),
      })
      .strict(),
    z
      .object({
        kind: z.literal('daily-limit'),
        maxMeetings: z.number().int().min(1).optional(),
        maxMinutes: z.number().int().min(1).optional(),
        weekdays: weekdays.optional(),
      })
      .strict(),
    z.object({ kind: z.literal('gap'), minutes: z.number().int().min(1) }).strict(),
    z.object({ kind: z.literal('notice'), minutes: z.number().int().min(1) }).strict(),
    z.object({ kind: z.literal('max-length'), minutes: z.number().int().min(1) }).strict(),
  ])
  .superRefine((body, ctx) => {
    // shapes a sentence cannot say are refused here, so every valid rule has a normalized sentence
    if (
      (body.kind === 'window' || body.kind === 'keep-free') &&
      body.weekdays === undefined &&
      body.times === undefined
    )
      ctx.addIssue({ code: 'custom', message: 'a time rule needs weekdays or times of day' });
    if (
      'times' in body &&
      body.times !== undefined &&
      'from' in body.times &&
      body.times.from === 0 &&
      body.times.to === 1440
    )
      ctx.addIssue({
        code: 'custom',
        message: 'a clock range over the whole day is the same as no clock range; leave it out',
      });
    if (body.kind === 'daily-limit' && body.maxMeetings === undefined && body.maxMinutes === undefined)
      ctx.addIssue({ code: 'custom', message: 'a daily limit needs a number of meetings or of minutes' });
    if (body.kind === 'dates' && body.to < body.from)
      ctx.addIssue({ code: 'custom', message: 'a date range must not end before it starts' });
    if (
      'weekdays' in body &&
      body.weekdays !== undefined &&
      body.weekdays.some((d, i, a) => i > 0 && d <= a[i - 1]!)
    )
      ctx.addIssue({ code: 'custom', message: 'weekdays are listed once each, Monday (1) first' });
  });
/** What a rule says. */
export type RuleBody = z.infer<typeof ruleBodySchema>;

/** One rule in structured form, as parsed from a plain sentence and as stored. */
export const ruleSchema = z
  .object({
    subject: ruleSubjectSchema,
    strength: z.enum(['hard', 'preference']),
    body: ruleBodySchema,
  })
  .strict();
/** One rule in structured form. */
export type Rule = z.infer<typeof ruleSchema>;

/** Why a sentence could not become a rule. */
export interface RuleIssue {
  readonly code: 'rule_unreadable' | 'rule_ambiguous';
  readonly path: readonly (string | number)[];
  readonly message: string;
  /** Whole sentences we do understand that come closest to what was said. */
  readonly suggestions: readonly string[];
}

/** Result of parsing a sentence: the rule and its normalized sentence, or the issues. */
export type RuleParse =
  | { readonly ok: true; readonly rule: Rule; readonly text: string }
  | { readonly ok: false; readonly issues: readonly RuleIssue[] };

/** A person, room or group a sentence may name. */
export interface NamedEntity {
  readonly id: string;
  readonly name?: string;
}

/** What parseRule needs to read a sentence. */
export interface RuleContext {
  /** IANA zone of the speaker; dates like "the 24th" are read on this zone's calendar. */
  readonly zone: string;
  /** Current instant (epoch ms); relative dates count from here. */
  readonly now: number;
  /** Id of the person speaking; naming yourself binds the rule to the speaker. */
  readonly speaker?: string;
  /** People the sentence may name. @default [] */
  readonly people?: readonly NamedEntity[];
  /** Rooms the sentence may name. @default [] */
  readonly rooms?: readonly NamedEntity[];
  /** Groups the sentence may name. @default [] */
  readonly groups?: readonly NamedEntity[];
}
