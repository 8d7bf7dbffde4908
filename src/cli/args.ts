import { parseArgs } from 'node:util';
import { UsageError } from './io.ts';

/** Option spec as node:util parseArgs takes it. */
export type OptionSpec = Readonly<
  Record<
    string,
    { readonly type: 'string' | 'boolean'; readonly short?: string; readonly multiple?: boolean }
  >
>;

/** Parsed values: strings, booleans, or string arrays for `multiple` options. */
export type ParsedValues = Readonly<Record<string, string | boolean | (string | boolean)[] | undefined>>;

/**
 * Parses a verb's arguments strictly: unknown options and missing values become a UsageError with a
 * one-line reason, which the CLI turns into exit code 2.
 */
export function parseVerbArgs(
  args: readonly string[],
  options: OptionSpec,
  positionals: { min: number; max: number; names: string } = { min: 0, max: 0, names: '' },
): { values: ParsedValues; positionals: string[] } {
  let parsed: { values: ParsedValues; positionals: string[] };
  try {
    parsed = parseArgs({
      args: [...args],
      options: options as never,
      strict: true,
      allowPositionals: true,
    }) as never;
  } catch (error) {
    throw new UsageError(error instanceof Error ? error.message.split('\n')[0]! : String(error));
  }
  const n = parsed.positionals.length;
  if (n < positionals.min) throw new UsageError(`missing ${positionals.names}`);
  if (n > positionals.max)
    throw new UsageError(`unexpected argument '${parsed.positionals[positionals.max]}'`);
  return parsed;
}

/** Reads a string option; throws a UsageError when it is required and absent. */
export function stringOption(values: ParsedValues, name: string, required: true): string;
export function stringOption(values: ParsedValues, name: string, required?: false): string | undefined;
export function stringOption(values: ParsedValues, name: string, required = false): string | undefined {
  const v = values[name];
  if (v === undefined) {
    if (required) throw new UsageError(`--${name} is required`);
    return undefined;
  }
  if (typeof v !== 'string') throw new UsageError(`--${name} takes a value`);
  return v;
}

/** Reads a positive whole number option. */
export function intOption(values: ParsedValues, name: string, fallback: number, min = 1): number {
  const v = stringOption(values, name);
  if (v === undefined) return fallback;
  if (!/^\d+$/.test(v) || Number(v) < min)
    throw new UsageError(`--${name} takes a whole number of at least ${min}, got '${v}'`);
  return Number(v);
}

/** Splits a comma-separated list option ("ana,bo") into trimmed, non-empty items. */
export function listOption(values: ParsedValues, name: string): string[] {
  const v = stringOption(values, name);
  if (v === undefined) return [];
  const items = v.split(',').map((s) => s.trim());
  if (items.some((s) => s === ''))
    throw new UsageError(`--${name} takes a comma-separated list without empty items, got '${v}'`);
  return items;
}
