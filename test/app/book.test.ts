import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ICAL from 'ical.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BookingService, type BusyOf, directKey, type OptionChoice } from '../../src/app/book.ts';
import type { AuditLog, BookingStore } from '../../src/app/ports.ts';
import { openSqlStore, SecretBox, type SqlStore } from '../../src/store/index.ts';
import type { BusyInterval } from '../../src/time/index.ts';

const M = 60_000;
const H = 60 * M;
// Monday 2026-12-07 14:00 UTC: morning in Halifax, afternoon in Lisbon.
const T0 = Date.UTC(2026, 11, 7, 14, 0);
const EMAILS: Record<string, string> = {
  ines: 'ines@saltline.example',
  rui: 'rui@saltline.example',
  maren: 'maren@saltline.example',
  aroha: 'aroha@saltline.example',
};

let dir: string;
let store: SqlStore;
let clock = T0 - 24 * H;
let seq = 0;
const feedBusy = new Map<string, BusyInterval[]>();
const busyCalls: string[][] = [];
const busyOf: BusyOf = async (ids) => {
  busyCalls.push([...ids]);
  return new Map(ids.map((id) => [id, feedBusy.get(id) ?? []]));
};

function service(opts: { tentative?: 'penalty' | 'hard' } = {}) {
  const bookings: BookingStore = store.bookings;
  const audit: AuditLog = store.ledger;
  return new BookingService(
    { store: bookings, audit, busyOf, now: () => clock, newId: () => `bk-${++seq}`, admins: ['ines'] },
    {
      ...opts,
      invites: {
        domain: 'slotwright.saltline.example',
        person: (id) => (EMAILS[id] === undefined ? undefined : { name: id, email: EMAILS[id] }),
        roomName: (id) => (id === 'tejo' ? 'Tejo' : undefined),
      },
    },
  );
}

