import cron from 'node-cron';
import { Temporal } from 'temporal-polyfill';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { SingleProcessCoordinator } from '../../src/jobs/run-once.ts';
import { startWeekPostJob, type WeekPostRequest } from '../../src/jobs/week-post.ts';
import {
  nextWeekPostTimes,
  parseWeekPostTime,
  weekAnnouncedAt,
  weekPostCron,
  weekPostSettingsSchema,
} from '../../src/jobs/week-post-schedule.ts';

const at = (iso: string) => Temporal.Instant.from(iso).epochMilliseconds;
const iso = (ms: number) => Temporal.Instant.fromEpochMilliseconds(ms).toString();

// IANA rules (from memory, verified through Temporal below): Lisbon leaves WEST (UTC+1) for WET (UTC+0)
// on Sunday 2026-10-25; Halifax leaves ADT (UTC-3) for AST (UTC-4) on Sunday 2026-11-01.
describe('zone rules the tests rely on', () => {
  it('match the IANA database as Temporal ships it', () => {
    expect(Temporal.ZonedDateTime.from('2026-10-23T14:00[Europe/Lisbon]').offset).toBe('+01:00');
    expect(Temporal.ZonedDateTime.from('2026-10-30T14:00[Europe/Lisbon]').offset).toBe('+00:00');
    expect(Temporal.ZonedDateTime.from('2026-10-30T14:00[America/Halifax]').offset).toBe('-03:00');
    expect(Temporal.ZonedDateTime.from('2026-11-06T14:00[America/Halifax]').offset).toBe('-04:00');
  });
});

