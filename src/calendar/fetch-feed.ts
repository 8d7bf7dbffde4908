import { lookup as dnsLookup } from 'node:dns/promises';
import http from 'node:http';
import https from 'node:https';
import type { LookupFunction } from 'node:net';
import zlib from 'node:zlib';
import { SlotwrightError } from '../errors.ts';
import { isIpLiteral, refusedAddressReason } from './address-policy.ts';
import { redactUrl } from './redact-url.ts';

/** One resolved address of a host. */
export interface ResolvedAddress {
  readonly address: string;
  readonly family: 4 | 6;
}

/** How feed URLs are fetched. */
export interface FetchFeedOptions {
  /** Hosts an admin allows although they resolve to internal addresses (http is allowed for them too). @default [] */
  readonly allowHosts?: readonly string[];
  /** Whole request time, redirects included. @default 10000 */
  readonly timeoutMs?: number;
  /** Largest body accepted, counted both on the wire and after gzip/deflate/br decoding. @default 15728640 */
  readonly maxBytes?: number;
  /** Redirects followed; each target is checked again. @default 3 */
  readonly maxRedirects?: number;
  /** ETag of the copy we hold, sent as If-None-Match. @default undefined */
  readonly etag?: string;
  /** Last-Modified of the copy we hold, sent as If-Modified-Since. @default undefined */
  readonly lastModified?: string;
  /** Name resolution (tests pass a fixed table). @default node:dns lookup with all addresses */
  readonly resolve?: (host: string) => Promise<readonly ResolvedAddress[]>;
}

/** Outcome of a fetch: a fresh body, or confirmation that the held copy is still current. */
export type FetchFeedResult =
  | {
      readonly status: 'ok';
      readonly body: string;
      readonly etag: string | undefined;
      readonly lastModified: string | undefined;
    }
  | { readonly status: 'not-modified' };

const DEFAULTS = {
  allowHosts: [] as readonly string[],
  timeoutMs: 10_000,
  maxBytes: 15 * 1024 * 1024,
  maxRedirects: 3,
} satisfies Partial<FetchFeedOptions>;

async function systemResolve(host: string): Promise<readonly ResolvedAddress[]> {
  const found = await dnsLookup(host, { all: true, verbatim: true });
  return found.map((a) => ({ address: a.address, family: a.family === 6 ? 6 : 4 }));
}

function refuse(url: string, why: string): SlotwrightError {
  return new SlotwrightError('feed_refused', `refused to fetch ${redactUrl(url)}: ${why}`);
}

/** Checks a URL against the policy and returns the one address to connect to. */
async function admit(
  url: URL,
  allow: ReadonlySet<string>,
  resolve: (host: string) => Promise<readonly ResolvedAddress[]>,
): Promise<ResolvedAddress> {
  const host = url.hostname.replace(/^\[|\]$/g, '').toLowerCase();
  const allowed = allow.has(host);
  if (url.protocol !== 'https:' && !(url.protocol === 'http:' && allowed))
    throw refuse(
      url.href,
      url.protocol === 'http:'
        ? 'only https is allowed (an admin can allow http for an internal host in SLOTWRIGHT_FEED_ALLOW)'
        : `the scheme ${url.protocol} is not supported`,
    );
  if (url.username !== '' || url.password !== '')
    throw refuse(url.href, 'user names and passwords in feed URLs are not allowed');
  let addresses: readonly ResolvedAddress[];
  if (isIpLiteral(host)) addresses = [{ address: host, family: host.includes(':') ? 6 : 4 }];
  else {
    try {
      addresses = await resolve(host);
    } catch (error) {
      throw new SlotwrightError('feed_unreadable', `could not resolve the host of ${redactUrl(url.href)}`, {
        cause: error,
      });
    }
  }
  if (addresses.length === 0)
    throw new SlotwrightError('feed_unreadable', `no address for ${redactUrl(url.href)}`);
  if (!allowed) {
    for (const a of addresses) {
      const why = refusedAddressReason(a.address);
      if (why !== undefined) throw refuse(url.href, `its address is in a ${why} range`);
    }
  }
  return addresses[0]!;
}

function decoderFor(
  encoding: string | undefined,
): zlib.Gunzip | zlib.Inflate | zlib.BrotliDecompress | undefined {
  switch ((encoding ?? '').trim().toLowerCase()) {
    case 'gzip':
    case 'x-gzip':
      return zlib.createGunzip();
    case 'deflate':
      return zlib.createInflate();
    case 'br':
      return zlib.createBrotliDecompress();
    default:
      return undefined;
  }
}

interface Hop {
  readonly kind: 'body' | 'redirect' | 'not-modified';
  readonly location?: string;
  readonly body?: string;
  readonly etag?: string | undefined;
  readonly lastModified?: string | undefined;
}

