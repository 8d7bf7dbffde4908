import { type ChildProcess, spawn } from 'node:child_process';
import { createInterface } from 'node:readline';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FeedStateStore, RuleStore } from '../../src/app/ports.ts';
import { parseRule } from '../../src/rules/index.ts';
import {
  type BookingAttendee,
  hashToken,
  type ReserveInput,
  SecretBox,
  SqlFeedStateStore,
  SqlRuleStore,
  type SqlStore,
  sqlStoreOn,
} from '../../src/store/index.ts';
import type { StoreFactory, StoreUnderTest } from './factories.ts';

const H = 3_600_000;
const M = 60_000;
// 2026-12-07T09:00:00Z, a Monday in the demo weeks.
const T0 = Date.UTC(2026, 11, 7, 9, 0);
const KEY = Buffer.alloc(32, 7).toString('base64');

const people = (...ids: string[]): BookingAttendee[] => ids.map((id) => ({ id, role: 'required' }));

function input(over: Partial<ReserveInput> & { idemKey: string }): ReserveInput {
  return {
    newId: over.idemKey,
    organizer: 'ines',
    title: 'Survey sync',
    start: T0,
    end: T0 + H,
    attendees: people('ines', 'rui'),
    state: 'booked',
    now: T0 - 24 * H,
    ...over,
  };
}

function spawnChild(job: unknown): ChildProcess {
  return spawn(
    process.execPath,
    ['--import', 'tsx', new URL('./race-child.ts', import.meta.url).pathname, JSON.stringify(job)],
    {
      stdio: ['pipe', 'pipe', 'inherit'],
    },
  );
}

function nextLine(child: ChildProcess): Promise<string> {
  return new Promise((resolve, reject) => {
    const rl = createInterface({ input: child.stdout! });
    rl.once('line', (line) => {
      rl.close();
      resolve(line);
    });
    child.once('exit', (code) => reject(new Error(`child exited with ${code} before writing`)));
  });
}

