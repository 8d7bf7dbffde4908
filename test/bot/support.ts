// Shared pieces of the bot tests: a small invented workspace on disk, a loopback stub of the chat
// Web API and of response_url, a client that signs requests as the platform does, and the console
// run with piped input.
import { spawn } from 'node:child_process';
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { createServer, type IncomingMessage, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse as parseQuery } from 'node:querystring';
import { signSlackRequest } from '../../src/bot/signature.ts';

/** Monday 2026-12-07 09:00 UTC: "tomorrow" is Tuesday 2026-12-08 for everyone in the test workspace. */
export const NOW = Date.UTC(2026, 11, 7, 9, 0);

/** Teo's busy time on Tuesday: 13:00-14:00 UTC (09:00-10:00 in Halifax, UTC-4 in December). */
export const TEO_BUSY = { start: Date.UTC(2026, 11, 8, 13, 0), end: Date.UTC(2026, 11, 8, 14, 0) };

const TEO_ICS = [
  'BEGIN:VCALENDAR',
  'VERSION:2.0',
  'PRODID:-//slotwright tests//EN',
  'BEGIN:VEVENT',
  'UID:teo-busy-1@saltline.example',
  'DTSTAMP:20261201T000000Z',
  'DTSTART:20261208T130000Z',
  'DTEND:20261208T140000Z',
  'SUMMARY:Private matter',
  'END:VEVENT',
  'END:VCALENDAR',
  '',
].join('\r\n');

/** Writes a four-person workspace from the invented demo cooperative into a fresh folder. */
export function writeTestWorkspace(): string {
  const dir = mkdtempSync(join(tmpdir(), 'slotwright-bot-'));
  mkdirSync(join(dir, 'feeds'));
  writeFileSync(join(dir, 'feeds', 'teo.ics'), TEO_ICS);
  writeFileSync(
    join(dir, 'workspace.yaml'),
    [
      'name: Saltline Survey Cooperative (test)',
      'zone: Europe/Lisbon',
      'grid: 15',
      'horizon: 7',
      'workingHours:',
      '  mon: ["09:00-17:00"]',
      '  tue: ["09:00-17:00"]',
      '  wed: ["09:00-17:00"]',
      '  thu: ["09:00-17:00"]',
      '  fri: ["09:00-17:00"]',
      'admins: [ines]',
      'people:',
      '  - {id: ines, name: Ines Carvalhal, email: ines@saltline.example, chat: U0DEMO006, zone: Europe/Lisbon}',
      '  - {id: teo, name: Teo Brannigan, email: teo@saltline.example, chat: U0DEMO002, zone: America/Halifax, feeds: [feeds/teo.ics]}',
      '  - {id: rui, name: Rui Teixo, email: rui@saltline.example, chat: U0DEMO007, zone: Europe/Lisbon}',
      '  - {id: lena, name: Lena Strand, email: lena@saltline.example, zone: Europe/Lisbon}',
      'rooms:',
      '  - {id: tejo, name: Tejo, capacity: 10, features: [screen, phone], zone: Europe/Lisbon}',
      'groups:',
      '  - {id: lisbon-office, members: [ines, rui, lena]}',
      '',
    ].join('\n'),
  );
  return dir;
}

/** One call the stub received. */
export interface StubCall {
  readonly method: string;
  readonly args: Record<string, unknown>;
  readonly at: number;
}

function readBody(req: IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    let s = '';
    req.setEncoding('utf8');
    req.on('data', (c: string) => {
      s += c;
    });
    req.on('end', () => resolve(s));
    req.on('error', reject);
  });
}

