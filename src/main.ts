/**
 * The one composition root: reads the environment, loads the workspace, wires the real adapters and
 * starts the chat app (Slack when tokens are set) or the terminal console.
 */
import type { Readable } from 'node:stream';
import { z } from 'zod';
import { DefaultSlotwrightService, type ServicePerson } from './app/service.ts';
import { runConsole } from './bot/console.ts';
import { Conversation } from './bot/conversation.ts';
import { InMemoryDeliveryLog } from './bot/in-memory-delivery-log.ts';
import { type RunningSlackApp, type SlackConnection, startSlackApp } from './bot/slack-app.ts';
import { loadWorkspace } from './config/index.ts';
import { type Result, SlotwrightError } from './errors.ts';

/** The workspace folder used when SLOTWRIGHT_WORKSPACE is not set. */
export const DEFAULT_WORKSPACE = 'fixtures/demo';

const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);

/** The environment the chat app reads; parsed once at start, a bad value stops startup. */
export const envSchema = z
  .object({
    SLACK_BOT_TOKEN: z.preprocess(
      blankToUndefined,
      z.string().startsWith('xoxb-', 'must start with xoxb-').optional(),
    ),
    SLACK_APP_TOKEN: z.preprocess(
      blankToUndefined,
      z.string().startsWith('xapp-', 'must start with xapp-').optional(),
    ),
    SLACK_SIGNING_SECRET: z.preprocess(blankToUndefined, z.string().min(8, 'looks too short').optional()),
    SLACK_API_URL: z.preprocess(blankToUndefined, z.url({ protocol: /^https?$/ }).optional()),
    PORT: z.preprocess(
      blankToUndefined,
      z.coerce.number().int('must be a whole number').min(0).max(65535).default(3000),
    ),
    SLOTWRIGHT_WORKSPACE: z.preprocess(blankToUndefined, z.string().default(DEFAULT_WORKSPACE)),
  })
  .superRefine((env, ctx) => {
    if (
      env.SLACK_BOT_TOKEN === undefined &&
      (env.SLACK_APP_TOKEN !== undefined || env.SLACK_SIGNING_SECRET !== undefined)
    )
      ctx.addIssue({
        code: 'custom',
        path: ['SLACK_BOT_TOKEN'],
        message: 'is needed when other SLACK_ variables are set',
      });
    if (
      env.SLACK_BOT_TOKEN !== undefined &&
      env.SLACK_APP_TOKEN === undefined &&
      env.SLACK_SIGNING_SECRET === undefined
    )
      ctx.addIssue({
        code: 'custom',
        path: ['SLACK_SIGNING_SECRET'],
        message: 'is needed in HTTP mode (or set SLACK_APP_TOKEN for Socket Mode)',
      });
  });

/** The parsed environment. */
export type AppEnv = z.infer<typeof envSchema>;

/** Parses the environment; each issue names the variable and what is wrong with it. */
export function parseEnv(env: Readonly<Record<string, string | undefined>>): Result<AppEnv> {
  const r = envSchema.safeParse(env);
  if (r.success) return { ok: true, value: r.data };
  return {
    ok: false,
    issues: r.error.issues.map((i) => ({
      code: 'config_invalid',
      path: i.path.map((p) => (typeof p === 'number' ? p : String(p))),
      message: `${i.path.join('.')} ${i.message}`,
    })),
  };
}

/** Loads a workspace folder and builds the service over it; a bad folder throws config_invalid. */
export function openService(workspaceDir: string, nowMs: number): DefaultSlotwrightService {
  const ws = loadWorkspace(workspaceDir, { now: nowMs });
  if (!ws.ok) {
    throw new SlotwrightError('config_invalid', ws.issues.map((i) => i.message).join('\n'), {
      details: { issues: ws.issues },
    });
  }
  return new DefaultSlotwrightService({ workspace: ws.value, deliveries: new InMemoryDeliveryLog() });
}

/** Options of runConsoleOver. */
export interface ConsoleRunOptions {
  readonly workspaceDir: string;
  /** Person id to act as. @default the first admin */
  readonly as?: string;
  /** A fixed "now" in epoch ms (for scripts and tests). @default the real clock */
  readonly nowMs?: number;
  readonly input: Readable;
  readonly out: (text: string) => void;
  readonly err: (text: string) => void;
  readonly isTty: boolean;
}

/** Opens the terminal console over a workspace folder. */
export async function runConsoleOver(options: ConsoleRunOptions): Promise<number> {
  const now = options.nowMs === undefined ? () => Date.now() : () => options.nowMs!;
  const service = openService(options.workspaceDir, now());
  let actor: ServicePerson;
  if (options.as === undefined) actor = service.defaultPerson();
  else {
    const p = service.person(options.as);
    if (p === undefined) {
      options.err(
        `slotwright console: --as '${options.as}' is not a person of the workspace; people: ${service.workspace.people.map((x) => x.id).join(', ')}`,
      );
      return 2;
    }
    actor = p;
  }
  return runConsole({
    conversation: new Conversation(service),
    actor,
    input: options.input,
    out: options.out,
    isTty: options.isTty,
    now,
    log: options.err,
  });
}

/** Starts the Slack app from a parsed environment; resolves once it is listening. */
export async function startSlackFromEnv(
  env: AppEnv & { SLACK_BOT_TOKEN: string },
  log: (text: string) => void,
): Promise<RunningSlackApp> {
  const service = openService(env.SLOTWRIGHT_WORKSPACE, Date.now());
  const connection: SlackConnection =
    env.SLACK_APP_TOKEN !== undefined
      ? { mode: 'socket', appToken: env.SLACK_APP_TOKEN }
      : { mode: 'http', signingSecret: env.SLACK_SIGNING_SECRET!, port: env.PORT };
  return startSlackApp({
    botToken: env.SLACK_BOT_TOKEN,
    connection,
    conversation: new Conversation(service),
    log,
    ...(env.SLACK_API_URL === undefined ? {} : { slackApiUrl: env.SLACK_API_URL }),
  });
}
