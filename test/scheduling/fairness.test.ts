import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import {
  countOffHours,
  isOffHours,
  isoWeekOf,
  mondayOfIsoWeek,
  type OffHoursTally,
  offHoursWeights,
  type UsualHours,
  weeksBefore,
} from '../../src/scheduling/fairness.ts';
import { DEFAULT_WORKING_HOURS, workingIntervals } from '../../src/time/working-hours.ts';
import { zonedToInstant } from '../../src/time/zoned.ts';

const HOUR = 3_600_000;

// Two people in each office of the demo cooperative (fixtures/demo/workspace.yaml), 09:00-17:00 on
// weekdays in their own zone.
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

function offMinutes(person: string, start: number, end: number): number {
  const u = USUAL[person]!;
  const inside = workingIntervals(u.hours, u.zone, { start, end }).reduce((n, i) => n + i.end - i.start, 0);
  return (end - start - inside) / 60_000;
}

/**
 * A weekly one-hour meeting of the whole team, placed each week at the start (30-minute steps over
 * Monday to Friday UTC) with the least off-hours cost: attendee-hours outside usual hours times the
 * attendee's weight, the cost the week plan uses. Ties go to the earliest start.
 */
function simulate(
  firstMonday: string,
  weeks: number,
  fair: boolean,
): { totals: Record<string, number>; starts: number[] } {
  const history: OffHoursTally[] = [];
  const starts: number[] = [];
  let monday = firstMonday;
  for (let w = 0; w < weeks; w++) {
    const week = isoWeekOf(monday);
    const weights = fair ? offHoursWeights(PEOPLE, history) : Object.fromEntries(PEOPLE.map((p) => [p, 1]));
    const t0 = zonedToInstant(monday, 0, 'UTC');
    let best = { start: 0, cost: Number.POSITIVE_INFINITY };
    for (let k = 0; k < 5 * 48; k++) {
      const start = t0 + k * 1_800_000;
      const cost = PEOPLE.reduce((c, p) => c + weights[p]! * offMinutes(p, start, start + HOUR), 0);
      if (cost < best.cost) best = { start, cost };
    }
    starts.push(best.start);
    const counts = countOffHours([{ start: best.start, end: best.start + HOUR, attendees: PEOPLE }], USUAL);
    for (const [person, count] of counts) history.push({ person, isoWeek: week, count });
    monday = Temporal.PlainDate.from(monday).add({ weeks: 1 }).toString();
  }
  const totals: Record<string, number> = Object.fromEntries(PEOPLE.map((p) => [p, 0]));
  for (const h of history) totals[h.person]! += h.count;
  return { totals, starts };
}

const spread = (totals: Record<string, number>) =>
  Math.max(...Object.values(totals)) - Math.min(...Object.values(totals));

describe('fairness over eight simulated weeks, team in Halifax, Lisbon and Auckland', () => {
  it('spring 2027, across all three daylight-saving changes: off-hours counts differ by at most one', () => {
    // IANA rules (from memory, checked through Temporal): Halifax goes to UTC-3 on 2027-03-14, Lisbon
    // to UTC+1 on 2027-03-28, Auckland back to UTC+12 on 2027-04-04; all inside the eight weeks.
    expect(Temporal.ZonedDateTime.from('2027-03-15T12:00[America/Halifax]').offset).toBe('-03:00');
    expect(Temporal.ZonedDateTime.from('2027-03-29T12:00[Europe/Lisbon]').offset).toBe('+01:00');
    expect(Temporal.ZonedDateTime.from('2027-04-05T12:00[Pacific/Auckland]').offset).toBe('+12:00');
    const { totals } = simulate('2027-03-01', 8, true);
    expect(totals).toEqual({ maren: 3, teo: 3, ines: 4, rui: 4, aroha: 4, niko: 4 });
    expect(spread(totals)).toBeLessThanOrEqual(1);
  });

  it('winter 2027: the burden alternates between Lisbon and Auckland; Halifax is never needed off-hours', () => {
    // The bound this proves: counts differ by at most one among the people who are off-hours at some
    // least-burden slot (Lisbon and Auckland). Halifax overlaps both other offices in winter, so every
    // slot that puts Halifax off-hours also puts Lisbon or Auckland off-hours: moving Halifax out of its
    // hours would add burden without relieving anyone, and the weights rightly never do it.
    const { totals } = simulate('2027-01-04', 8, true);
    expect(totals).toEqual({ maren: 0, teo: 0, ines: 4, rui: 4, aroha: 4, niko: 4 });
    const t0 = zonedToInstant('2027-01-04', 0, 'UTC');
    for (let k = 0; k < 5 * 48; k++) {
      const s = t0 + k * 1_800_000;
      if (offMinutes('maren', s, s + HOUR) > 0) {
        expect(offMinutes('ines', s, s + HOUR) + offMinutes('aroha', s, s + HOUR)).toBeGreaterThan(0);
      }
    }
  });

  it('without the weights, the same office takes every inconvenient meeting', () => {
    const { totals } = simulate('2027-01-04', 8, false);
    expect(totals).toEqual({ maren: 0, teo: 0, ines: 0, rui: 0, aroha: 8, niko: 8 });
  });
});

