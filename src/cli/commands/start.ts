import { parseEnv, runConsoleOver, startSlackFromEnv } from '../../main.ts';
import { parseVerbArgs } from '../args.ts';
import type { CliCommand } from '../main.ts';

/** `slotwright start`: the Slack app when tokens are set, else the terminal console over the demo. */
export const command: CliCommand = {
  name: 'start',
  summary: 'run the chat app (Slack when SLACK_BOT_TOKEN is set, else the terminal console)',
  usage: [
    'Usage: slotwright start',
    '',
    'With SLACK_BOT_TOKEN set, connects to Slack: Socket Mode when SLACK_APP_TOKEN is set, otherwise',
    'HTTP on PORT (default 3000) with SLACK_SIGNING_SECRET. Without chat tokens, opens the terminal',
    'console over SLOTWRIGHT_WORKSPACE (default fixtures/demo) as its first admin.',
    '',
    'Environment: SLACK_BOT_TOKEN, SLACK_APP_TOKEN, SLACK_SIGNING_SECRET, PORT, SLACK_API_URL,',
    'SLOTWRIGHT_WORKSPACE.',
  ].join('\n'),
  async run(args, io) {
    parseVerbArgs(args, {});
    const env = parseEnv(io.env);
    if (!env.ok) {
      io.err('slotwright start: the environment is not usable:');
      for (const i of env.issues) io.err(`  ${i.message}`);
      return 1;
    }
    const e = env.value;
    if (e.SLACK_BOT_TOKEN === undefined) {
      return runConsoleOver({
        workspaceDir: e.SLOTWRIGHT_WORKSPACE,
        input: process.stdin,
        out: io.out,
        err: io.err,
        isTty: process.stdin.isTTY === true && process.stdout.isTTY === true,
        ...(e.SLOTWRIGHT_DATABASE_URL === undefined ? {} : { database: e.SLOTWRIGHT_DATABASE_URL }),
        ...(e.SLOTWRIGHT_SECRET_KEY === undefined ? {} : { secretKey: e.SLOTWRIGHT_SECRET_KEY }),
      });
    }
    const running = await startSlackFromEnv({ ...e, SLACK_BOT_TOKEN: e.SLACK_BOT_TOKEN }, io.err);
    io.err(
      running.port === undefined
        ? 'slotwright: connected to Slack in Socket Mode'
        : `slotwright: listening for Slack on port ${running.port} (POST /slack/events)`,
    );
    await new Promise<void>((resolve) => {
      const stop = (): void => {
        void running.stop().then(resolve);
      };
      process.once('SIGINT', stop);
      process.once('SIGTERM', stop);
    });
    return 0;
  },
};