const option = (over: Partial<OptionChoice> = {}): OptionChoice => ({
  requestId: 'req-1',
  optionId: 'opt-1',
  organizer: 'maren',
  title: 'Survey planning',
  start: T0,
  end: T0 + 45 * M,
  room: 'tejo',
  attendees: [
    { id: 'maren', role: 'required' },
    { id: 'rui', role: 'required' },
    { id: 'aroha', role: 'optional' },
  ],
  ...over,
});

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'sw-book-'));
  store = await openSqlStore(
    { dialect: 'sqlite', file: join(dir, 's.sqlite') },
    new SecretBox(Buffer.alloc(32, 1).toString('base64')),
  );
});
afterAll(async () => {
  await store.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('booking an option', () => {
  it('the organizer books; the invite is a REQUEST naming the organizer and the other attendees', async () => {
    const r = await service().book('maren', option());
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.created).toBe(true);
    expect(r.value.booking.state).toBe('booked');
    expect(busyCalls.at(-1)).toEqual(['maren', 'rui', 'aroha', 'tejo']);
    const cal = new ICAL.Component(ICAL.parse(r.value.invite!));
    const ev = cal.getFirstSubcomponent('vevent')!;
    expect(cal.getFirstPropertyValue('method')).toBe('REQUEST');
    expect(ev.getFirstPropertyValue('uid')).toBe(`${r.value.booking.id}@slotwright.saltline.example`);
    expect(String(ev.getFirstPropertyValue('organizer')).toLowerCase()).toBe('mailto:maren@saltline.example');
    expect(
      ev
        .getAllProperties('attendee')
        .map((p) => [String(p.getFirstValue()).toLowerCase(), p.getParameter('role')]),
    ).toEqual([
      ['mailto:aroha@saltline.example', 'OPT-PARTICIPANT'],
      ['mailto:rui@saltline.example', 'REQ-PARTICIPANT'],
    ]);
    expect(ev.getFirstPropertyValue('location')).toBe('Tejo');
  });

  it('booking the same option again returns the same booking', async () => {
    const r = await service().book('maren', option());
    expect(r.ok && r.value.created).toBe(false);
    expect(r.ok && r.value.booking.id).toBe('bk-1');
  });

  it("someone else may not book the organizer's option; the refusal is clear and audited", async () => {
    const r = await service().book('rui', option({ optionId: 'opt-2', start: T0 + 2 * H, end: T0 + 3 * H }));
    expect(r).toEqual({
      ok: false,
      issues: [
        {
          code: 'unauthorized',
          path: ['actor'],
          message: 'rui may not book this option: only the organizer or a workspace admin may',
        },
      ],
    });
    const log = await store.ledger.auditLog({ subject: 'option:req-1/opt-2' });
    expect(log.map((e) => [e.actor, e.action, e.outcome])).toEqual([['rui', 'book', 'refused:unauthorized']]);
  });

  it('a workspace admin may book it', async () => {
    const r = await service().book('ines', option({ optionId: 'opt-3', start: T0 + 3 * H, end: T0 + 4 * H }));
    expect(r.ok).toBe(true);
  });

  it('fresh feed busy time refuses the booking and names who; tentative blocks only when set to hard', async () => {
    feedBusy.set('rui', [{ start: T0 + 5 * H, end: T0 + 5 * H + 30 * M, kind: 'tentative' }]);
    feedBusy.set('tejo', [{ start: T0 + 6 * H, end: T0 + 7 * H, kind: 'busy' }]);
    const tentativeHard = await service({ tentative: 'hard' }).book(
      'maren',
      option({ optionId: 'opt-t', start: T0 + 5 * H, end: T0 + 6 * H }),
    );
    expect(!tentativeHard.ok && tentativeHard.issues[0]).toMatchObject({ code: 'conflict', with: ['rui'] });
    const tentativeSoft = await service().book(
      'maren',
      option({ optionId: 'opt-t', start: T0 + 5 * H, end: T0 + 6 * H }),
    );
    expect(tentativeSoft.ok).toBe(true);
    const roomBusy = await service().book(
      'maren',
      option({ optionId: 'opt-r', start: T0 + 6 * H + 59 * M, end: T0 + 8 * H }),
    );
    expect(roomBusy).toEqual({
      ok: false,
      issues: [{ code: 'conflict', path: ['with'], message: 'taken at that time: tejo', with: ['tejo'] }],
    });
  });
});

describe('holds', () => {
  it('a hold lasts 10 minutes by default, blocks others meanwhile, and is confirmed by booking', async () => {
    const start = T0 + 24 * H;
    const held = await service().hold('maren', option({ requestId: 'req-h', start, end: start + H }));
    expect(held.ok && held.value.booking.state).toBe('held');
    expect(held.ok && held.value.booking.holdExpiresAt).toBe(clock + 10 * M);
    expect(held.ok && held.value.invite).toBeUndefined();
    const rival = await service().bookDirect('rui', {
      start,
      end: start + 30 * M,
      attendees: [{ id: 'rui', role: 'required' }],
    });
    expect(!rival.ok && rival.issues[0]?.with).toEqual(['rui']);
    clock += 9 * M;
    const confirmed = await service().book('maren', option({ requestId: 'req-h', start, end: start + H }));
    expect(confirmed.ok && confirmed.value.booking.id).toBe(held.ok ? held.value.booking.id : '');
    expect(confirmed.ok && confirmed.value.booking.state).toBe('booked');
    expect(confirmed.ok && confirmed.value.invite).toContain('METHOD:REQUEST');
  });

  it('after the hold lapses (fake clock) someone else can book the time', async () => {
    const start = T0 + 48 * H;
    const held = await service().hold('maren', option({ requestId: 'req-lapse', start, end: start + H }));
    expect(held.ok).toBe(true);
    clock += 10 * M;
    const rival = await service().bookDirect('rui', {
      start,
      end: start + 30 * M,
      attendees: [{ id: 'rui', role: 'required' }],
    });
    expect(rival.ok).toBe(true);
    const late = await service().book('maren', option({ requestId: 'req-lapse', start, end: start + H }));
    expect(!late.ok && late.issues[0]?.with).toEqual(['rui']);
  });
});

describe('direct bookings', () => {
  it('a person may book a meeting they attend; only an admin may book for others', async () => {
    const start = T0 + 72 * H;
    const choice = { start, end: start + H, attendees: [{ id: 'maren', role: 'required' as const }] };
    const r = await service().bookDirect('rui', choice);
    expect(!r.ok && r.issues[0]?.code).toBe('unauthorized');
    const byAdmin = await service().bookDirect('ines', choice);
    expect(byAdmin.ok && byAdmin.value.booking.organizer).toBe('ines');
    expect(byAdmin.ok && byAdmin.value.booking.idemKey).toBe(directKey(choice));
    const again = await service().bookDirect('ines', choice);
    expect(again.ok && again.value.created).toBe(false);
  });

  it('says who could not be put on the invite for lack of an email address', async () => {
    const start = T0 + 80 * H;
    const r = await service().bookDirect('ines', {
      start,
      end: start + H,
      attendees: [
        { id: 'ines', role: 'required' },
        { id: 'juno', role: 'required' },
      ],
    });
    expect(r.ok && r.value.warnings).toEqual([
      'juno has no email address in the workspace and is not on the invite',
    ]);
  });
});

describe('cancelling', () => {
  it('only the organizer or an admin cancels; the CANCEL keeps the UID and raises SEQUENCE by one', async () => {
    const refused = await service().cancel('rui', 'bk-1');
    expect(!refused.ok && refused.issues[0]?.code).toBe('unauthorized');
    const r = await service().cancel('maren', 'bk-1');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const ev = new ICAL.Component(ICAL.parse(r.value.invite!)).getFirstSubcomponent('vevent')!;
    expect(r.value.invite).toContain('METHOD:CANCEL');
    expect(ev.getFirstPropertyValue('uid')).toBe('bk-1@slotwright.saltline.example');
    expect(ev.getFirstPropertyValue('sequence')).toBe(1);
    expect(ev.getFirstPropertyValue('status')).toBe('CANCELLED');
    const twice = await service().cancel('maren', 'bk-1');
    expect(twice.ok && twice.value.invite).toBeUndefined();
    const missing = await service().cancel('ines', 'bk-none');
    expect(!missing.ok && missing.issues[0]?.code).toBe('not_found');
    const log = await store.ledger.auditLog({ subject: 'bk-1' });
    expect(log.map((e) => `${e.actor} ${e.action} ${e.outcome}`)).toEqual([
      'maren book ok',
      'maren book ok:repeat',
      'rui cancel refused:unauthorized',
      'maren cancel ok',
      'maren cancel ok:repeat',
    ]);
  });
});
