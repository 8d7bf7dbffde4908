import { describe, expect, it } from 'vitest';
import { startFeedRefreshJob } from '../../src/jobs/feed-refresh.ts';

describe('feed refresh job', () => {
  it('runs the refresh on its node-cron schedule and on demand', async () => {
    let runs = 0;
    const job = startFeedRefreshJob(
      async () => {
        runs++;
      },
      { schedule: '* * * * * *' },
    );
    try {
      await job.refreshNow();
      expect(runs).toBe(1);
      const deadline = Date.now() + 3000;
      while (runs < 2 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
      expect(runs).toBeGreaterThanOrEqual(2);
    } finally {
      await job.stop();
    }
  });
  it('reports a failed run and keeps going', async () => {
    const errors: string[] = [];
    const job = startFeedRefreshJob(
      async () => {
        throw new Error('store down');
      },
      { schedule: '* * * * * *', onError: (e) => errors.push(e.message) },
    );
    try {
      const deadline = Date.now() + 3000;
      while (errors.length < 1 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
      expect(errors[0]).toBe('store down');
    } finally {
      await job.stop();
    }
  });
  it('refuses a schedule that is not a cron expression', () => {
    expect(() => startFeedRefreshJob(async () => undefined, { schedule: 'every day' })).toThrow(RangeError);
  });
});
