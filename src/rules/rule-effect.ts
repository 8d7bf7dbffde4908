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

/** Constant-offset stretches of a zone covering [from, to): each with its UTC offset in ms. */
function offsetSegments(
  zone: string,
  from: number,
  to: number,
): { start: number; end: number; offset: number }[] {
  const out: { start: number; end: number; offset: number }[] = [];
  let cursor = Temporal.Instant.fromEpochMilliseconds(from).toZonedDateTimeISO(zone);
  while (cursor.epochMilliseconds < to) {
    const next = cursor.getTimeZoneTransition('next');
    const end = next === null ? to : Math.min(to, next.epochMilliseconds);
    out.push({ start: cursor.epochMilliseconds, end, offset: cursor.offsetNanoseconds / 1_000_000 });
    if (next === null) break;
    cursor = next;
  }
  return out;
}

/**
 * The instants of each calendar day of `zone` whose wall-clock reading falls in [span.from, span.to).
 * Worked out per constant-offset stretch, so on DST days "before 10am" still ends at 10:00 local, a
 * range inside the spring-forward gap starts where the clock resumes (as RFC 5545 section 3.3.5 moves
 * such times forward), and a repeated hour in the autumn is covered both times it is on the clock.
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
  const segments = offsetSegments(zone, zonedToInstant(first, 0, zone), zonedToInstant(last, 1440, zone));
  for (let date = first; date <= last; date = addDays(date, 1)) {
    if (!keep(date)) continue;
    const [y, m, d] = date.split('-').map(Number) as [number, number, number];
    const wallMidnight = Date.UTC(y, m - 1, d);
    for (const seg of segments) {
      const start = Math.max(seg.start, wallMidnight + span.from * 60_000 - seg.offset);
      const end = Math.min(seg.end, wallMidnight + span.to * 60_000 - seg.offset);
      if (end > start) out.push({ start, end });
    }
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
