import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { busyFromIcs } from '../../src/calendar/busy-from-ics.ts';
import type { BusyInterval } from '../../src/time/interval.ts';

// The invented demo scenario: every person and room feed named in fixtures/demo/workspace.yaml.
const DEMO = join(import.meta.dirname, '..', '..', 'fixtures', 'demo');
interface Owner {
  id: string;
  email?: string;
  zone: string;
  feeds?: string[];
}
const ws = parse(readFileSync(join(DEMO, 'workspace.yaml'), 'utf8')) as { people: Owner[]; rooms: Owner[] };
const WINDOW = { start: Date.UTC(2026, 11, 7), end: Date.UTC(2026, 11, 26) };
const iso = (ms: number) => new Date(ms).toISOString().replace('.000Z', 'Z');

function read(o: Owner): { busy: readonly BusyInterval[]; warnings: readonly string[]; skipped: number } {
  const file = join(DEMO, o.feeds![0]!);
  return busyFromIcs(readFileSync(file, 'utf8'), {
    window: WINDOW,
    zone: o.zone,
    ...(o.email === undefined ? {} : { ownerEmail: o.email }),
  });
}
const byId = (id: string) => [...ws.people, ...ws.rooms].find((o) => o.id === id)!;
const has = (busy: readonly BusyInterval[], start: string, end: string, kind = 'busy') =>
  busy.some((b) => iso(b.start) <= start && iso(b.end) >= end && b.kind === kind);

describe('demo feeds', () => {
  it('every person has a feed file, and so does every room that names one', () => {
    const missing = [...ws.people, ...ws.rooms]
      .flatMap((o) => o.feeds ?? [])
      .filter((f) => !existsSync(join(DEMO, f)));
    expect(missing).toEqual([]);
    expect(ws.people.every((p) => (p.feeds ?? []).length > 0)).toBe(true);
    expect(ws.people.length).toBe(14);
  });
  it('every feed reads without warnings or skipped parts and has busy time in the window', () => {
    for (const o of [...ws.people, ...ws.rooms].filter((x) => x.feeds !== undefined)) {
      const r = read(o);
      expect({ id: o.id, warnings: r.warnings, skipped: r.skipped }).toEqual({
        id: o.id,
        warnings: [],
        skipped: 0,
      });
      expect(r.busy.length).toBeGreaterThan(0);
    }
  });
  it("Maren's planning session moved, a cancelled one, a declined invitation and all-day leave", () => {
    const { busy } = read(byId('maren'));
    // Halifax is UTC-4 in December (IANA tzdata)
    expect(has(busy, '2026-12-08T18:00:00Z', '2026-12-08T19:00:00Z')).toBe(false);
    expect(has(busy, '2026-12-10T19:00:00Z', '2026-12-10T20:00:00Z')).toBe(true);
    expect(has(busy, '2026-12-15T18:00:00Z', '2026-12-15T19:00:00Z')).toBe(false);
    expect(has(busy, '2026-12-22T18:00:00Z', '2026-12-22T19:00:00Z')).toBe(true);
    expect(has(busy, '2026-12-09T14:00:00Z', '2026-12-09T15:00:00Z')).toBe(false);
    expect(has(busy, '2026-12-24T04:00:00Z', '2026-12-26T00:00:00Z')).toBe(true);
  });
  it("reads Teo's embedded VTIMEZONE, Juno's Windows zone name and Silas's VFREEBUSY", () => {
    expect(has(read(byId('teo')).busy, '2026-12-07T17:00:00Z', '2026-12-07T18:00:00Z')).toBe(true);
    expect(has(read(byId('teo')).busy, '2026-12-10T15:00:00Z', '2026-12-10T16:00:00Z', 'tentative')).toBe(
      true,
    );
    expect(has(read(byId('juno')).busy, '2026-12-07T19:00:00Z', '2026-12-07T20:00:00Z')).toBe(true);
    expect(has(read(byId('juno')).busy, '2026-12-09T16:00:00Z', '2026-12-09T17:00:00Z')).toBe(false);
    const silas = read(byId('silas')).busy;
    expect(has(silas, '2026-12-08T17:00:00Z', '2026-12-08T19:00:00Z', 'tentative')).toBe(true);
    expect(has(silas, '2026-12-11T19:00:00Z', '2026-12-11T21:00:00Z')).toBe(true);
  });
  it('leaves a Halifax and Lisbon meeting possible in the week of 2026-12-07', () => {
    // Working hours 09:00-17:00 in both offices overlap 13:00-17:00 UTC in December.
    const people = ws.people.filter((p) => p.zone === 'America/Halifax' || p.zone === 'Europe/Lisbon');
    const all = people.flatMap((p) => read(p).busy);
    const freeSlots: string[] = [];
    for (let day = 7; day <= 11; day++) {
      for (let m = 13 * 60; m + 30 <= 17 * 60; m += 30) {
        const s = Date.UTC(2026, 11, day, 0, m);
        const e = s + 30 * 60_000;
        if (!all.some((b) => b.start < e && b.end > s)) freeSlots.push(iso(s));
      }
    }
    expect(freeSlots.length).toBeGreaterThanOrEqual(3);
  });
});
