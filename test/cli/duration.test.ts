import { describe, expect, it } from 'vitest';
import { parseDuration } from '../../src/cli/duration.ts';
import { UsageError } from '../../src/cli/io.ts';

describe('parseDuration', () => {
  it.each([
    ['45m', 45],
    ['1h', 60],
    ['1h30m', 90],
    ['1h 30m', 90],
    ['2H15M', 135],
    ['90', 90],
    ['30min', 30],
    [' 15m ', 15],
  ])('%s is %i minutes', (text, minutes) => {
    expect(parseDuration(text)).toBe(minutes);
  });

  it.each([
    ['', "--length '' is not a length; use forms like 45m, 1h30m or 90 (minutes)"],
    ['1.5h', "--length '1.5h' is not a length; use forms like 45m, 1h30m or 90 (minutes)"],
    ['h', "--length 'h' is not a length; use forms like 45m, 1h30m or 90 (minutes)"],
    ['30m1h', "--length '30m1h' is not a length; use forms like 45m, 1h30m or 90 (minutes)"],
    ['0', "--length must be longer than 0 minutes, got '0'"],
    ['0h0m', "--length must be longer than 0 minutes, got '0h0m'"],
    ['200h', "--length '200h' is longer than a week; use forms like 45m, 1h30m or 90 (minutes)"],
  ])('refuses %j with a reason', (text, message) => {
    expect(() => parseDuration(text)).toThrow(new UsageError(message));
  });

  it('names the option it reads', () => {
    expect(() => parseDuration('soon', 'gap')).toThrow(/^--gap 'soon'/);
  });
});
