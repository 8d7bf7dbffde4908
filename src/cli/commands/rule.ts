import { Temporal } from 'temporal-polyfill';
import { parseRule, ruleFields } from '../../rules/index.ts';
import { isValidZone } from '../../time/index.ts';
import { parseVerbArgs, stringOption } from '../args.ts';
import { UsageError } from '../io.ts';
import type { CliCommand } from '../main.ts';

function zoneOf(value: string | undefined, env: Readonly<Record<string, string | undefined>>): string {
  if (value !== undefined) {
    if (!isValidZone(value))
      throw new UsageError(`--zone takes an IANA time-zone name such as Europe/Lisbon, got '${value}'`);
    return value;
  }
  const tz = env.TZ;
  return tz !== undefined && tz !== '' && isValidZone(tz) ? tz : 'UTC';
}

function nowOf(value: string | undefined, fallback: number): number {
  if (value === undefined) return fallback;
  try {
    return Temporal.Instant.from(value).epochMilliseconds;
  } catch {
    throw new UsageError(
      `--now takes an instant with a zone offset, e.g. 2026-12-01T12:00:00Z, got '${value}'`,
    );
  }
}

/** `slotwright rule "<sentence>"`: reads a rule in plain words and shows what it would mean. */
export const command: CliCommand = {
  name: 'rule',
  summary: 'read a rule in plain words and show its structure (nothing is saved)',
  usage: [
    'Usage: slotwright rule "<sentence>" [--zone <IANA>] [--now <instant>] [--json]',
    '',
    'Reads one rule, e.g. "no meetings before 10am" or "keep Tuesday mornings free", and prints the',
    'sentence as slotwright understood it and its structure. Nothing is saved. Exits 1 when the',
    'sentence cannot be read or is ambiguous (with the closest sentences that can be read).',
    '',
    '  --zone <IANA>     zone the rule is read in (default: $TZ when it names a zone, else UTC)',
    '  --now <instant>   read dates like "the 24th" from this instant, e.g. 2026-12-01T12:00:00Z',
    '  --json            print {"rule":...,"text":...} or {"error":...,"suggestions":[...]}',
  ].join('\n'),
  async run(args, io) {
    const { values, positionals } = parseVerbArgs(
      args,
      { zone: { type: 'string' }, now: { type: 'string' }, json: { type: 'boolean' } },
      { min: 1, max: 1, names: 'the rule sentence (quote it)' },
    );
    const zone = zoneOf(stringOption(values, 'zone'), io.env);
    const now = nowOf(stringOption(values, 'now'), io.now());
    const json = values.json === true;
    const parsed = parseRule(positionals[0]!, { zone, now });
    if (!parsed.ok) {
      const error = parsed.issues.map((i) => i.message).join('; ');
      const suggestions = [...new Set(parsed.issues.flatMap((i) => i.suggestions))];
      if (json) io.out(JSON.stringify({ error, suggestions }));
      else {
        io.err(`slotwright rule: ${error}`);
        if (suggestions.length > 0)
          io.err(`Sentences I can read: ${suggestions.map((s) => `"${s}"`).join(', ')}`);
      }
      return 1;
    }
    if (json) {
      io.out(JSON.stringify({ rule: parsed.rule, text: parsed.text }));
      return 0;
    }
    io.out(parsed.text);
    for (const f of ruleFields(parsed.rule)) io.out(`  ${f.label.padEnd(18)} ${f.value}`);
    io.out(`  ${'structure'.padEnd(18)} ${JSON.stringify(parsed.rule)}`);
    return 0;
  },
};
