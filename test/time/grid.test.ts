import { describe, expect, it } from 'vitest';
import { makeGrid, tickStart, ticksCovered, ticksTouched } from '../../src/time/grid.ts';

const T = Date.UTC(2026, 11, 7, 9, 0);
const MIN = 60_000;

describe('makeGrid', () => {
  it('starts on the first tick boundary at or after the window start and keeps whole ticks only', () => {
    const g = makeGrid({ start: T + 3 * MIN, end: T + 62 * MIN }, 5);
    expect(g.origin).toBe(T + 5 * MIN);
    expect(g.ticks).toBe(11); // 09:05 .. 10:00, 10:00-10:02 is not a whole tick
    expect(tickStart(g, 2)).toBe(T + 15 * MIN);
  });

  it('is empty for a window shorter than one tick', () => {
    expect(makeGrid({ start: T + MIN, end: T + 4 * MIN }, 5).ticks).toBe(0);
  });

  it('refuses a grid that is not a whole number of minutes', () => {
    expect(() => makeGrid({ start: T, end: T + 60 * MIN }, 0)).toThrow(RangeError);
    expect(() => makeGrid({ start: T, end: T + 60 * MIN }, 2.5)).toThrow(RangeError);
  });
});

describe('ticksTouched and ticksCovered', () => {
  const g = makeGrid({ start: T, end: T + 60 * MIN }, 5);
  it('counts a tick touched when any minute of it overlaps', () => {
    expect(ticksTouched(g, { start: T + 7 * MIN, end: T + 11 * MIN })).toEqual({ first: 1, end: 3 });
    expect(ticksTouched(g, { start: T + 10 * MIN, end: T + 15 * MIN })).toEqual({ first: 2, end: 3 });
  });
  it('counts a tick covered only when all of it lies inside', () => {
    expect(ticksCovered(g, { start: T + 7 * MIN, end: T + 21 * MIN })).toEqual({ first: 2, end: 4 });
    expect(ticksCovered(g, { start: T + 7 * MIN, end: T + 9 * MIN })).toEqual({ first: 0, end: 0 });
  });
  it('clamps to the grid', () => {
    expect(ticksTouched(g, { start: T - 60 * MIN, end: T + 120 * MIN })).toEqual({ first: 0, end: 12 });
    expect(ticksTouched(g, { start: T + 120 * MIN, end: T + 180 * MIN })).toEqual({ first: 0, end: 0 });
  });
});
