import { describe, expect, it } from 'vitest';
import type { WeekPlanView } from '../../src/app/service.ts';
import { lockReply, weekProgressReply, weekReply } from '../../src/bot/conversation.ts';
import { renderText } from '../../src/bot/render-text.ts';

// Monday 2026-12-07 14:00 UTC is 14:00 in Lisbon and 10:00 in Halifax (UTC+0 and UTC-4 in December,
// IANA tz database).
const MON_14 = Date.parse('2026-12-07T14:00:00Z');
const H = 3_600_000;

const PLAN: WeekPlanView = {
  weekOf: '2026-12-07',
  isoWeek: '2026-W50',
  sessions: [
    { series: 'Survey sync', seriesId: 'survey-sync', start: MON_14, end: MON_14 + 0.75 * H, room: 'Tejo' },
  ],
  unplaced: [
    {
      series: 'Data review',
      reason: 'no common free time for a session',
      blockers: ["Teo Brannigan's free time"],
    },
  ],
  cost: { total: 4, parts: [{ label: 'outside usual hours', points: 4 }] },
  diff: [
    { series: 'Survey sync', change: 'moved', before: MON_14 - H, after: MON_14 },
    { series: 'Data review', change: 'removed', before: MON_14 + 24 * H },
  ],
  relock: false,
  lockToken: '2026-W50:abc',
  warnings: [],
};

describe('week plan replies', () => {
  it('shows sessions on the viewer clock, cost parts, blockers, the diff and a Lock choice for admins', () => {
    const lisbon = renderText(weekReply(PLAN, true), 'Europe/Lisbon');
    expect(lisbon.text.split('\n')).toEqual([
      'Week plan for 2026-W50 (week of 2026-12-07)',
      '  - Mon 2026-12-07 14:00–14:45 Survey sync in Tejo',
      '  (cost 4 (lower is better): outside usual hours 4)',
      'Could not place:',
      "  - Data review: no common free time for a session (in the way: Teo Brannigan's free time)",
      'Changes against the locked week before:',
      '  - Survey sync: moved from Mon 2026-12-07 13:00 to Mon 2026-12-07 14:00',
      '  - Data review: no session at Tue 2026-12-08 14:00',
      '  [1] Lock this week (books every session)',
    ]);
    expect(lisbon.choices.map((c) => [c.id, c.value])).toEqual([['slot_lock_week', '2026-W50:abc']]);
    const halifax = renderText(weekReply(PLAN, false), 'America/Halifax');
    expect(halifax.text).toContain('  - Mon 2026-12-07 10:00–10:45 Survey sync in Tejo');
    expect(halifax.choices).toEqual([]);
    expect(halifax.text).toContain('An admin can lock this plan');
  });

  it('progress and lock replies', () => {
    expect(
      weekProgressReply({ elapsedMs: 1234, best: Number.NaN, unplaced: 2, phase: 'place' }).summary,
    ).toBe('Planning the week… 1.2 s, placing sessions, 2 series not placed yet');
    expect(weekProgressReply({ elapsedMs: 3000, best: 10.54, unplaced: 0, phase: 'improve' }).summary).toBe(
      'Planning the week… 3.0 s, best cost so far 10.5',
    );
    const r = lockReply({
      isoWeek: '2026-W50',
      lines: ['2026-W50: 1 of 1 sessions booked (times in Europe/Lisbon).'],
      booked: [
        { series: 'Survey sync', seriesId: 'survey-sync', start: MON_14, end: MON_14 + H, bookingId: 'b1' },
      ],
      pending: 0,
      invites: [{ series: 'Survey sync', method: 'REQUEST', uid: 'u@x' }],
    });
    expect(renderText(r, 'Europe/Lisbon').text.split('\n')).toEqual([
      '2026-W50: 1 of 1 sessions booked (times in Europe/Lisbon).',
      '  - Mon 2026-12-07 14:00–15:00 Survey sync · booked b1',
      '  (1 weekly invite(s) made but not sent (no invite outbox is configured): REQUEST u@x)',
    ]);
  });
});
