import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { gzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { refusedAddressReason } from '../../src/calendar/address-policy.ts';
import { fetchFeed } from '../../src/calendar/fetch-feed.ts';
import { redactUrl } from '../../src/calendar/redact-url.ts';
import { SlotwrightError } from '../../src/errors.ts';

const ICS = 'BEGIN:VCALENDAR\r\nVERSION:2.0\r\nPRODID:-//slotwright//test//EN\r\nEND:VCALENDAR\r\n';

let server: Server;
let base = '';
const seen: string[] = [];

function handler(req: IncomingMessage, res: ServerResponse): void {
  const path = req.url ?? '/';
  seen.push(path);
  if (path === '/feed.ics') {
    if (req.headers['if-none-match'] === '"v1"') {
      res.writeHead(304).end();
      return;
    }
    res.writeHead(200, {
      'content-type': 'text/calendar',
      etag: '"v1"',
      'last-modified': 'Mon, 30 Nov 2026 10:00:00 GMT',
    });
    res.end(ICS);
  } else if (path === '/gzip.ics') {
    res.writeHead(200, { 'content-encoding': 'gzip' }).end(gzipSync(ICS));
  } else if (path === '/big') {
    res.writeHead(200);
    res.end(Buffer.alloc(300_000, 65));
  } else if (path === '/bomb') {
    // 4 MB of zeros that gzip squeezes to a few kB: the cap must apply after decoding
    res.writeHead(200, { 'content-encoding': 'gzip' }).end(gzipSync(Buffer.alloc(4_000_000)));
  } else if (path === '/slow') {
    // never answers; the client must give up
  } else if (path.startsWith('/redirect-to/')) {
    res.writeHead(302, { location: decodeURIComponent(path.slice('/redirect-to/'.length)) }).end();
  } else if (path === '/loop') {
    res.writeHead(302, { location: '/loop' }).end();
  } else {
    res.writeHead(404).end();
  }
}

beforeAll(async () => {
  server = createServer(handler);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  server.closeAllConnections();
  await new Promise<void>((r) => server.close(() => r()));
});

const allow = { allowHosts: ['127.0.0.1'] };

async function codeOf(p: Promise<unknown>): Promise<string> {
  try {
    await p;
    return 'no error';
  } catch (error) {
    return error instanceof SlotwrightError ? error.code : `other: ${String(error)}`;
  }
}

describe('fetchFeed refuses internal addresses (SSRF)', () => {
  // Ranges: RFC 1918 (10/8, 172.16/12, 192.168/16), RFC 1122 loopback 127/8, RFC 3927 link-local
  // 169.254/16 (cloud metadata at 169.254.169.254: common practice), RFC 6598 carrier-grade NAT
  // 100.64/10, RFC 4193 unique-local fc00::/7, RFC 4291 loopback ::1, link-local fe80::/10 and
  // IPv4-mapped ::ffff:0:0/96, multicast 224/4 and ff00::/8. Numeric host spellings are normalised
  // by the WHATWG URL parser (2130706433, 0177.0.0.1, 0x7f.1 all mean 127.0.0.1).
  const refused = [
    'https://127.0.0.1/feed.ics',
    'https://127.1.2.3/feed.ics',
    'https://localhost.localdomain.invalid/feed.ics',
    'https://10.0.0.8/feed.ics',
    'https://172.16.5.4/feed.ics',
    'https://172.31.255.255/feed.ics',
    'https://192.168.1.10/feed.ics',
    'https://169.254.169.254/latest/meta-data/',
    'https://100.100.100.200/latest/',
    'https://100.64.0.1/feed.ics',
    'https://0.0.0.0/feed.ics',
    'https://255.255.255.255/feed.ics',
    'https://224.0.0.251/feed.ics',
    'https://[::1]/feed.ics',
    'https://[::]/feed.ics',
    'https://[fc00::1]/feed.ics',
    'https://[fd12:3456::1]/feed.ics',
    'https://[fd00:ec2::254]/feed.ics',
    'https://[fe80::1]/feed.ics',
    'https://[ff02::1]/feed.ics',
    'https://[::ffff:127.0.0.1]/feed.ics',
    'https://[::ffff:10.0.0.1]/feed.ics',
    'https://2130706433/feed.ics',
    'https://0177.0.0.1/feed.ics',
    'https://0x7f.1/feed.ics',
    'https://intranet.saltline.example/feed.ics',
  ];
  // names resolve through a fixed table so no real DNS is asked
  const table: Record<string, string> = {
    'localhost.localdomain.invalid': '127.0.0.1',
    'intranet.saltline.example': '10.20.30.40',
  };
  const resolve = async (host: string) => [{ address: table[host] ?? '203.0.113.9', family: 4 as const }];
  it('has at least 20 refused URLs', () => {
    expect(refused.length).toBeGreaterThanOrEqual(20);
  });
  for (const url of refused) {
    it(`refuses ${url}`, async () => {
      expect(await codeOf(fetchFeed(url, { resolve, timeoutMs: 2000 }))).toBe('feed_refused');
    });
  }
  it('refuses plain http by default, even to a public address', async () => {
    expect(await codeOf(fetchFeed('http://203.0.113.9/feed.ics', { resolve }))).toBe('feed_refused');
  });
  it('refuses other schemes and credentials in the URL', async () => {
    expect(await codeOf(fetchFeed('file:///etc/passwd', { resolve }))).toBe('feed_refused');
    expect(await codeOf(fetchFeed('https://user:pw@203.0.113.9/', { resolve }))).toBe('feed_refused');
  });
  it('refuses a name when any of its addresses is internal', async () => {
    const mixed = async () => [
      { address: '203.0.113.9', family: 4 as const },
      { address: '10.0.0.1', family: 4 as const },
    ];
    expect(await codeOf(fetchFeed('https://mixed.saltline.example/x.ics', { resolve: mixed }))).toBe(
      'feed_refused',
    );
  });
  it('refuses a redirect from an allowed loopback host to a refused address', async () => {
    const target = encodeURIComponent('http://169.254.169.254/latest/meta-data/');
    expect(await codeOf(fetchFeed(`${base}/redirect-to/${target}`, allow))).toBe('feed_refused');
    const v6 = encodeURIComponent('https://[::1]:443/feed.ics');
    expect(await codeOf(fetchFeed(`${base}/redirect-to/${v6}`, allow))).toBe('feed_refused');
  });
  it('classifies addresses by ipaddr.js range', () => {
    expect(refusedAddressReason('8.8.8.8')).toBeUndefined();
    expect(refusedAddressReason('2001:4860:4860::8888')).toBeUndefined();
    expect(refusedAddressReason('::ffff:10.1.1.1')).toBe('private');
    expect(refusedAddressReason('169.254.169.254')).toBe('cloud metadata');
    expect(refusedAddressReason('fe80::1%eth0')).toBe('linkLocal');
  });
});

describe('fetchFeed from an allowed loopback host', () => {
  it('fetches a feed and reports its validators', async () => {
    const r = await fetchFeed(`${base}/feed.ics`, allow);
    expect(r).toEqual({
      status: 'ok',
      body: ICS,
      etag: '"v1"',
      lastModified: 'Mon, 30 Nov 2026 10:00:00 GMT',
    });
  });
  it('sends If-None-Match and reuses the held copy on 304', async () => {
    expect(await fetchFeed(`${base}/feed.ics`, { ...allow, etag: '"v1"' })).toEqual({
      status: 'not-modified',
    });
  });
  it('decodes gzip', async () => {
    const r = await fetchFeed(`${base}/gzip.ics`, allow);
    expect(r.status === 'ok' && r.body).toBe(ICS);
  });
  it('follows a redirect within the allowed host', async () => {
    const r = await fetchFeed(`${base}/redirect-to/${encodeURIComponent('/feed.ics')}`, allow);
    expect(r.status).toBe('ok');
  });
  it('stops after 3 redirects', async () => {
    expect(await codeOf(fetchFeed(`${base}/loop`, allow))).toBe('feed_http');
  });
  it('caps the size on the wire and after decoding', async () => {
    expect(await codeOf(fetchFeed(`${base}/big`, { ...allow, maxBytes: 100_000 }))).toBe('feed_too_large');
    expect(await codeOf(fetchFeed(`${base}/bomb`, { ...allow, maxBytes: 1_000_000 }))).toBe('feed_too_large');
  });
  it('gives up after the timeout', async () => {
    const t0 = performance.now();
    expect(await codeOf(fetchFeed(`${base}/slow`, { ...allow, timeoutMs: 150 }))).toBe('feed_timeout');
    expect(performance.now() - t0).toBeLessThan(5000);
  });
  it('reports HTTP errors with the status, never the secret path', async () => {
    try {
      await fetchFeed(`${base}/private/token-abc123.ics`, allow);
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(SlotwrightError);
      expect((error as SlotwrightError).code).toBe('feed_http');
      expect((error as Error).message).not.toContain('token-abc123');
    }
  });
});

describe('redactUrl', () => {
  it('keeps scheme and host only', () => {
    expect(redactUrl('https://cal.saltline.example/u/maren/private-9f8e7d/basic.ics?key=s3cret')).toBe(
      'https://cal.saltline.example/…',
    );
    expect(redactUrl('https://alice:pw@cal.saltline.example:8443/')).toBe(
      'https://cal.saltline.example:8443/…',
    );
    expect(redactUrl('https://cal.saltline.example/')).toBe('https://cal.saltline.example/');
    expect(redactUrl('not a url')).toBe('[unreadable URL]');
  });
});
