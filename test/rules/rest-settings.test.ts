import { describe, expect, it } from 'vitest';
import { REST_CAUTION } from '../../src/rules/rest.ts';
import { restSettingsSchema, withRestEffects } from '../../src/rules/rest-settings.ts';
import { findOptions } from '../../src/scheduling/find-options.ts';
import type { SchedulingContext, SchedulingPerson } from '../../src/scheduling/types.ts';

const EARLY_HOURS = {
  mon: [{ start: 420, end: 1140 }],
  tue: [{ start: 420, end: 1140 }],
  wed: [{ start: 420, end: 1140 }],
  thu: [{ start: 420, end: 1140 }],
  fri: [{ start: 420, end: 1140 }],
};

// Ines (Lisbon, WET = UTC+0 in December) and Maren (Halifax, AST = UTC-4) share a call that is late
// for Ines (21:00-22:00 Monday) and early evening for Maren (17:00-18:00 Monday). Both work 07:00-19:00.
const CALL = {
  start: Date.parse('2026-12-07T21:00Z'),
  end: Date.parse('2026-12-07T22:00Z'),
  kind: 'busy' as const,
};
const people: SchedulingPerson[] = [
  { id: 'ines', zone: 'Europe/Lisbon', workingHours: EARLY_HOURS, busy: [CALL], rules: [] },
  { id: 'maren', zone: 'America/Halifax', workingHours: EARLY_HOURS, busy: [CALL], rules: [] },
];
const WINDOW = { start: Date.parse('2026-12-07T00:00Z'), end: Date.parse('2026-12-12T00:00Z') };

function context(ps: readonly SchedulingPerson[]): SchedulingContext {
  return {
    zone: 'Europe/Lisbon',
    gridMinutes: 15,
    tentative: 'penalty',
    now: Date.parse('2026-12-01T18:00Z'),
    people: ps,
    rooms: [],
    groups: [],
  };
}

function earliest(
  ctx: SchedulingContext,
  who: string,
  window: { start: number; end: number },
): string | undefined {
  // Ask for every start in the window, so the earliest allowed start is among the options whatever the ranking.
  const r = findOptions(ctx, { with: [who], lengthMinutes: 30, window, options: 200 });
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  const starts = r.value.options.map((o) => o.start).sort((a, b) => a - b);
  return starts[0] === undefined ? undefined : new Date(starts[0]).toISOString();
}

describe('rest between days in meet', () => {
  // 11 hours: the daily rest of the EU working-time directive 2003/88/EC, article 3.
  const rest = restSettingsSchema.parse({ hours: 11 });
  const tuesdayMorning = { start: Date.parse('2026-12-08T06:00Z'), end: Date.parse('2026-12-08T11:00Z') };

  it('a late meeting in Lisbon keeps the next Lisbon morning free until 09:00 for that person', () => {
    expect(earliest(context(people), 'ines', tuesdayMorning)).toBe('2026-12-08T07:00:00.000Z');
    const rested = withRestEffects(people, { workspace: rest }, WINDOW);
    expect(earliest(context(rested), 'ines', tuesdayMorning)).toBe('2026-12-08T09:00:00.000Z');
  });

  it('the same call ends at 18:00 in Halifax, so Maren may still start at 07:00 the next day', () => {
    const rested = withRestEffects(people, { workspace: rest }, WINDOW);
    // 07:00 AST on Tuesday is 11:00Z; the call ended 13 hours before.
    const halifaxMorning = { start: Date.parse('2026-12-08T10:00Z'), end: Date.parse('2026-12-08T15:00Z') };
    expect(earliest(context(rested), 'maren', halifaxMorning)).toBe('2026-12-08T11:00:00.000Z');
  });

  it("a person's own setting wins over the workspace's, and people without one are untouched", () => {
    const rested = withRestEffects(
      people,
      { workspace: rest, people: { ines: { hours: 12, strength: 'hard' } } },
      WINDOW,
    );
    expect(earliest(context(rested), 'ines', tuesdayMorning)).toBe('2026-12-08T10:00:00.000Z');
    expect(withRestEffects(people, {}, WINDOW)).toEqual(people);
  });
});

describe('rest between days in the week plan', () => {
  // A slice of the invented demo cooperative: a Tuesday early sync that may start 07:00-09:00 Lisbon.
  const YAML = `
zone: Europe/Lisbon
workingHours: {mon: ["07:00-19:00"], tue: ["07:00-19:00"], wed: ["07:00-19:00"], thu: ["07:00-19:00"], fri: ["07:00-19:00"]}
people:
  - {id: ines, name: Ines Carvalhal, zone: Europe/Lisbon}
  - {id: rui, name: Rui Teixo, zone: Europe/Lisbon}
series:
  - {id: early-sync, name: Early sync, attendees: [ines, rui], minutes: 30, days: [tue], hours: ["07:00-09:30"]}
`;
  const NOW = Date.parse('2026-12-01T18:00Z');

  async function planWith(rest: { hours: number; strength: 'hard' | 'preference' } | undefined) {
    const { parseWorkspace } = await import('../../src/config/load-workspace.ts');
    const { planWorkspaceWeek, weekContext } = await import('../../src/app/week.ts');
    const ws = parseWorkspace(YAML, { file: '/demo/workspace.yaml', dir: '/demo' }, { now: NOW });
    if (!ws.ok) throw new Error(JSON.stringify(ws.issues));
    const base = weekContext(ws.value, NOW, WINDOW);
    // Ines's late call on Monday (from her feed in real use).
    const people = base.people.map((p) => (p.id === 'ines' ? { ...p, busy: [CALL] } : p));
    const ctx = {
      ...base,
      people: rest === undefined ? people : withRestEffects(people, { workspace: rest }, WINDOW),
    };
    const r = planWorkspaceWeek(ws.value, ctx, {
      now: NOW,
      isoWeek: '2026-W50',
      clock: () => 0,
      timeMs: 1e9,
      seed: 1,
    });
    if (!r.ok) throw new Error(JSON.stringify(r.issues));
    return r.value;
  }

  it('moves the early sync to 09:00 after an 11-hour rest, and leaves it out when no start is rested enough', async () => {
    const free = await planWith(undefined);
    expect(free.complete).toBe(true);
    // Without the rule the plan is free to use the early starts (it picks one before 09:00).
    expect(free.sessions[0]!.start).toBeLessThan(Date.parse('2026-12-08T09:00Z'));
    const rested = await planWith({ hours: 11, strength: 'hard' });
    expect(rested.sessions.map((s) => new Date(s.start).toISOString())).toEqual(['2026-12-08T09:00:00.000Z']);
    const tooLong = await planWith({ hours: 12, strength: 'hard' });
    expect(tooLong.sessions).toEqual([]);
    expect(tooLong.unplaced.map((u) => u.series)).toEqual(['early-sync']);
  });
});

describe('restSettingsSchema', () => {
  it('defaults to a hard rule and refuses hours out of range with the fix', () => {
    expect(restSettingsSchema.parse({ hours: 11 })).toEqual({ hours: 11, strength: 'hard' });
    const bad = restSettingsSchema.safeParse({ hours: 30 });
    expect(bad.success ? [] : bad.error.issues.map((i) => i.message)).toEqual([
      'rest between days takes 1 to 24 hours, for example 11',
    ]);
  });

  it('carries the caution in its description', () => {
    expect(restSettingsSchema.description).toBe(`Rest between days. ${REST_CAUTION}`);
  });
});
