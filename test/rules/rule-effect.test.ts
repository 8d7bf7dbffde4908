import { Temporal } from 'temporal-polyfill';
import { describe, expect, it } from 'vitest';
import { parseRule } from '../../src/rules/parse-rule.ts';
import type { Rule } from '../../src/rules/rule.ts';
import { ruleEffect } from '../../src/rules/rule-effect.ts';

const iso = (s: string): number => Date.parse(s);
const iv = (a: string, b: string) => ({ start: iso(a), end: iso(b) });

function rule(text: string, zone = 'Europe/Lisbon'): Rule {
  const p = parseRule(text, { zone, now: iso('2026-12-01T12:00:00Z') });
  if (!p.ok) throw new Error(p.issues[0]!.message);
  return p.rule;
}

/** UTC offset in minutes of an instant in a zone, from the runtime's ICU data (independent of Temporal). */
function icuOffset(epochMs: number, zone: string): number {
  const parts = new Intl.DateTimeFormat('en-US', { timeZone: zone, timeZoneName: 'longOffset' })
    .formatToParts(new Date(epochMs))
    .find((p) => p.type === 'timeZoneName')!.value; // "GMT+01:00" or "GMT"
  const m = /GMT([+-])(\d{2}):(\d{2})/.exec(parts);
  return m === null ? 0 : (m[1] === '-' ? -1 : 1) * (Number(m[2]) * 60 + Number(m[3]));
}

describe('the DST changes the tests rely on', () => {
  // IANA tz rules, from memory: EU summer time starts the last Sunday of March at 01:00 UTC;
  // Atlantic Canada returns to standard time the first Sunday of November at 02:00 local.
  it('Europe/Lisbon moves from UTC+0 to UTC+1 at 2026-03-29T01:00Z (checked with ICU and Temporal)', () => {
    expect(icuOffset(iso('2026-03-29T00:59:00Z'), 'Europe/Lisbon')).toBe(0);
    expect(icuOffset(iso('2026-03-29T01:00:00Z'), 'Europe/Lisbon')).toBe(60);
    expect(Temporal.ZonedDateTime.from('2026-03-29T10:00[Europe/Lisbon]').epochMilliseconds).toBe(
      iso('2026-03-29T09:00:00Z'),
    );
  });
  it('America/Halifax moves from UTC-3 to UTC-4 at 2026-11-01T05:00Z (checked with ICU and Temporal)', () => {
    expect(icuOffset(iso('2026-11-01T04:59:00Z'), 'America/Halifax')).toBe(-180);
    expect(icuOffset(iso('2026-11-01T05:00:00Z'), 'America/Halifax')).toBe(-240);
    expect(Temporal.ZonedDateTime.from('2026-11-01T17:00[America/Halifax]').epochMilliseconds).toBe(
      iso('2026-11-01T21:00:00Z'),
    );
  });
});

describe('ruleEffect across DST changes', () => {
  it('keeps "before 10am" at 10:00 on the Lisbon wall clock on the spring-forward day', () => {
    const e = ruleEffect(rule('No meetings before 10am'), {
      zone: 'Europe/Lisbon',
      from: iso('2026-03-28T00:00:00Z'),
      to: iso('2026-03-31T00:00:00Z'),
      now: iso('2026-03-01T00:00:00Z'),
    });
    expect(e.avoid).toEqual([
      iv('2026-03-28T00:00:00Z', '2026-03-28T10:00:00Z'),
      iv('2026-03-29T00:00:00Z', '2026-03-29T09:00:00Z'), // a 9-hour morning: 01:00 to 02:00 never happens
      iv('2026-03-29T23:00:00Z', '2026-03-30T09:00:00Z'),
      iv('2026-03-30T23:00:00Z', '2026-03-31T00:00:00Z'), // the start of 31 March, clipped at the window
    ]);
  });

  it('moves a clock range inside the Lisbon gap forward, as RFC 5545 section 3.3.5 asks', () => {
    const e = ruleEffect(rule('no meetings between 1am and 3am'), {
      zone: 'Europe/Lisbon',
      from: iso('2026-03-29T00:00:00Z'),
      to: iso('2026-03-29T12:00:00Z'),
      now: 0,
    });
    // 01:00 local does not exist and becomes 02:00 WEST = 01:00Z; 03:00 WEST = 02:00Z
    expect(e.avoid).toEqual([iv('2026-03-29T01:00:00Z', '2026-03-29T02:00:00Z')]);
  });

  it('keeps "after 5pm" at 17:00 on the Halifax wall clock across the fall-back day', () => {
    const e = ruleEffect(rule('no meetings after 5pm', 'America/Halifax'), {
      zone: 'America/Halifax',
      from: iso('2026-10-31T03:00:00Z'),
      to: iso('2026-11-02T04:00:00Z'),
      now: 0,
    });
    expect(e.avoid).toEqual([
      iv('2026-10-31T20:00:00Z', '2026-11-01T03:00:00Z'), // 17:00-24:00 ADT (UTC-3)
      iv('2026-11-01T21:00:00Z', '2026-11-02T04:00:00Z'), // 17:00-24:00 AST (UTC-4)
    ]);
  });

  it('covers the repeated hour in Halifax both times it is on the clock', () => {
    const e = ruleEffect(rule('no meetings before 1:30am', 'America/Halifax'), {
      zone: 'America/Halifax',
      from: iso('2026-11-01T03:00:00Z'),
      to: iso('2026-11-01T12:00:00Z'),
      now: 0,
    });
    // 00:00-01:30 ADT is 03:00Z-04:30Z; at 05:00Z the clock falls back to 01:00 AST and reads
    // 01:00-01:30 again until 05:30Z, which is also before 1:30am on the wall clock
    expect(e.avoid).toEqual([
      iv('2026-11-01T03:00:00Z', '2026-11-01T04:30:00Z'),
      iv('2026-11-01T05:00:00Z', '2026-11-01T05:30:00Z'),
    ]);
  });

  it('places Sunday mornings in Halifax on standard time after the change', () => {
    const e = ruleEffect(rule('keep sunday mornings free', 'America/Halifax'), {
      zone: 'America/Halifax',
      from: iso('2026-10-24T00:00:00Z'),
      to: iso('2026-11-03T00:00:00Z'),
      now: 0,
    });
    expect(e.avoid).toEqual([
      iv('2026-10-25T11:00:00Z', '2026-10-25T15:00:00Z'), // 08:00-12:00 ADT
      iv('2026-11-01T12:00:00Z', '2026-11-01T16:00:00Z'), // 08:00-12:00 AST
    ]);
  });
});

