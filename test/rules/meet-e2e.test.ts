import { describe, expect, it } from 'vitest';
import { parseRule } from '../../src/rules/parse-rule.ts';
import type { Rule } from '../../src/rules/rule.ts';
import { ruleEffect } from '../../src/rules/rule-effect.ts';
import type { MeetOption, SchedulingContext } from '../../src/scheduling/index.ts';
import { findOptions } from '../../src/scheduling/index.ts';
import type { BusyInterval } from '../../src/time/interval.ts';
import { breaksRule as breaks } from './support/rule-checker.ts';

// End to end through the scheduling layer's findOptions (the core of meet): for each rule kind, a
// one-person workspace without the rule offers an option that breaks it, and with the rule offers
// none that does. "Breaks" is decided by an independent checker reading wall clocks with ICU data.

const iso = (s: string): number => Date.parse(s);
const ALL_DAY = [{ start: 7 * 60, end: 23 * 60 }];
const HOURS = {
  mon: ALL_DAY,
  tue: ALL_DAY,
  wed: ALL_DAY,
  thu: ALL_DAY,
  fri: ALL_DAY,
  sat: ALL_DAY,
  sun: ALL_DAY,
};

interface Case {
  readonly sentence: string;
  readonly zone: string;
  readonly window: readonly [string, string];
  readonly now: string;
  readonly minutes: number;
  readonly busy?: readonly (readonly [string, string])[];
}

