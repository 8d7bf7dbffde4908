import { type CompareOptions, compareRules, type RuleComparison } from './compare-rules.ts';
import { formatClock, formatDuration } from './describe-rule.ts';
import type { Rule } from './rule.ts';

/** One labelled line of a rule's structured form, for the echo-back before saving. */
export interface RuleField {
  readonly label: string;
  readonly value: string;
}

/** What to show before saving a rule: the sentence, the structure, related rules and the question. */
export interface RuleConfirmation {
  /** The normalized sentence. */
  readonly text: string;
  readonly rule: Rule;
  /** The structured form as labelled lines, in a fixed order. */
  readonly fields: readonly RuleField[];
  /** Existing rules this one repeats, overlaps or contradicts. */
  readonly related: readonly RuleComparison[];
  /** The yes/no question to put to the person. */
  readonly question: string;
}

const DAY_SHORT = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'] as const;

function days(weekdays: readonly number[] | undefined): string {
  return weekdays === undefined ? 'every day' : weekdays.map((d) => DAY_SHORT[d - 1]).join(', ');
}

/** The structured form of a rule as labelled lines. */
export function ruleFields(rule: Rule): RuleField[] {
  const s = rule.subject;
  const fields: RuleField[] = [
    { label: 'for', value: s.kind === 'speaker' ? 'you' : `${s.kind} ${s.id}` },
    {
      label: 'strength',
      value: rule.strength === 'hard' ? 'hard rule (must hold)' : 'preference (would like)',
    },
  ];
  const b = rule.body;
  const add = (label: string, value: string): void => {
    fields.push({ label, value });
  };
  switch (b.kind) {
    case 'window':
    case 'keep-free':
    case 'dates': {
      add(
        'kind',
        b.kind === 'window'
          ? `time window (${b.mode === 'avoid' ? 'keep meetings out' : 'meetings only here'})`
          : b.kind === 'keep-free'
            ? 'keep free'
            : `dates (${b.mode === 'avoid' ? 'keep meetings out' : 'meetings only here'})`,
      );
      if (b.kind === 'dates') add('dates', b.from === b.to ? b.from : `${b.from} to ${b.to} (both included)`);
      else add('days', days(b.weekdays));
      const t = b.times;
      add(
        'hours',
        t === undefined ? 'all day' : 'part' in t ? t.part : `${formatClock(t.from)} to ${formatClock(t.to)}`,
      );
      add('zone', b.zone ?? 'your own zone');
      break;
    }
    case 'daily-limit':
      add('kind', 'daily limit');
      if (b.maxMeetings !== undefined) add('most meetings', String(b.maxMeetings));
      if (b.maxMinutes !== undefined) add('most meeting time', formatDuration(b.maxMinutes));
      add('days', days(b.weekdays));
      break;
    case 'gap':
      add('kind', 'gap between meetings');
      add('length', formatDuration(b.minutes));
      break;
    case 'notice':
      add('kind', 'notice before a meeting starts');
      add('length', formatDuration(b.minutes));
      break;
    case 'max-length':
      add('kind', 'longest meeting');
      add('length', formatDuration(b.minutes));
      break;
  }
  return fields;
}

/** The echo-back content shown before a rule is saved; the chat layer renders it and asks. */
export function ruleConfirmation(
  parsed: { readonly rule: Rule; readonly text: string },
  existing: readonly Rule[],
  options: CompareOptions = {},
): RuleConfirmation {
  return {
    text: parsed.text,
    rule: parsed.rule,
    fields: ruleFields(parsed.rule),
    related: compareRules(parsed.rule, existing, options),
    question: 'Save this rule?',
  };
}
