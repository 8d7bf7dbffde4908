import { describe, expect, it } from 'vitest';
import { meet } from '../../src/app/meet.ts';
import { parseWorkspace } from '../../src/config/index.ts';
import { parseRule } from '../../src/rules/parse-rule.ts';
import type { BusyInterval } from '../../src/time/interval.ts';
import { breaksRule } from './support/rule-checker.ts';

// End to end through the meet use case: a workspace written as YAML with one rule under a person,
// loaded by the config loader, its sentences read by parseWorkspaceRules, solved by meet. For each
// rule kind, the same workspace without the rule offers an option that breaks it; with the rule, no
// option does. The judge is the ICU-based checker in support/rule-checker.ts.

const iso = (s: string): number => Date.parse(s);

function workspaceYaml(zone: string, rules: readonly string[]): string {
  const hours = '["07:00-23:00"]';
  return [
    'name: Rule check',
    `zone: ${zone}`,
    'grid: 5',
    'horizon: 14',
    'workingHours:',
    ...['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'].map((d) => `  ${d}: ${hours}`),
    'people:',
    `  - id: rui`,
    `    name: Rui Teixo`,
    `    zone: ${zone}`,
    `    rules: ${JSON.stringify(rules)}`,
  ].join('\n');
}

interface Case {
  readonly sentence: string;
  readonly zone: string;
  readonly window: readonly [string, string];
  readonly now: string;
  readonly minutes: number;
  readonly busy?: readonly (readonly [string, string])[];
}

const CASES: readonly Case[] = [
  {
    sentence: 'No meetings before 10am',
    zone: 'Europe/Lisbon',
    window: ['2026-12-07T08:00:00Z', '2026-12-07T12:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 60,
  },
  {
    sentence: 'prefer no meetings after 4pm',
    zone: 'Europe/Lisbon',
    window: ['2026-12-07T15:00:00Z', '2026-12-07T18:00:00Z'],
    now: '2026-12-01T12:00:00Z',
    minutes: 60,
  },
  {
    sentence: 'meetings only on weekdays',
    zone: 'Europe/Lisbon',
    window: ['2026-12-12T09:00:00Z', '2026-12-14T12:00:00Z'],
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
];

async function ask(c: Case, rules: readonly string[]) {
  const now = iso(c.now);
  const parsed = parseWorkspace(
    workspaceYaml(c.zone, rules),
    { file: 'workspace.yaml', dir: '/nonexistent' },
    { now },
  );
  if (!parsed.ok) throw new Error(parsed.issues.map((i) => i.message).join('; '));
  const busy: BusyInterval[] = (c.busy ?? []).map(([a, b]) => ({ start: iso(a), end: iso(b), kind: 'busy' }));
  return meet(
    parsed.value,
    {
      with: ['rui'],
      lengthMinutes: c.minutes,
      window: { start: iso(c.window[0]), end: iso(c.window[1]) },
      options: 12,
    },
    { now, busyOf: async (ids) => new Map(ids.map((id) => [id, id === 'rui' ? busy : []])) },
  );
}

describe('meet with one workspace rule', () => {
  for (const c of CASES) {
    it(`"${c.sentence}"`, async () => {
      const p = parseRule(c.sentence, { zone: c.zone, now: iso(c.now) });
      if (!p.ok) throw new Error(p.issues[0]!.message);
      const busy: BusyInterval[] = (c.busy ?? []).map(([a, b]) => ({
        start: iso(a),
        end: iso(b),
        kind: 'busy',
      }));
      const broken = (o: { start: number; end: number }): boolean =>
        breaksRule(p.rule, o, c.zone, iso(c.now), busy);
      const before = await ask(c, []);
      const after = await ask(c, [c.sentence]);
      if (!before.ok || !after.ok) throw new Error('meet failed');
      const brokenBefore = before.value.options.filter(broken);
      expect(brokenBefore.length, 'an option without the rule breaks it').toBeGreaterThan(0);
      if (p.rule.strength === 'hard') {
        expect(after.value.options.filter(broken)).toEqual([]);
        // the options that broke the rule are gone
        const afterStarts = new Set(after.value.options.map((o) => o.start));
        expect(brokenBefore.filter((o) => afterStarts.has(o.start))).toEqual([]);
      } else {
        // a preference reorders: the best option keeps to it when some option can
        expect(broken(after.value.options[0]!)).toBe(false);
        // and an option that breaks it carries the rule in its score breakdown
        const costly = after.value.options.filter(broken);
        expect(costly.length).toBeGreaterThan(0);
        for (const o of costly)
          expect(o.breakdown.some((part) => part.why.includes(p.text) && part.points < 0)).toBe(true);
      }
      if (p.rule.body.kind === 'max-length') {
        expect(after.value.options).toEqual([]);
        expect(after.value.blockers.map((b) => b.detail)).toEqual([
          "rui's rule: No meetings longer than 45 minutes",
        ]);
      } else expect(after.value.options.length).toBeGreaterThan(0);
    });
  }

  it('refuses to plan over an unreadable rule, naming the person and the sentence', async () => {
    const r = await ask(CASES[0]!, ['no meetings before 9']);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues[0]!.message).toBe(
      'workspace.yaml: person rui (Rui Teixo), rule 1 "no meetings before 9": \'before 9\' could mean before 9am or before 9pm; say which (with am/pm or as 24-hour time)',
    );
  });
});
