import { describe, expect, it } from 'vitest';
import { normalizeBusy } from '../../src/time/busy-set.ts';

const W = { start: 0, end: 100 };

describe('normalizeBusy', () => {
  it('clips, merges touching and overlapping stretches of one kind', () => {
    expect(
      normalizeBusy(
        [
          { start: -10, end: 5, kind: 'busy' },
          { start: 5, end: 10, kind: 'busy' },
          { start: 8, end: 12, kind: 'busy' },
          { start: 95, end: 120, kind: 'busy' },
        ],
        W,
      ),
    ).toEqual([
      { start: 0, end: 12, kind: 'busy' },
      { start: 95, end: 100, kind: 'busy' },
    ]);
  });
  it('cuts tentative time around busy time', () => {
    expect(
      normalizeBusy(
        [
          { start: 10, end: 60, kind: 'tentative' },
          { start: 20, end: 30, kind: 'busy' },
          { start: 40, end: 45, kind: 'busy' },
          { start: 55, end: 70, kind: 'busy' },
        ],
        W,
      ),
    ).toEqual([
      { start: 10, end: 20, kind: 'tentative' },
      { start: 20, end: 30, kind: 'busy' },
      { start: 30, end: 40, kind: 'tentative' },
      { start: 40, end: 45, kind: 'busy' },
      { start: 45, end: 55, kind: 'tentative' },
      { start: 55, end: 70, kind: 'busy' },
    ]);
  });
  it('drops tentative time fully inside busy time and empty stretches', () => {
    expect(
      normalizeBusy(
        [
          { start: 10, end: 20, kind: 'tentative' },
          { start: 5, end: 25, kind: 'busy' },
          { start: 30, end: 30, kind: 'busy' },
          { start: 150, end: 160, kind: 'busy' },
        ],
        W,
      ),
    ).toEqual([{ start: 5, end: 25, kind: 'busy' }]);
  });
});
