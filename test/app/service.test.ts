import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PeopleDirectory, relaxedQuery, type ServicePerson } from '../../src/app/service.ts';
import { type OpenedService, openService } from '../../src/main.ts';
import { NOW, TEO_BUSY, writeTestWorkspace } from '../bot/support.ts';

const person = (id: string, name: string, extra: Partial<ServicePerson> = {}): ServicePerson => ({
  id,
  name,
  zone: 'Europe/Lisbon',
  admin: false,
  ...extra,
});

describe('people directory', () => {
  const dir = new PeopleDirectory(
    [
      person('ines', 'Ines Carvalhal', { chat: 'U0DEMO006', email: 'ines@saltline.example', admin: true }),
      person('rteixo', 'Rui Teixo', { email: 'rui@saltline.example' }),
      person('ramaral', 'Rui Amaral'),
    ],
    new Map([['lisbon-office', ['ines', 'rteixo']]]),
  );

  it('finds a chat user by chat id first, then by email in any letter case', () => {
    expect(dir.identify({ chatId: 'U0DEMO006' })).toMatchObject({ ok: true, value: { id: 'ines' } });
    expect(dir.identify({ chatId: 'U0OTHER01', email: 'RUI@Saltline.Example' })).toMatchObject({
      ok: true,
      value: { id: 'rteixo' },
    });
    expect(dir.identify({ chatId: 'U0OTHER02', email: 'x@elsewhere.example' })).toMatchObject({
      ok: false,
      issues: [{ code: 'chat_unknown_user' }],
    });
  });

  it('resolves ids, groups and unique first names; names an ambiguous or unknown handle', () => {
    const r = dir.resolve([{ kind: 'name', id: 'lisbon-office' }], [{ kind: 'name', id: 'ramaral' }]);
    expect(r.ok && [r.value.required.map((p) => p.id), r.value.optional.map((p) => p.id)]).toEqual([
      ['ines', 'rteixo'],
      ['ramaral'],
    ]);
    expect(dir.resolve([{ kind: 'name', id: 'Ines' }], [])).toMatchObject({
      ok: true,
      value: { required: [{ id: 'ines' }] },
    });
    expect(
      dir.resolve(
        [
          { kind: 'name', id: 'Rui' },
          { kind: 'chat', id: 'U0NOPE' },
        ],
        [],
      ),
    ).toEqual({
      ok: false,
      issues: [
        {
          code: 'person_ambiguous',
          path: ['required', 0],
          message: '@Rui could be @rteixo or @ramaral; use the id',
        },
        {
          code: 'person_unknown',
          path: ['required', 1],
          message: '<@U0NOPE> is not one of the workspace people',
        },
      ],
    });
  });

  it('turns a relaxation into the request it stands for, and leaves unknown ones as text', () => {
    const people = { required: [person('ines', 'Ines'), person('rui', 'Rui')], optional: [] };
    const q = { lengthMinutes: 60, required: [], optional: [], features: ['screen'], roomFor: 4 };
    expect(relaxedQuery(q, people, 'make rui optional', 'Europe/Lisbon', NOW)).toMatchObject({
      required: [{ kind: 'name', id: 'ines' }],
      optional: [{ kind: 'name', id: 'rui' }],
    });
    expect(relaxedQuery(q, people, 'shorten to 30 minutes', 'Europe/Lisbon', NOW)?.lengthMinutes).toBe(30);
    expect(relaxedQuery(q, people, 'drop the need for screen', 'Europe/Lisbon', NOW)?.features).toEqual([]);
    expect(
      relaxedQuery(q, people, 'accept a room with fewer than 4 seats', 'Europe/Lisbon', NOW),
    ).not.toHaveProperty('roomFor');
    expect(
      relaxedQuery(q, people, 'widen the window by 7 days (to 2026-12-21)', 'Europe/Lisbon', NOW)?.window,
    ).toEqual({
      from: '2026-12-07',
      to: '2026-12-20',
    });
    expect(relaxedQuery(q, people, 'accept tentative conflicts', 'Europe/Lisbon', NOW)).toBeUndefined();
  });
});