describe('ruleEffect in named zones', () => {
  it('reads "after 5pm Lisbon time" in Lisbon even for a Halifax person', () => {
    const e = ruleEffect(rule('no meetings after 5pm Lisbon time', 'America/Halifax'), {
      zone: 'America/Halifax',
      from: iso('2026-12-07T00:00:00Z'),
      to: iso('2026-12-09T00:00:00Z'),
      now: 0,
    });
    expect(e.avoid).toEqual([
      iv('2026-12-07T17:00:00Z', '2026-12-08T00:00:00Z'), // Lisbon is on UTC+0 in winter
      iv('2026-12-08T17:00:00Z', '2026-12-09T00:00:00Z'),
    ]);
  });

  it('reads "before 9am Auckland time" on the Auckland calendar (UTC+13 in December, IANA rules, from memory)', () => {
    const e = ruleEffect(rule('no meetings before 9am Auckland time'), {
      zone: 'Europe/Lisbon',
      from: iso('2026-12-07T00:00:00Z'),
      to: iso('2026-12-08T00:00:00Z'),
      now: 0,
    });
    // 2026-12-08 00:00-09:00 NZDT is 2026-12-07T11:00Z-20:00Z
    expect(e.avoid).toEqual([iv('2026-12-07T11:00:00Z', '2026-12-07T20:00:00Z')]);
    expect(icuOffset(iso('2026-12-07T11:00:00Z'), 'Pacific/Auckland')).toBe(780);
  });
});

describe('ruleEffect by kind', () => {
  const win = { zone: 'Europe/Lisbon', from: iso('2026-12-07T00:00:00Z'), to: iso('2026-12-14T00:00:00Z') };

  it('turns an only-rule into the complement of the allowed time', () => {
    const e = ruleEffect(rule('meetings only on weekdays'), { ...win, now: 0 });
    expect(e.avoid).toEqual([iv('2026-12-12T00:00:00Z', '2026-12-14T00:00:00Z')]);
    expect(e.strength).toBe('hard');
  });

  it('uses configured day parts', () => {
    const e = ruleEffect(rule('no meetings on Friday mornings'), {
      ...win,
      now: 0,
      dayParts: {
        morning: { from: 420, to: 690 },
        afternoon: { from: 690, to: 1020 },
        evening: { from: 1020, to: 1320 },
      },
    });
    expect(e.avoid).toEqual([iv('2026-12-11T07:00:00Z', '2026-12-11T11:30:00Z')]);
  });

  it('covers whole local days for a date range across the year end', () => {
    const e = ruleEffect(rule("I'm out the 21st to the 2nd"), {
      zone: 'Europe/Lisbon',
      from: iso('2026-12-14T00:00:00Z'),
      to: iso('2027-01-11T00:00:00Z'),
      now: 0,
    });
    expect(e.avoid).toEqual([iv('2026-12-21T00:00:00Z', '2027-01-03T00:00:00Z')]);
    expect(e.text).toBe('No meetings from 2026-12-21 to 2027-01-02');
  });

  it('gives notice as [from, now + notice)', () => {
    const now = iso('2026-12-07T09:30:00Z');
    const e = ruleEffect(rule('at least 24 hours notice'), { ...win, now, id: 'r-7' });
    expect(e).toEqual({
      ruleId: 'r-7',
      text: 'At least 24 hours notice',
      strength: 'hard',
      avoid: [iv('2026-12-07T00:00:00Z', '2026-12-08T09:30:00Z')],
    });
    expect(
      ruleEffect(rule('at least 2 hours notice'), { ...win, now: iso('2026-12-01T00:00:00Z') }).avoid,
    ).toEqual([]);
  });

  it('passes lengths, gaps and daily limits through as numbers', () => {
    expect(ruleEffect(rule('no meetings longer than 45 minutes'), { ...win, now: 0 })).toEqual({
      ruleId: 'rule:No meetings longer than 45 minutes',
      text: 'No meetings longer than 45 minutes',
      strength: 'hard',
      avoid: [],
      maxLengthMinutes: 45,
    });
    expect(ruleEffect(rule('prefer a 5 minute buffer between calls'), { ...win, now: 0 })).toMatchObject({
      strength: 'preference',
      avoid: [],
      gapMinutes: 5,
    });
    expect(
      ruleEffect(rule('no more than 3 hours of meetings on Fridays'), { ...win, now: 0 }).dailyLimit,
    ).toEqual({
      zone: 'Europe/Lisbon',
      maxMinutes: 180,
      weekdays: [5],
    });
  });
});