// Week of 2026-12-07 (a Monday); Lisbon is on UTC+0 in December, Halifax falls back on 2026-11-01.
const CASES: readonly Case[] = [
  {
    sentence: 'No meetings before 10am',
    zone: 'Europe/Lisbon',
    window: ['2026-12-07T08:00:00Z', '2026-12-07T12:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 60,
  },
  {
    sentence: 'no meetings between 12 and 1',
    zone: 'Europe/Lisbon',
    window: ['2026-12-07T11:00:00Z', '2026-12-07T15:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 30,
  },
  {
    sentence: 'meetings only on weekdays',
    zone: 'Europe/Lisbon',
    window: ['2026-12-12T09:00:00Z', '2026-12-14T12:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 60,
  },
  {
    sentence: 'no meetings on Friday afternoons',
    zone: 'Europe/Lisbon',
    window: ['2026-12-11T10:00:00Z', '2026-12-11T18:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 60,
  },
  {
    sentence: 'Keep Tuesday mornings free',
    zone: 'Europe/Lisbon',
    window: ['2026-12-08T08:00:00Z', '2026-12-08T14:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 60,
  },
  {
    sentence: 'No meetings on the 24th',
    zone: 'Europe/Lisbon',
    window: ['2026-12-24T09:00:00Z', '2026-12-25T12:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 60,
  },
  {
    sentence: "I'm out the 21st to the 2nd",
    zone: 'Europe/Lisbon',
    window: ['2027-01-01T09:00:00Z', '2027-01-04T12:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 60,
  },
  {
    sentence: 'no meetings after 5pm Halifax time',
    zone: 'Europe/Lisbon',
    window: ['2026-12-07T18:00:00Z', '2026-12-07T23:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 60,
  },
  {
    sentence: 'no meetings before 10am',
    zone: 'America/Halifax',
    window: ['2026-10-31T11:00:00Z', '2026-11-02T16:00:00Z'],
    now: '2026-10-01T12:00:00Z',
    minutes: 60,
  },
  {
    sentence: 'at least 24 hours notice',
    zone: 'Europe/Lisbon',
    window: ['2026-12-07T20:00:00Z', '2026-12-08T12:00:00Z'],
    now: '2026-12-07T09:00:00Z',
    minutes: 60,
  },
  {
    sentence: 'no meetings longer than 45 minutes',
    zone: 'Europe/Lisbon',
    window: ['2026-12-07T09:00:00Z', '2026-12-07T12:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 60,
  },
  {
    sentence: 'at least 15 minutes between meetings',
    zone: 'Europe/Lisbon',
    window: ['2026-12-07T09:00:00Z', '2026-12-07T12:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 30,
    busy: [['2026-12-07T10:00:00Z', '2026-12-07T11:00:00Z']],
  },
  {
    sentence: 'At most 2 meetings a day',
    zone: 'Europe/Lisbon',
    window: ['2026-12-07T08:00:00Z', '2026-12-08T12:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 60,
    busy: [
      ['2026-12-07T09:00:00Z', '2026-12-07T09:30:00Z'],
      ['2026-12-07T13:00:00Z', '2026-12-07T13:30:00Z'],
    ],
  },
  {
    sentence: 'at most 90 minutes of meetings per day',
    zone: 'Europe/Lisbon',
    window: ['2026-12-07T08:00:00Z', '2026-12-08T12:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 60,
    busy: [['2026-12-07T09:00:00Z', '2026-12-07T10:00:00Z']],
  },
];

function solve(
  c: Case,
  rule: Rule | undefined,
): { options: readonly MeetOption[]; blockers: readonly string[] } {
  const now = iso(c.now);
  const window = { start: iso(c.window[0]), end: iso(c.window[1]) };
  const busy: BusyInterval[] = (c.busy ?? []).map(([a, b]) => ({ start: iso(a), end: iso(b), kind: 'busy' }));
  const effects =
    rule === undefined
      ? []
      : [
          ruleEffect(rule, {
            zone: c.zone,
            from: window.start - 86_400_000,
            to: window.end + 86_400_000,
            now,
            id: 'r1',
          }),
        ];
  const context: SchedulingContext = {
    zone: c.zone,
    gridMinutes: 5,
    tentative: 'penalty',
    now,
    people: [{ id: 'rui', zone: c.zone, workingHours: HOURS, busy, rules: effects }],
    rooms: [],
    groups: [],
  };
  const r = findOptions(context, { with: ['rui'], lengthMinutes: c.minutes, window, options: 12 });
  if (!r.ok) throw new Error(r.issues.map((i) => i.message).join('; '));
  return { options: r.value.options, blockers: r.value.blockers.map((b) => b.detail) };
}

describe('rules end to end through findOptions', () => {
  for (const c of CASES) {
    it(`"${c.sentence}" removes the options that break it and only those kinds`, () => {
      const p = parseRule(c.sentence, { zone: c.zone, now: iso('2026-12-01T12:00:00Z') });
      if (!p.ok) throw new Error(p.issues[0]!.message);
      const busy: BusyInterval[] = (c.busy ?? []).map(([a, b]) => ({
        start: iso(a),
        end: iso(b),
        kind: 'busy',
      }));
      const before = solve(c, undefined);
      const after = solve(c, p.rule);
      const broken = (o: MeetOption): boolean => breaks(p.rule, o, c.zone, iso(c.now), busy);
      expect(before.options.some(broken), 'some option without the rule breaks it').toBe(true);
      expect(after.options.filter(broken)).toEqual([]);
      if (p.rule.body.kind === 'max-length') {
        expect(after.options).toEqual([]);
        expect(after.blockers).toEqual(["rui's rule: No meetings longer than 45 minutes"]);
      } else expect(after.options.length).toBeGreaterThan(0);
      // the rule removes nothing more: each earlier option that keeps to it can still be had alone
      const kept = before.options.filter((o) => !broken(o)).slice(0, 3);
      if (p.rule.body.kind !== 'max-length') expect(kept.length).toBeGreaterThan(0);
      for (const o of kept) {
        const alone = solve(
          { ...c, window: [new Date(o.start).toISOString(), new Date(o.end).toISOString()] },
          p.rule,
        );
        expect(alone.options.map((x) => x.start)).toEqual([o.start]);
      }
    });
  }

  it('ranks a preference: the best option keeps to "prefer meetings in the afternoon" when it can', () => {
    const c: Case = {
      sentence: 'prefer meetings in the afternoon',
      zone: 'Europe/Lisbon',
      window: ['2026-12-07T08:00:00Z', '2026-12-07T16:00:00Z'],
      now: '2026-12-01T12:00:00Z',
      minutes: 60,
    };
    const p = parseRule(c.sentence, { zone: c.zone, now: iso(c.now) });
    if (!p.ok) throw new Error('unreadable');
    const best = solve(c, p.rule).options[0]!;
    expect(breaks(p.rule, best, c.zone, iso(c.now), [])).toBe(false);
  });
});
