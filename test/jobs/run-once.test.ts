import { execFile } from 'node:child_process';
import { join } from 'node:path';
import { promisify } from 'node:util';
import cron from 'node-cron';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  advisoryKey,
  PgCronRunCoordinator,
  PgRunOnceCoordinator,
  SingleProcessCoordinator,
} from '../../src/jobs/run-once.ts';
import { startWeekPostJob } from '../../src/jobs/week-post.ts';

const run = promisify(execFile);
const URL = process.env.SLOTWRIGHT_TEST_DATABASE_URL;

describe('SingleProcessCoordinator', () => {
  it('always runs, so a failed run can be retried', async () => {
    const c = new SingleProcessCoordinator();
    let n = 0;
    await expect(
      c.runOnce('job', 'k', async () => {
        n++;
        throw new Error('down');
      }),
    ).rejects.toThrow('down');
    expect(await c.runOnce('job', 'k', async () => void n++)).toBe('ran');
    expect(n).toBe(2);
  });
});

describe('advisoryKey', () => {
  it('is 32-bit FNV-1a as a signed int4', () => {
    // FNV-1a published test vectors (draft-eastlake-fnv): "" -> 0x811c9dc5, "a" -> 0xe40c292c,
    // "foobar" -> 0xbf9cf968.
    expect(advisoryKey('')).toBe(0x811c9dc5 | 0);
    expect(advisoryKey('a')).toBe(0xe40c292c | 0);
    expect(advisoryKey('foobar')).toBe(0xbf9cf968 | 0);
  });
});

if (URL === undefined) {
  console.warn('NOTICE: SLOTWRIGHT_TEST_DATABASE_URL is not set; the PostgreSQL run-once tests are skipped.');
}

describe.skipIf(URL === undefined)(
  'PgRunOnceCoordinator on PostgreSQL (needs SLOTWRIGHT_TEST_DATABASE_URL)',
  () => {
    // One schema per run keeps these tables apart from every other test using the same database.
    const schema = `jobs_${process.pid}_${Date.now().toString(36)}`;
    let admin: pg.Pool;
    const pools: pg.Pool[] = [];
    const poolFor = () => {
      const p = new pg.Pool({ connectionString: URL, max: 3, options: `-c search_path=${schema}` });
      pools.push(p);
      return p;
    };

    beforeAll(async () => {
      admin = new pg.Pool({ connectionString: URL, max: 1 });
      await admin.query(`create schema ${schema}`);
      await admin.query(`create table ${schema}.posts (replica text not null, iso_week text not null)`);
    });

    afterAll(async () => {
      for (const p of pools) await p.end();
      await admin.query(`drop schema if exists ${schema} cascade`);
      await admin.end();
    });

    it('two processes firing together post exactly once; a late third finds the week done', async () => {
      const script = join(import.meta.dirname, 'helpers', 'replica.ts');
      const firedAt = String(Date.parse('2026-10-23T13:00:00Z'));
      const startAt = String(Date.now() + 4000);
      const spawn = (name: string) =>
        run(process.execPath, ['--import', 'tsx', script, URL!, schema, name, firedAt, startAt], {
          timeout: 30_000,
        });
      const [a, b] = await Promise.all([spawn('replica-a'), spawn('replica-b')]);
      const outcomes = [a.stdout, b.stdout].map(
        (s) => JSON.parse(s.trim()) as { replica: string; outcome: string },
      );
      // The loser answers 'busy' when the two overlap (the usual case: both wait for the same instant),
      // or 'done' when a slow start made it arrive after the winner committed; never a second 'ran'.
      const sorted = outcomes.map((o) => o.outcome).sort();
      expect([
        ['busy', 'ran'],
        ['done', 'ran'],
      ]).toContainEqual(sorted);
      // A third replica that wakes late (here in this process) finds the week already posted.
      const late = startWeekPostJob(
        { post: 'fri 14:00', channel: 'C0DEMO01', zone: 'Europe/Lisbon' },
        {
          postWeekPlan: async () => {
            throw new Error('a late replica must not post');
          },
        },
        new PgRunOnceCoordinator(poolFor(), { replica: 'replica-c' }),
      );
      expect(await late.fire(Number(firedAt))).toBe('done');
      await late.stop();
      const posts = await admin.query(`select replica, iso_week from ${schema}.posts`);
      expect(posts.rows).toEqual([
        { replica: outcomes.find((o) => o.outcome === 'ran')!.replica, iso_week: '2026-W44' },
      ]);
    }, 60_000);

    it('a failed run leaves no record, so the next attempt runs', async () => {
      const c = new PgRunOnceCoordinator(poolFor(), { replica: 'r1', clock: () => 1 });
      await expect(
        c.runOnce('week-plan-post', 'C0X:2027-W01', async () => {
          throw new Error('chat API unavailable');
        }),
      ).rejects.toThrow('chat API unavailable');
      expect(await c.doneBy('week-plan-post', 'C0X:2027-W01')).toBeUndefined();
      expect(await c.runOnce('week-plan-post', 'C0X:2027-W01', async () => {})).toBe('ran');
      expect(await c.doneBy('week-plan-post', 'C0X:2027-W01')).toBe('r1');
      expect(await c.runOnce('week-plan-post', 'C0X:2027-W01', async () => {})).toBe('done');
    });

    it('another key of the same job is independent, and a running key answers busy at once', async () => {
      const one = new PgRunOnceCoordinator(poolFor(), { replica: 'one' });
      const two = new PgRunOnceCoordinator(poolFor(), { replica: 'two' });
      let release!: () => void;
      const gate = new Promise<void>((r) => {
        release = r;
      });
      let started!: () => void;
      const running = new Promise<void>((r) => {
        started = r;
      });
      const first = one.runOnce('week-plan-post', 'C0Y:2027-W02', async () => {
        started();
        await gate;
      });
      await running;
      expect(await two.runOnce('week-plan-post', 'C0Y:2027-W02', async () => {})).toBe('busy');
      expect(await two.runOnce('week-plan-post', 'C0Y:2027-W03', async () => {})).toBe('ran');
      release();
      expect(await first).toBe('ran');
    });

    it('node-cron tasks on two replicas with the cron-slot coordinator run each slot once', async () => {
      const runs: { replica: string; slot: string }[] = [];
      const tasks = ['east', 'west'].map((replica) =>
        cron.schedule('* * * * * *', (ctx) => void runs.push({ replica, slot: ctx.date.toISOString() }), {
          name: 'coordination-check',
          distributed: true,
          runCoordinator: new PgCronRunCoordinator(poolFor(), { replica }),
        }),
      );
      await new Promise((r) => setTimeout(r, 3500));
      for (const t of tasks) await t.destroy();
      const slots = runs.map((r) => r.slot);
      expect(slots.length).toBeGreaterThanOrEqual(2);
      expect(new Set(slots).size).toBe(slots.length);
    });

    it('the cron-slot coordinator elects one of two replicas asking at once', async () => {
      const a = new PgCronRunCoordinator(poolFor(), { replica: 'a' });
      const b = new PgCronRunCoordinator(poolFor(), { replica: 'b' });
      const key = 'sweep:2026-12-01T18:00:00.000Z';
      const answers = await Promise.all([a.shouldRun(key, 0), b.shouldRun(key, 0)]);
      expect(answers.sort()).toEqual([false, true]);
      expect(await a.shouldRun('sweep:2026-12-01T18:01:00.000Z', 0)).toBe(true);
    });
  },
);