/** The store contract: every behaviour both SQLite and PostgreSQL must show, run against a factory. */
export function storeContract(name: string, factory: StoreFactory): void {
  describe(`store contract (${name})`, () => {
    let sut: StoreUnderTest;
    let store: SqlStore;
    beforeAll(async () => {
      sut = await factory();
      store = sqlStoreOn(sut.handle, new SecretBox(KEY));
    });
    afterAll(async () => {
      await sut?.cleanup();
    });

    describe('bookings', () => {
      it('books, then refuses an overlapping booking for a shared attendee and names them', async () => {
        const a = await store.bookings.reserve(input({ idemKey: 'b-a' }));
        expect(a.ok && a.created).toBe(true);
        const b = await store.bookings.reserve(
          input({ idemKey: 'b-b', start: T0 + 30 * M, end: T0 + 90 * M, attendees: people('rui', 'bea') }),
        );
        expect(b).toEqual({ ok: false, reason: 'conflict', with: ['rui'] });
        expect(await store.bookings.getByKey('b-b')).toBeUndefined();
      });

      it('allows back-to-back bookings: the end instant is not part of the booking', async () => {
        // RFC 5545 section 3.6.1: DTEND is the non-inclusive end of the event.
        const r = await store.bookings.reserve(
          input({ idemKey: 'b-next', start: T0 + H, end: T0 + 2 * H, attendees: people('rui') }),
        );
        expect(r.ok).toBe(true);
      });

      it('refuses a room that is taken and names the room', async () => {
        const room = 'tejo';
        const first = await store.bookings.reserve(
          input({ idemKey: 'room-1', start: T0 + 5 * H, end: T0 + 6 * H, room, attendees: people('lena') }),
        );
        expect(first.ok).toBe(true);
        const second = await store.bookings.reserve(
          input({
            idemKey: 'room-2',
            start: T0 + 5 * H + 59 * M,
            end: T0 + 7 * H,
            room,
            attendees: people('tomas'),
          }),
        );
        expect(second).toEqual({ ok: false, reason: 'conflict', with: ['tejo'] });
      });

      it('returns the same booking when the same option is booked twice', async () => {
        const i = input({ idemKey: 'req-1/opt-2', newId: 'first', start: T0 + 10 * H, end: T0 + 11 * H });
        const one = await store.bookings.reserve(i);
        const two = await store.bookings.reserve({ ...i, newId: 'second' });
        expect(one.ok && two.ok).toBe(true);
        if (!one.ok || !two.ok) return;
        expect(two.booking.id).toBe('first');
        expect(two.created).toBe(false);
        expect(two.booking).toEqual(one.booking);
      });

      it('many concurrent calls with one idempotency key make one booking', async () => {
        const i = input({ idemKey: 'req-9/opt-1', start: T0 + 60 * H, end: T0 + 61 * H, room: 'sounding' });
        const all = await Promise.all(
          Array.from({ length: 8 }, (_, k) => store.bookings.reserve({ ...i, newId: `same-${k}` })),
        );
        const ids = new Set(all.map((r) => (r.ok ? r.booking.id : 'refused')));
        expect(all.filter((r) => !r.ok)).toEqual([]);
        expect(ids.size).toBe(1);
        expect([...ids][0]).toMatch(/^same-\d$/);
        const rows = await sut.handle.db
          .selectFrom('booking')
          .select('id')
          .where('idem_key', '=', 'req-9/opt-1')
          .execute();
        expect(rows).toHaveLength(1);
      });

      it('keeps attendees with their roles in the child table', async () => {
        const r = await store.bookings.reserve(
          input({
            idemKey: 'roles',
            start: T0 + 30 * H,
            end: T0 + 31 * H,
            attendees: [
              { id: 'maren', role: 'required' },
              { id: 'aroha', role: 'optional' },
            ],
          }),
        );
        expect(r.ok && r.booking.attendees).toEqual([
          { id: 'aroha', role: 'optional' },
          { id: 'maren', role: 'required' },
        ]);
      });

      it('asks the caller about outside busy time inside the transaction and writes nothing when busy', async () => {
        const seen: { ids: readonly string[]; start: number; end: number }[] = [];
        const r = await store.bookings.reserve(
          input({
            idemKey: 'feed-busy',
            start: T0 + 20 * H,
            end: T0 + 21 * H,
            room: 'sounding',
            attendees: people('bea', 'tomas'),
            recheck: async (ids, iv) => {
              seen.push({ ids, ...iv });
              return ids.filter((id) => id === 'tomas');
            },
          }),
        );
        expect(r).toEqual({ ok: false, reason: 'conflict', with: ['tomas'] });
        expect(seen).toEqual([{ ids: ['bea', 'tomas', 'sounding'], start: T0 + 20 * H, end: T0 + 21 * H }]);
        const rows = await sut.handle.db
          .selectFrom('occupancy')
          .innerJoin('booking', 'booking.id', 'occupancy.booking_id')
          .select('occupancy.id')
          .where('booking.idem_key', '=', 'feed-busy')
          .execute();
        expect(rows).toEqual([]);
      });

      it('cancels: SEQUENCE goes up by one, the time is free again, and the option can be booked again', async () => {
        const i = input({ idemKey: 'to-cancel', start: T0 + 40 * H, end: T0 + 41 * H, room: 'quay' });
        const made = await store.bookings.reserve(i);
        expect(made.ok).toBe(true);
        if (!made.ok) return;
        const c = await store.bookings.cancel(made.booking.id, { now: T0 });
        expect(c.ok && c.booking.state).toBe('cancelled');
        expect(c.ok && c.booking.sequence).toBe(made.booking.sequence + 1);
        const again = await store.bookings.cancel(made.booking.id, { now: T0 });
        expect(again.ok && again.changed).toBe(false);
        const rebooked = await store.bookings.reserve({ ...i, newId: 'to-cancel-2' });
        expect(rebooked.ok && rebooked.booking.id).toBe('to-cancel-2');
        expect(await store.bookings.cancel('no-such-booking', { now: T0 })).toEqual({
          ok: false,
          reason: 'not_found',
        });
      });

      it('rejects a booking that ends before it starts', async () => {
        await expect(store.bookings.reserve(input({ idemKey: 'bad', start: T0, end: T0 }))).rejects.toThrow(
          /end after it starts/,
        );
      });
    });

    describe('holds', () => {
      const base = T0 + 100 * H;
      it('a live hold blocks others; confirming it books the same row', async () => {
        const hold = await store.bookings.reserve(
          input({
            idemKey: 'h-1',
            start: base,
            end: base + H,
            state: 'held',
            holdExpiresAt: base - H + 10 * M,
            now: base - H,
          }),
        );
        expect(hold.ok && hold.booking.state).toBe('held');
        const other = await store.bookings.reserve(
          input({
            idemKey: 'h-other',
            start: base,
            end: base + H,
            attendees: people('ines'),
            now: base - H + M,
          }),
        );
        expect(other).toEqual({ ok: false, reason: 'conflict', with: ['ines'] });
        const booked = await store.bookings.reserve(
          input({ idemKey: 'h-1', newId: 'unused', start: base, end: base + H, now: base - H + 2 * M }),
        );
        expect(booked.ok && booked.booking.state).toBe('booked');
        expect(booked.ok && hold.ok && booked.booking.id).toBe(hold.ok ? hold.booking.id : '');
        expect(booked.ok && booked.booking.holdExpiresAt).toBe(null);
      });

      it('booking one option of a request lets go of the holds on its other options', async () => {
        const start = base + 50 * H;
        const now = start - 3 * H;
        const opt = (o: string, at: number) =>
          input({
            idemKey: `req-s/${o}`,
            newId: `req-s-${o}`,
            requestId: 'req-s',
            optionId: o,
            start: at,
            end: at + H,
            now,
          });
        const h1 = await store.bookings.reserve({
          ...opt('o1', start),
          state: 'held',
          holdExpiresAt: now + 10 * M,
        });
        const h2 = await store.bookings.reserve({
          ...opt('o2', start + 30 * M),
          state: 'held',
          holdExpiresAt: now + 10 * M,
        });
        expect(h1.ok).toBe(true);
        // Same people, overlapping time: the organizer's own first hold is in the way of the second.
        expect(h2).toEqual({ ok: false, reason: 'conflict', with: ['ines', 'rui'] });
        const h3 = await store.bookings.reserve({
          ...opt('o3', start + 2 * H),
          state: 'held',
          holdExpiresAt: now + 10 * M,
        });
        expect(h3.ok).toBe(true);
        const booked = await store.bookings.reserve(opt('o2', start + 30 * M));
        expect(booked.ok && booked.booking.state).toBe('booked');
        expect((await store.bookings.get('req-s-o1'))?.cancelReason).toBe('another option booked');
        expect((await store.bookings.get('req-s-o3'))?.state).toBe('cancelled');
      });

      it('an expired hold blocks nobody and the sweeper releases it (clock passed in)', async () => {
        const start = base + 10 * H;
        const now = start - 2 * H;
        const hold = await store.bookings.reserve(
          input({
            idemKey: 'h-2',
            start,
            end: start + H,
            state: 'held',
            holdExpiresAt: now + 10 * M,
            now,
            room: 'tejo',
          }),
        );
        expect(hold.ok).toBe(true);
        expect(await store.bookings.releaseExpiredHolds(now + 9 * M)).toBe(0);
        expect(await store.bookings.releaseExpiredHolds(now + 10 * M)).toBe(1);
        const released = hold.ok ? await store.bookings.get(hold.booking.id) : undefined;
        expect(released?.state).toBe('cancelled');
        expect(released?.cancelReason).toBe('hold_expired');
        const h3 = await store.bookings.reserve(
          input({
            idemKey: 'h-3',
            start,
            end: start + H,
            state: 'held',
            holdExpiresAt: now + 30 * M,
            now: now + 20 * M,
            room: 'tejo',
          }),
        );
        expect(h3.ok).toBe(true);
        // Not swept yet, but past its expiry: a booking at now+31m must still go through.
        const taker = await store.bookings.reserve(
          input({
            idemKey: 'h-taker',
            start,
            end: start + H,
            now: now + 31 * M,
            room: 'tejo',
            attendees: people('lena'),
          }),
        );
        expect(taker.ok).toBe(true);
      });
    });

    describe('ledger', () => {
      it('insert-or-ignore tells a new chat delivery from a retry', async () => {
        expect(await store.ledger.recordDelivery('evt-1', T0)).toBe(true);
        expect(await store.ledger.recordDelivery('evt-1', T0 + 5)).toBe(false);
        expect(await store.ledger.recordDelivery('evt-2', T0)).toBe(true);
        expect(await store.ledger.pruneDeliveries(T0 + 1)).toBe(2);
        expect(await store.ledger.recordDelivery('evt-1', T0 + 9)).toBe(true);
      });

      it('keeps the audit log in order', async () => {
        await store.ledger.audit({
          actor: 'rui',
          action: 'cancel',
          subject: 'bk-9',
          outcome: 'refused:unauthorized',
          at: T0,
        });
        await store.ledger.audit({
          actor: 'ines',
          action: 'cancel',
          subject: 'bk-9',
          outcome: 'ok',
          detail: { seq: 1 },
          at: T0 + 1,
        });
        expect(await store.ledger.auditLog({ subject: 'bk-9' })).toEqual([
          { actor: 'rui', action: 'cancel', subject: 'bk-9', outcome: 'refused:unauthorized', at: T0 },
          { actor: 'ines', action: 'cancel', subject: 'bk-9', outcome: 'ok', detail: { seq: 1 }, at: T0 + 1 },
        ]);
      });

      it('adds up off-hours sessions per person and ISO week', async () => {
        await store.ledger.addOffHours('aroha', '2026-W50', 1);
        await store.ledger.addOffHours('aroha', '2026-W50', 2);
        await store.ledger.addOffHours('maren', '2026-W50', 1);
        await store.ledger.addOffHours('aroha', '2026-W51', 1);
        expect(await store.ledger.offHours(['aroha', 'maren'], ['2026-W50'])).toEqual([
          { person: 'aroha', isoWeek: '2026-W50', count: 3 },
          { person: 'maren', isoWeek: '2026-W50', count: 1 },
        ]);
      });

      it('stores subscription tokens only as sha-256 and honours revocation', async () => {
        // FIPS 180-2 appendix B.1 worked example: SHA-256("abc").
        expect(hashToken('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
        const token = 'dG9rZW4tZm9yLXRlc3RzLW9ubHktMzItYnl0ZXMtbG9uZw';
        await store.ledger.saveSubscriptionToken(token, { kind: 'room', id: 'tejo' }, T0);
        const rows = await sut.handle.db.selectFrom('subscription_token').select('token_hash').execute();
        expect(rows.map((r) => r.token_hash)).toEqual([hashToken(token)]);
        expect(await store.ledger.lookupSubscriptionToken(token)).toEqual({ kind: 'room', id: 'tejo' });
        expect(await store.ledger.lookupSubscriptionToken(`${token}x`)).toBeUndefined();
        expect(await store.ledger.revokeSubscriptionTokens({ kind: 'room', id: 'tejo' }, T0 + 1)).toBe(1);
        expect(await store.ledger.lookupSubscriptionToken(token)).toBeUndefined();
      });
    });

    describe('workspace state', () => {
      it('replaces people, rooms and groups as one', async () => {
        await store.workspace.replaceDirectory({
          people: [
            {
              id: 'ines',
              name: 'Ines Carvalhal',
              email: 'ines@saltline.example',
              zone: 'Europe/Lisbon',
              data: { holidays: 'PT' },
            },
          ],
          rooms: [
            { id: 'tejo', name: 'Tejo', capacity: 10, zone: 'Europe/Lisbon', data: { features: ['screen'] } },
          ],
          groups: [{ id: 'leads', members: ['maren', 'ines', 'aroha'] }],
        });
        await store.workspace.replaceDirectory({
          people: [{ id: 'rui', name: 'Rui Teixo', email: null, zone: 'Europe/Lisbon', data: {} }],
          rooms: [],
          groups: [{ id: 'leads', members: ['ines'] }],
        });
        expect((await store.workspace.people()).map((p) => p.id)).toEqual(['rui']);
        expect(await store.workspace.rooms()).toEqual([]);
        expect(await store.workspace.groups()).toEqual([{ id: 'leads', members: ['ines'] }]);
      });

      it('encrypts feed URLs at rest and keeps the last good copy when a fetch fails', async () => {
        const url = 'https://calendar.saltline.example/private/9f8e7d/basic.ics';
        await store.workspace.addFeed({ id: 'f1', owner: 'juno', url });
        const raw = await sut.handle.db
          .selectFrom('feed')
          .select('url_encrypted')
          .where('id', '=', 'f1')
          .executeTakeFirstOrThrow();
        expect(raw.url_encrypted).not.toContain('saltline');
        await store.workspace.recordFetch('f1', {
          ok: true,
          at: T0,
          etag: '"v1"',
          lastModified: null,
          body: 'BEGIN:VCALENDAR',
          busy: [[1, 2]],
        });
        await store.workspace.recordFetch('f1', { ok: false, at: T0 + H, error: 'feed_timeout' });
        const [feed] = await store.workspace.feeds('juno');
        expect(feed).toEqual({
          id: 'f1',
          owner: 'juno',
          url,
          etag: '"v1"',
          lastModified: null,
          lastBody: 'BEGIN:VCALENDAR',
          lastBusy: [[1, 2]],
          lastOkAt: T0,
          lastErrAt: T0 + H,
          lastError: 'feed_timeout',
        });
        const otherKey = sqlStoreOn(sut.handle, new SecretBox(Buffer.alloc(32, 9).toString('base64')));
        await expect(otherKey.workspace.feeds('juno')).rejects.toThrow(/SLOTWRIGHT_SECRET_KEY/);
        await store.workspace.replaceBusy('p:juno', 'f1', [{ start: T0, end: T0 + H, kind: 'busy' }]);
        expect(await store.workspace.busy('p:juno', { start: T0 + H - 1, end: T0 + 2 * H })).toEqual([
          { start: T0, end: T0 + H, kind: 'busy' },
        ]);
        expect(await store.workspace.removeFeed('f1', 'maren')).toEqual({ ok: false, reason: 'not_owner' });
        expect(await store.workspace.removeFeed('f1', 'juno')).toEqual({ ok: true });
        expect(await store.workspace.busy('p:juno', { start: 0, end: T0 * 2 })).toEqual([]);
      });

      it('saves requests with options, series and week plans as JSON', async () => {
        await store.workspace.saveRequest({
          id: 'q1',
          organizer: 'ines',
          body: { length: 45 },
          options: [{ id: 'o1' }],
          at: T0,
        });
        expect(await store.workspace.request('q1')).toEqual({
          id: 'q1',
          organizer: 'ines',
          body: { length: 45 },
          options: [{ id: 'o1' }],
          createdAt: T0,
        });
        await store.workspace.saveSeries({ id: 's1', owner: 'ines', body: { perWeek: 2 }, at: T0 });
        expect(await store.workspace.series()).toEqual([{ id: 's1', owner: 'ines', body: { perWeek: 2 } }]);
        await store.workspace.saveWeekPlan({ id: 'w1', isoWeek: '2026-W50', body: { sessions: [] }, at: T0 });
        expect((await store.workspace.weekPlans('2026-W50')).map((p) => p.id)).toEqual(['w1']);
      });
    });

    describe('rule store port', () => {
      it("saves parsed rules per owner, reads them back checked, and removes only the owner's", async () => {
        const rules: RuleStore = new SqlRuleStore(sut.handle);
        const parsed = parseRule('no meetings before 10am', {
          zone: 'Europe/Lisbon',
          now: T0,
          speaker: 'maren',
        });
        expect(parsed.ok).toBe(true);
        if (!parsed.ok) return;
        const saved = {
          id: 'rule-m1',
          ownerId: 'maren',
          rule: parsed.rule,
          text: parsed.text,
          createdAt: T0,
        };
        await rules.add(saved);
        await rules.add({ ...saved, id: 'rule-m0', createdAt: T0 - 1 });
        await expect(rules.add(saved)).rejects.toThrow(/already used/);
        expect((await rules.list('maren')).map((r) => r.id)).toEqual(['rule-m0', 'rule-m1']);
        expect((await rules.list('maren'))[1]).toEqual(saved);
        expect(await rules.remove('teo', 'rule-m1')).toBe(false);
        expect(await rules.remove('maren', 'rule-m1')).toBe(true);
        expect((await rules.list('maren')).map((r) => r.id)).toEqual(['rule-m0']);
        await sut.handle.db
          .updateTable('rule')
          .set({ structure: '{"subject":{"kind":"nobody"}}' })
          .where('id', '=', 'rule-m0')
          .execute();
        await expect(rules.list('maren')).rejects.toThrow(/does not match the rule structure/);
        await sut.handle.db.deleteFrom('rule').where('id', '=', 'rule-m0').execute();
      });
    });

    describe('feed state port', () => {
      it('saves and replaces the state of a feed, keeping the last good busy time beside an error', async () => {
        const states: FeedStateStore = new SqlFeedStateStore(sut.handle);
        expect(await states.load('juno:feeds/juno.ics')).toBeUndefined();
        const good = {
          busy: [
            { start: T0, end: T0 + H, kind: 'busy' as const },
            { start: T0 + 2 * H, end: T0 + 3 * H, kind: 'tentative' as const },
          ],
          horizon: { start: T0 - 24 * H, end: T0 + 14 * 24 * H },
          warnings: ['one event had no end; read as lasting zero minutes'],
          skipped: 1,
          fetchedAt: T0 - H,
          attemptedAt: T0 - H,
          etag: '"abc"',
          lastModified: 'Tue, 01 Dec 2026 17:00:00 GMT',
          lastError: undefined,
        };
        await states.save('juno:feeds/juno.ics', good);
        expect(await states.load('juno:feeds/juno.ics')).toEqual(good);
        const failed = {
          ...good,
          attemptedAt: T0,
          lastError: { code: 'feed_timeout', message: 'no answer in 10 s' },
        };
        await states.save('juno:feeds/juno.ics', failed);
        expect(await states.load('juno:feeds/juno.ics')).toEqual(failed);
        const fresh = {
          ...good,
          etag: undefined,
          lastModified: undefined,
          fetchedAt: undefined,
          busy: [],
          warnings: [],
        };
        await states.save('room:tejo', fresh);
        expect(await states.load('room:tejo')).toEqual(fresh);
      });
    });

    // Child processes start through tsx; on a loaded machine that alone can take many seconds.
    describe('across processes', () => {
      it('50 racing attempts on one room from 4 processes: one booking per overlapping set', async () => {
        // 10 clusters, 5 attempts each; inside a cluster starts differ by at most 20 minutes and each
        // lasts 40, so all five overlap one another; clusters are two hours apart.
        const base = T0 + 1000 * H;
        const attempts = Array.from({ length: 50 }, (_, i) => {
          const cluster = Math.floor(i / 5);
          const start = base + cluster * 2 * H + (i % 5) * 5 * M;
          return {
            key: `race-${i}`,
            person: `p${i}`,
            room: 'chart-room',
            start,
            end: start + 40 * M,
            cluster,
          };
        });
        const children = [0, 1, 2, 3].map((k) =>
          spawnChild({
            mode: 'race',
            location: sut.location,
            searchPath: sut.searchPath,
            attempts: attempts.filter((_, i) => i % 4 === k),
          }),
        );
        const readies = children.map((c) => nextLine(c));
        expect(await Promise.all(readies)).toEqual(['ready', 'ready', 'ready', 'ready']);
        const results = children.map((c) => nextLine(c));
        for (const c of children) c.stdin!.write('go\n');
        const outcomes = (await Promise.all(results)).flatMap(
          (line) => JSON.parse(line) as { key: string; ok: boolean; with?: string[] }[],
        );
        expect(outcomes).toHaveLength(50);
        const winners = outcomes.filter((o) => o.ok).map((o) => o.key);
        const perCluster = new Map<number, number>();
        for (const w of winners) {
          const c = attempts.find((a) => a.key === w)!.cluster;
          perCluster.set(c, (perCluster.get(c) ?? 0) + 1);
        }
        expect([...perCluster.values()]).toEqual(Array(10).fill(1));
        for (const o of outcomes.filter((x) => !x.ok)) expect(o.with).toEqual(['chart-room']);
        // Independent check straight on the rows: no two live bookings of the room overlap.
        const rows = await sql<{ start_ms: number | string; end_ms: number | string }>`
          select start_ms, end_ms from booking where room = ${'chart-room'} and state = ${'booked'}
          order by start_ms`.execute(sut.handle.db);
        const spans = rows.rows.map((r) => [Number(r.start_ms), Number(r.end_ms)] as const);
        expect(spans).toHaveLength(10);
        for (let i = 0; i < spans.length; i++)
          for (let j = i + 1; j < spans.length; j++)
            expect(spans[i]![0] < spans[j]![1] && spans[j]![0] < spans[i]![1]).toBe(false);
      }, 120_000);

      it('a process killed inside a booking transaction leaves no partial rows and no lock', async () => {
        const start = T0 + 2000 * H;
        const a = { key: 'killed-1', person: 'odile', room: 'harbour-view', start, end: start + H };
        const child = spawnChild({
          mode: 'hang',
          location: sut.location,
          searchPath: sut.searchPath,
          attempts: [a],
        });
        expect(await nextLine(child)).toBe('inside');
        const exited = new Promise((r) => child.once('exit', r));
        child.kill('SIGKILL');
        await exited;
        for (const table of ['booking', 'booking_attendee', 'occupancy'] as const) {
          const col = table === 'booking' ? 'id' : 'booking_id';
          const rows = await sql`select 1 from ${sql.table(table)} where ${sql.ref(col)} = ${a.key}`.execute(
            sut.handle.db,
          );
          expect(rows.rows, table).toEqual([]);
        }
        // The write lock died with the process: the same room and time can be booked right away.
        const r = await store.bookings.reserve(
          input({
            idemKey: 'after-kill',
            start,
            end: start + H,
            room: 'harbour-view',
            attendees: people('odile'),
          }),
        );
        expect(r.ok).toBe(true);
      }, 120_000);
    });
  });
}
