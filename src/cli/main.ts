import { readFileSync } from 'node:fs';
import { normalizeError } from '../errors.ts';
import { type CliIo, defaultIo, UsageError } from './io.ts';

/** A CLI verb: a module under `src/cli/commands/` exporting `command`. */
export interface CliCommand {
  /** The verb typed after `slotwright`. */
  readonly name: string;
  /** One line for the help listing. */
  readonly summary: string;
  /** Full usage text shown by `slotwright <verb> --help`. */
  readonly usage: string;
  /** Runs the verb; returns the process exit code. Throws UsageError for bad arguments. */
  run(args: readonly string[], io: CliIo): Promise<number>;
}

/** Every verb, loaded lazily so one verb's dependencies do not slow the others. */
const COMMANDS: Readonly<Record<string, { summary: string; load: () => Promise<{ command: CliCommand }> }>> =
  {
    // one line per verb; keep alphabetical
    book: { summary: 'book a time directly (admins and scripts)', load: () => import('./commands/book.ts') },
    busy: { summary: 'show the busy time of one calendar feed', load: () => import('./commands/busy.ts') },
    cancel: { summary: 'cancel a booking or release a hold', load: () => import('./commands/cancel.ts') },
    check: { summary: 'validate a workspace folder', load: () => import('./commands/check.ts') },
    console: { summary: 'chat in the terminal (pipes work)', load: () => import('./commands/console.ts') },
    meet: { summary: 'propose and rank meeting times', load: () => import('./commands/meet.ts') },
    rule: {
      summary: 'read a rule in plain words and show its structure',
      load: () => import('./commands/rule.ts'),
    },
    start: { summary: 'run the chat app (Slack or console)', load: () => import('./commands/start.ts') },
    subscription: {
      summary: "make a private calendar address of a person's or room's bookings",
      load: () => import('./commands/subscription.ts'),
    },
    week: { summary: 'plan a week of recurring meetings together', load: () => import('./commands/week.ts') },
  };

function version(): string {
  const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as {
    version: string;
  };
  return pkg.version;
}

function help(): string {
  const lines = Object.entries(COMMANDS).map(([name, c]) => `  ${name.padEnd(10)} ${c.summary}`);
  return [
    'slotwright: find meeting times for groups, book them without collisions, plan a week of recurring meetings.',
    '',
    'Usage: slotwright <verb> [options]',
    '',
    'Verbs:',
    ...lines,
    '',
    'Options:',
    '  --help     show help (also after a verb: slotwright meet --help)',
    '  --version  show the version',
  ].join('\n');
}

/** Entry point of the CLI; returns the exit code (0 ok, 1 failure, 2 bad arguments, 3 nothing fits). */
export async function runCli(argv: readonly string[], io: CliIo = defaultIo()): Promise<number> {
  const [verb, ...rest] = argv;
  if (verb === undefined || verb === '--help' || verb === '-h' || verb === 'help') {
    io.out(help());
    return 0;
  }
  if (verb === '--version' || verb === '-V') {
    io.out(version());
    return 0;
  }
  const entry = COMMANDS[verb];
  if (entry === undefined) {
    io.err(`slotwright: unknown verb '${verb}'; run 'slotwright --help' for the list`);
    return 2;
  }
  const { command } = await entry.load();
  if (rest.includes('--help') || rest.includes('-h')) {
    io.out(command.usage);
    return 0;
  }
  try {
    return await command.run(rest, io);
  } catch (error) {
    if (error instanceof UsageError) {
      io.err(`slotwright ${verb}: ${error.message}`);
      return 2;
    }
    const e = normalizeError(error);
    io.err(`slotwright ${verb}: ${e.message} [${e.code}]`);
    return 1;
  }
}
