import { describe, expect, it } from 'vitest';
import { prepare } from '../../src/scheduling/prepare.ts';
import { scoreOf } from '../../src/scheduling/score.ts';
import type { SchedulingContext } from '../../src/scheduling/types.ts';
import { DEFAULT_WORKING_HOURS } from '../../src/time/working-hours.ts';

// Lisbon keeps UTC in December (WET, IANA rules, from memory), so the local times below read as UTC.
const at = (hhmm: string) => Date.parse(`2026-12-07T${hhmm}:00Z`);
const context: SchedulingContext = {
  zone: 'Europe/Lisbon',
  gridMinutes: 15,
  tentative: 'penalty',
  now: 0,
  people: [
    { id: 'ana', zone: 'Europe/Lisbon', workingHours: DEFAULT_WORKING_HOURS, busy: [], rules: [] },
    {
      id: 'bo',
      zone: 'Europe/Lisbon',
      workingHours: DEFAULT_WORKING_HOURS,
      busy: [{ start: at('09:00'), end: at('09:30'), kind: 'tentative' }],
      rules: [],
    },
    {
      id: 'cy',
      zone: 'Europe/Lisbon',
      workingHours: DEFAULT_WORKING_HOURS,
      busy: [{ start: at('09:00'), end: at('17:00'), kind: 'busy' }],
      rules: [],
    },
  ],
  rooms: [],
  groups: [],
};

describe('scoreOf', () => {
  const p = prepare(context, {
    with: ['ana', 'bo'],
    optional: ['cy'],
    lengthMinutes: 30,
    window: { start: at('09:00'), end: at('10:00') },
  });
  if (!p.ok) throw new Error('prepare failed');

  it('adds the named parts to 100: first hour of the day, an optional attendee away, a tentative overlap', () => {
    // 09:00-09:30: 30 minutes in the first hour of both days (-0.1 each), cy busy all day, bo tentative
    expect(scoreOf(p.value, 0, -1)).toEqual({
      score: 76,
      breakdown: [
        {
          why: 'early or late in the day for ana (09:00 Europe/Lisbon), bo (09:00 Europe/Lisbon)',
          points: -6,
        },
        { why: 'optional cy cannot come', points: -10 },
        { why: 'overlaps tentative time of bo', points: -8 },
      ],
    });
  });

  it('counts short gaps left before the meeting and the days after the window opens', () => {
    // 09:15-09:45: 15 minutes later (-0.01), 15 free minutes left before it for ana (bo's are tentative)
    expect(scoreOf(p.value, 1, -1)).toEqual({
      score: 73.99,
      breakdown: [
        { why: '0.0 days after the window opens', points: -0.01 },
        {
          why: 'early or late in the day for ana (09:15 Europe/Lisbon), bo (09:15 Europe/Lisbon)',
          points: -6,
        },
        { why: 'leaves gaps under 30 minutes for ana', points: -2 },
        { why: 'optional cy cannot come', points: -10 },
        { why: 'overlaps tentative time of bo', points: -8 },
      ],
    });
  });
});
