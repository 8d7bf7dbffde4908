import { describe, expect, it } from 'vitest';
import { anneal, type NeighbourhoodProblem, Prng } from '../../src/solver/index.ts';

/**
 * An assignment of n items to n slots (a permutation) with a cost per item and slot and some
 * forbidden pairs (the hard rule). A change to a held slot exchanges with its holder.
 */
class Placement implements NeighbourhoodProblem {
  readonly size: number;
  readonly slotOf: Int32Array;
  readonly itemAt: Int32Array;
  readonly #cost: number[][];
  readonly #forbidden: boolean[][];
  readonly #domain: Int32Array;
  #total = 0;
  changes = 0;

  constructor(cost: number[][], forbidden: boolean[][], start: readonly number[]) {
    this.size = cost.length;
    this.#cost = cost;
    this.#forbidden = forbidden;
    this.#domain = Int32Array.from({ length: this.size }, (_, i) => i);
    this.slotOf = Int32Array.from(start);
    this.itemAt = new Int32Array(this.size);
    this.assign(start);
  }

  value(v: number): number {
    return this.slotOf[v]!;
  }
  domain(): ArrayLike<number> {
    return this.#domain;
  }
  cost(): number {
    return this.#total;
  }
  recomputed(): number {
    let c = 0;
    for (let v = 0; v < this.size; v++) c += this.#cost[v]![this.slotOf[v]!]!;
    return c;
  }
  feasible(): boolean {
    for (let v = 0; v < this.size; v++) if (this.#forbidden[v]![this.slotOf[v]!]) return false;
    return true;
  }
  tryChange(v: number, b: number, accept: (d: number) => boolean): boolean {
    return this.trySwap(v, this.itemAt[b]!, accept);
  }
  trySwap(a: number, b: number, accept: (d: number) => boolean): boolean {
    if (a === b) return false;
    const sa = this.slotOf[a]!;
    const sb = this.slotOf[b]!;
    if (this.#forbidden[a]![sb] || this.#forbidden[b]![sa]) return false;
    const c = this.#cost;
    const d = c[a]![sb]! + c[b]![sa]! - c[a]![sa]! - c[b]![sb]!;
    if (!accept(d)) return false;
    this.slotOf[a] = sb;
    this.slotOf[b] = sa;
    this.itemAt[sb] = a;
    this.itemAt[sa] = b;
    this.#total += d;
    this.changes++;
    return true;
  }
  assign(values: ArrayLike<number>): void {
    for (let v = 0; v < this.size; v++) {
      this.slotOf[v] = values[v]!;
      this.itemAt[values[v]!] = v;
    }
    this.#total = this.recomputed();
  }
}

function instance(seed: number, n: number) {
  const rng = new Prng(seed);
  const cost = Array.from({ length: n }, () => Array.from({ length: n }, () => rng.int(50)));
  // the identity is kept allowed so the start is feasible; a few other pairs are forbidden
  const forbidden = Array.from({ length: n }, (_, i) =>
    Array.from({ length: n }, (_, j) => i !== j && rng.next() < 0.2),
  );
  return { cost, forbidden, start: Array.from({ length: n }, (_, i) => i) };
}

/** Optimum over every permutation (brute force, independent of the search). */
function bruteForce(cost: number[][], forbidden: boolean[][]): number {
  const n = cost.length;
  const used = new Array<boolean>(n).fill(false);
  let best = Number.POSITIVE_INFINITY;
  const go = (i: number, sum: number): void => {
    if (sum >= best) return;
    if (i === n) {
      best = sum;
      return;
    }
    for (let s = 0; s < n; s++) {
      if (used[s] || forbidden[i]![s]) continue;
      used[s] = true;
      go(i + 1, sum + cost[i]![s]!);
      used[s] = false;
    }
  };
  go(0, 0);
  return best;
}

describe('anneal (engine simulated annealing over a problem that prices its own moves)', () => {
  it('reaches the brute-force optimum of small constrained assignment problems and never breaks the hard rule', () => {
    for (const seed of [1, 2, 3, 4]) {
      const { cost, forbidden, start } = instance(seed, 8);
      const p = new Placement(cost, forbidden, start);
      const res = anneal(p, { budget: { nodes: 60_000 }, seed });
      expect(p.feasible()).toBe(true);
      expect(res.cost).toBe(p.recomputed());
      expect(res.cost).toBe(bruteForce(cost, forbidden));
      expect(Array.from(res.values)).toEqual(Array.from(p.slotOf));
    }
  });

  it('is deterministic for a seed and a move budget, and spends exactly that budget', () => {
    const { cost, forbidden, start } = instance(9, 12);
    const a = anneal(new Placement(cost, forbidden, start), { budget: { nodes: 5000 }, seed: 3 });
    const b = anneal(new Placement(cost, forbidden, start), { budget: { nodes: 5000 }, seed: 3 });
    expect(Array.from(a.values)).toEqual(Array.from(b.values));
    expect(a.moves).toBe(5000);
    expect(a.cost).toBeLessThanOrEqual(a.startCost);
  });

  it('never ends worse than its start, even with a scalding temperature', () => {
    const { cost, forbidden, start } = instance(5, 10);
    const p = new Placement(cost, forbidden, start);
    const before = p.recomputed();
    const res = anneal(p, { budget: { nodes: 300 }, seed: 1, startTemperature: 1e6, endShare: 1 });
    expect(res.startCost).toBe(before);
    expect(res.cost).toBeLessThanOrEqual(before);
    // the walk did move (it is not a check that cannot fail)
    expect(p.changes).toBeGreaterThan(0);
  });

  it('with only a signal, runs rounds until it is aborted and reports progress', () => {
    const { cost, forbidden, start } = instance(6, 10);
    const stop = new AbortController();
    const seen: number[] = [];
    const res = anneal(new Placement(cost, forbidden, start), {
      budget: { signal: stop.signal },
      roundMoves: 5000,
      seed: 2,
      onProgress: (p) => {
        seen.push(p.moves);
        if (p.moves >= 40_000) stop.abort();
      },
    });
    expect(res.rounds).toBeGreaterThanOrEqual(2);
    expect(res.moves).toBeGreaterThanOrEqual(40_000);
    // progress comes every 4096 moves and the signal is read every 128
    expect(res.moves).toBeLessThanOrEqual(40_000 + 4096 + 128);
    expect(seen.length).toBeGreaterThan(5);
  });

  it('offers chain moves in the share asked for, and only to a problem that has them', () => {
    const { cost, forbidden, start } = instance(10, 9);
    const p = new Placement(cost, forbidden, start);
    let chains = 0;
    // a "chain" here is a three-cycle of slots: a compound move the engine knows nothing about
    const chained = Object.assign(p, {
      tryChain(v: number, b: number, accept: (d: number) => boolean): boolean {
        chains++;
        const u = p.itemAt[b]!;
        const w = p.itemAt[(b + 1) % p.size]!;
        if (new Set([v, u, w]).size < 3) return false;
        // v -> slot of u, u -> slot of w, w -> slot of v, as two swaps priced together
        let d = 0;
        const ok1 = p.trySwap(v, u, (x) => {
          d += x;
          return true;
        });
        const ok2 =
          ok1 &&
          p.trySwap(v, w, (x) => {
            d += x;
            return true;
          });
        if (ok1 && ok2 && accept(d)) return true;
        if (ok2) p.trySwap(v, w, () => true);
        if (ok1) p.trySwap(v, u, () => true);
        return false;
      },
    });
    const res = anneal(chained, { budget: { nodes: 4000 }, seed: 4, swapShare: 0.25, chainShare: 0.5 });
    // about half the moves are chains (a fixed seed, so the count is exact; the bounds allow a 10% band)
    expect(chains).toBeGreaterThan(1800);
    expect(chains).toBeLessThan(2200);
    expect(p.feasible()).toBe(true);
    expect(res.cost).toBe(p.recomputed());
    const none = anneal(new Placement(cost, forbidden, start), { budget: { nodes: 100 }, chainShare: 0.9 });
    expect(none.moves).toBe(100);
  });

  it('stops on reaching the lower bound, and when a long run of moves finds nothing better', () => {
    const { cost, forbidden, start } = instance(11, 8);
    const optimum = bruteForce(cost, forbidden);
    const atBound = anneal(new Placement(cost, forbidden, start), {
      budget: { nodes: 10_000_000 },
      seed: 1,
      lowerBound: optimum,
    });
    expect(atBound.cost).toBe(optimum);
    expect(atBound.moves).toBeLessThan(10_000_000);
    // without a bound, the stall rule ends a run whose budget is far more than it needs
    const stalled = anneal(new Placement(cost, forbidden, start), {
      budget: { nodes: 10_000_000 },
      seed: 1,
      stallMoves: 20_000,
    });
    expect(stalled.cost).toBe(optimum);
    expect(stalled.moves).toBeLessThan(1_000_000);
  });

  it('with a time limit, stops on a stall only once a fifth of the limit has passed without a better plan', () => {
    const { cost, forbidden, start } = instance(11, 8);
    const optimum = bruteForce(cost, forbidden);
    let now = 0;
    // a fake clock that advances 0.01 ms per reading (one reading per 128 moves): a stall of 20000
    // moves alone would end the run within a few ms of the last better plan
    const res = anneal(new Placement(cost, forbidden, start), {
      budget: { timeMs: 100, clock: () => (now += 0.01) },
      seed: 1,
      stallMoves: 20_000,
    });
    expect(res.cost).toBe(optimum);
    expect(now).toBeGreaterThanOrEqual(20);
    // and it did stop on the stall, well before the limit
    expect(now).toBeLessThan(99);
  });

  it('follows a time budget on the given clock', () => {
    const { cost, forbidden, start } = instance(7, 10);
    let now = 0;
    // a fake clock that advances 1 ms per reading: the search must stop near 50 readings
    const res = anneal(new Placement(cost, forbidden, start), {
      budget: { timeMs: 50, clock: () => now++ },
      seed: 1,
    });
    expect(res.moves).toBeGreaterThan(0);
    expect(now).toBeLessThan(200);
  });

  it('refuses a budget it cannot keep and bad schedule settings, saying what to fix', () => {
    const { cost, forbidden, start } = instance(8, 5);
    const p = new Placement(cost, forbidden, start);
    expect(() => anneal(p, { budget: {} })).toThrow(/budget\.nodes/);
    expect(() => anneal(p, { budget: { timeMs: 10 } })).toThrow(/clock/);
    expect(() => anneal(p, { budget: { nodes: 10 }, endShare: 0 })).toThrow(/endShare/);
    expect(() => anneal(p, { budget: { nodes: 10 }, startTemperature: -1 })).toThrow(/startTemperature/);
    expect(() => anneal(p, { budget: { nodes: 10 }, swapShare: 0.6, chainShare: 0.6 })).toThrow(/sum/);
  });
});
