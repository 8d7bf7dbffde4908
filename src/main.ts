/**
 * The one composition root: reads the environment, loads the workspace, wires the real adapters and
 * starts the chat app (Slack when tokens are set) or the terminal console.
 */
import { randomBytes, randomUUID } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { hostname } from 'node:os';
import { join } from 'node:path';
import type { Readable } from 'node:stream';
import pg from 'pg';
import { z } from 'zod';
import { BookingService } from './app/book.ts';
import type { ChatTransport, FairnessLedger } from './app/ports.ts';
import {
  DefaultSlotwrightService,
  feedBusyOf,
  fileInviteOutbox,
  type ServiceOptions,
  type ServicePerson,
} from './app/service.ts';
import { SolvePool } from './app/solve-pool.ts';
import { startWeekPlanPosting, type WeekPostCoordination } from './app/week-post.ts';
import { runConsole } from './bot/console.ts';
import { Conversation } from './bot/conversation.ts';
import type { RunningSlackApp, SlackConnection } from './bot/slack-app.ts';
import {
  type FeedOwner,
  loadSecretKey,
  newSubscriptionToken,
  subscriptionHandler,
} from './calendar/index.ts';
import { loadWorkspace, type Workspace } from './config/index.ts';
import { normalizeError, type Result, SlotwrightError } from './errors.ts';
import {
  type HoldReleaser,
  type HoldSweeper,
  PgCronRunCoordinator,
  startHoldSweeper,
  type WeekPostJob,
} from './jobs/index.ts';
import {
  openStore,
  parseStoreLocation,
  SecretBox,
  SqlBookingStore,
  SqlFeedStateStore,
  SqlLedgerStore,
  SqlRuleStore,
  SqlWorkspaceStore,
} from './store/index.ts';

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
    SLOTWRIGHT_DATABASE_URL: z.preprocess(blankToUndefined, z.string().optional()),
    SLOTWRIGHT_SECRET_KEY: z.preprocess(blankToUndefined, z.string().optional()),
    SLOTWRIGHT_TOKEN_KEY: z.preprocess(
      blankToUndefined,
      z.string().min(16, 'must be at least 16 characters').optional(),
    ),
    SLOTWRIGHT_INVITES_DIR: z.preprocess(blankToUndefined, z.string().optional()),
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

/** Options of openService. */
export interface OpenServiceOptions {
  /** Current instant, epoch ms, for loading; and the clock the use cases read. */
  readonly now: () => number;
  /** SLOTWRIGHT_DATABASE_URL: a postgres:// URL, a SQLite path or :memory:. @default data/slotwright.sqlite */
  readonly database?: string;
  /** Solve on worker threads. @default true */
  readonly pool?: boolean;
  /** Key signing option tokens; replicas must share it. @default a random key per process */
  readonly tokenKey?: string;
  /** SLOTWRIGHT_SECRET_KEY (32 bytes, base64): seals feed addresses added in chat. @default a key generated into data/secret.key */
  readonly secretKey?: string;
  /** Feed fetcher override (tests). @default the safe fetcher of src/calendar */
  readonly fetchFeed?: ServiceOptions['fetchFeed'];
  /** SLOTWRIGHT_INVITES_DIR: where weekly invites of a locked week are written for download. @default data/invites */
  readonly invitesDir?: string;
  /** Search time of a week plan in ms. @default 5000 */
  readonly weekTimeMs?: number;
  /** Least time between week-plan progress reports in ms. @default 1000 */
  readonly weekProgressMs?: number;
}

/** A service with the adapters it opened, closed together. */
export interface OpenedService {
  readonly service: DefaultSlotwrightService;
  /** The worker pool the service solves on, when there is one. */
  readonly pool: SolvePool | undefined;
  /** The store's holds, for the hold sweeper. */
  readonly holds: HoldReleaser;
  /** Fairness history, for the weekly post. */
  readonly fairness: FairnessLedger;
  /** Serves `GET /feeds/<token>.ics`: one person's or room's bookings as a subscription calendar. */
  readonly feeds: (req: IncomingMessage, res: ServerResponse) => void;
  /** Makes a new subscription token for a person or room (only its hash is stored); returns the token. */
  issueFeedToken(owner: FeedOwner): Promise<string>;
  close(): Promise<void>;
}