function parseArgs(body: string, contentType: string | undefined): Record<string, unknown> {
  if (contentType?.includes('json')) return JSON.parse(body) as Record<string, unknown>;
  const q = parseQuery(body);
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(q)) {
    const s = Array.isArray(v) ? v[0] : v;
    // The Web API client sends objects (blocks, view) as JSON strings inside the form.
    out[k] = typeof s === 'string' && /^[[{]/.test(s) ? JSON.parse(s) : s;
  }
  return out;
}

/** A loopback stand-in for the Web API (`/api/<method>`) and for response_url (`/respond/<n>`). */
export class WebApiStub {
  readonly calls: StubCall[] = [];
  readonly responses: { path: string; body: Record<string, unknown>; at: number }[] = [];
  /** users.info answers by user id. */
  readonly users = new Map<string, { email?: string; tz?: string }>();
  #server: Server | undefined;
  #ts = 1000;
  port = 0;

  async start(): Promise<void> {
    this.#server = createServer((req, res) => {
      void (async () => {
        const body = await readBody(req);
        const url = req.url ?? '/';
        if (url.startsWith('/respond/')) {
          this.responses.push({
            path: url,
            body: JSON.parse(body) as Record<string, unknown>,
            at: Date.now(),
          });
          res.writeHead(200, { 'content-type': 'text/plain' }).end('ok');
          return;
        }
        const method = url.replace(/^\/api\//, '').split('?')[0]!;
        const args = parseArgs(body, req.headers['content-type']);
        this.calls.push({ method, args, at: Date.now() });
        res.writeHead(200, { 'content-type': 'application/json' });
        res.end(JSON.stringify(this.#answer(method, args)));
      })();
    });
    await new Promise<void>((r) => this.#server!.listen(0, '127.0.0.1', () => r()));
    this.port = (this.#server.address() as AddressInfo).port;
  }

  #answer(method: string, args: Record<string, unknown>): Record<string, unknown> {
    switch (method) {
      case 'auth.test':
        return {
          ok: true,
          user_id: 'U0BOT0001',
          bot_id: 'B0BOT0001',
          team_id: 'T0TEST001',
          user: 'slotwright',
        };
      case 'chat.postMessage':
        this.#ts++;
        return { ok: true, channel: args.channel, ts: `1765000000.${this.#ts}` };
      case 'users.info': {
        const u = this.users.get(String(args.user));
        if (u === undefined) return { ok: false, error: 'user_not_found' };
        return { ok: true, user: { id: args.user, tz: u.tz, profile: { email: u.email } } };
      }
      default:
        return { ok: true };
    }
  }

  /** Calls of one Web API method. */
  callsOf(method: string): StubCall[] {
    return this.calls.filter((c) => c.method === method);
  }

  get apiUrl(): string {
    return `http://127.0.0.1:${this.port}/api/`;
  }

  responseUrl(n: number): string {
    return `http://127.0.0.1:${this.port}/respond/${n}`;
  }

  /** Waits until `check` holds (the app answers asynchronously after its ack). */
  async until(check: () => boolean, timeoutMs = 15_000): Promise<void> {
    const end = Date.now() + timeoutMs;
    while (!check()) {
      if (Date.now() > end) throw new Error('timed out waiting for the app');
      await new Promise((r) => setTimeout(r, 20));
    }
  }

  async stop(): Promise<void> {
    await new Promise<void>((r) => this.#server?.close(() => r()));
  }
}

/** What a signed POST came back with, and how long the app took to answer (the ack). */
export interface PostResult {
  readonly status: number;
  readonly text: string;
  readonly ms: number;
}

/** Sends a request signed exactly as the platform signs it (v0 HMAC-SHA256 over `v0:{ts}:{body}`). */
export async function signedPost(
  port: number,
  secret: string,
  body: string,
  options: { contentType: string; timestamp: number; headers?: Record<string, string>; signature?: string },
): Promise<PostResult> {
  const started = performance.now();
  const res = await fetch(`http://127.0.0.1:${port}/slack/events`, {
    method: 'POST',
    headers: {
      'content-type': options.contentType,
      'x-slack-request-timestamp': String(options.timestamp),
      'x-slack-signature': options.signature ?? signSlackRequest(secret, options.timestamp, body),
      ...options.headers,
    },
    body,
  });
  const text = await res.text();
  return { status: res.status, text, ms: performance.now() - started };
}

/** A slash command body as the platform sends it (form encoded). */
export function slashBody(userId: string, text: string, responseUrl: string): string {
  return new URLSearchParams({
    token: 'legacy-token-unused',
    team_id: 'T0TEST001',
    team_domain: 'saltline',
    channel_id: 'C0CHAN001',
    channel_name: 'survey',
    user_id: userId,
    user_name: userId.toLowerCase(),
    command: '/slot',
    text,
    api_app_id: 'A0APP0001',
    response_url: responseUrl,
    trigger_id: '1.2.3',
  }).toString();
}

/** A block_actions body for one button click (form encoded with a JSON `payload`). */
export function buttonBody(
  userId: string,
  button: { action_id: string; value: string },
  where: { messageTs: string; responseUrl: string },
): string {
  const payload = {
    type: 'block_actions',
    user: { id: userId, username: userId.toLowerCase(), team_id: 'T0TEST001' },
    api_app_id: 'A0APP0001',
    token: 'legacy-token-unused',
    container: { type: 'message', message_ts: where.messageTs, channel_id: 'C0CHAN001', is_ephemeral: true },
    trigger_id: '4.5.6',
    team: { id: 'T0TEST001', domain: 'saltline' },
    channel: { id: 'C0CHAN001', name: 'survey' },
    response_url: where.responseUrl,
    actions: [
      {
        ...button,
        block_id: 'b1',
        type: 'button',
        text: { type: 'plain_text', text: 'x' },
        action_ts: '1765000001.1',
      },
    ],
  };
  return new URLSearchParams({ payload: JSON.stringify(payload) }).toString();
}

/** An Events API envelope (JSON) around one event. */
export function eventBody(eventId: string, event: Record<string, unknown>): string {
  return JSON.stringify({
    token: 'legacy-token-unused',
    team_id: 'T0TEST001',
    api_app_id: 'A0APP0001',
    event,
    type: 'event_callback',
    event_id: eventId,
    event_time: Math.floor(NOW / 1000),
    authorizations: [{ team_id: 'T0TEST001', user_id: 'U0BOT0001', is_bot: true }],
  });
}

/** Every button in a list of Block Kit blocks. */
export function buttonsIn(blocks: unknown): { action_id: string; value: string; text: string }[] {
  const out: { action_id: string; value: string; text: string }[] = [];
  for (const b of (blocks as {
    type: string;
    elements?: { type: string; action_id: string; value: string; text: { text: string } }[];
  }[]) ?? []) {
    if (b.type !== 'actions') continue;
    for (const e of b.elements ?? [])
      if (e.type === 'button') out.push({ action_id: e.action_id, value: e.value, text: e.text.text });
  }
  return out;
}

/** The instants of the `<!date^seconds^…>` tokens in a text, in order. */
export function dateTokens(text: string): number[] {
  return [...text.matchAll(/<!date\^(\d+)\^/g)].map((m) => Number(m[1]) * 1000);
}

const BIN = join(import.meta.dirname, '..', '..', 'bin', 'slotwright.mjs');

/** Runs `slotwright console` with piped standard input, as a script would, on an in-memory store. */
export function runConsole(
  args: readonly string[],
  lines: readonly string[],
  env: Record<string, string> = {},
): Promise<{ code: number; out: string; err: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [BIN, 'console', ...args], {
      env: { ...process.env, SLOTWRIGHT_DATABASE_URL: ':memory:', ...env },
      stdio: ['pipe', 'pipe', 'pipe'],
    });
    let out = '';
    let err = '';
    child.stdout.on('data', (c: Buffer) => {
      out += c.toString('utf8');
    });
    child.stderr.on('data', (c: Buffer) => {
      err += c.toString('utf8');
    });
    child.on('error', reject);
    child.on('close', (code) => resolve({ code: code ?? -1, out, err }));
    child.stdin.end(`${lines.join('\n')}\n`);
  });
}
