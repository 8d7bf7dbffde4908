import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  bitIndices,
  clearRange,
  fullBits,
  popcount,
  runEndAt,
  runStartAt,
  shiftDown,
  slide,
} from '../../src/scheduling/bits.ts';

describe('slide', () => {
  it('sets bit s exactly when ticks s .. s + len - 1 are all free (against a plain loop)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 300 }),
        fc.integer({ min: 1, max: 70 }),
        fc.array(fc.tuple(fc.nat(299), fc.integer({ min: 1, max: 20 })), { maxLength: 8 }),
        (ticks, len, holes) => {
          const bits = fullBits(ticks);
          const free = Array<boolean>(ticks).fill(true);
          for (const [a, n] of holes) {
            const z = Math.min(ticks, a + n);
            if (a >= ticks) continue;
            clearRange(bits, a, z);
            for (let i = a; i < z; i++) free[i] = false;
          }
          const expected: number[] = [];
          for (let s = 0; s + len <= ticks; s++) if (free.slice(s, s + len).every(Boolean)) expected.push(s);
          expect(bitIndices(slide(bits, ticks, len))).toEqual(expected);
          expect(popcount(bits)).toBe(free.filter(Boolean).length);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('shifts across word boundaries', () => {
    const b = fullBits(70);
    clearRange(b, 0, 40);
    expect(bitIndices(shiftDown(b, 33))).toEqual(Array.from({ length: 30 }, (_, i) => i + 7));
  });
});

describe('runStartAt and runEndAt', () => {
  it('find the run of set bits around an index (against a plain loop)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 200 }),
        fc.array(fc.tuple(fc.nat(199), fc.integer({ min: 1, max: 40 })), { maxLength: 6 }),
        (n, holes) => {
          const bits = fullBits(n);
          for (const [a, k] of holes) if (a < n) clearRange(bits, a, Math.min(n, a + k));
          const on = (i: number) => i >= 0 && i < n && ((bits[i >>> 5]! >>> (i & 31)) & 1) === 1;
          for (let t = 0; t < n; t++) {
            if (!on(t)) {
              expect(runStartAt(bits, t)).toBe(-1);
              continue;
            }
            let a = t;
            while (on(a - 1)) a--;
            let z = t + 1;
            while (on(z)) z++;
            expect([runStartAt(bits, t), runEndAt(bits, t)]).toEqual([a, z]);
          }
        },
      ),
      { numRuns: 200 },
    );
  });
});
