import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ICAL from 'ical.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { WeekProgressView } from '../../src/app/service.ts';
import { type OpenedService, openService } from '../../src/main.ts';
import { openStore, SqlBookingStore, SqlWorkspaceStore } from '../../src/store/index.ts';
import { WEEK_NOW, weekWorkspaceYaml } from './week-workspace.ts';

const YAML = weekWorkspaceYaml('Saltline Survey Cooperative (week test)', '{step: 30}');
const DEMO = join(import.meta.dirname, '..', '..', 'fixtures', 'demo');
const NOW = WEEK_NOW;

let dir: string;
let invites: string;
let db: string;
let opened: OpenedService;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'slotwright-week-chat-'));
  writeFileSync(join(dir, 'workspace.yaml'), YAML);
  invites = join(dir, 'invites');
  db = join(dir, 'store.sqlite');
  opened = await openService(dir, {
    now: () => NOW,
    database: db,
    invitesDir: invites,
    weekTimeMs: 1200,
    weekProgressMs: 200,
  });
});

afterAll(async () => {
  await opened?.close();
});

describe('week plan through the service: plan with progress, lock, re-lock', () => {
  it("plans next week: every series placed inside everyone's working hours, a token to lock it", async () => {
    const s = opened.service;
    const r = await s.week(s.person('ines')!, undefined, NOW);
    if (!r.ok) throw new Error(JSON.stringify(r.issues));
    const w = r.value;
    expect([w.isoWeek, w.weekOf]).toEqual(['2026-W50', '2026-12-07']);
    expect(w.sessions.map((x) => x.seriesId).sort()).toEqual(['ines-rui', 'survey-sync', 'survey-sync']);
    expect(w.unplaced).toEqual([]);
    // Nothing locked the week before, so there is nothing to compare with.
    expect(w.diff).toBeUndefined();
    expect(w.relock).toBe(false);
    expect(w.lockToken).toMatch(/^2026-W50:/);
    // Teo's Halifax 09-17 is 13:00-21:00 UTC in December (UTC-4, IANA tz database) and Lisbon's
    // 09-17 is 09:00-17:00 UTC, so the sync lies in 13:00-17:00 UTC.
    for (const x of w.sessions.filter((y) => y.seriesId === 'survey-sync')) {
      expect(x.start).toBeGreaterThanOrEqual(
        Date.parse(`${new Date(x.start).toISOString().slice(0, 10)}T13:00:00Z`),
      );
      expect(x.end).toBeLessThanOrEqual(
        Date.parse(`${new Date(x.start).toISOString().slice(0, 10)}T17:00:00Z`),
      );
      expect(x.end - x.start).toBe(45 * 60_000);
    }
  });

  it('reports progress from the worker thread while the demo week is solved, at most one per interval', async () => {
    const demo = await openService(DEMO, {
      now: () => NOW,
      database: ':memory:',
      invitesDir: invites,
      weekTimeMs: 2500,
      // short enough that a fast machine, where the demo week settles in about a second, still sees
      // several reports
      weekProgressMs: 100,
    });
    try {
      const s = demo.service;
      const progress: { p: WeekProgressView; at: number }[] = [];
      const started = performance.now();
      const r = await s.week(s.defaultPerson(), '2026-W50', NOW, (p) =>
        progress.push({ p, at: performance.now() - started }),
      );
      const done = performance.now() - started;
      if (!r.ok) throw new Error(JSON.stringify(r.issues));
      expect(progress.length).toBeGreaterThanOrEqual(3);
      const times = progress.map((x) => x.p.elapsedMs);
      for (let i = 1; i < times.length; i++) expect(times[i]! - times[i - 1]!).toBeGreaterThanOrEqual(100);
      // Reports arrived before the answer, while the main thread was free.
      expect(progress.at(-2)!.at).toBeLessThan(done);
      expect(progress.some((x) => Number.isFinite(x.p.best))).toBe(true);
      // A series the demo week cannot place is named with what is in its way.
      for (const u of r.value.unplaced) expect(u.blockers.length).toBeGreaterThan(0);
      expect(r.value.cost.parts.every((p) => p.points !== 0)).toBe(true);
    } finally {
      await demo.close();
    }
  });

  it('refuses a lock by someone who is not an admin, and a token it did not give', async () => {
    const s = opened.service;
    const r = await s.week(s.person('rui')!, '2026-W50', NOW);
    if (!r.ok) throw new Error(JSON.stringify(r.issues));
    const refused = await s.lockWeek(s.person('rui')!, r.value.lockToken!, NOW);
    expect(refused.ok ? [] : refused.issues.map((i) => i.code)).toEqual(['unauthorized']);
    const forged = await s.lockWeek(s.person('ines')!, '2026-W50:not-a-plan', NOW);
    expect(forged.ok ? [] : forged.issues.map((i) => i.code)).toEqual(['not_found']);
  });

  it('locks: books every session in the store, keeps the locked plan, writes weekly invites; a re-lock keeps them', async () => {
    const s = opened.service;
    const ines = s.person('ines')!;
    const planned = await s.week(ines, '2026-12-09', NOW);
    if (!planned.ok) throw new Error(JSON.stringify(planned.issues));
    const locked = await s.lockWeek(ines, planned.value.lockToken!, NOW);
    if (!locked.ok) throw new Error(JSON.stringify(locked.issues));
    const v = locked.value;
    expect(v.lines[0]).toBe('2026-W50: 3 of 3 sessions booked (times in Europe/Lisbon).');
    expect(v.pending).toBe(0);
    expect(v.booked.map((b) => [b.seriesId, b.start, b.end])).toEqual(
      planned.value.sessions.map((x) => [x.seriesId, x.start, x.end]),
    );

    // The bookings are in the store, one per session, for every attendee.
    const handle = await openStore({ dialect: 'sqlite', file: db });
    try {
      const store = new SqlBookingStore(handle);
      const week = { start: Date.parse('2026-12-07T00:00:00Z'), end: Date.parse('2026-12-14T00:00:00Z') };
      const teo = await store.listFor({ kind: 'person', id: 'teo' }, week, ['booked']);
      expect(teo.map((b) => b.title)).toEqual(['Survey sync', 'Survey sync']);
      const rui = await store.listFor({ kind: 'person', id: 'rui' }, week, ['booked']);
      expect(rui).toHaveLength(3);
      // The locked plan is kept in the week plan table for the next lock and next week's diff.
      const rows = await new SqlWorkspaceStore(handle, undefined as never).weekPlans('2026-W50');
      const row = rows.find((x) => x.id === 'locked:2026-W50');
      expect((row!.body as { locked: { sessions: unknown[] } }).locked.sessions).toHaveLength(3);
    } finally {
      await handle.close();
    }

    // One weekly invite per session, written for download. RFC 5545 section 3.3.10: FREQ=WEEKLY;
    // RFC 5546 section 3.2.2: a REQUEST names the ORGANIZER (the admin) and the attendees.
    expect(v.invites.map((i) => i.method)).toEqual(['REQUEST', 'REQUEST', 'REQUEST']);
    for (const inv of v.invites) {
      expect(inv.where!.startsWith(join(invites, '2026-W50'))).toBe(true);
      const cal = new ICAL.Component(ICAL.parse(readFileSync(inv.where!, 'utf8')));
      expect(cal.getFirstPropertyValue('method')).toBe('REQUEST');
      const ev = cal.getFirstSubcomponent('vevent')!;
      const rrule = ev.getFirstPropertyValue('rrule') as ICAL.Recur;
      expect(rrule.freq).toBe('WEEKLY');
      expect(String(ev.getFirstPropertyValue('organizer')).toLowerCase()).toBe(
        'mailto:ines@saltline.example',
      );
      expect(ev.getFirstPropertyValue('uid')).toBe(inv.uid);
    }

    // The same week again: the locked week's own bookings do not block it, and locking keeps them.
    const again = await s.week(ines, '2026-W50', NOW);
    if (!again.ok) throw new Error(JSON.stringify(again.issues));
    expect(again.value.relock).toBe(true);
    const relock = await s.lockWeek(ines, again.value.lockToken!, NOW);
    if (!relock.ok) throw new Error(JSON.stringify(relock.issues));
    expect(relock.value.lines[0]).toBe('2026-W50: 3 of 3 sessions booked (times in Europe/Lisbon).');
    const keptBookings = relock.value.booked.filter((b) => v.booked.some((x) => x.bookingId === b.bookingId));
    const sameTimes = again.value.sessions.filter((x) =>
      v.booked.some((b) => b.seriesId === x.seriesId && b.start === x.start),
    );
    // Every session at an unchanged time keeps its booking (the previous lock is passed on).
    expect(keptBookings.length).toBe(sameTimes.length);
    const list = await s.upcoming(s.person('rui')!, NOW);
    expect(list.ok && list.value.filter((b) => b.state === 'booked')).toHaveLength(3);

    // The next week compares with this locked week.
    const next = await s.week(ines, '2026-W51', NOW);
    if (!next.ok) throw new Error(JSON.stringify(next.issues));
    const diff = next.value.diff!;
    // Lisbon stays on UTC+0 between the two weeks (IANA tz database), so "same local time" is +7 days.
    const week = 7 * 86_400_000;
    const lockedNow = relock.value.booked;
    const kept = next.value.sessions.filter((x) =>
      lockedNow.some((b) => b.seriesId === x.seriesId && b.start + week === x.start),
    );
    const changedAfter = diff.filter((d) => d.after !== undefined).map((d) => d.after);
    expect(kept.length + changedAfter.length).toBe(next.value.sessions.length);
    for (const d of diff) {
      if (d.change === 'moved') expect(d.after).not.toBe(d.before! + week);
    }
  });

  it('records fairness history at a lock: a row per attendee for the locked week', async () => {
    const rows = await opened.fairness.offHours(['ines', 'rui', 'teo'], ['2026-W50']);
    // Every session was placed inside everyone's working hours (checked above for the sync, and the
    // one-to-one is two Lisbon people on Lisbon hours), so no one has an off-hours session that week.
    expect(rows.map((r) => [r.person, r.isoWeek, r.count]).sort()).toEqual([
      ['ines', '2026-W50', 0],
      ['rui', '2026-W50', 0],
      ['teo', '2026-W50', 0],
    ]);
  });
});
