/** Where a CLI verb writes; tests pass a recording one. */
export interface CliIo {
  out(text: string): void;
  err(text: string): void;
  /** Environment variables as given to the process (parsed by the verb that needs them). */
  readonly env: Readonly<Record<string, string | undefined>>;
  /** True when stderr is a terminal (live progress is shown only then). */
  readonly isTty: boolean;
  /** Current time in epoch milliseconds. */
  now(): number;
}

/** The process's real streams and clock. */
export function defaultIo(): CliIo {
  return {
    out: (text) => process.stdout.write(`${text}\n`),
    err: (text) => process.stderr.write(`${text}\n`),
    env: process.env,
    isTty: process.stderr.isTTY === true,
    now: () => Date.now(),
  };
}

/** Thrown by a verb for bad arguments: the CLI prints the message on one line and exits 2. */
export class UsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'UsageError';
  }
}
