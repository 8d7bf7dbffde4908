import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseRule } from '../../src/rules/parse-rule.ts';

const CTX = {
  zone: 'America/Halifax',
  now: Date.parse('2026-12-01T12:00:00Z'),
  people: [{ id: 'teo', name: 'Teo Brannigan' }],
};
const WORDS = [
  'no',
  'never',
  'meetings',
  'before',
  'after',
  'between',
  'and',
  'to',
  'at',
  'on',
  'the',
  'prefer',
  'only',
  'keep',
  'free',
  'mornings',
  'afternoon',
  'evening',
  'friday',
  'mondays',
  'weekends',
  '9',
  '10am',
  '4:30pm',
  '17:00',
  'noon',
  'midnight',
  '21st',
  '2nd',
  'dec',
  'jan',
  'next',
  'tomorrow',
  'at most',
  'hours',
  'minutes',
  'of',
  'a day',
  'notice',
  'longer than',
  'until',
  'this',
  'week',
  'weekend',
  'month',
  'a.m.',
  "o'clock",
  'Lisbon time',
  'Europe/Lisbon',
  'teo',
  "can't",
  'rather',
  'out',
  '2026-12-24',
  '-',
  ',',
  '03/04',
  '#',
];

describe('parseRule on arbitrary input', () => {
  it('never throws, and whatever it reads reads back the same from its own sentence', () => {
    const sentence = fc.oneof(
      fc.string({ maxLength: 80 }),
      fc.array(fc.constantFrom(...WORDS), { minLength: 1, maxLength: 9 }).map((w) => w.join(' ')),
    );
    fc.assert(
      fc.property(sentence, (text) => {
        const parsed = parseRule(text, CTX);
        if (!parsed.ok) {
          expect(parsed.issues.length).toBeGreaterThan(0);
          for (const i of parsed.issues) expect(['rule_unreadable', 'rule_ambiguous']).toContain(i.code);
          return;
        }
        expect(parseRule(parsed.text, CTX)).toEqual(parsed);
      }),
      { numRuns: 1500, seed: 42 },
    );
  });
});
