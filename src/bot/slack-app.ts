import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { App, HTTPReceiver, LogLevel } from '@slack/bolt';
import type { ChatTransport } from '../app/ports.ts';
import { normalizeError } from '../errors.ts';
import type { Conversation } from './conversation.ts';
import { registerListeners } from './listeners/index.ts';
import { userMessage } from './messages.ts';
import { verifySlackRequest } from './signature.ts';
import { type BotDeps, ChatPeople, type ChatWebApi } from './slack-adapter.ts';
import { SlackChatTransport } from './slack-chat-transport.ts';

/** How the app reaches the platform: Socket Mode, or HTTP with request signatures. */
export type SlackConnection =
  | { readonly mode: 'socket'; readonly appToken: string }
  | {
      readonly mode: 'http';
      readonly signingSecret: string;
      /** Port to listen on; 0 picks a free one. @default 3000 */
      readonly port?: number;
      /** Interface to listen on. @default '0.0.0.0' */
      readonly host?: string;
    };

/** Options of createSlackApp. */
export interface SlackAppOptions {
  readonly botToken: string;
  readonly connection: SlackConnection;
  readonly conversation: Conversation;
  /** Serves `/feeds/…` (subscription calendars) on the same HTTP server, before the signature check. @default none */
  readonly feeds?: (req: IncomingMessage, res: ServerResponse) => void;
  /** Web API base URL (proxies, loopback stubs in tests). @default 'https://slack.com/api/' */
  readonly slackApiUrl?: string;
  /** Current instant in epoch ms. @default Date.now */
  readonly now?: () => number;
  /** Where operator logs go. @default stderr */
  readonly log?: (text: string) => void;
}

/** A started chat app. */
export interface RunningSlackApp {
  /** The port the HTTP endpoint listens on (HTTP mode only). */
  readonly port: number | undefined;
  /** Posts as the app outside a request (scheduled jobs such as the weekly plan). */
  readonly chat: ChatTransport;
  stop(): Promise<void>;
}

/** Most a request body may hold; the platform's payloads are far smaller. */
const BODY_LIMIT = 1_000_000;

function readBody(req: IncomingMessage): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on('data', (c: Buffer) => {
      size += c.length;
      if (size > BODY_LIMIT) {
        reject(new Error('request body too large'));
        req.destroy();
      } else chunks.push(c);
    });
    req.on('end', () => resolve(Buffer.concat(chunks)));
    req.on('error', reject);
  });
}

function header(req: IncomingMessage, name: string): string | undefined {
  const v = req.headers[name];
  return Array.isArray(v) ? v[0] : v;
}

/**
 * Builds the Bolt app with every listener and starts it. In HTTP mode our own signature check runs
 * in front of Bolt's request handling (Bolt's is switched off, so there is exactly one check, the one
 * tested against the platform's published example).
 */
export async function startSlackApp(options: SlackAppOptions): Promise<RunningSlackApp> {
  const now = options.now ?? Date.now;
  const log = options.log ?? ((t: string) => process.stderr.write(`${t}\n`));
  const clientOptions = options.slackApiUrl === undefined ? {} : { slackApiUrl: options.slackApiUrl };
  const deps: BotDeps = {
    conversation: options.conversation,
    now,
    log,
    people: new ChatPeople(options.conversation),
  };
  const logLevel = LogLevel.ERROR;

  let app: App;
  let receiver: HTTPReceiver | undefined;
  if (options.connection.mode === 'socket') {
    app = new App({
      token: options.botToken,
      appToken: options.connection.appToken,
      socketMode: true,
      clientOptions,
      logLevel,
      extendedErrorHandler: true,
    });
  } else {
    receiver = new HTTPReceiver({
      signingSecret: options.connection.signingSecret,
      signatureVerification: false,
      logLevel,
    });
    app = new App({ token: options.botToken, receiver, clientOptions, logLevel, extendedErrorHandler: true });
  }
  registerListeners(app, deps);
  const onError = async ({ error, body, context }: ErrorArgs): Promise<void> => {
    // The one error handler of the chat entry point: log the code, tell the person in plain words.
    const e = normalizeError(error.original ?? error);
    log(`slack: ${e.code}: ${e.message}`);
    const user = userOf(body);
    if (user === undefined) return;
    try {
      await (app.client as unknown as ChatWebApi).chat.postMessage({
        channel: user,
        text: `${userMessage(e)} [${e.code}]`,
        ...(typeof context.botToken === 'string' ? { token: context.botToken } : {}),
      });
    } catch (sendError) {
      log(`slack: could not report an error to ${user}: ${normalizeError(sendError).message}`);
    }
  };
  // With extendedErrorHandler Bolt passes { error, body, context }; its typings only know the short form.
  app.error(onError as never);

  const chat = new SlackChatTransport(app.client as unknown as ChatWebApi);
  if (receiver === undefined || options.connection.mode !== 'http') {
    await app.start();
    return { port: undefined, chat, stop: async () => void (await app.stop()) };
  }
  const secret = options.connection.signingSecret;
  const bolt = receiver;
  const feeds = options.feeds;
  const server: Server = createServer((req: IncomingMessage, res: ServerResponse) => {
    // Calendar clients fetch subscription feeds with a token in the path; they carry no chat signature.
    if (feeds !== undefined && (req.url ?? '').startsWith('/feeds/')) {
      feeds(req, res);
      return;
    }
    void (async () => {
      let raw: Buffer;
      try {
        raw = await readBody(req);
      } catch {
        res.writeHead(413).end();
        return;
      }
      const text = raw.toString('utf8');
      const check = verifySlackRequest(
        secret,
        {
          signature: header(req, 'x-slack-signature'),
          timestamp: header(req, 'x-slack-request-timestamp'),
          rawBody: text,
        },
        Math.floor(now() / 1000),
      );
      if (!check.ok) {
        log(`slack: refused a request to ${req.url}: ${check.issues[0]?.message ?? 'bad signature'}`);
        res.writeHead(401).end();
        return;
      }
      (req as IncomingMessage & { rawBody?: Buffer }).rawBody = raw;
      try {
        bolt.requestListener(req, res);
      } catch {
        // Bolt throws for paths it does not serve.
        res.writeHead(404).end();
      }
    })();
  });
  const connection = options.connection;
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(connection.port ?? 3000, connection.host ?? '0.0.0.0', () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  return {
    port,
    chat,
    stop: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}

/** What Bolt passes to the error handler when extendedErrorHandler is on. */
interface ErrorArgs {
  readonly error: Error & { readonly original?: unknown };
  readonly body: unknown;
  readonly context: { readonly botToken?: unknown };
}

function userOf(body: unknown): string | undefined {
  const b = body as { user?: { id?: unknown }; user_id?: unknown; event?: { user?: unknown } } | undefined;
  const id = b?.user?.id ?? b?.user_id ?? b?.event?.user;
  return typeof id === 'string' ? id : undefined;
}
