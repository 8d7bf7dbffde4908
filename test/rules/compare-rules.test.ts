import { describe, expect, it } from 'vitest';
import { compareRules } from '../../src/rules/compare-rules.ts';
import { parseRule } from '../../src/rules/parse-rule.ts';
import type { Rule } from '../../src/rules/rule.ts';
import { ruleConfirmation, ruleFields } from '../../src/rules/rule-confirmation.ts';

const CTX = {
  zone: 'Europe/Lisbon',
  now: Date.parse('2026-12-01T12:00:00Z'),
  people: [{ id: 'maren', name: 'Maren Holloway' }],
};
function rule(text: string): Rule {
  const p = parseRule(text, CTX);
  if (!p.ok) throw new Error(p.issues[0]!.message);
  return p.rule;
}

describe('compareRules', () => {
  it('finds that a wished-for time is entirely excluded by a hard rule', () => {
    expect(compareRules(rule('prefer 9am meetings'), [rule('no meetings before 10am')])).toEqual([
      {
        index: 0,
        relation: 'contradicts',
        text: 'No meetings before 10am',
        message:
          "'Prefer meetings between 9am and 10am' contradicts your rule 'No meetings before 10am': both cannot hold",
      },
    ]);
  });

  it('sorts overlaps, repeats, contradictions and unrelated rules', () => {
    const existing = [
      rule('no meetings before 10am'), // 0: overlaps "before 11" (one hour more)
      rule('No meetings before 10'), // 1: bare 10 is 10am, so it overlaps too
      rule('Keep Tuesday mornings free'), // 2: overlaps 08:00-11:00 on Tuesdays
      rule('no meetings after 5pm'), // 3: unrelated
      rule('at most 4 meetings a day'), // 4: another kind
      rule('For maren: no meetings before 11am'), // 5: someone else
      rule('meetings only after 2pm'), // 6: wants 14:00-24:00, disjoint from before 11 -> nothing
    ];
    const found = compareRules(rule('no meetings before 11am'), existing).map((c) => [c.index, c.relation]);
    expect(found).toEqual([
      [0, 'overlaps'],
      [1, 'overlaps'],
      [2, 'overlaps'],
    ]);
  });

  it('reports a rule said twice in other words as the same', () => {
    expect(
      compareRules(rule('Never book me after 5pm'), [rule('no meetings after 17:00')])[0]?.relation,
    ).toBe('same');
  });

  it('finds two only-rules with no common time contradictory', () => {
    const found = compareRules(rule('meetings only in the morning'), [
      rule('meetings only in the afternoon'),
    ]);
    expect(found.map((c) => c.relation)).toEqual(['contradicts']);
  });

  it('finds partly excluded wishes as overlaps', () => {
    const found = compareRules(rule('prefer meetings in the morning'), [rule('no meetings before 10am')]);
    expect(found.map((c) => c.relation)).toEqual(['overlaps']);
  });

  it('compares dates against weekly windows over the dates', () => {
    // 2026-12-25 is a Friday (checked: Temporal.PlainDate dayOfWeek 5)
    const found = compareRules(rule('meetings only on 2026-12-25'), [rule('no meetings on Fridays')]);
    expect(found.map((c) => c.relation)).toEqual(['contradicts']);
    expect(compareRules(rule('meetings only on 2026-12-24'), [rule('no meetings on Fridays')])).toEqual([]);
  });

  it('treats two numbers of the same kind as overlapping', () => {
    const found = compareRules(rule('at most 3 meetings a day'), [
      rule('at most 4 meetings a day'),
      rule('at least 24 hours notice'),
    ]);
    expect(found.map((c) => [c.index, c.relation])).toEqual([[0, 'overlaps']]);
  });
});

describe('ruleConfirmation', () => {
  it('returns the sentence, the structure as lines and related rules, and asks', () => {
    const p = parseRule('Keep Tuesday mornings free', CTX);
    if (!p.ok) throw new Error('unreadable');
    expect(ruleConfirmation(p, [rule('no meetings before 10am')])).toEqual({
      text: 'Keep Tuesday mornings free',
      rule: p.rule,
      fields: [
        { label: 'for', value: 'you' },
        { label: 'strength', value: 'hard rule (must hold)' },
        { label: 'kind', value: 'keep free' },
        { label: 'days', value: 'Tue' },
        { label: 'hours', value: 'morning' },
        { label: 'zone', value: 'your own zone' },
      ],
      related: [
        {
          index: 0,
          relation: 'overlaps',
          text: 'No meetings before 10am',
          message: "'Keep Tuesday mornings free' overlaps your rule 'No meetings before 10am'",
        },
      ],
      question: 'Save this rule?',
    });
  });

  it('lists limits and dates in plain words', () => {
    expect(ruleFields(rule('at most 4 meetings and 5 hours of meetings per day'))).toEqual([
      { label: 'for', value: 'you' },
      { label: 'strength', value: 'hard rule (must hold)' },
      { label: 'kind', value: 'daily limit' },
      { label: 'most meetings', value: '4' },
      { label: 'most meeting time', value: '5 hours' },
      { label: 'days', value: 'every day' },
    ]);
    expect(ruleFields(rule("I'd rather not meet Dec 21 to Jan 2")).slice(1, 4)).toEqual([
      { label: 'strength', value: 'preference (would like)' },
      { label: 'kind', value: 'dates (keep meetings out)' },
      { label: 'dates', value: '2026-12-21 to 2027-01-02 (both included)' },
    ]);
  });
});
