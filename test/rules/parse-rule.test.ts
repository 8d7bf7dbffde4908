import { describe, expect, it } from 'vitest';
import { describeRule } from '../../src/rules/describe-rule.ts';
import { parseRule } from '../../src/rules/parse-rule.ts';
import type { Rule, RuleBody, RuleContext, RuleSubject } from '../../src/rules/rule.ts';

// Tuesday 2026-12-01, 12:00 UTC (12:00 in Lisbon, which is on UTC+0 in winter).
const NOW = Date.parse('2026-12-01T12:00:00Z');
const CTX: RuleContext = {
  zone: 'Europe/Lisbon',
  now: NOW,
  speaker: 'ines',
  people: [
    { id: 'maren', name: 'Maren Holloway' },
    { id: 'ines', name: 'Ines Carvalhal' },
    { id: 'teo', name: 'Teo Brannigan' },
  ],
  rooms: [{ id: 'tejo', name: 'Tejo' }],
  groups: [{ id: 'data-team' }],
};

const ME: RuleSubject = { kind: 'speaker' };
const hard = (body: RuleBody, subject: RuleSubject = ME): Rule => ({ subject, strength: 'hard', body });
const pref = (body: RuleBody, subject: RuleSubject = ME): Rule => ({ subject, strength: 'preference', body });
const avoidTimes = (from: number, to: number, extra: Partial<RuleBody> = {}): RuleBody =>
  ({ kind: 'window', mode: 'avoid', times: { from, to }, ...extra }) as RuleBody;
const H = (h: number, m = 0): number => h * 60 + m;

