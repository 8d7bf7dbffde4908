import { describe, expect, it } from 'vitest';
import { parseRule } from '../../src/rules/parse-rule.ts';
import type { RuleContext, RuleIssue } from '../../src/rules/rule.ts';

const CTX: RuleContext = {
  zone: 'Europe/Lisbon',
  now: Date.parse('2026-12-01T12:00:00Z'),
  speaker: 'ines',
  people: [
    { id: 'maren', name: 'Maren Holloway' },
    { id: 'teo', name: 'Teo Brannigan' },
  ],
  rooms: [{ id: 'tejo', name: 'Tejo' }],
};

type Row = readonly [text: string, code: RuleIssue['code'], message: string, suggestions?: readonly string[]];

// A bare hour is ambiguous when both its am and pm readings fall in 07:00-22:00 (our documented band).
const TABLE: readonly Row[] = [
  [
    'no meetings before 9',
    'rule_ambiguous',
    "'before 9' could mean before 9am or before 9pm; say which (with am/pm or as 24-hour time)",
    ['no meetings before 9am', 'no meetings before 9pm'],
  ],
  [
    'no meetings after 7:30',
    'rule_ambiguous',
    "'after 7:30' could mean after 7:30am or after 7:30pm; say which (with am/pm or as 24-hour time)",
  ],
  [
    'no meetings at 8',
    'rule_ambiguous',
    "'at 8' could mean at 8am or at 8pm; say which (with am/pm or as 24-hour time)",
  ],
  [
    'no meetings between 8 and 10',
    'rule_ambiguous',
    "'between 8 and 10' could mean between 8am and 10am or between 8am and 10pm or between 8pm and 10pm; say which (with am/pm or as 24-hour time)",
  ],
  [
    'meetings in the afternoon',
    'rule_ambiguous',
    "Should 'meetings in the afternoon' keep meetings out of that time, or only in it?",
    ['No meetings in the afternoon', 'Meetings only in the afternoon'],
  ],
  [
    'no meetings before 9am or after 5pm',
    'rule_ambiguous',
    "'no meetings before 9am or after 5pm' names more than one time range ('before 9am', 'after 5pm'); say one range per rule",
    ['No meetings before 9am', 'No meetings after 5pm'],
  ],
  [
    'no meetings in the morning after 10am',
    'rule_ambiguous',
    "'no meetings in the morning after 10am' names both a part of the day and a clock time ('after 10am'); say one of them",
  ],
  [
    'no meetings in the mornings and evenings',
    'rule_ambiguous',
    "'no meetings in the mornings and evenings' names more than one part of the day; say one part or one clock range per rule",
  ],
  ['no back to back meetings', 'rule_ambiguous', 'How many minutes should stay free between meetings?'],
  [
    'at most 4 meetings',
    'rule_ambiguous',
    "'at most 4 meetings' gives a limit but not over what; say 'per day' or name the weekdays",
    ['at most 4 meetings per day'],
  ],
  [
    'at least 15 minutes between meetings and 24 hours notice',
    'rule_ambiguous',
    "'at least 15 minutes between meetings and 24 hours notice' holds more than one rule (gap, notice); say them one at a time",
  ],
  [
    "I'm out 03/04",
    'rule_ambiguous',
    "'03/04' could be read day-first or month-first; write the date as YYYY-MM-DD or with the month's name",
  ],
  [
    'no meetings on the 24th and the 31st',
    'rule_ambiguous',
    "'no meetings on the 24th and the 31st' names more than one date or range; say one per rule",
    ['No meetings on 2026-12-24', 'No meetings on 2026-12-31'],
  ],
  [
    'no meetings in 2 weeks',
    'rule_ambiguous',
    "'in 2 weeks' does not name the days exactly; say the first and last day, like 'from the 21st to the 2nd'",
  ],
  [
    'no meetings next year',
    'rule_ambiguous',
    "'next year' does not name the days exactly; say the first and last day, like 'from the 21st to the 2nd'",
  ],
  [
    'I am out until 2026-11-05',
    'rule_unreadable',
    "I could not read 'until 2026-11-05': that date has passed",
  ],
  [
    'no meetings on Fridays and the 24th',
    'rule_ambiguous',
    "'no meetings on Fridays and the 24th' names both dates and weekdays; say one of them",
  ],
  [
    'no meetings after midnight',
    'rule_ambiguous',
    "'after midnight' covers the whole day; give both ends, like 'between midnight and 6am'",
  ],
  [
    "Maren and Teo can't meet on Fridays",
    'rule_ambiguous',
    "'Maren and Teo can't meet on Fridays' names more than one person, room or group; say one per rule",
  ],
  [
    'no meetings when it rains',
    'rule_unreadable',
    "I could not read 'when it rains' in 'no meetings when it rains'",
    ['No meetings before 10am', 'No meetings after 5pm', 'No meetings between noon and 1pm'],
  ],
  [
    'no meetings on Fridays during full moon',
    'rule_unreadable',
    "I could not read 'full moon' in 'no meetings on Fridays during full moon'",
    ['No meetings on Fridays'],
  ],
  [
    'purple monkey dishwasher',
    'rule_unreadable',
    "I could not read 'purple monkey dishwasher' in 'purple monkey dishwasher'",
  ],
  ['', 'rule_unreadable', 'I could not read an empty rule'],
  [
    'no meetings after 5pm Boston time',
    'rule_unreadable',
    "I could not read the zone 'boston time'; use an IANA name such as Europe/Lisbon",
  ],
  [
    'no meetings after 5pm Mars/Olympus time',
    'rule_unreadable',
    "I could not read the zone 'mars/olympus'; use an IANA name such as Europe/Lisbon",
  ],
  [
    'no meetings after 25',
    'rule_unreadable',
    "I could not read the time 'after 25'; write it like 9am, 4:30pm or 16:30",
  ],
  [
    'no meetings on 2026-02-30',
    'rule_unreadable',
    "I could not read '2026-02-30': it is not a calendar date (use YYYY-MM-DD)",
  ],
  [
    'no meetings between 5pm and 9am',
    'rule_unreadable',
    "I could not read 'between 5pm and 9am': it ends before it starts; split a range over midnight into two rules",
  ],
  [
    'at most 0 meetings a day',
    'rule_unreadable',
    "I could not read 'at most 0 meetings a day': meetings must be a whole number of at least 1",
  ],
  [
    'no meetings longer than 0 minutes',
    'rule_unreadable',
    "I could not read 'no meetings longer than 0 minutes': minutes must be a whole number of at least 1",
  ],
  [
    'Quentin cannot meet on Fridays',
    'rule_unreadable',
    "I could not read 'Quentin' in 'Quentin cannot meet on Fridays'",
  ],
];

describe('parseRule on unreadable and ambiguous text', () => {
  for (const [text, code, message, suggestions] of TABLE) {
    it(`${code}: "${text}"`, () => {
      const parsed = parseRule(text, CTX);
      expect(parsed.ok).toBe(false);
      if (parsed.ok) return;
      expect(parsed.issues).toHaveLength(1);
      const [first] = parsed.issues;
      expect(first!.code).toBe(code);
      expect(first!.message).toBe(message);
      if (suggestions !== undefined) expect(first!.suggestions).toEqual(suggestions);
    });
  }

  it('suggests only sentences it can read itself', () => {
    for (const [text] of TABLE) {
      const parsed = parseRule(text, CTX);
      if (parsed.ok) continue;
      for (const s of parsed.issues.flatMap((i) => i.suggestions)) {
        expect(parseRule(s, CTX).ok, `suggestion '${s}' for '${text}'`).toBe(true);
      }
    }
  });

  it('is stable: the same input gives the same answer', () => {
    for (const [text] of TABLE) expect(parseRule(text, CTX)).toEqual(parseRule(text, CTX));
  });
});
