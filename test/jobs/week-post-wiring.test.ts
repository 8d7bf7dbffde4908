import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import { parseWorkspace, type Workspace } from '../../src/config/load-workspace.ts';
import { startBackgroundJobs } from '../../src/main.ts';

// Invented demo people of the Lisbon office.
const YAML = (post: string) => `name: Saltline Survey Cooperative (jobs test)
zone: Europe/Lisbon
admins: [ines]
people:
  - {id: ines, name: Ines Carvalhal, zone: Europe/Lisbon}
  - {id: rui, name: Rui Teixo, zone: Europe/Lisbon}
series:
  - {id: ines-rui, name: Ines and Rui one-to-one, attendees: [ines, rui], minutes: 30}
weekPlan: {step: 30${post}}
`;
const NOW = Date.parse('2026-12-01T18:00:00Z');

function workspace(post: string): Workspace {
  const r = parseWorkspace(YAML(post), { file: '/ws/workspace.yaml', dir: '/ws' }, { now: NOW });
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.value;
}

function fakes() {
  const posts: { channel: string; text: string }[] = [];
  const sweeps: number[] = [];
  return {
    posts,
    sweeps,
    chat: {
      post: async (channel: string, message: { text: string }) => {
        posts.push({ channel, text: message.text });
        return { channel, ts: '1.1' };
      },
    },
    holds: {
      releaseExpiredHolds: async (now: number) => {
        sweeps.push(now);
        return 0;
      },
    },
  };
}

const POST = ', post: "fri 14:00", channel: C0123ABCD, zone: Europe/Lisbon';

describe('startBackgroundJobs (the composition root wiring of scheduled jobs)', () => {
  it('with post settings and chat on SQLite: a single-process weekly post at Friday 14:00 Lisbon, and the hold sweeper', async () => {
    const f = fakes();
    const logs: string[] = [];
    const jobs = startBackgroundJobs({
      workspace: workspace(POST),
      chat: f.chat,
      holds: f.holds,
      database: '/tmp/slotwright-test.sqlite',
      now: () => NOW,
      log: (t) => logs.push(t),
    });
    try {
      expect(jobs.coordination).toBe('single');
      // cron counts Sunday as 0, so Friday is 5 (common practice); the zone is node-cron's timezone.
      expect([jobs.weekPost?.cron, jobs.weekPost?.timezone]).toEqual(['0 14 * * 5', 'Europe/Lisbon']);
      const next = Temporal.Instant.fromEpochMilliseconds(
        jobs.weekPost!.nextRuns(1)[0]!.getTime(),
      ).toZonedDateTimeISO('Europe/Lisbon');
      expect([next.dayOfWeek, next.hour, next.minute]).toEqual([5, 14, 0]);
      // Friday 2026-12-04 14:00 in Lisbon is 14:00 UTC (WET, UTC+0 in December, IANA tz database).
      const fired = await jobs.weekPost!.fire(Date.parse('2026-12-04T14:00:00Z'));
      expect(fired).not.toBe('failed');
      expect(f.posts.map((p) => [p.channel, p.text.split('\n')[0]])).toEqual([
        ['C0123ABCD', 'Week plan for 2026-W50 (times in Europe/Lisbon):'],
      ]);
      expect(f.posts[0]!.text).toContain('Ines and Rui one-to-one');
      expect(await jobs.holdSweeper.sweepNow()).toBe(0);
      expect(f.sweeps).toEqual([NOW]);
      expect(logs).toContain('week plan posts fri 14:00 (Europe/Lisbon) to C0123ABCD');
    } finally {
      await jobs.stop();
    }
  });

  it('with PostgreSQL the post and the sweeper coordinate through a pool on that URL, closed at stop', async () => {
    const f = fakes();
    const opened: string[] = [];
    let ended = 0;
    const jobs = startBackgroundJobs({
      workspace: workspace(POST),
      chat: f.chat,
      holds: f.holds,
      database: 'postgresql://slotwright@127.0.0.1:5432/slotwright',
      openPgPool: (url) => {
        opened.push(url);
        return {
          end: async () => {
            ended++;
          },
        } as unknown as import('pg').Pool;
      },
      replica: 'replica-a',
      now: () => NOW,
      log: () => {},
    });
    expect(jobs.coordination).toBe('postgres');
    expect(jobs.weekPost).toBeDefined();
    expect(opened).toEqual(['postgresql://slotwright@127.0.0.1:5432/slotwright']);
    await jobs.stop();
    expect(ended).toBe(1);
  });

  it('no weekly post without post settings or without chat; the sweeper still runs', async () => {
    for (const [post, chat] of [
      ['', true],
      [POST, false],
    ] as const) {
      const f = fakes();
      const jobs = startBackgroundJobs({
        workspace: workspace(post),
        ...(chat ? { chat: f.chat } : {}),
        holds: f.holds,
        now: () => NOW,
        log: () => {},
      });
      try {
        expect(jobs.weekPost).toBeUndefined();
        expect(jobs.coordination).toBe('single');
        await jobs.holdSweeper.sweepNow();
        expect(f.sweeps).toHaveLength(1);
      } finally {
        await jobs.stop();
      }
    }
  });
});