/** Loads a workspace folder, opens the store and builds the service; a bad folder throws config_invalid. */
export async function openService(workspaceDir: string, options: OpenServiceOptions): Promise<OpenedService> {
  const ws = loadWorkspace(workspaceDir, { now: options.now() });
  if (!ws.ok) {
    throw new SlotwrightError('config_invalid', ws.issues.map((i) => i.message).join('\n'), {
      details: { issues: ws.issues },
    });
  }
  const handle = await openStore(parseStoreLocation(options.database, process.cwd()));
  const bookingStore = new SqlBookingStore(handle);
  const ledger = new SqlLedgerStore(handle);
  const bookings = new BookingService({
    store: bookingStore,
    audit: ledger,
    busyOf: feedBusyOf(ws.value),
    now: options.now,
    newId: randomUUID,
    admins: ws.value.admins,
  });
  const pool = options.pool === false ? undefined : new SolvePool();
  // Week plans are not sealed; the box only matters for feed addresses, which need the real key.
  const workspaceStore = new SqlWorkspaceStore(
    handle,
    new SecretBox(options.secretKey ?? randomBytes(32).toString('base64')),
  );
  const service = new DefaultSlotwrightService({
    workspace: ws.value,
    deliveries: ledger,
    bookings,
    bookingStore,
    rules: new SqlRuleStore(handle),
    tokenKey: options.tokenKey ?? randomBytes(32).toString('hex'),
    feedStates: new SqlFeedStateStore(handle),
    clock: options.now,
    weekPlans: workspaceStore,
    fairness: ledger,
    inviteOutbox: fileInviteOutbox(options.invitesDir ?? join(process.cwd(), 'data', 'invites')),
    inviteDomain: 'slotwright.invalid',
    ...(options.weekTimeMs === undefined ? {} : { weekTimeMs: options.weekTimeMs }),
    ...(options.weekProgressMs === undefined ? {} : { weekProgressMs: options.weekProgressMs }),
    ...(options.secretKey === undefined ? {} : { chatFeeds: workspaceStore }),
    ...(options.fetchFeed === undefined ? {} : { fetchFeed: options.fetchFeed }),
    ...(pool === undefined ? {} : { pool }),
  });
  const roomNames = new Map(ws.value.rooms.map((r) => [r.id, r.name ?? r.id]));
  const feeds = subscriptionHandler({
    lookup: (token) => ledger.lookupSubscriptionToken(token),
    // a booking record already has every field a feed booking needs
    bookingsOf: (owner, window) => bookingStore.listFor(owner, window, ['booked', 'cancelled']),
    now: options.now,
    feed: {
      domain: 'slotwright.invalid',
      name: ws.value.name ?? 'slotwright',
      roomName: (id) => roomNames.get(id),
    },
  });
  const owners = {
    person: new Set(ws.value.people.map((p) => p.id)),
    room: new Set(ws.value.rooms.map((r) => r.id)),
  };
  return {
    service,
    pool,
    holds: bookingStore,
    fairness: ledger,
    feeds,
    issueFeedToken: async (owner) => {
      if (!owners[owner.kind].has(owner.id))
        throw new SlotwrightError('not_found', `the workspace has no ${owner.kind} '${owner.id}'`);
      const token = newSubscriptionToken();
      await ledger.saveSubscriptionToken(token, owner, options.now());
      return token;
    },
    close: async () => {
      await pool?.close();
      await handle.close();
    },
  };
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
  /** Store location (SLOTWRIGHT_DATABASE_URL). @default data/slotwright.sqlite */
  readonly database?: string;
  /** SLOTWRIGHT_SECRET_KEY, for feeds added in the console. @default none */
  readonly secretKey?: string;
  /** Where weekly invites are written. @default SLOTWRIGHT_INVITES_DIR, else data/invites */
  readonly invitesDir?: string;
}