function requestOnce(
  url: URL,
  target: ResolvedAddress,
  options: Required<Pick<FetchFeedOptions, 'maxBytes'>> & FetchFeedOptions,
  signal: AbortSignal,
): Promise<Hop> {
  // Connecting through a lookup that returns the already-checked address means no second DNS
  // answer (rebinding) can slip in; TLS still verifies the certificate against the host name (SNI).
  const lookup: LookupFunction = (_host, opts, cb) => {
    if ((opts as { all?: boolean }).all === true)
      (cb as (e: null, a: { address: string; family: number }[]) => void)(null, [
        { address: target.address, family: target.family },
      ]);
    else cb(null, target.address, target.family);
  };
  const headers: Record<string, string> = {
    'user-agent': 'slotwright-feed-reader',
    accept: 'text/calendar, text/plain;q=0.5, */*;q=0.1',
    'accept-encoding': 'gzip, deflate, br',
  };
  if (options.etag !== undefined) headers['if-none-match'] = options.etag;
  if (options.lastModified !== undefined) headers['if-modified-since'] = options.lastModified;
  const lib = url.protocol === 'https:' ? https : http;
  return new Promise<Hop>((resolvePromise, reject) => {
    const req = lib.request(url, { method: 'GET', headers, lookup, signal, agent: false }, (res) => {
      const status = res.statusCode ?? 0;
      if ([301, 302, 303, 307, 308].includes(status)) {
        res.resume();
        const location = res.headers.location;
        if (location === undefined) {
          reject(
            new SlotwrightError('feed_http', `${redactUrl(url.href)} answered ${status} without a Location`),
          );
          return;
        }
        resolvePromise({ kind: 'redirect', location });
        return;
      }
      if (status === 304) {
        res.resume();
        resolvePromise({ kind: 'not-modified' });
        return;
      }
      if (status !== 200) {
        res.resume();
        reject(
          new SlotwrightError('feed_http', `${redactUrl(url.href)} answered HTTP ${status}`, {
            details: { status },
          }),
        );
        return;
      }
      const declared = Number(res.headers['content-length'] ?? Number.NaN);
      const tooLarge = () =>
        new SlotwrightError(
          'feed_too_large',
          `${redactUrl(url.href)} is larger than ${options.maxBytes} bytes; ask for a smaller feed or raise the limit`,
        );
      if (Number.isFinite(declared) && declared > options.maxBytes) {
        res.destroy();
        reject(tooLarge());
        return;
      }
      let wire = 0;
      let decodedBytes = 0;
      const chunks: Buffer[] = [];
      const decoder = decoderFor(res.headers['content-encoding']);
      let settled = false;
      const fail = (error: unknown) => {
        if (settled) return;
        settled = true;
        reject(error);
        res.destroy();
        decoder?.destroy();
      };
      res.on('aborted', () =>
        fail(new SlotwrightError('feed_unreadable', `the connection to ${redactUrl(url.href)} was cut`)),
      );
      res.on('data', (chunk: Buffer) => {
        wire += chunk.length;
        if (wire > options.maxBytes) fail(tooLarge());
      });
      const out = decoder === undefined ? res : res.pipe(decoder);
      if (decoder !== undefined) res.on('data', () => undefined);
      out.on('data', (chunk: Buffer) => {
        decodedBytes += chunk.length;
        if (decodedBytes > options.maxBytes) fail(tooLarge());
        else if (!settled) chunks.push(chunk);
      });
      out.on('error', (error) =>
        fail(
          new SlotwrightError('feed_unreadable', `could not decode ${redactUrl(url.href)}`, { cause: error }),
        ),
      );
      out.on('end', () => {
        if (settled) return;
        settled = true;
        const body = new TextDecoder('utf-8').decode(Buffer.concat(chunks)).replace(/^\uFEFF/, '');
        const etag = res.headers.etag;
        const lastModified = res.headers['last-modified'];
        resolvePromise({ kind: 'body', body, etag, lastModified });
      });
    });
    req.on('error', (error) => {
      reject(
        new SlotwrightError('feed_unreadable', `could not fetch ${redactUrl(url.href)}`, { cause: error }),
      );
    });
    req.end();
  });
}

/**
 * Fetches a calendar feed URL safely: https only unless an admin allowed the host, no private,
 * loopback, link-local or other internal addresses (checked again after every redirect), a time
 * and size limit, and conditional GET with ETag / Last-Modified.
 */
export async function fetchFeed(url: string, options: FetchFeedOptions = {}): Promise<FetchFeedResult> {
  const o = { ...DEFAULTS, ...options };
  const allow = new Set(
    o.allowHosts.map((h) =>
      h
        .trim()
        .toLowerCase()
        .replace(/^\[|\]$/g, ''),
    ),
  );
  const resolve = o.resolve ?? systemResolve;
  const controller = new AbortController();
  let timedOut = false;
  const timer = setTimeout(() => {
    timedOut = true;
    controller.abort();
  }, o.timeoutMs);
  const timeoutError = () =>
    new SlotwrightError('feed_timeout', `${redactUrl(url)} did not answer within ${o.timeoutMs} ms`);
  try {
    let current: URL;
    try {
      current = new URL(url);
    } catch {
      throw new SlotwrightError('feed_refused', `not a URL: ${redactUrl(url)}`);
    }
    for (let hop = 0; ; hop++) {
      const target = await admit(current, allow, resolve);
      if (timedOut) throw timeoutError();
      let result: Hop;
      try {
        result = await requestOnce(current, target, o, controller.signal);
      } catch (error) {
        if (timedOut) throw timeoutError();
        throw error;
      }
      if (result.kind === 'not-modified') return { status: 'not-modified' };
      if (result.kind === 'body')
        return {
          status: 'ok',
          body: result.body ?? '',
          etag: result.etag,
          lastModified: result.lastModified,
        };
      if (hop >= o.maxRedirects)
        throw new SlotwrightError(
          'feed_http',
          `${redactUrl(url)} redirected more than ${o.maxRedirects} times`,
        );
      current = new URL(result.location!, current);
    }
  } finally {
    clearTimeout(timer);
  }
}
