import { Temporal } from 'temporal-polyfill';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fairnessWeightsFor, InMemoryFairnessLedger, recordWeekOffHours } from '../../src/app/fairness.ts';
import type { FairnessLedger } from '../../src/app/ports.ts';
import { isoWeekOf, type UsualHours } from '../../src/scheduling/fairness.ts';
import { planWeek } from '../../src/scheduling/week/plan-week.ts';
import { type WeekCell, type WeekRequest, ZERO_WEIGHTS } from '../../src/scheduling/week/week-request.ts';
import { openStore, SqlLedgerStore, type StoreHandle } from '../../src/store/index.ts';
import { DEFAULT_WORKING_HOURS, workingIntervals } from '../../src/time/working-hours.ts';
import { zonedToInstant } from '../../src/time/zoned.ts';

// Two people in each office of the demo cooperative (fixtures/demo/workspace.yaml).
const TEAM: Readonly<Record<string, string>> = {
  maren: 'America/Halifax',
  teo: 'America/Halifax',
  ines: 'Europe/Lisbon',
  rui: 'Europe/Lisbon',
  aroha: 'Pacific/Auckland',
  niko: 'Pacific/Auckland',
};
const PEOPLE = Object.keys(TEAM);
const USUAL: Record<string, UsualHours> = Object.fromEntries(
  PEOPLE.map((p) => [p, { zone: TEAM[p]!, hours: DEFAULT_WORKING_HOURS }]),
);
const CELL = 1_800_000;

/** One week of 30-minute cells, Monday to Friday UTC, with each person's off-hours share per cell. */
function weekRequest(monday: string, weights: Record<string, number>): WeekRequest {
  const t0 = zonedToInstant(monday, 0, 'UTC');
  const cells: WeekCell[] = [];
  for (let k = 0; k < 5 * 48; k++)
    cells.push({ start: t0 + k * CELL, end: t0 + (k + 1) * CELL, day: Math.floor(k / 48) });
  return {
    cells,
    days: 5,
    rooms: [],
    attendees: PEOPLE.map((id) => ({
      id,
      offHours: cells.map((c) => {
        const inside = workingIntervals(USUAL[id]!.hours, USUAL[id]!.zone, c).reduce(
          (n, i) => n + i.end - i.start,
          0,
        );
        return (CELL - inside) / CELL;
      }),
      offHoursWeight: weights[id]!,
    })),
    series: [{ id: 'all-hands', attendees: PEOPLE.map((_, i) => i), sessions: 1, minDays: 1, length: 2 }],
    weights: { ...ZERO_WEIGHTS, usualHours: 1 },
    seatsHard: true,
  };
}

/** Eight weeks through the real week plan: weights from the ledger, plan, then record the week. */
async function eightWeeks(ledger: FairnessLedger, firstMonday: string): Promise<Record<string, number>> {
  let monday = firstMonday;
  const totals: Record<string, number> = Object.fromEntries(PEOPLE.map((p) => [p, 0]));
  for (let w = 0; w < 8; w++) {
    const week = isoWeekOf(monday);
    const weights = await fairnessWeightsFor(ledger, PEOPLE, week);
    const request = weekRequest(monday, weights);
    const plan = planWeek(request, { seed: 7, moves: 4000 });
    expect(plan.complete).toBe(true);
    const cell = request.cells[plan.sessions[0]!.cell]!;
    const counts = await recordWeekOffHours(
      ledger,
      week,
      [{ start: cell.start, end: cell.start + 2 * CELL, attendees: PEOPLE }],
      USUAL,
    );
    for (const [p, c] of Object.entries(counts)) totals[p]! += c;
    monday = Temporal.PlainDate.from(monday).add({ weeks: 1 }).toString();
  }
  return totals;
}

describe('fairness through the week plan and a stored history', () => {
  let handle: StoreHandle;
  beforeAll(async () => {
    handle = await openStore({ dialect: 'sqlite', file: ':memory:' });
  });
  afterAll(async () => {
    await handle.close();
  });

  it('spring 2027 on SQLite: eight weekly plans spread the off-hours sessions to within one', async () => {
    const totals = await eightWeeks(new SqlLedgerStore(handle), '2027-03-01');
    expect(Math.max(...Object.values(totals)) - Math.min(...Object.values(totals))).toBeLessThanOrEqual(1);
    // Everyone takes a share: the history moved the burden onto Halifax too once it had been spared.
    expect(Object.values(totals).every((n) => n >= 3)).toBe(true);
  });

  it('the stored history is what the next plan reads', async () => {
    const ledger = new SqlLedgerStore(handle);
    const rows = await ledger.offHours(PEOPLE, ['2027-W09', '2027-W10']);
    expect(rows.length).toBe(12);
    expect(rows.reduce((n, r) => n + r.count, 0)).toBeGreaterThan(0);
  });
});

describe('recordWeekOffHours', () => {
  it('replaces a week on a second call instead of adding to it', async () => {
    const ledger = new InMemoryFairnessLedger();
    // 13:00-14:00 UTC on Monday 2027-01-04: inside Halifax and Lisbon hours, 02:00 in Auckland.
    const early = {
      start: Date.parse('2027-01-04T13:00Z'),
      end: Date.parse('2027-01-04T14:00Z'),
      attendees: PEOPLE,
    };
    // 20:00-21:00 UTC: 16:00 Halifax, 20:00 Lisbon, 09:00 Tuesday Auckland.
    const late = {
      start: Date.parse('2027-01-04T20:00Z'),
      end: Date.parse('2027-01-04T21:00Z'),
      attendees: PEOPLE,
    };
    expect(await recordWeekOffHours(ledger, '2027-W01', [early], USUAL)).toMatchObject({ aroha: 1, ines: 0 });
    expect(await recordWeekOffHours(ledger, '2027-W01', [late], USUAL)).toMatchObject({ aroha: 0, ines: 1 });
    const rows = await ledger.offHours(['aroha', 'ines'], ['2027-W01']);
    expect(rows).toEqual([
      { person: 'aroha', isoWeek: '2027-W01', count: 0 },
      { person: 'ines', isoWeek: '2027-W01', count: 1 },
    ]);
  });

  it('weights look back a fixed number of weeks', async () => {
    const ledger = new InMemoryFairnessLedger();
    await ledger.addOffHours('aroha', '2026-W40', 5);
    await ledger.addOffHours('ines', '2027-W01', 2);
    expect(await fairnessWeightsFor(ledger, ['aroha', 'ines'], '2027-W02')).toEqual({ aroha: 1, ines: 3 });
    expect(await fairnessWeightsFor(ledger, ['aroha', 'ines'], '2027-W02', { lookbackWeeks: 20 })).toEqual({
      aroha: 4,
      ines: 1,
    });
  });
});
