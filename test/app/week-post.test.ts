import { afterEach, describe, expect, it, vi } from 'vitest';
import { InMemoryFairnessLedger } from '../../src/app/fairness.ts';
import { startWeekPlanPosting, usualHoursOf, weekPlanMessage } from '../../src/app/week-post.ts';
import { parseWorkspace, type Workspace } from '../../src/config/load-workspace.ts';

// A slice of the invented demo cooperative.
const YAML = `
name: Saltline Survey Cooperative
zone: Europe/Lisbon
admins: [ines]
people:
  - {id: maren, name: Maren Holloway, email: maren@saltline.example, zone: America/Halifax}
  - {id: ines, name: Ines Carvalhal, email: ines@saltline.example, zone: Europe/Lisbon}
  - {id: rui, name: Rui Teixo, email: rui@saltline.example, zone: Europe/Lisbon}
rooms:
  - {id: sounding, name: Sounding, capacity: 3, features: [whiteboard], zone: Europe/Lisbon}
series:
  - {id: ines-rui, name: Ines and Rui one-to-one, attendees: [ines, rui], minutes: 30, preferredDays: [thu], room: {features: [whiteboard]}}
  - {id: survey-sync, name: Survey sync, attendees: [maren, ines], minutes: 45}
`;

function workspace(): Workspace {
  const r = parseWorkspace(
    YAML,
    { file: '/demo/workspace.yaml', dir: '/demo' },
    { now: Date.parse('2026-12-01T18:00Z') },
  );
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.value;
}

describe('the scheduled week-plan post', () => {
  afterEach(() => {
    vi.useRealTimers();
  });

  it('plans next week and posts it to the channel at Friday 14:00 Lisbon time', async () => {
    vi.useFakeTimers({ now: Date.parse('2026-12-04T13:58:00Z') });
    const posted: { channel: string; text: string; at: string }[] = [];
    let ticks = 0;
    const ledger = new InMemoryFairnessLedger();
    await ledger.addOffHours('maren', '2026-W49', 1);
    const job = startWeekPlanPosting(
      { post: 'fri 14:00', channel: 'C0DEMO01', zone: 'Europe/Lisbon' },
      {
        workspace,
        chat: {
          post: async (channel, message) => {
            posted.push({ channel, text: message.text, at: new Date().toISOString() });
            return { channel, ts: '1' };
          },
        },
        now: () => Date.now(),
        // The fake clock stands still while the plan runs; a counting clock ends its time budget.
        clock: () => (ticks += 5),
        fairness: ledger,
        timeMs: 500,
      },
      { kind: 'single' },
    );
    try {
      await vi.advanceTimersByTimeAsync(60_000);
      expect(posted).toEqual([]);
      await vi.advanceTimersByTimeAsync(2 * 60_000);
      expect(posted.map((p) => [p.channel, p.at])).toEqual([['C0DEMO01', '2026-12-04T14:00:00.000Z']]);
      const lines = posted[0]!.text.split('\n');
      expect(lines[0]).toBe('Week plan for 2026-W50 (times in Europe/Lisbon):');
      expect(lines).toHaveLength(3);
      expect(lines).toContainEqual(expect.stringMatching(/^- (Mon|Tue|Wed|Thu|Fri) \d\d:\d\d Survey sync$/));
      // Thursday is the one-to-one's preferred day.
      expect(lines).toContainEqual(
        expect.stringMatching(/^- Thu \d\d:\d\d Ines and Rui one-to-one in Sounding$/),
      );
    } finally {
      await job.stop();
    }
  });

  it('usual hours come from each person', () => {
    const ws = workspace();
    expect(usualHoursOf(ws).maren).toEqual({ zone: 'America/Halifax', hours: ws.people[0]!.workingHours });
  });

  it('says when nothing is to be placed', () => {
    const ws = workspace();
    const msg = weekPlanMessage(
      { isoWeek: '2026-W50', sessions: [], unplaced: [] } as unknown as Parameters<typeof weekPlanMessage>[0],
      ws,
    );
    expect(msg.text).toBe('Week plan for 2026-W50 (times in Europe/Lisbon):\n- no series to place');
  });
});