/** Opens the terminal console over a workspace folder. */
export async function runConsoleOver(options: ConsoleRunOptions): Promise<number> {
  const now = options.nowMs === undefined ? () => Date.now() : () => options.nowMs!;
  const invitesDir = options.invitesDir ?? process.env.SLOTWRIGHT_INVITES_DIR;
  const opened = await openService(options.workspaceDir, {
    now,
    ...(invitesDir === undefined || invitesDir === '' ? {} : { invitesDir }),
    ...(options.database === undefined ? {} : { database: options.database }),
    ...(options.secretKey === undefined ? {} : { secretKey: options.secretKey }),
  });
  try {
    const service = opened.service;
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
    return await runConsole({
      conversation: new Conversation(service),
      actor,
      input: options.input,
      out: options.out,
      isTty: options.isTty,
      now,
      log: options.err,
    });
  } finally {
    await opened.close();
  }
}

/** Starts the Slack app from a parsed environment; resolves once it is listening. */
export async function startSlackFromEnv(
  env: AppEnv & { SLACK_BOT_TOKEN: string },
  log: (text: string) => void,
): Promise<RunningSlackApp> {
  const opened = await openService(env.SLOTWRIGHT_WORKSPACE, {
    now: () => Date.now(),
    ...(env.SLOTWRIGHT_INVITES_DIR === undefined ? {} : { invitesDir: env.SLOTWRIGHT_INVITES_DIR }),
    ...(env.SLOTWRIGHT_DATABASE_URL === undefined ? {} : { database: env.SLOTWRIGHT_DATABASE_URL }),
    // Replicas behind a load balancer must share the key; one process can make its own.
    ...(env.SLOTWRIGHT_TOKEN_KEY === undefined ? {} : { tokenKey: env.SLOTWRIGHT_TOKEN_KEY }),
    // Without SLOTWRIGHT_SECRET_KEY a key is generated once into data/secret.key (with a warning), so
    // feed addresses sealed today still open after a restart.
    secretKey: loadSecretKey({
      env: { SLOTWRIGHT_SECRET_KEY: env.SLOTWRIGHT_SECRET_KEY },
      dataDir: 'data',
      warn: log,
    }).toString('base64'),
  });
  const connection: SlackConnection =
    env.SLACK_APP_TOKEN !== undefined
      ? { mode: 'socket', appToken: env.SLACK_APP_TOKEN }
      : { mode: 'http', signingSecret: env.SLACK_SIGNING_SECRET!, port: env.PORT };
  // Loaded only here, so the console does not pay for the Slack libraries at start.
  const { startSlackApp } = await import('./bot/slack-app.ts');
  const running = await startSlackApp({
    botToken: env.SLACK_BOT_TOKEN,
    connection,
    conversation: new Conversation(opened.service),
    feeds: opened.feeds,
    log,
    ...(env.SLACK_API_URL === undefined ? {} : { slackApiUrl: env.SLACK_API_URL }),
  });
  const jobs = startBackgroundJobs({
    workspace: opened.service.workspace,
    chat: running.chat,
    holds: opened.holds,
    fairness: opened.fairness,
    ...(env.SLOTWRIGHT_DATABASE_URL === undefined ? {} : { database: env.SLOTWRIGHT_DATABASE_URL }),
    now: () => Date.now(),
    log,
  });
  return {
    port: running.port,
    chat: running.chat,
    stop: async () => {
      await jobs.stop();
      await running.stop();
      await opened.close();
    },
  };
}