describe('offHoursWeights', () => {
  it('starts everyone at 1 and adds a step per session beyond the least burdened, capped', () => {
    const history: OffHoursTally[] = [
      { person: 'aroha', isoWeek: '2027-W01', count: 1 },
      { person: 'aroha', isoWeek: '2027-W02', count: 2 },
      { person: 'ines', isoWeek: '2027-W02', count: 1 },
      { person: 'stranger', isoWeek: '2027-W02', count: 9 },
    ];
    expect(offHoursWeights(['aroha', 'ines', 'maren'], history)).toEqual({ aroha: 4, ines: 2, maren: 1 });
    expect(offHoursWeights(['aroha', 'ines'], history, { step: 2, maxWeight: 4 })).toEqual({
      aroha: 4,
      ines: 1,
    });
    expect(offHoursWeights(['maren'], [])).toEqual({ maren: 1 });
  });
});

describe('off-hours counting', () => {
  it('a session is off-hours when any part of it is outside usual hours, on the local clock', () => {
    const lisbon = USUAL.ines!;
    // 16:30-17:30 Lisbon on Monday 2027-01-04 runs half an hour past 17:00.
    expect(
      isOffHours({ start: Date.parse('2027-01-04T16:30Z'), end: Date.parse('2027-01-04T17:30Z') }, lisbon),
    ).toBe(true);
    expect(
      isOffHours({ start: Date.parse('2027-01-04T16:00Z'), end: Date.parse('2027-01-04T17:00Z') }, lisbon),
    ).toBe(false);
    // Saturday is outside the default working week.
    expect(
      isOffHours({ start: Date.parse('2027-01-09T10:00Z'), end: Date.parse('2027-01-09T11:00Z') }, lisbon),
    ).toBe(true);
  });

  it('counts per attendee and leaves out people without known hours', () => {
    const s = { start: Date.parse('2027-01-04T13:00Z'), end: Date.parse('2027-01-04T14:00Z') };
    const counts = countOffHours([{ ...s, attendees: ['maren', 'ines', 'aroha', 'guest'] }], USUAL);
    expect(Object.fromEntries(counts)).toEqual({ maren: 0, ines: 0, aroha: 1 });
  });
});

describe('ISO weeks', () => {
  // Independent check: the ordinal-date rule of ISO 8601, week = floor((ordinal - weekday + 10) / 7),
  // with weeks 0 and 53 folded into the neighbouring year (the published algorithm, from memory).
  function isoWeekByOrdinal(date: string): string {
    const d = Temporal.PlainDate.from(date);
    const weeksIn = (y: number) => {
      const p = (x: number) => (x + Math.floor(x / 4) - Math.floor(x / 100) + Math.floor(x / 400)) % 7;
      return p(y) === 4 || p(y - 1) === 3 ? 53 : 52;
    };
    let year = d.year;
    let week = Math.floor((d.dayOfYear - d.dayOfWeek + 10) / 7);
    if (week < 1) {
      year -= 1;
      week = weeksIn(year);
    } else if (week > weeksIn(year)) {
      year += 1;
      week = 1;
    }
    return `${year}-W${String(week).padStart(2, '0')}`;
  }

  it('agrees with the ordinal-date rule for every day of 2024 to 2028', () => {
    for (
      let d = Temporal.PlainDate.from('2024-01-01');
      Temporal.PlainDate.compare(d, Temporal.PlainDate.from('2029-01-01')) < 0;
      d = d.add({ days: 1 })
    ) {
      expect(isoWeekOf(d.toString())).toBe(isoWeekByOrdinal(d.toString()));
    }
  });

  it('knows the year-end edges', () => {
    // 2026 starts on a Thursday, so it has 53 ISO weeks (ISO 8601: a year has week 53 when 1 January
    // or 31 December is a Thursday).
    expect(isoWeekOf('2026-12-31')).toBe('2026-W53');
    expect(isoWeekOf('2027-01-03')).toBe('2026-W53');
    expect(isoWeekOf('2027-01-04')).toBe('2027-W01');
    expect(mondayOfIsoWeek('2026-W53')).toBe('2026-12-28');
    expect(mondayOfIsoWeek('2027-W01')).toBe('2027-01-04');
    expect(weeksBefore('2027-W02', 3)).toEqual(['2026-W52', '2026-W53', '2027-W01']);
    expect(() => mondayOfIsoWeek('2027-W53')).toThrow(/does not exist/);
    expect(() => mondayOfIsoWeek('week 3')).toThrow(/not an ISO week/);
  });
});
