import { z } from 'zod';
import type { Interval } from '../time/interval.ts';
import type { RuleEffect } from './effect.ts';
import { REST_CAUTION, restEffect } from './rest.ts';

/**
 * `rest:` in a workspace (all people) or on one person: the minimum hours between the last meeting of
 * a day and the first of the next. Optional and off unless set.
 */
export const restSettingsSchema = z
  .object({
    hours: z
      .number()
      .min(1, { message: 'rest between days takes 1 to 24 hours, for example 11' })
      .max(24, { message: 'rest between days takes 1 to 24 hours, for example 11' })
      .describe('Minimum hours between the last meeting of a day and the first of the next.'),
    strength: z
      .enum(['hard', 'preference'])
      .default('hard')
      .describe('hard: never plan inside the rest; preference: avoid it when another time exists.'),
  })
  .strict()
  .describe(`Rest between days. ${REST_CAUTION}`);

/** Validated rest settings. */
export type RestSettings = z.infer<typeof restSettingsSchema>;

/** A person as the scheduling context holds them: enough to add a rest rule. */
export interface RestSubject {
  readonly id: string;
  readonly zone: string;
  readonly busy: readonly Interval[];
  readonly rules: readonly RuleEffect[];
}

/**
 * Adds each person's rest-between-days effect to their rules over `window`: a person's own setting
 * wins over the workspace's; people with neither are returned unchanged.
 */
export function withRestEffects<P extends RestSubject>(
  people: readonly P[],
  settings: { readonly workspace?: RestSettings; readonly people?: Readonly<Record<string, RestSettings>> },
  window: Interval,
): P[] {
  return people.map((p) => {
    const rest = settings.people?.[p.id] ?? settings.workspace;
    if (rest === undefined) return p;
    const effect = restEffect(p.busy, {
      zone: p.zone,
      hours: rest.hours,
      from: window.start,
      to: window.end,
      strength: rest.strength,
      ruleId: `rest:${p.id}`,
    });
    return { ...p, rules: [...p.rules, effect] };
  });
}