/** What the background jobs need from the running app. */
export interface BackgroundJobsOptions {
  readonly workspace: Workspace;
  /** The chat transport of the running app; without it there is nothing to post to. @default undefined */
  readonly chat?: Pick<ChatTransport, 'post'>;
  /** The store's holds, released by the sweeper. */
  readonly holds: HoldReleaser;
  /** Fairness history weighed by the weekly plan. @default undefined */
  readonly fairness?: FairnessLedger;
  /** SLOTWRIGHT_DATABASE_URL; a postgres:// URL makes replicas coordinate. @default SQLite (one process) */
  readonly database?: string;
  /** Opens the PostgreSQL pool the coordinators use (tests pass a stand-in). @default a pg Pool on `database` */
  readonly openPgPool?: (url: string) => import('pg').Pool;
  /** Names this replica in the coordinators' records. @default host name and process id */
  readonly replica?: string;
  readonly now: () => number;
  readonly log: (text: string) => void;
}

/** The running background jobs and how they were wired. */
export interface BackgroundJobs {
  /** The weekly post, when the workspace has post settings and chat is configured. */
  readonly weekPost: WeekPostJob | undefined;
  /** How replicas agree on the weekly post (and the sweeper's ticks). */
  readonly coordination: WeekPostCoordination['kind'];
  readonly holdSweeper: HoldSweeper;
  stop(): Promise<void>;
}

/** True for a SLOTWRIGHT_DATABASE_URL that names PostgreSQL. */
export function isPostgresUrl(url: string | undefined): url is string {
  return url !== undefined && /^postgres(ql)?:\/\//i.test(url);
}

/**
 * Starts the scheduled jobs of a running chat app: the weekly week-plan post (when the workspace sets
 * `weekPlan.post` and chat is configured) and the hold sweeper. With PostgreSQL both run once across
 * replicas (advisory lock for the post, cron-slot rows for the sweeper); with SQLite there is one process.
 */
export function startBackgroundJobs(options: BackgroundJobsOptions): BackgroundJobs {
  const replica = options.replica ?? `${hostname()}:${process.pid}`;
  let pgPool: import('pg').Pool | undefined;
  const coordination: WeekPostCoordination = (() => {
    if (!isPostgresUrl(options.database)) return { kind: 'single' };
    pgPool = (options.openPgPool ?? defaultPgPool)(options.database);
    return { kind: 'postgres', pool: pgPool, replica };
  })();
  const settings = options.workspace.weekPost;
  const weekPost =
    settings === undefined || options.chat === undefined
      ? undefined
      : startWeekPlanPosting(
          settings,
          {
            workspace: () => options.workspace,
            chat: options.chat,
            now: options.now,
            clock: () => performance.now(),
            ...(options.fairness === undefined ? {} : { fairness: options.fairness }),
          },
          coordination,
          {
            onOutcome: (outcome, request) =>
              options.log(`week post ${request.isoWeek} to ${request.channel}: ${outcome}`),
            onError: (error, request) =>
              options.log(`week post ${request.isoWeek} failed: ${error.code}: ${error.message}`),
          },
        );
  if (weekPost !== undefined)
    options.log(`week plan posts ${settings!.post} (${settings!.zone}) to ${settings!.channel}`);
  const holdSweeper = startHoldSweeper(options.holds, options.now, {
    ...(coordination.kind === 'postgres'
      ? { runCoordinator: new PgCronRunCoordinator(coordination.pool, { replica, clock: options.now }) }
      : {}),
    onError: (error) => options.log(`hold sweeper: ${error.code}: ${error.message}`),
  });
  return {
    weekPost,
    coordination: coordination.kind,
    holdSweeper,
    stop: async () => {
      await weekPost?.stop();
      await holdSweeper.stop();
      await pgPool
        ?.end()
        .catch((error: unknown) => options.log(`jobs pool: ${normalizeError(error).message}`));
    },
  };
}

function defaultPgPool(url: string): import('pg').Pool {
  // Two connections are plenty for once-a-minute and once-a-week jobs.
  return new pg.Pool({ connectionString: url, max: 2 });
}
