import ICAL from 'ical.js';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { BookingService } from '../../src/app/book.ts';
import { InMemoryFairnessLedger } from '../../src/app/fairness.ts';
import { planWorkspaceWeek, type WorkspaceWeekPlan, weekContext } from '../../src/app/week.ts';
import { describeWeekLock, lockWeek, type WeekLockDeps } from '../../src/app/week-lock.ts';
import { parseWorkspace, type Workspace } from '../../src/config/load-workspace.ts';
import type { SchedulingContext } from '../../src/scheduling/types.ts';
import { openStore, SqlBookingStore, SqlLedgerStore, type StoreHandle } from '../../src/store/index.ts';
import { DEFAULT_WORKING_HOURS } from '../../src/time/working-hours.ts';
import { zonedToInstant } from '../../src/time/zoned.ts';

// A slice of the invented demo cooperative: two people in Lisbon, two in Halifax, two rooms.
const YAML = `
name: Saltline Survey Cooperative
zone: Europe/Lisbon
grid: 5
workingHours: {mon: ["09:00-17:00"], tue: ["09:00-17:00"], wed: ["09:00-17:00"], thu: ["09:00-17:00"], fri: ["09:00-17:00"]}
admins: [ines]
people:
  - {id: maren, name: Maren Holloway, email: maren@saltline.example, zone: America/Halifax}
  - {id: teo, name: Teo Brannigan, email: teo@saltline.example, zone: America/Halifax}
  - {id: ines, name: Ines Carvalhal, email: ines@saltline.example, zone: Europe/Lisbon}
  - {id: rui, name: Rui Teixo, email: rui@saltline.example, zone: Europe/Lisbon}
rooms:
  - {id: tejo, name: Tejo, capacity: 10, features: [screen, phone], zone: Europe/Lisbon}
  - {id: sounding, name: Sounding, capacity: 3, features: [whiteboard], zone: Europe/Lisbon}
series:
  - {id: survey-sync, name: Survey sync across the Atlantic, attendees: [maren, teo, ines, rui], minutes: 45, sessions: 2, minDays: 2, room: {features: [phone]}}
  - {id: ines-rui, name: Ines and Rui one-to-one, attendees: [ines, rui], minutes: 30, room: {features: [whiteboard]}}
  - {id: maren-teo, name: Maren and Teo one-to-one, attendees: [maren, teo], minutes: 30, zone: America/Halifax}
`;
const NOW = Date.parse('2026-12-01T18:00:00Z');
const ISO_WEEK = '2026-W50';
const DOMAIN = 'slotwright.saltline.example';

let handle: StoreHandle;
let workspace: Workspace;
let context: SchedulingContext;
let plan: WorkspaceWeekPlan;
let service: BookingService;
let deps: WeekLockDeps;
let ids = 0;

beforeEach(async () => {
  const parsed = parseWorkspace(YAML, { file: '/demo/workspace.yaml', dir: '/demo' }, { now: NOW });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  workspace = parsed.value;
  const monday = zonedToInstant('2026-12-07', 0, workspace.zone);
  context = weekContext(workspace, NOW, { start: monday - 86_400_000, end: monday + 8 * 86_400_000 });
  const planned = planWorkspaceWeek(workspace, context, {
    now: NOW,
    isoWeek: ISO_WEEK,
    clock: () => 0,
    timeMs: 1_000_000,
    seed: 3,
  });
  if (!planned.ok) throw new Error(JSON.stringify(planned.issues));
  plan = planned.value;
  handle = await openStore({ dialect: 'sqlite', file: ':memory:' });
  const store = new SqlBookingStore(handle);
  service = new BookingService({
    store,
    audit: new SqlLedgerStore(handle),
    busyOf: async () => new Map(),
    now: () => NOW,
    newId: () => `b${++ids}`,
    admins: ['ines'],
  });
  deps = { booking: service, store, now: () => NOW, clock: () => 0 };
});

afterEach(async () => {
  await handle.close();
});

async function bookingsOf(person: string) {
  const store = new SqlBookingStore(handle);
  return store.listFor({ kind: 'person', id: person }, plan.week.window, ['booked', 'held']);
}

function overlapsWithin(list: readonly { start: number; end: number }[]): boolean {
  const s = [...list].sort((a, b) => a.start - b.start);
  return s.some((x, i) => i > 0 && x.start < s[i - 1]!.end);
}

