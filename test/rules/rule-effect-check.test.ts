import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseRule } from '../../src/rules/parse-rule.ts';
import { DEFAULT_DAY_PARTS, type Rule } from '../../src/rules/rule.ts';
import { ruleEffect } from '../../src/rules/rule-effect.ts';

// An independent check of ruleEffect: for sampled instants, read the wall clock with the runtime's
// ICU time-zone data (Intl.DateTimeFormat, not Temporal and not src/time) and decide from the rule's
// structure alone whether a meeting touching that instant breaks the rule.

const formatters = new Map<string, Intl.DateTimeFormat>();
function wall(t: number, zone: string): { date: string; weekday: number; minutes: number } {
  let f = formatters.get(zone);
  if (f === undefined) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone: zone,
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      weekday: 'short',
      hourCycle: 'h23',
    });
    formatters.set(zone, f);
  }
  const p = Object.fromEntries(f.formatToParts(new Date(t)).map((x) => [x.type, x.value]));
  const weekday = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'].indexOf(p.weekday!) + 1;
  return { date: `${p.year}-${p.month}-${p.day}`, weekday, minutes: Number(p.hour) * 60 + Number(p.minute) };
}

function breaks(rule: Rule, t: number, personZone: string, now: number): boolean {
  const b = rule.body;
  if (b.kind === 'notice') return t < now + b.minutes * 60_000;
  if (b.kind !== 'window' && b.kind !== 'keep-free' && b.kind !== 'dates') return false;
  const w = wall(t, b.zone ?? personZone);
  const span =
    b.times === undefined
      ? { from: 0, to: 1440 }
      : 'part' in b.times
        ? DEFAULT_DAY_PARTS[b.times.part]
        : b.times;
  const inTime = w.minutes >= span.from && w.minutes < span.to;
  const inDays =
    b.kind === 'dates'
      ? w.date >= b.from && w.date <= b.to
      : b.weekdays === undefined || b.weekdays.includes(w.weekday);
  const inside = inTime && inDays;
  return b.kind === 'keep-free' || b.mode === 'avoid' ? inside : !inside;
}

const SENTENCES = [
  'No meetings before 10am',
  'no meetings after 5pm',
  'no meetings between 1am and 3am',
  'no meetings before 1:30am',
  'No meetings between 12 and 1',
  'no meetings on Friday afternoons',
  'meetings only on weekdays',
  'meetings must be after 10am',
  'Keep Sunday mornings free',
  'no meetings after 5pm Lisbon time',
  'no meetings before 9am Auckland time',
  'no meetings after 17:30 America/Halifax time',
  "I'm out the 21st to the 2nd",
  'no meetings on 2026-03-29 before 3am',
  'no meetings on 2026-11-01 between 1am and 2am',
  'prefer meetings in the evening',
  'at least 24 hours notice',
];
const ZONES = ['Europe/Lisbon', 'America/Halifax', 'Pacific/Auckland', 'UTC'];
// windows around the 2026 DST changes of these zones and the year end (IANA rules, from memory:
// Auckland 2026-04-05 and 2026-09-27, Lisbon 2026-03-29 and 2026-10-25, Halifax 2026-03-08 and 2026-11-01)
const ANCHORS = [
  '2026-03-07',
  '2026-03-28',
  '2026-04-04',
  '2026-09-26',
  '2026-10-24',
  '2026-10-31',
  '2026-12-30',
].map((d) => Date.parse(`${d}T00:00:00Z`));

describe('ruleEffect against an ICU wall-clock checker', () => {
  const parsed = SENTENCES.map((s) => {
    const p = parseRule(s, { zone: 'Europe/Lisbon', now: Date.parse('2026-12-01T12:00:00Z') });
    if (!p.ok) throw new Error(`${s}: ${p.issues[0]!.message}`);
    return p.rule;
  });

  it('avoids exactly the instants a meeting may not touch', () => {
    fc.assert(
      fc.property(
        fc.nat(parsed.length - 1),
        fc.constantFrom(...ZONES),
        fc.constantFrom(...ANCHORS),
        fc.integer({ min: -36, max: 36 }), // window start, hours from the anchor
        fc.integer({ min: 6, max: 96 }), // window length in hours
        fc.integer({ min: -48, max: 96 }), // now, hours from the window start
        (ri, zone, anchor, startH, lengthH, nowH) => {
          const rule = parsed[ri]!;
          const from = anchor + startH * 3_600_000;
          const to = from + lengthH * 3_600_000;
          const now = from + nowH * 3_600_000;
          const effect = ruleEffect(rule, { zone, from, to, now });
          const inAvoid = (t: number): boolean => effect.avoid.some((i) => t >= i.start && t < i.end);
          const samples: number[] = [];
          for (let t = from; t < to; t += 7 * 60_000) samples.push(t);
          for (const i of effect.avoid) samples.push(i.start, i.end - 1, i.start - 1, i.end);
          for (const t of samples) {
            if (t < from || t >= to) continue;
            if (inAvoid(t) !== breaks(rule, t, zone, now))
              throw new Error(
                `${effect.text} in ${zone} at ${new Date(t).toISOString()}: effect ${inAvoid(t)}`,
              );
          }
          for (const i of effect.avoid) expect(i.end).toBeGreaterThan(i.start);
        },
      ),
      { numRuns: 300, seed: 20261201 },
    );
  });
});