describe('service over a workspace and a SQLite store', () => {
  let opened: OpenedService;
  beforeAll(async () => {
    opened = await openService(writeTestWorkspace(), { now: () => NOW, database: ':memory:', pool: false });
  });
  afterAll(() => opened.close());

  it('offers times clear of busy time and of what is already booked, and books a signed option once', async () => {
    const s = opened.service;
    const ines = s.person('ines')!;
    const query = {
      lengthMinutes: 60,
      required: [{ kind: 'name' as const, id: 'teo' }],
      optional: [],
      features: [],
      window: { from: '2026-12-08', to: '2026-12-08' },
    };
    const first = await s.meet(ines, query, NOW);
    expect(first.ok).toBe(true);
    if (!first.ok) return;
    expect(first.value.attendees.map((p) => p.id)).toEqual(['ines', 'teo']);
    for (const o of first.value.options)
      expect(o.start >= TEO_BUSY.end || o.end <= TEO_BUSY.start).toBe(true);
    const top = first.value.options[0]!;
    const b1 = await s.book(ines, top.token, NOW);
    const b2 = await s.book(ines, top.token, NOW);
    expect(b1.ok && b2.ok && b1.value.id === b2.value.id).toBe(true);
    const again = await s.meet(ines, query, NOW);
    expect(again.ok && again.value.options.every((o) => o.start >= top.end || o.end <= top.start)).toBe(true);
  });

  it('holds an option, then books that hold into the same booking', async () => {
    const s = opened.service;
    const lena = s.person('lena')!;
    const r = await s.meet(
      lena,
      { lengthMinutes: 45, required: [{ kind: 'name', id: 'rui' }], optional: [], features: [] },
      NOW,
    );
    if (!r.ok) throw new Error('expected options');
    const held = await s.hold(lena, r.value.options[0]!.token, NOW);
    if (!held.ok) throw new Error(held.issues[0]!.message);
    expect(held.value.state).toBe('held');
    // Holds last 10 minutes by default (booking use case default).
    expect(held.value.expiresAt).toBe(NOW + 10 * 60_000);
    const booked = await s.book(lena, `hold:${held.value.id}`, NOW);
    expect(booked).toMatchObject({ ok: true, value: { id: held.value.id, state: 'booked' } });
  });

  it('refuses a forged or altered option token', async () => {
    const s = opened.service;
    const ines = s.person('ines')!;
    const r = await s.meet(
      ines,
      { lengthMinutes: 30, required: [{ kind: 'name', id: 'rui' }], optional: [], features: [] },
      NOW,
    );
    if (!r.ok) throw new Error('expected options');
    const token = r.value.options[0]!.token;
    const [body, mac] = token.split('.');
    const payload = JSON.parse(Buffer.from(body!, 'base64url').toString('utf8')) as Record<string, unknown>;
    const forged = `${Buffer.from(JSON.stringify({ ...payload, start: 0, end: 1 })).toString('base64url')}.${mac}`;
    expect(await s.book(ines, forged, NOW)).toMatchObject({ ok: false, issues: [{ code: 'token_invalid' }] });
    expect(await s.hold(ines, 'not-a-token', NOW)).toMatchObject({
      ok: false,
      issues: [{ code: 'token_invalid' }],
    });
  });

  it('only the organizer or an admin cancels a booking', async () => {
    const s = opened.service;
    const ines = s.person('ines')!;
    const rui = s.person('rui')!;
    const r = await s.meet(
      rui,
      { lengthMinutes: 15, required: [{ kind: 'name', id: 'lena' }], optional: [], features: [] },
      NOW,
    );
    if (!r.ok) throw new Error('expected options');
    const booked = await s.book(rui, r.value.options[0]!.token, NOW);
    if (!booked.ok) throw new Error('expected a booking');
    const lena = s.person('lena')!;
    expect(await s.cancel(lena, booked.value.id, NOW)).toMatchObject({
      ok: false,
      issues: [{ code: 'unauthorized' }],
    });
    expect(await s.cancel(ines, booked.value.id, NOW)).toMatchObject({
      ok: true,
      value: { state: 'cancelled' },
    });
  });

  it('keeps rules said in chat per person and applies them to that person only', async () => {
    const s = opened.service;
    const rui = s.person('rui')!;
    const preview = await s.previewRule(rui, 'no meetings before 16:00', NOW);
    if (!preview.ok) throw new Error(preview.issues[0]!.message);
    expect(preview.value.strength).toBe('hard');
    const saved = await s.confirmRule(rui, preview.value.token, NOW);
    expect(saved.ok).toBe(true);
    expect((await s.rules(rui)).ok && (await s.rules(s.person('ines')!))).toMatchObject({
      ok: true,
      value: [],
    });
    const r = await s.meet(
      rui,
      {
        lengthMinutes: 30,
        required: [{ kind: 'name', id: 'lena' }],
        optional: [],
        features: [],
        window: { from: '2026-12-09', to: '2026-12-09' },
      },
      NOW,
    );
    // Lisbon is UTC+0 in December: nothing may start before 16:00 UTC that day.
    expect(
      r.ok &&
        r.value.options.length > 0 &&
        r.value.options.every((o) => o.start >= Date.UTC(2026, 11, 9, 16, 0)),
    ).toBe(true);
  });
});