describe('post time', () => {
  it('reads a weekday and a 24-hour time and names the fix otherwise', () => {
    expect(parseWeekPostTime('fri 14:00')).toEqual({ weekday: 5, minutes: 840 });
    expect(parseWeekPostTime('Sunday 01:30')).toEqual({ weekday: 7, minutes: 90 });
    expect(() => parseWeekPostTime('friday 2pm')).toThrow('write it like "fri 14:00"');
    expect(() => parseWeekPostTime('14:00')).toThrow(/is not a weekday and a time/);
  });

  it('becomes the cron expression node-cron runs (Sunday is 0 in cron)', () => {
    expect(weekPostCron({ weekday: 5, minutes: 840 })).toBe('0 14 * * 5');
    expect(weekPostCron({ weekday: 7, minutes: 90 })).toBe('30 1 * * 0');
    expect(cron.validate('0 14 * * 5')).toBe(true);
  });

  it('fires at 14:00 local on both sides of the Lisbon change', () => {
    const fires = nextWeekPostTimes(
      parseWeekPostTime('fri 14:00'),
      'Europe/Lisbon',
      at('2026-10-20T00:00Z'),
      3,
    );
    expect(fires.map(iso)).toEqual(['2026-10-23T13:00:00Z', '2026-10-30T14:00:00Z', '2026-11-06T14:00:00Z']);
  });

  it('fires at 14:00 local on both sides of the Halifax change', () => {
    const fires = nextWeekPostTimes(
      parseWeekPostTime('fri 14:00'),
      'America/Halifax',
      at('2026-10-26T00:00Z'),
      2,
    );
    expect(fires.map(iso)).toEqual(['2026-10-30T17:00:00Z', '2026-11-06T18:00:00Z']);
  });

  it('takes a repeated local time once and moves a skipped one forward by the gap', () => {
    // Sunday 2026-10-25 01:30 happens twice in Lisbon (01:30 WEST, then 01:30 WET): post once, the first.
    const fall = nextWeekPostTimes(
      parseWeekPostTime('sun 01:30'),
      'Europe/Lisbon',
      at('2026-10-24T00:00Z'),
      2,
    );
    expect(fall.map(iso)).toEqual(['2026-10-25T00:30:00Z', '2026-11-01T01:30:00Z']);
    // Sunday 2027-03-28 01:30 does not exist in Lisbon (01:00 WET jumps to 02:00 WEST): post at 02:30 WEST.
    const spring = nextWeekPostTimes(
      parseWeekPostTime('sun 01:30'),
      'Europe/Lisbon',
      at('2027-03-27T00:00Z'),
      1,
    );
    expect(spring.map(iso)).toEqual(['2027-03-28T01:30:00Z']);
    expect(
      Temporal.Instant.from('2027-03-28T01:30Z').toZonedDateTimeISO('Europe/Lisbon').toPlainTime().toString(),
    ).toBe('02:30:00');
  });

  it('announces the ISO week after the one it fires in', () => {
    expect(weekAnnouncedAt(at('2026-10-23T13:00Z'), 'Europe/Lisbon')).toEqual({
      isoWeek: '2026-W44',
      weekStart: '2026-10-26',
    });
    // Friday 2026-12-25 announces 2026-W53 (2026 has 53 ISO weeks), Friday 2027-01-01 announces 2027-W01.
    expect(weekAnnouncedAt(at('2026-12-25T14:00Z'), 'Europe/Lisbon').isoWeek).toBe('2026-W53');
    expect(weekAnnouncedAt(at('2027-01-01T14:00Z'), 'Europe/Lisbon').isoWeek).toBe('2027-W01');
    // 2026-12-06T12:00Z is Sunday in Lisbon but already Monday 01:00 in Auckland: the zone's calendar decides.
    expect(weekAnnouncedAt(at('2026-12-06T12:00Z'), 'Pacific/Auckland').weekStart).toBe('2026-12-14');
    expect(weekAnnouncedAt(at('2026-12-06T12:00Z'), 'Europe/Lisbon').weekStart).toBe('2026-12-07');
  });

  it('validates the workspace settings with a clear message', () => {
    expect(
      weekPostSettingsSchema.parse({ post: 'fri 14:00', channel: 'C0123ABCD', zone: 'Europe/Lisbon' }),
    ).toEqual({
      post: 'fri 14:00',
      channel: 'C0123ABCD',
      zone: 'Europe/Lisbon',
    });
    const bad = weekPostSettingsSchema.safeParse({ post: 'fridays', channel: '#general', zone: 'Lisbon' });
    expect(bad.success ? [] : bad.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`)).toEqual([
      'post: write the post time as a weekday and a 24-hour time, for example "fri 14:00"',
      'channel: a channel id such as C0123ABCD (the id, not the #name)',
      'zone: an IANA zone such as Europe/Lisbon',
    ]);
  });
});

describe('the node-cron job', () => {
  afterEach(() => {
    vi.useRealTimers();
  });

  it('schedules the configured expression in the configured zone, and node-cron agrees with Temporal', async () => {
    const job = startWeekPostJob(
      { post: 'fri 14:00', channel: 'C0DEMO01', zone: 'America/Halifax' },
      { postWeekPlan: async () => {} },
      new SingleProcessCoordinator(),
    );
    try {
      expect({ cron: job.cron, timezone: job.timezone }).toEqual({
        cron: '0 14 * * 5',
        timezone: 'America/Halifax',
      });
      // From the real now: the next 30 Fridays span the 2027-03-14 change in Halifax.
      const now = Date.now();
      const ours = nextWeekPostTimes({ weekday: 5, minutes: 840 }, 'America/Halifax', now, 30);
      expect(job.nextRuns(30).map((d) => d.getTime())).toEqual(ours);
    } finally {
      await job.stop();
    }
  });

  it('fires at 14:00 Lisbon time across the 2026-10-25 change, driven by a fake clock', async () => {
    vi.useFakeTimers({ now: at('2026-10-23T12:55:00Z') });
    const posts: { request: WeekPostRequest; at: string }[] = [];
    const job = startWeekPostJob(
      { post: 'fri 14:00', channel: 'C0DEMO01', zone: 'Europe/Lisbon' },
      {
        postWeekPlan: async (request) => {
          posts.push({ request, at: new Date().toISOString() });
        },
      },
      new SingleProcessCoordinator(),
    );
    try {
      await vi.advanceTimersByTimeAsync(10 * 60_000);
      expect(posts.map((p) => p.at)).toEqual(['2026-10-23T13:00:00.000Z']);
      // A week later at 13:05Z nothing has fired yet: 14:00 WET is 14:00Z, an hour later than before.
      await vi.advanceTimersByTimeAsync(7 * 24 * 3_600_000);
      expect(posts).toHaveLength(1);
      await vi.advanceTimersByTimeAsync(3_600_000);
      expect(posts.map((p) => p.at)).toEqual(['2026-10-23T13:00:00.000Z', '2026-10-30T14:00:00.000Z']);
      expect(posts.map((p) => p.request)).toEqual([
        { channel: 'C0DEMO01', zone: 'Europe/Lisbon', isoWeek: '2026-W44', weekStart: '2026-10-26' },
        { channel: 'C0DEMO01', zone: 'Europe/Lisbon', isoWeek: '2026-W45', weekStart: '2026-11-02' },
      ]);
    } finally {
      await job.stop();
    }
  });

  it('fires at 14:00 Halifax time across the 2026-11-01 change, driven by a fake clock', async () => {
    vi.useFakeTimers({ now: at('2026-10-30T16:55:00Z') });
    const fired: string[] = [];
    const job = startWeekPostJob(
      { post: 'fri 14:00', channel: 'C0DEMO02', zone: 'America/Halifax' },
      {
        postWeekPlan: async () => {
          fired.push(new Date().toISOString());
        },
      },
      new SingleProcessCoordinator(),
    );
    try {
      await vi.advanceTimersByTimeAsync(7 * 24 * 3_600_000 + 2 * 3_600_000);
      expect(fired).toEqual(['2026-10-30T17:00:00.000Z', '2026-11-06T18:00:00.000Z']);
    } finally {
      await job.stop();
    }
  });

  it('retries a failed post and reports when every attempt failed', async () => {
    let calls = 0;
    const errors: string[] = [];
    const job = startWeekPostJob(
      { post: 'fri 14:00', channel: 'C0DEMO01', zone: 'Europe/Lisbon' },
      {
        postWeekPlan: async () => {
          calls++;
          if (calls < 3) throw new Error('chat API unavailable');
        },
      },
      new SingleProcessCoordinator(),
      { attempts: 3, retryDelayMs: 0 },
    );
    try {
      expect(await job.fire(at('2026-10-23T13:00Z'))).toBe('ran');
      expect(calls).toBe(3);
      const failing = startWeekPostJob(
        { post: 'fri 14:00', channel: 'C0DEMO01', zone: 'Europe/Lisbon' },
        {
          postWeekPlan: async () => {
            throw new Error('chat API unavailable');
          },
        },
        new SingleProcessCoordinator(),
        {
          attempts: 2,
          retryDelayMs: 0,
          onError: (e, r) => errors.push(`${e.code}: ${e.message} (${r.isoWeek})`),
        },
      );
      expect(await failing.fire(at('2026-10-23T13:00Z'))).toBe('failed');
      await failing.stop();
      expect(errors).toEqual(['internal: chat API unavailable (2026-W44)']);
    } finally {
      await job.stop();
    }
  });
});
