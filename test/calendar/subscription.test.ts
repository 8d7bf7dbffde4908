import { mkdtempSync, rmSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ICAL from 'ical.js';
import ical from 'node-ical';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { newSubscriptionToken, subscriptionHandler } from '../../src/calendar/subscription.ts';
import { openSqlStore, SecretBox, type SqlStore } from '../../src/store/index.ts';

const H = 3_600_000;
const NOW = Date.UTC(2026, 11, 1, 18, 0);
let dir: string;
let store: SqlStore;
let server: Server;
let base: string;
let ruiToken: string;
let roomToken: string;
const errors: string[] = [];

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'sw-sub-'));
  store = await openSqlStore(
    { dialect: 'sqlite', file: join(dir, 's.sqlite') },
    new SecretBox(Buffer.alloc(32, 3).toString('base64')),
  );
  const book = async (id: string, title: string, start: number, who: string[], room?: string) => {
    const r = await store.bookings.reserve({
      idemKey: id,
      newId: id,
      organizer: who[0]!,
      title,
      start,
      end: start + H,
      attendees: who.map((p) => ({ id: p, role: 'required' as const })),
      ...(room === undefined ? {} : { room }),
      state: 'booked',
      now: NOW,
    });
    expect(r.ok).toBe(true);
  };
  await book('bk-a', 'Sonar calibration review', NOW + 24 * H, ['rui', 'bea'], 'tejo');
  await book('bk-b', 'Hull survey debrief', NOW + 48 * H, ['bea', 'lena'], 'tejo');
  await book('bk-c', 'Data handover', NOW + 72 * H, ['rui']);
  await store.bookings.cancel('bk-c', { now: NOW });
  ruiToken = newSubscriptionToken();
  roomToken = newSubscriptionToken();
  await store.ledger.saveSubscriptionToken(ruiToken, { kind: 'person', id: 'rui' }, NOW);
  await store.ledger.saveSubscriptionToken(roomToken, { kind: 'room', id: 'tejo' }, NOW);
  server = createServer(
    subscriptionHandler({
      lookup: (t) => store.ledger.lookupSubscriptionToken(t),
      bookingsOf: (owner, window) => store.bookings.listFor(owner, window, ['booked', 'cancelled']),
      now: () => NOW,
      feed: { domain: 'slotwright.saltline.example', roomName: (id) => (id === 'tejo' ? 'Tejo' : undefined) },
      onError: (e) => errors.push(e.message),
    }),
  );
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  await new Promise((r) => server.close(r));
  await store.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('subscription tokens', () => {
  it('are 32 random bytes in base64url', () => {
    const t = newSubscriptionToken();
    expect(t).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(Buffer.from(t, 'base64url')).toHaveLength(32);
    expect(newSubscriptionToken()).not.toBe(t);
  });
});

describe('subscription feed over HTTP (loopback)', () => {
  it("serves a person's own live bookings with titles, as METHOD:PUBLISH", async () => {
    const res = await fetch(`${base}/feeds/${ruiToken}.ics`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('text/calendar; charset=utf-8');
    expect(res.headers.get('cache-control')).toBe('private, no-store');
    const text = await res.text();
    const cal = new ICAL.Component(ICAL.parse(text));
    // RFC 5546 section 3.2.1: PUBLISH carries events without asking anyone to reply.
    expect(cal.getFirstPropertyValue('method')).toBe('PUBLISH');
    const events = cal.getAllSubcomponents('vevent').map((v) => ({
      uid: v.getFirstPropertyValue('uid'),
      summary: v.getFirstPropertyValue('summary'),
      location: v.getFirstPropertyValue('location'),
    }));
    expect(events).toEqual([
      { uid: 'bk-a@slotwright.saltline.example', summary: 'Sonar calibration review', location: 'Tejo' },
    ]);
    const viaNodeIcal = Object.values(ical.sync.parseICS(text)).filter((c) => c?.type === 'VEVENT');
    expect(viaNodeIcal).toHaveLength(1);
  });

  it("a room's feed shows when it is booked but not what the meetings are", async () => {
    const text = await (await fetch(`${base}/feeds/${roomToken}.ics`)).text();
    const cal = new ICAL.Component(ICAL.parse(text));
    const events = cal.getAllSubcomponents('vevent');
    expect(events.map((v) => v.getFirstPropertyValue('summary'))).toEqual(['Booked', 'Booked']);
    expect(text).not.toContain('Sonar');
    expect(text).not.toContain('Hull');
  });

  it('unknown, malformed and revoked tokens get the same 404', async () => {
    const unknown = await fetch(`${base}/feeds/${newSubscriptionToken()}.ics`);
    const malformed = await fetch(`${base}/feeds/short.ics`);
    const noPrefix = await fetch(`${base}/${ruiToken}.ics`);
    expect([unknown.status, malformed.status, noPrefix.status]).toEqual([404, 404, 404]);
    expect(await unknown.text()).toBe(await malformed.text());
    const t = newSubscriptionToken();
    await store.ledger.saveSubscriptionToken(t, { kind: 'person', id: 'bea' }, NOW);
    expect((await fetch(`${base}/feeds/${t}.ics`)).status).toBe(200);
    await store.ledger.revokeSubscriptionTokens({ kind: 'person', id: 'bea' }, NOW + 1);
    expect((await fetch(`${base}/feeds/${t}.ics`)).status).toBe(404);
  });

  it('answers only GET and HEAD', async () => {
    const res = await fetch(`${base}/feeds/${ruiToken}.ics`, { method: 'POST' });
    expect(res.status).toBe(405);
    expect(res.headers.get('allow')).toBe('GET, HEAD');
    const head = await fetch(`${base}/feeds/${ruiToken}.ics`, { method: 'HEAD' });
    expect(head.status).toBe(200);
    expect(await head.text()).toBe('');
  });

  it('a failing store gives 500 and the error goes to onError, not to the client', async () => {
    const failing = createServer(
      subscriptionHandler({
        lookup: async () => ({ kind: 'person', id: 'rui' }),
        bookingsOf: async () => Promise.reject(new Error('disk I/O error')),
        now: () => NOW,
        feed: { domain: 'slotwright.saltline.example' },
        onError: (e) => errors.push(e.message),
      }),
    );
    await new Promise<void>((r) => failing.listen(0, '127.0.0.1', r));
    try {
      const port = (failing.address() as AddressInfo).port;
      const res = await fetch(`http://127.0.0.1:${port}/feeds/${ruiToken}.ics`);
      expect(res.status).toBe(500);
      expect(await res.text()).toBe('feed unavailable\n');
      expect(errors).toEqual(['disk I/O error']);
    } finally {
      await new Promise((r) => failing.close(r));
    }
  });
});