describe('feeds added in chat', () => {
  let withFeeds: OpenedService;
  const fetched: string[] = [];
  // Rui's private calendar (invented): busy Wednesday 2026-12-09 10:00-12:00 UTC.
  const RUI_ICS = [
    'BEGIN:VCALENDAR',
    'VERSION:2.0',
    'PRODID:-//slotwright tests//EN',
    'BEGIN:VEVENT',
    'UID:rui-1@saltline.example',
    'DTSTAMP:20261201T000000Z',
    'DTSTART:20261209T100000Z',
    'DTEND:20261209T120000Z',
    'SUMMARY:Dentist',
    'END:VEVENT',
    'END:VCALENDAR',
    '',
  ].join('\r\n');
  beforeAll(async () => {
    withFeeds = await openService(writeTestWorkspace(), {
      now: () => NOW,
      database: ':memory:',
      pool: false,
      secretKey: Buffer.alloc(32, 7).toString('base64'),
      fetchFeed: async (url) => {
        fetched.push(url);
        if (url.includes('broken')) throw new Error('HTTP 404 from calendar.example');
        return { status: 'ok', body: RUI_ICS, etag: undefined, lastModified: undefined };
      },
    });
  });
  afterAll(() => withFeeds.close());

  it('reads a feed once before keeping it, lists it as fresh, and counts its busy time', async () => {
    const s = withFeeds.service;
    const rui = s.person('rui')!;
    expect(await s.addFeed(rui, 'http://calendar.example/rui.ics', NOW)).toMatchObject({
      ok: false,
      issues: [{ code: 'feed_refused' }],
    });
    const broken = await s.addFeed(rui, 'https://calendar.example/broken.ics', NOW);
    expect(broken).toMatchObject({ ok: false, issues: [{ code: 'feed_unreadable' }] });
    expect((await s.feeds(rui, NOW)).ok && (await s.feeds(rui, NOW))).toMatchObject({ ok: true, value: [] });
    const added = await s.addFeed(rui, 'https://calendar.example/rui.ics?token=secret123', NOW);
    expect(added).toMatchObject({ ok: true, value: { freshness: 'fresh', owner: 'rui' } });
    // The address is shown without its private token.
    expect(added.ok && added.value.label).not.toContain('secret123');
    const listed = await s.feeds(rui, NOW);
    expect(listed.ok && listed.value.map((f) => f.freshness)).toEqual(['fresh']);
    const r = await s.meet(
      rui,
      {
        lengthMinutes: 60,
        required: [{ kind: 'name', id: 'lena' }],
        optional: [],
        features: [],
        window: { from: '2026-12-09', to: '2026-12-09' },
      },
      NOW,
    );
    expect(r.ok && r.value.options.length).toBeGreaterThan(0);
    const busy = { start: Date.UTC(2026, 11, 9, 10), end: Date.UTC(2026, 11, 9, 12) };
    expect(r.ok && r.value.options.every((o) => o.end <= busy.start || o.start >= busy.end)).toBe(true);
  });

  it('refuses to add feeds when no secret key seals their addresses', async () => {
    const s = (await import('../../src/main.ts')).openService;
    const plain = await s(writeTestWorkspace(), { now: () => NOW, database: ':memory:', pool: false });
    try {
      const r = await plain.service.addFeed(
        plain.service.person('rui')!,
        'https://calendar.example/x.ics',
        NOW,
      );
      expect(r).toMatchObject({ ok: false, issues: [{ code: 'not_available' }] });
    } finally {
      await plain.close();
    }
  });
});

describe('what chat stores survives a restart', () => {
  it('keeps a confirmed rule and a booking in the SQLite file', async () => {
    const { mkdtempSync } = await import('node:fs');
    const { tmpdir } = await import('node:os');
    const { join } = await import('node:path');
    const db = join(mkdtempSync(join(tmpdir(), 'slotwright-db-')), 'store.sqlite');
    const ws = writeTestWorkspace();
    const first = await openService(ws, { now: () => NOW, database: db, pool: false });
    const rui = first.service.person('rui')!;
    const preview = await first.service.previewRule(rui, 'no meetings on fridays', NOW);
    if (!preview.ok) throw new Error(preview.issues[0]!.message);
    await first.service.confirmRule(rui, preview.value.token, NOW);
    const r = await first.service.meet(
      rui,
      { lengthMinutes: 30, required: [{ kind: 'name', id: 'lena' }], optional: [], features: [] },
      NOW,
    );
    if (!r.ok) throw new Error('expected options');
    const booked = await first.service.book(rui, r.value.options[0]!.token, NOW);
    await first.close();
    const second = await openService(ws, { now: () => NOW, database: db, pool: false });
    try {
      const rules = await second.service.rules(second.service.person('rui')!);
      expect(rules.ok && rules.value.map((x) => x.text)).toEqual([preview.value.description]);
      const upcoming = await second.service.upcoming(second.service.person('lena')!, NOW);
      expect(booked.ok && upcoming.ok && upcoming.value.map((b) => b.id)).toEqual([
        booked.ok ? booked.value.id : '',
      ]);
    } finally {
      await second.close();
    }
  });
});
