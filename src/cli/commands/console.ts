import { Temporal } from 'temporal-polyfill';
import { runConsoleOver } from '../../main.ts';
import { parseVerbArgs, stringOption } from '../args.ts';
import { UsageError } from '../io.ts';
import type { CliCommand } from '../main.ts';

/** Reads `--now` as an ISO 8601 instant with an offset or Z. */
export function parseNow(value: string | undefined): number | undefined {
  if (value === undefined) return undefined;
  try {
    return Temporal.Instant.from(value).epochMilliseconds;
  } catch {
    throw new UsageError(
      `--now takes an instant with a zone offset, e.g. 2026-12-07T09:00:00Z, got '${value}'`,
    );
  }
}

/** `slotwright console`: a chat in the terminal over any workspace folder. */
export const command: CliCommand = {
  name: 'console',
  summary: 'chat with slotwright in the terminal (one command per line; pipes work)',
  usage: [
    'Usage: slotwright console --workspace <dir> [--as <person-id>] [--now <instant>]',
    '',
    'Opens a chat in the terminal with the same answers as in Slack. Buttons become numbered',
    'choices: type the number. Reads one command per line from standard input and ends at end of',
    'input, so it can be scripted: printf "meet 30m with @teo tomorrow\\n1\\n" | slotwright console ...',
    '',
    '  --workspace <dir>   workspace folder (holds workspace.yaml)',
    '  --as <person-id>    who you are (default: the first admin)',
    '  --now <instant>     pretend it is this instant, e.g. 2026-12-07T09:00:00Z (default: now)',
  ].join('\n'),
  async run(args, io) {
    const { values } = parseVerbArgs(args, {
      workspace: { type: 'string' },
      as: { type: 'string' },
      now: { type: 'string' },
    });
    const workspaceDir = stringOption(values, 'workspace', true);
    const as = stringOption(values, 'as');
    const nowMs = parseNow(stringOption(values, 'now'));
    return runConsoleOver({
      workspaceDir,
      ...(as === undefined ? {} : { as }),
      ...(nowMs === undefined ? {} : { nowMs }),
      input: process.stdin,
      out: io.out,
      err: io.err,
      isTty: process.stdin.isTTY === true && process.stdout.isTTY === true,
      ...(io.env.SLOTWRIGHT_DATABASE_URL === undefined ? {} : { database: io.env.SLOTWRIGHT_DATABASE_URL }),
      ...(io.env.SLOTWRIGHT_SECRET_KEY === undefined ? {} : { secretKey: io.env.SLOTWRIGHT_SECRET_KEY }),
    });
  },
};