// Each phrasing with the whole structure it must give (now fixed at 2026-12-01T12:00Z, Lisbon).
const PHRASINGS: readonly (readonly [string, Rule])[] = [
  // clock windows, 12- and 24-hour, negations
  ['No meetings before 10am', hard(avoidTimes(0, H(10)))],
  ['no meetings before 10', hard(avoidTimes(0, H(10)))], // 22:00 is outside 07:00-22:00, so 10am
  ["I can't meet before 09:30", hard(avoidTimes(0, H(9, 30)))], // a leading zero is 24-hour time
  ['Never book me after 5pm', hard(avoidTimes(H(17), 1440))],
  ['no meetings after 16:30', hard(avoidTimes(H(16, 30), 1440))],
  ["don't schedule anything after 6", hard(avoidTimes(H(18), 1440))], // 06:00 is implausible
  ['no meetings after 4:30', hard(avoidTimes(H(16, 30), 1440))],
  ['No meetings between 12 and 1', hard(avoidTimes(H(12), H(13)))], // 12:00-13:00, common practice
  ['no meetings between noon and 1:30pm', hard(avoidTimes(H(12), H(13, 30)))],
  ['no meetings at noon', hard(avoidTimes(H(12), H(13)))],
  ['no meetings at 2:30pm', hard(avoidTimes(H(14, 30), H(15, 30)))],
  ['No meetings between midnight and 7am', hard(avoidTimes(0, H(7)))],
  ['no meetings between 10pm and midnight', hard(avoidTimes(H(22), 1440))],
  ['no meetings until noon', hard(avoidTimes(0, H(12)))],
  ['no meetings from 9am to 11am', hard(avoidTimes(H(9), H(11)))],
  ['no meetings 13:00-14:00', hard(avoidTimes(H(13), H(14)))],
  ['between 6 and 10 no meetings', hard(avoidTimes(H(18), H(22)))], // only 18:00-22:00 fits the band
  ['no meetings between 9 and 11', hard(avoidTimes(H(9), H(11)))], // 21:00-23:00 ends past 22:00
  ['meetings must be after 10am', hard({ kind: 'window', mode: 'only', times: { from: H(10), to: 1440 } })],
  ['no meetings before 12pm', hard(avoidTimes(0, H(12)))],
  ["no meetings before 10 o'clock", hard(avoidTimes(0, H(10)))],
  ['no meetings before 9 a.m.', hard(avoidTimes(0, H(9)))],
  ['no meetings after 5 p.m. please', hard(avoidTimes(H(17), 1440))],
  ['no meetings after 11pm', hard(avoidTimes(H(23), 1440))],
  // weekdays and parts of day
  ['No meetings on Fridays', hard({ kind: 'window', mode: 'avoid', weekdays: [5] })],
  ["I don't do meetings on weekends", hard({ kind: 'window', mode: 'avoid', weekdays: [6, 7] })],
  ['only meet on tuesdays and thursdays', hard({ kind: 'window', mode: 'only', weekdays: [2, 4] })],
  ['meetings only on weekdays', hard({ kind: 'window', mode: 'only', weekdays: [1, 2, 3, 4, 5] })],
  [
    'no meetings monday to wednesday after 4pm',
    hard({ kind: 'window', mode: 'avoid', weekdays: [1, 2, 3], times: { from: H(16), to: 1440 } }),
  ],
  [
    'no meetings on Friday afternoons',
    hard({ kind: 'window', mode: 'avoid', weekdays: [5], times: { part: 'afternoon' } }),
  ],
  [
    "Maren can't do mornings",
    hard({ kind: 'window', mode: 'avoid', times: { part: 'morning' } }, { kind: 'person', id: 'maren' }),
  ],
  // preferences
  ['I prefer mornings', pref({ kind: 'window', mode: 'only', times: { part: 'morning' } })],
  [
    'I’d rather not meet on Tuesday mornings', // a typographic apostrophe
    pref({ kind: 'window', mode: 'avoid', weekdays: [2], times: { part: 'morning' } }),
  ],
  [
    'no meetings on Tues and Thurs afternoons',
    hard({ kind: 'window', mode: 'avoid', weekdays: [2, 4], times: { part: 'afternoon' } }),
  ],
  ['no meetings on sat or sun', hard({ kind: 'window', mode: 'avoid', weekdays: [6, 7] })],
  [
    'No meetings from Monday to Friday before 8:15am',
    hard({ kind: 'window', mode: 'avoid', weekdays: [1, 2, 3, 4, 5], times: { from: 0, to: H(8, 15) } }),
  ],
  [
    "I'd rather not meet on Monday mornings",
    pref({ kind: 'window', mode: 'avoid', weekdays: [1], times: { part: 'morning' } }),
  ],
  ['prefer 9am meetings', pref({ kind: 'window', mode: 'only', times: { from: H(9), to: H(10) } })],
  ['Ideally no meetings after 4pm', pref(avoidTimes(H(16), 1440))],
  [
    'if possible, no calls in the evening',
    pref({ kind: 'window', mode: 'avoid', times: { part: 'evening' } }),
  ],
  ['try not to book me before 11', pref(avoidTimes(0, H(11)))], // 23:00 is implausible, so 11am
  [
    'I would like meetings in the afternoon',
    pref({ kind: 'window', mode: 'only', times: { part: 'afternoon' } }),
  ],
  // named zones (city names as the IANA tz database names its zones, and IANA names)
  ['no meetings after 5pm Lisbon time', hard(avoidTimes(H(17), 1440, { zone: 'Europe/Lisbon' }))],
  ['no meetings before 9am Halifax time', hard(avoidTimes(0, H(9), { zone: 'America/Halifax' }))],
  [
    'no meetings after 17:30 America/Halifax time',
    hard(avoidTimes(H(17, 30), 1440, { zone: 'America/Halifax' })),
  ],
  ['No meetings before 8am in Pacific/Auckland', hard(avoidTimes(0, H(8), { zone: 'Pacific/Auckland' }))],
  ['no meetings after 4pm UTC', hard(avoidTimes(H(16), 1440, { zone: 'UTC' }))],
  // who the rule binds
  [
    'For maren: no meetings on Fridays',
    hard({ kind: 'window', mode: 'avoid', weekdays: [5] }, { kind: 'person', id: 'maren' }),
  ],
  [
    'Teo never meets on Mondays',
    hard({ kind: 'window', mode: 'avoid', weekdays: [1] }, { kind: 'person', id: 'teo' }),
  ],
  ['Ines: no meetings on Fridays', hard({ kind: 'window', mode: 'avoid', weekdays: [5] })], // the speaker
  [
    'The Tejo room is unavailable on weekends',
    hard({ kind: 'window', mode: 'avoid', weekdays: [6, 7] }, { kind: 'room', id: 'tejo' }),
  ],
  [
    'the data team: no meetings on Mondays',
    hard({ kind: 'window', mode: 'avoid', weekdays: [1] }, { kind: 'group', id: 'data-team' }),
  ],
  // keep-free blocks
  ['Keep Tuesday mornings free', hard({ kind: 'keep-free', weekdays: [2], times: { part: 'morning' } })],
  ['keep friday afternoons free', hard({ kind: 'keep-free', weekdays: [5], times: { part: 'afternoon' } })],
  ['Please keep Wednesdays free', hard({ kind: 'keep-free', weekdays: [3] })],
  ['block off mornings', hard({ kind: 'keep-free', times: { part: 'morning' } })],
  [
    "I'd like to keep Thursday afternoons free",
    pref({ kind: 'keep-free', weekdays: [4], times: { part: 'afternoon' } }),
  ],
  ['keep noon to 1pm free', hard({ kind: 'keep-free', times: { from: H(12), to: H(13) } })],
  // dates, relative to now in the speaker's zone
  ['No meetings on the 24th', hard({ kind: 'dates', mode: 'avoid', from: '2026-12-24', to: '2026-12-24' })],
  [
    "I'm out the 21st to the 2nd",
    hard({ kind: 'dates', mode: 'avoid', from: '2026-12-21', to: '2027-01-02' }),
  ],
  [
    'No meetings Dec 21 to Jan 2',
    hard({ kind: 'dates', mode: 'avoid', from: '2026-12-21', to: '2027-01-02' }),
  ],
  [
    "I'm away from 21 December to 2 January",
    hard({ kind: 'dates', mode: 'avoid', from: '2026-12-21', to: '2027-01-02' }),
  ],
  // chrono-node reads "next Friday" from a Tuesday as the Friday of next week
  ['no meetings next Friday', hard({ kind: 'dates', mode: 'avoid', from: '2026-12-11', to: '2026-12-11' })],
  ['no meetings this friday', hard({ kind: 'dates', mode: 'avoid', from: '2026-12-04', to: '2026-12-04' })],
  // ISO weeks run Monday to Sunday (ISO 8601); "next weekend" is the weekend of next week, like "next Friday"
  ['no meetings next week', hard({ kind: 'dates', mode: 'avoid', from: '2026-12-07', to: '2026-12-13' })],
  ['no meetings this week', hard({ kind: 'dates', mode: 'avoid', from: '2026-12-01', to: '2026-12-06' })],
  ["I'm out this weekend", hard({ kind: 'dates', mode: 'avoid', from: '2026-12-05', to: '2026-12-06' })],
  ["I'm out next weekend", hard({ kind: 'dates', mode: 'avoid', from: '2026-12-12', to: '2026-12-13' })],
  ['no meetings next month', hard({ kind: 'dates', mode: 'avoid', from: '2027-01-01', to: '2027-01-31' })],
  ["I'm out until the 5th", hard({ kind: 'dates', mode: 'avoid', from: '2026-12-01', to: '2026-12-05' })],
  ["I'm out until Jan 5", hard({ kind: 'dates', mode: 'avoid', from: '2026-12-01', to: '2027-01-05' })],
  ['off through 2027-01-04', hard({ kind: 'dates', mode: 'avoid', from: '2026-12-01', to: '2027-01-04' })],
  ["I'm off tomorrow", hard({ kind: 'dates', mode: 'avoid', from: '2026-12-02', to: '2026-12-02' })],
  ['no meetings on 2027-01-05', hard({ kind: 'dates', mode: 'avoid', from: '2027-01-05', to: '2027-01-05' })],
  [
    'out from 2026-12-28 to 2027-01-03',
    hard({ kind: 'dates', mode: 'avoid', from: '2026-12-28', to: '2027-01-03' }),
  ],
  [
    'no meetings on the 24th after 3pm',
    hard({
      kind: 'dates',
      mode: 'avoid',
      from: '2026-12-24',
      to: '2026-12-24',
      times: { from: H(15), to: 1440 },
    }),
  ],
  ['No meetings on the 1st', hard({ kind: 'dates', mode: 'avoid', from: '2026-12-01', to: '2026-12-01' })], // today counts
  [
    'no meetings on the 31st of january',
    hard({ kind: 'dates', mode: 'avoid', from: '2027-01-31', to: '2027-01-31' }),
  ],
  [
    "I'd rather not meet on December 24",
    pref({ kind: 'dates', mode: 'avoid', from: '2026-12-24', to: '2026-12-24' }),
  ],
  ["I'm out 12/24", hard({ kind: 'dates', mode: 'avoid', from: '2026-12-24', to: '2026-12-24' })], // 24 cannot be a month
  // daily limits
  ['At most 4 meetings a day', hard({ kind: 'daily-limit', maxMeetings: 4 })],
  ['max 6 meetings per day', hard({ kind: 'daily-limit', maxMeetings: 6 })],
  ['ideally at most three meetings a day', pref({ kind: 'daily-limit', maxMeetings: 3 })],
  [
    'no more than 3 hours of meetings on Fridays',
    hard({ kind: 'daily-limit', maxMinutes: 180, weekdays: [5] }),
  ],
  ['at most 2.5 hours of meetings per day', hard({ kind: 'daily-limit', maxMinutes: 150 })],
  [
    'No more than 90 minutes of meetings on Mondays and Tuesdays',
    hard({ kind: 'daily-limit', maxMinutes: 90, weekdays: [1, 2] }),
  ],
  [
    'at most 4 meetings and 5 hours of meetings per day',
    hard({ kind: 'daily-limit', maxMeetings: 4, maxMinutes: 300 }),
  ],
  // gaps
  ['at least 15 minutes between meetings', hard({ kind: 'gap', minutes: 15 })],
  ['Leave 10 minutes between meetings', hard({ kind: 'gap', minutes: 10 })],
  ['I need a break of 30 minutes between meetings', hard({ kind: 'gap', minutes: 30 })],
  ['prefer a 5 minute buffer between calls', pref({ kind: 'gap', minutes: 5 })],
  // notice
  ['I need at least 24 hours notice', hard({ kind: 'notice', minutes: 1440 })],
  ["at least 2 hours' notice", hard({ kind: 'notice', minutes: 120 })],
  ["a day's notice please", hard({ kind: 'notice', minutes: 1440 })],
  ['no meetings booked less than 3 hours ahead', hard({ kind: 'notice', minutes: 180 })],
  ['no meetings within the next 4 hours', hard({ kind: 'notice', minutes: 240 })],
  // lengths
  ['no meetings longer than 45 minutes', hard({ kind: 'max-length', minutes: 45 })],
  ['meetings no longer than an hour', hard({ kind: 'max-length', minutes: 60 })],
  ['keep meetings under 30 minutes', hard({ kind: 'max-length', minutes: 30 })],
  ['prefer no calls longer than half an hour', pref({ kind: 'max-length', minutes: 30 })],
];

