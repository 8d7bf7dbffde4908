import { describe, expect, it } from 'vitest';
import { betterWeekPlan, planWeekOnThreads } from '../../src/app/week-threads.ts';
import { planWeek } from '../../src/scheduling/week/plan-week.ts';
import { syntheticWeek } from '../../src/scheduling/week/synthetic-week.ts';
import { planProblems } from '../scheduling/week/plan-checker.ts';

const request = syntheticWeek({ series: 24, people: 30, rooms: 4, seed: 4 });

describe('week plan on several threads', () => {
  it('keeps the best of the runs with seeds seed..seed+threads-1, each the plan of that seed in process', async () => {
    const moves = 3000;
    const direct = [7, 8, 9].map((seed) => planWeek(request, { moves, seed }));
    // the runs must differ, or picking the best could not go wrong
    expect(new Set(direct.map((p) => p.score.total)).size).toBeGreaterThan(1);
    const threaded = await planWeekOnThreads(request, { threads: 3, moves, seed: 7 });
    expect(threaded.runs).toEqual(
      direct.map((p, k) => ({
        seed: 7 + k,
        total: p.score.total,
        unplaced: p.unplaced.length,
        violations: p.violations,
      })),
    );
    const cheapest = Math.min(...direct.filter((p) => p.complete).map((p) => p.score.total));
    const winner = direct.findIndex((p) => p.complete && p.score.total === cheapest);
    expect(threaded.seed).toBe(7 + winner);
    expect(threaded.plan.score.total).toBe(cheapest);
    expect(Array.from(threaded.plan.values)).toEqual(Array.from(direct[winner]!.values));
    expect(threaded.plan.values).toBeInstanceOf(Int32Array);
    // the independent checker agrees the kept plan breaks no hard rule
    expect(planProblems(request, threaded.plan.sessions)).toEqual([]);
  });

  it('gives the same plan for the same seed, thread count and move budget', async () => {
    const a = await planWeekOnThreads(request, { threads: 2, moves: 2000, seed: 3 });
    const b = await planWeekOnThreads(request, { threads: 2, moves: 2000, seed: 3 });
    expect(Array.from(b.plan.values)).toEqual(Array.from(a.plan.values));
    expect(b.seed).toBe(a.seed);
  });

  it('refuses a thread count or seed it cannot use, naming the allowed range', async () => {
    for (const threads of [0, 1.5, 65, Number.NaN])
      await expect(planWeekOnThreads(request, { threads, moves: 10 })).rejects.toThrow(
        /threads must be a whole number from 1 to 64/,
      );
    await expect(planWeekOnThreads(request, { threads: 2, moves: 10, seed: 0xffffffff })).rejects.toThrow(
      /seed must be a whole number from 0 to 4294967294 with 2 threads/,
    );
    await expect(planWeekOnThreads(request, { threads: 2, moves: 10, seed: -1 })).rejects.toThrow(
      /seed must be a whole number/,
    );
  });

  it('ranks plans by series left out, then hard violations, then cost; a tie is no win', () => {
    const plan = (unplaced: number, violations: number, total: number) => ({
      unplaced: Array.from({ length: unplaced }, (_, i) => ({
        series: `s${i}`,
        code: 'conflict' as const,
        blockers: [],
      })),
      violations,
      score: { total, parts: {} as never },
    });
    expect(betterWeekPlan(plan(0, 0, 50), plan(1, 0, 5))).toBe(true);
    expect(betterWeekPlan(plan(1, 0, 5), plan(0, 0, 50))).toBe(false);
    expect(betterWeekPlan(plan(0, 0, 50), plan(0, 2, 5))).toBe(true);
    expect(betterWeekPlan(plan(0, 1, 5), plan(0, 0, 50))).toBe(false);
    expect(betterWeekPlan(plan(0, 0, 4), plan(0, 0, 5))).toBe(true);
    expect(betterWeekPlan(plan(0, 0, 5), plan(0, 0, 5))).toBe(false);
  });
});
