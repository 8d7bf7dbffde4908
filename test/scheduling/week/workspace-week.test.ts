import { describe, expect, it } from 'vitest';
import { seriesListSchema, weekPlanSettingsSchema } from '../../../src/config/series-schema.ts';
import type { SchedulingContext } from '../../../src/scheduling/index.ts';
import { planWeek, syntheticWeek, workspaceWeek } from '../../../src/scheduling/week/index.ts';
import { DEFAULT_WORKING_HOURS } from '../../../src/time/working-hours.ts';
import { planProblems } from './plan-checker.ts';

// An invented two-person workspace in Lisbon.
const context: SchedulingContext = {
  zone: 'Europe/Lisbon',
  gridMinutes: 5,
  tentative: 'penalty',
  now: Date.parse('2026-12-01T12:00:00Z'),
  people: [
    { id: 'ana', zone: 'Europe/Lisbon', workingHours: DEFAULT_WORKING_HOURS, busy: [], rules: [] },
    {
      id: 'rui',
      zone: 'Europe/Lisbon',
      workingHours: DEFAULT_WORKING_HOURS,
      // busy Monday 2026-12-07 all day (UTC equals Lisbon time in December)
      busy: [
        { start: Date.parse('2026-12-07T00:00:00Z'), end: Date.parse('2026-12-08T00:00:00Z'), kind: 'busy' },
      ],
      rules: [],
    },
  ],
  rooms: [{ id: 'nook', capacity: 2, features: ['screen'], zone: 'Europe/Lisbon', busy: [], rules: [] }],
  groups: [{ id: 'pair', members: ['ana', 'rui'] }],
};
const settings = weekPlanSettingsSchema.parse({ step: 30, compact: ['pair'] });

describe('workspaceWeek', () => {
  it('lays the ISO week on the grid and reads availability from the scheduling layer', () => {
    const series = seriesListSchema.parse([
      {
        id: 'sync',
        name: 'Sync',
        attendees: ['pair'],
        minutes: 45,
        sessions: 2,
        hours: ['10:00-12:00'],
        room: {},
      },
    ]);
    const r = workspaceWeek({ context, series, settings, isoWeek: '2026-W50' });
    if (!r.ok) throw new Error(JSON.stringify(r.issues));
    const w = r.value;
    // ISO 8601: 2026-W50 runs Monday 7 to Sunday 13 December 2026
    expect(w.dates).toEqual([
      '2026-12-07',
      '2026-12-08',
      '2026-12-09',
      '2026-12-10',
      '2026-12-11',
      '2026-12-12',
      '2026-12-13',
    ]);
    expect(w.request.cells).toHaveLength(7 * 48);
    const s = w.request.series[0]!;
    // 45 minutes on a 30-minute grid take two cells; the group expands to both people plus itself
    expect(s.length).toBe(2);
    expect(s.attendees.map((a) => w.request.attendees[a]!.id)).toEqual(['ana', 'rui', 'pair']);
    expect(s.room).toEqual({ seats: 2, features: [] });
    // allowed starts: 10:00, 10:30 and 11:00 (ends 11:45) on each day
    const allowedTimes = new Set(
      w.request.cells
        .filter((_, c) => s.allowed![c])
        .map((c) => new Date(c.start).toISOString().slice(11, 16)),
    );
    expect([...allowedTimes].sort()).toEqual(['10:00', '10:30', '11:00']);
    // rui is busy all Monday and nobody works on Saturday
    const rui = w.request.attendees[1]!;
    expect(w.request.cells.some((c, i) => c.day === 0 && rui.free![i])).toBe(false);
    expect(w.request.cells.some((c, i) => c.day === 5 && w.request.attendees[0]!.free![i])).toBe(false);
    expect(w.request.cells.filter((c, i) => c.day === 1 && rui.free![i])).toHaveLength(16);
    const plan = planWeek(w.request, { moves: 500 });
    expect(plan.complete).toBe(true);
    expect(planProblems(w.request, plan.sessions)).toEqual([]);
    expect(plan.sessions.every((p) => w.request.cells[p.cell]!.day !== 0)).toBe(true);
  });

  it('names unknown attendees and rooms as issues with their paths', () => {
    const series = seriesListSchema.parse([
      { id: 'x', name: 'X', attendees: ['ana', 'nobody'], minutes: 30, room: { only: ['attic'] } },
    ]);
    const r = workspaceWeek({ context, series, settings, isoWeek: '2026-W50' });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues.map((i) => [i.code, i.path])).toEqual([
      ['unknown_attendee', ['series', 0, 'attendees', 1]],
      ['unknown_room', ['series', 0, 'room', 'only', 0]],
    ]);
    expect(workspaceWeek({ context, series: [], settings, isoWeek: '2026-W54' }).ok).toBe(false);
  });
});

describe('syntheticWeek', () => {
  it('is deterministic for a seed and plannable without breaking a hard rule', () => {
    const a = syntheticWeek({ series: 60, people: 40, rooms: 6, seed: 4 });
    expect(syntheticWeek({ series: 60, people: 40, rooms: 6, seed: 4 })).toEqual(a);
    const plan = planWeek(a, { moves: 300, seed: 2 });
    expect(planProblems(a, plan.sessions)).toEqual([]);
    expect(plan.violations).toBe(0);
    expect(plan.sessions.length).toBeGreaterThan(0);
  });
});