describe('parseRule', () => {
  it('has a broad table of phrasings', () => {
    expect(PHRASINGS.length).toBeGreaterThanOrEqual(60);
  });

  for (const [text, expected] of PHRASINGS) {
    it(`reads "${text}"`, () => {
      const parsed = parseRule(text, CTX);
      expect(parsed).toEqual({ ok: true, rule: expected, text: describeRule(expected) });
    });
  }

  it('gives normalized sentences in our own words', () => {
    const texts = [
      'No meetings between 12 and 1',
      "I'm out the 21st to the 2nd",
      "I'd rather not meet on Monday mornings",
      'no more than 3 hours of meetings on Fridays',
      "Maren can't do mornings",
      'The Tejo room is unavailable on weekends',
      'keep noon to 1pm free',
      'at most 2.5 hours of meetings per day',
    ].map((t) => {
      const p = parseRule(t, CTX);
      return p.ok ? p.text : p.issues[0]!.message;
    });
    expect(texts).toEqual([
      'No meetings between noon and 1pm',
      'No meetings from 2026-12-21 to 2027-01-02',
      'Prefer no meetings on Monday mornings',
      'At most 3 hours of meetings per day on Fridays',
      'For maren: No meetings in the morning',
      'For room tejo: No meetings on weekends',
      'Keep between noon and 1pm free',
      'At most 150 minutes of meetings per day',
    ]);
  });

  it('reads dates on the calendar of the given zone', () => {
    // 2026-12-01T23:30Z is already 2026-12-02 in Auckland (UTC+13 in December, IANA rules, from memory)
    const late = { ...CTX, zone: 'Pacific/Auckland', now: Date.parse('2026-12-01T23:30:00Z') };
    expect(parseRule("I'm off tomorrow", late)).toMatchObject({
      ok: true,
      rule: { body: { from: '2026-12-03', to: '2026-12-03' } },
    });
    expect(parseRule("I'm off tomorrow", CTX)).toMatchObject({
      ok: true,
      rule: { body: { from: '2026-12-02' } },
    });
  });

  it('rolls a range that ends in an earlier month into the next year', () => {
    const march = { ...CTX, now: Date.parse('2027-03-10T12:00:00Z') };
    expect(parseRule("I'm out the 28th to the 3rd", march)).toMatchObject({
      ok: true,
      rule: { body: { from: '2027-03-28', to: '2027-04-03' } },
    });
  });
});

describe('round trip', () => {
  for (const [text, expected] of PHRASINGS) {
    it(`describeRule of "${text}" parses back to the same structure`, () => {
      const sentence = describeRule(expected);
      const back = parseRule(sentence, CTX);
      expect(back).toEqual({ ok: true, rule: expected, text: sentence });
    });
  }
});
