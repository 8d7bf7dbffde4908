import { Temporal } from 'temporal-polyfill';
import type { Interval } from '../time/interval.ts';
import { addDays, instantToZoned, weekdayOf, zonedToInstant } from '../time/zoned.ts';
import { describeRule } from './describe-rule.ts';
import type { RuleEffect } from './effect.ts';
import { clip, complement } from './interval-sets.ts';
import { type DayParts, DEFAULT_DAY_PARTS, type Rule, type TimeSpan } from './rule.ts';

/** What ruleEffect needs besides the rule. */
export interface RuleEffectContext {
  /** IANA zone of the person or room the rule binds; used unless the rule names its own zone. */
  readonly zone: string;
  /** Start of the search window (epoch ms, inclusive). */
  readonly from: number;
  /** End of the search window (epoch ms, exclusive). */
  readonly to: number;
  /** Current instant (epoch ms); notice rules count from here. */
  readonly now: number;
  /** Stable rule id for explanations. @default `rule:` + the normalized sentence */
  readonly id?: string;
  /** Clock bands of morning, afternoon and evening. @default DEFAULT_DAY_PARTS */
  readonly dayParts?: DayParts;
}

function spanMinutes(times: TimeSpan | undefined, parts: DayParts): { from: number; to: number } {
  if (times === undefined) return { from: 0, to: 1440 };
  if ('part' in times) return parts[times.part];
  return times;
}

/**
 * One local stretch per calendar day of `zone` over the window. Each end is placed with
 * zonedToInstant, so "before 10am" stays 10:00 on the wall clock on DST days (the day is 23 or 25
 * hours long, and the stretch from midnight shrinks or grows by the hour).
 */
function localStretches(
  zone: string,
  from: number,
  to: number,
  span: { from: number; to: number },
  keep: (date: string) => boolean,
): Interval[] {
  const out: Interval[] = [];
  const first = addDays(instantToZoned(from, zone).date, -1);
  const last = addDays(instantToZoned(to, zone).date, 1);
  for (let date = first; date <= last; date = addDays(date, 1)) {
    if (!keep(date)) continue;
    out.push({ start: zonedToInstant(date, span.from, zone), end: zonedToInstant(date, span.to, zone) });
  }
  return clip(out, from, to);
}

/**
 * Turns a rule into what the scheduling layer needs over one window: UTC avoid-intervals for time
 * windows, dates, keep-free blocks and notice ([from, now + notice)), or the numeric limits for
 * lengths, gaps and daily limits. An `only` rule becomes the complement of its allowed time.
 */
export function ruleEffect(rule: Rule, ctx: RuleEffectContext): RuleEffect {
  const text = describeRule(rule);
  const base = { ruleId: ctx.id ?? `rule:${text}`, text, strength: rule.strength };
  const parts = ctx.dayParts ?? DEFAULT_DAY_PARTS;
  const body = rule.body;
  switch (body.kind) {
    case 'window':
    case 'keep-free': {
      const zone = body.zone ?? ctx.zone;
      const days = body.weekdays;
      const stretches = localStretches(zone, ctx.from, ctx.to, spanMinutes(body.times, parts), (d) =>
        days === undefined ? true : days.includes(weekdayOf(d)),
      );
      const only = body.kind === 'window' && body.mode === 'only';
      return { ...base, avoid: only ? complement(stretches, ctx.from, ctx.to) : stretches };
    }
    case 'dates': {
      const zone = body.zone ?? ctx.zone;
      const stretches = localStretches(
        zone,
        ctx.from,
        ctx.to,
        spanMinutes(body.times, parts),
        (d) => Temporal.PlainDate.compare(d, body.from) >= 0 && Temporal.PlainDate.compare(d, body.to) <= 0,
      );
      return { ...base, avoid: body.mode === 'only' ? complement(stretches, ctx.from, ctx.to) : stretches };
    }
    case 'notice': {
      const until = Math.min(ctx.to, ctx.now + body.minutes * 60_000);
      return { ...base, avoid: until > ctx.from ? [{ start: ctx.from, end: until }] : [] };
    }
    case 'max-length':
      return { ...base, avoid: [], maxLengthMinutes: body.minutes };
    case 'gap':
      return { ...base, avoid: [], gapMinutes: body.minutes };
    case 'daily-limit':
      return {
        ...base,
        avoid: [],
        dailyLimit: {
          zone: ctx.zone,
          ...(body.maxMeetings === undefined ? {} : { maxMeetings: body.maxMeetings }),
          ...(body.maxMinutes === undefined ? {} : { maxMinutes: body.maxMinutes }),
          ...(body.weekdays === undefined ? {} : { weekdays: body.weekdays }),
        },
      };
  }
}
