import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { describeRule } from '../../src/rules/describe-rule.ts';
import { parseRule } from '../../src/rules/parse-rule.ts';
import { type Rule, type RuleBody, ruleSchema } from '../../src/rules/rule.ts';

// Any valid rule, not just the phrasings in the table, must read back from its own sentence.
const CTX = {
  zone: 'Europe/Lisbon',
  now: Date.parse('2026-12-01T12:00:00Z'),
  people: [{ id: 'maren', name: 'Maren Holloway' }],
  rooms: [{ id: 'tejo', name: 'Tejo' }],
  groups: [{ id: 'data-team' }],
};

const weekdays = fc
  .subarray([1, 2, 3, 4, 5, 6, 7], { minLength: 1 })
  .map((a) => [...a].sort((x, y) => x - y));
const clock = fc
  .tuple(fc.integer({ min: 0, max: 1440 }), fc.integer({ min: 0, max: 1440 }))
  .filter(([a, b]) => a < b && !(a === 0 && b === 1440))
  .map(([from, to]) => ({ from, to }));
const times = fc.oneof(
  fc.constantFrom('morning', 'afternoon', 'evening').map((part) => ({ part })),
  clock,
);
const zone = fc.option(
  fc.constantFrom('Europe/Lisbon', 'America/Halifax', 'Pacific/Auckland', 'UTC', 'Asia/Tokyo'),
  {
    nil: undefined,
  },
);
const date = fc
  .integer({ min: 0, max: 800 })
  .map((n) => new Date(Date.UTC(2026, 0, 1) + n * 86_400_000).toISOString().slice(0, 10));
const mode = fc.constantFrom('avoid', 'only' as const);
const amount = fc.integer({ min: 1, max: 2000 });

function opt<T extends object>(o: T): T {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as T;
}

const body: fc.Arbitrary<RuleBody> = fc.oneof(
  fc
    .record({
      mode,
      weekdays: fc.option(weekdays, { nil: undefined }),
      times: fc.option(times, { nil: undefined }),
      zone,
    })
    .map((b) => opt({ kind: 'window' as const, ...b })),
  fc
    .record({
      weekdays: fc.option(weekdays, { nil: undefined }),
      times: fc.option(times, { nil: undefined }),
      zone,
    })
    .map((b) => opt({ kind: 'keep-free' as const, ...b })),
  fc
    .record({ mode, a: date, b: date, times: fc.option(times, { nil: undefined }), zone })
    .map(({ a, b, ...rest }) => {
      const [from, to] = [a, b].sort() as [string, string];
      return opt({ kind: 'dates' as const, from, to, ...rest });
    }),
  fc
    .record({
      maxMeetings: fc.option(fc.integer({ min: 1, max: 20 }), { nil: undefined }),
      maxMinutes: fc.option(amount, { nil: undefined }),
      weekdays: fc.option(weekdays, { nil: undefined }),
    })
    .map((b) => opt({ kind: 'daily-limit' as const, ...b })),
  amount.map((minutes) => ({ kind: 'gap' as const, minutes })),
  amount.map((minutes) => ({ kind: 'notice' as const, minutes })),
  amount.map((minutes) => ({ kind: 'max-length' as const, minutes })),
) as fc.Arbitrary<RuleBody>;

const subject = fc.constantFrom(
  { kind: 'speaker' as const },
  { kind: 'person' as const, id: 'maren' },
  { kind: 'room' as const, id: 'tejo' },
  { kind: 'group' as const, id: 'data-team' },
);

const rule: fc.Arbitrary<Rule> = fc
  .record({ subject, strength: fc.constantFrom('hard', 'preference' as const), body })
  .filter((r) => ruleSchema.safeParse(r).success);

describe('round trip over generated rules', () => {
  it('parseRule(describeRule(rule)) gives the rule back', () => {
    fc.assert(
      fc.property(rule, (r) => {
        const sentence = describeRule(r);
        const back = parseRule(sentence, CTX);
        expect(back, sentence).toEqual({ ok: true, rule: r, text: sentence });
      }),
      { numRuns: 400, seed: 5545 },
    );
  });
});