describe('lockWeek', () => {
  it('books every planned session when nothing changed, with one weekly invite per session', async () => {
    expect(plan.complete).toBe(true);
    expect(plan.sessions).toHaveLength(4);
    const out = await lockWeek(deps, workspace, context, plan, { actor: 'ines', domain: DOMAIN });
    expect(out.pending).toEqual([]);
    expect(out.moved).toEqual([]);
    expect(out.booked.map((s) => [s.series, s.start])).toEqual(plan.sessions.map((s) => [s.series, s.start]));
    expect(out.invites.map((i) => [i.method, i.sequence])).toEqual(plan.sessions.map(() => ['REQUEST', 0]));
    // Read back with ical.js (reference RFC 5545 parser): a weekly RRULE, stable UID, SEQUENCE 0.
    const first = out.invites[0]!;
    const vevent = new ICAL.Component(ICAL.parse(first.ics)).getFirstSubcomponent('vevent')!;
    expect(vevent.getFirstPropertyValue('uid')).toBe(first.uid);
    expect(vevent.getFirstPropertyValue('sequence')).toBe(0);
    const rrule = vevent.getFirstPropertyValue('rrule') as ICAL.Recur;
    expect(rrule.freq).toBe('WEEKLY');
    expect(rrule.count).toBe(12);
    expect(describeWeekLock(out, workspace.zone)).toEqual([
      `${ISO_WEEK}: 4 of 4 sessions booked (times in Europe/Lisbon).`,
    ]);
  });

  it('re-places a session whose slot another booking took in between, and books the rest as planned', async () => {
    const target = plan.sessions.find((s) => s.series === 'survey-sync')!;
    // Rui books a personal appointment over the planned survey sync after the plan was made.
    const taken = await service.bookDirect('rui', {
      title: 'Harbour authority call',
      start: target.start - 15 * 60_000,
      end: target.end,
      attendees: [{ id: 'rui', role: 'required' }],
    });
    expect(taken.ok).toBe(true);

    const out = await lockWeek(deps, workspace, context, plan, { actor: 'ines', domain: DOMAIN });
    expect(out.pending).toEqual([]);
    expect(out.moved).toHaveLength(1);
    const m = out.moved[0]!;
    expect(m.series).toBe('survey-sync');
    expect(m.from).toEqual(target);
    expect(m.takenBy).toEqual(['rui']);
    expect(m.to.start).not.toBe(target.start);
    // The other sessions are booked exactly as planned.
    const others = plan.sessions.filter((s) => s !== target);
    expect(out.booked.map((s) => [s.series, s.start, s.room])).toEqual(
      others.map((s) => [s.series, s.start, s.room]),
    );
    // Nobody is double-booked: not Rui, not the others of the series.
    for (const p of ['maren', 'teo', 'ines', 'rui']) expect(overlapsWithin(await bookingsOf(p))).toBe(false);
    // The two survey-sync sessions stay on different days (minDays 2).
    const days = out.locked.sessions
      .filter((s) => s.series === 'survey-sync')
      .map((s) => new Date(s.start).toISOString().slice(0, 10));
    expect(new Set(days).size).toBe(2);
    const reply = describeWeekLock(out, workspace.zone);
    expect(reply[0]).toBe(`${ISO_WEEK}: 4 of 4 sessions booked (times in Europe/Lisbon).`);
    expect(reply[1]).toMatch(
      /^survey-sync: \w+day \d\d:\d\d was taken \(rui\), so it moved to \w+day \d\d:\d\d\.$/,
    );
  });

  it('handles a slot taken while the lock is running, between two of its own bookings', async () => {
    const target = plan.sessions.find((s) => s.series === 'ines-rui')!;
    let raced = false;
    const racing: WeekLockDeps = {
      ...deps,
      booking: {
        bookDirect: async (actor, choice) => {
          if (!raced && choice.start === target.start && choice.title === 'Ines and Rui one-to-one') {
            raced = true;
            // Another replica books Sounding for a workshop a moment before the lock reaches it.
            const other = await service.bookDirect('ines', {
              title: 'Workshop',
              start: target.start,
              end: target.end,
              room: 'sounding',
              attendees: [{ id: 'ines', role: 'required' }],
            });
            expect(other.ok).toBe(true);
          }
          return service.bookDirect(actor, choice);
        },
        cancel: (actor, id) => service.cancel(actor, id),
      },
    };
    const out = await lockWeek(racing, workspace, context, plan, { actor: 'ines', domain: DOMAIN });
    expect(raced).toBe(true);
    expect(out.pending).toEqual([]);
    expect(out.moved.map((m) => [m.series, m.from.start, m.takenBy])).toEqual([
      ['ines-rui', target.start, ['ines', 'sounding']],
    ]);
    expect(out.booked).toHaveLength(3);
    for (const p of ['ines', 'rui']) expect(overlapsWithin(await bookingsOf(p))).toBe(false);
  });

  it('names the series the plan itself left out, so a locked week never looks complete when it is not', async () => {
    const partial: WorkspaceWeekPlan = {
      ...plan,
      complete: false,
      unplaced: [
        {
          series: 'leads-sync',
          code: 'no_free_start',
          blockers: [],
          reason: 'no common free time for a session: no start fits',
        },
      ],
    };
    const out = await lockWeek(deps, workspace, context, partial, { actor: 'ines', domain: DOMAIN });
    expect(out.unplaced).toEqual([
      { series: 'leads-sync', reason: 'no common free time for a session: no start fits' },
    ]);
    expect(describeWeekLock(out, workspace.zone).slice(1)).toEqual([
      'leads-sync: the plan found no time for it (no common free time for a session: no start fits).',
      'The week is not fully booked until the sessions above are placed.',
    ]);
  });

  it('lists a session as pending, and books the rest, when no other time fits', async () => {
    // Maren is away for the whole week (booked from Monday to Saturday).
    const away = await service.bookDirect('maren', {
      title: 'Field survey',
      start: plan.week.window.start,
      end: plan.week.window.start + 6 * 86_400_000,
      attendees: [{ id: 'maren', role: 'required' }],
    });
    expect(away.ok).toBe(true);
    const out = await lockWeek(deps, workspace, context, plan, { actor: 'ines', domain: DOMAIN });
    const withMaren = plan.sessions.filter((s) => s.series !== 'ines-rui');
    expect(out.pending.map((p) => p.series).sort()).toEqual(withMaren.map((s) => s.series).sort());
    expect(new Set(out.pending.map((p) => p.reason))).toEqual(
      new Set(['no other time fits: the attendees have no common free time left for it this week']),
    );
    expect(out.booked.map((s) => s.series)).toEqual(['ines-rui']);
    const reply = describeWeekLock(out, workspace.zone);
    expect(reply[0]).toBe(`${ISO_WEEK}: 1 of 4 sessions booked (times in Europe/Lisbon).`);
    expect(reply.at(-1)).toBe('The week is not fully booked until the sessions above are placed.');
  });

  it('a re-lock that moves a session cancels its booking and sends an update with the same UID and SEQUENCE + 1', async () => {
    const first = await lockWeek(deps, workspace, context, plan, { actor: 'ines', domain: DOMAIN });
    const oneToOne = first.locked.sessions.find((s) => s.series === 'ines-rui')!;
    // A later plan of the same week puts the one-to-one a day later at the same time.
    const later = { ...oneToOne, start: oneToOne.start + 86_400_000, end: oneToOne.end + 86_400_000 };
    const plan2: WorkspaceWeekPlan = {
      ...plan,
      sessions: plan.sessions.map((s) =>
        s.series === 'ines-rui' ? { series: s.series, start: later.start, end: later.end, room: s.room } : s,
      ),
    };
    const fairness = {
      ledger: new InMemoryFairnessLedger(),
      usual: {} as Record<string, { zone: string; hours: typeof DEFAULT_WORKING_HOURS }>,
    };
    for (const p of workspace.people) fairness.usual[p.id] = { zone: p.zone, hours: DEFAULT_WORKING_HOURS };
    const second = await lockWeek({ ...deps, fairness }, workspace, context, plan2, {
      actor: 'ines',
      domain: DOMAIN,
      previous: first.locked,
    });
    expect(second.kept).toHaveLength(3);
    expect(second.cancelled).toEqual([oneToOne.bookingId]);
    expect(second.booked.map((s) => [s.series, s.start])).toEqual([['ines-rui', later.start]]);
    expect(second.invites).toHaveLength(1);
    const update = second.invites[0]!;
    expect(update.uid).toBe(`${oneToOne.uidStem}@${DOMAIN}`);
    expect(update.sequence).toBe(oneToOne.sequence + 1);
    const vevent = new ICAL.Component(ICAL.parse(update.ics)).getFirstSubcomponent('vevent')!;
    expect(vevent.getFirstPropertyValue('sequence')).toBe(1);
    expect((vevent.getFirstPropertyValue('dtstart') as ICAL.Time).toUnixTime() * 1000).toBe(later.start);
    // The old booking is cancelled in the store; only the new one is live for Rui's one-to-one.
    const rui = (await bookingsOf('rui')).filter((b) => b.title === 'Ines and Rui one-to-one');
    expect(rui.map((b) => b.start)).toEqual([later.start]);
    // Fairness history is written for the locked week.
    expect(Object.keys(second.offHours ?? {}).sort()).toEqual(['ines', 'maren', 'rui', 'teo']);
  });
});
