import { afterAll, describe, expect, it } from 'vitest';
import { SolvePool } from '../../src/app/solve-pool.ts';
import { planWeek } from '../../src/scheduling/week/plan-week.ts';
import { syntheticWeek } from '../../src/scheduling/week/synthetic-week.ts';

const pool = new SolvePool({ maxThreads: 1 });
afterAll(() => pool.close());

describe('solve pool', () => {
  it('gives the same week plan on a worker thread as in process (same seed and move budget)', async () => {
    const request = syntheticWeek({ series: 20, people: 30, rooms: 4, seed: 3 });
    const direct = planWeek(request, { moves: 2000, seed: 5 });
    const answer = await pool.run({ kind: 'week', request, moves: 2000, seed: 5 });
    expect(answer.kind).toBe('week');
    expect(answer.plan.sessions).toEqual(direct.sessions);
    expect(answer.plan.values).toEqual(Array.from(direct.values));
    expect(answer.plan.score.total).toBe(direct.score.total);
  });

  it('keeps the event loop free while a long plan runs', async () => {
    // About three seconds of solving on this machine (construction of 80 series plus a 1 s search).
    const request = syntheticWeek({ series: 80, people: 60, rooms: 8, seed: 1 });
    let longestGap = 0;
    let last = performance.now();
    let ticks = 0;
    const timer = setInterval(() => {
      const t = performance.now();
      longestGap = Math.max(longestGap, t - last);
      last = t;
      ticks++;
    }, 10);
    const started = performance.now();
    const answer = await pool.run({ kind: 'week', request, timeMs: 1000 });
    const took = performance.now() - started;
    clearInterval(timer);
    expect(answer.plan.sessions.length).toBeGreaterThan(0);
    // The plan ran for its time budget, and the main thread kept ticking all the while.
    expect(took).toBeGreaterThan(900);
    expect(ticks).toBeGreaterThan(took / 10 / 4);
    expect(longestGap).toBeLessThan(500);
  });

  it('stops a task when its signal aborts', async () => {
    const request = syntheticWeek({ series: 80, people: 60, rooms: 8, seed: 2 });
    const ac = new AbortController();
    const run = pool.run({ kind: 'week', request, timeMs: 20_000 }, ac.signal);
    setTimeout(() => ac.abort(), 100);
    await expect(run).rejects.toThrow(/solving failed/);
  });
});
