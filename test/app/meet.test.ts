import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { meet } from '../../src/app/meet.ts';
import { loadWorkspace } from '../../src/config/index.ts';

// Requests against the invented demo workspace (fixtures/demo), with the outcomes written down.
const DEMO = join(import.meta.dirname, '..', '..', 'fixtures', 'demo');
const NOW = Date.parse('2026-12-01T12:00:00Z');
const loaded = loadWorkspace(DEMO, { now: NOW });
if (!loaded.ok) throw new Error(loaded.issues.map((i) => i.message).join('\n'));
const ws = loaded.value;
const opts = { now: NOW };
const week = { start: Date.parse('2026-12-07T00:00:00Z'), end: Date.parse('2026-12-12T00:00:00Z') };
const HOUR = 3_600_000;

describe('meet on the demo workspace with its feeds', () => {
  it('a Halifax and Lisbon pair in the week of 2026-12-07 gets options in their overlap, 13:00-17:00 UTC, none on the Portuguese holiday of 2026-12-08', async () => {
    // Halifax 09:00-17:00 AST is 13:00-21:00 UTC; Lisbon 09:00-17:00 WET is 09:00-17:00 UTC (IANA rules, from memory)
    const r = await meet(ws, { with: ['maren', 'ines'], lengthMinutes: 45, window: week }, opts);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.options.length).toBe(5);
    for (const o of r.value.options) {
      const utc = new Date(o.start);
      const day = o.start - (o.start % (24 * HOUR));
      expect(o.start).toBeGreaterThanOrEqual(day + 13 * HOUR);
      expect(o.end).toBeLessThanOrEqual(day + 17 * HOUR);
      expect(utc.toISOString().slice(0, 10)).not.toBe('2026-12-08');
      expect(o.room).toBeNull();
    }
    // spread over days: the five options fall on at least four different days (Dec 7, 9, 10, 11)
    expect(
      new Set(r.value.options.map((o) => new Date(o.start).toISOString().slice(0, 10))).size,
    ).toBeGreaterThanOrEqual(4);
  });

  it('the three leads (Halifax, Lisbon, Auckland) in standard hours: nothing fits; Lisbon and Auckland hours block; making either optional opens options', async () => {
    // Auckland 09:00-17:00 NZDT is 20:00-04:00 UTC: it meets Halifax (20:00-21:00 UTC) but never Lisbon
    const r = await meet(ws, { with: ['leads'], lengthMinutes: 60, window: week }, opts);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.options).toEqual([]);
    expect([...r.value.blockers].sort((a, b) => a.who.localeCompare(b.who))).toEqual([
      { who: 'aroha', kind: 'person', detail: "aroha's working hours (09:00-17:00 Pacific/Auckland)" },
      { who: 'ines', kind: 'person', detail: "ines's working hours (09:00-17:00 Europe/Lisbon)" },
    ]);
    const changes = r.value.relaxations.map((x) => x.change);
    expect(changes[0]).toBe('make aroha optional');
    expect(changes).toContain('make ines optional');
    expect(changes).not.toContain('make the attendees in Pacific/Auckland optional (aroha)'); // same change as above
    const byChange = new Map(r.value.relaxations.map((x) => [x.change, x.opens]));
    // without aroha: maren and ines share 13:00-17:00 UTC; without ines: maren and aroha share one hour a day
    expect(byChange.get('make aroha optional')!).toBeGreaterThan(byChange.get('make ines optional')!);
    // Without busy time: 37 one-hour starts (13:00 .. 16:00 UTC every 5 minutes) on Dec 7, 9, 10 and 11
    // = 148, and 20:00 UTC Monday to Thursday in Halifax (Tuesday to Friday in Auckland) = 4. The demo
    // feeds take 24 of the first (these numbers change when the demo feeds change).
    expect(byChange.get('make aroha optional')).toBe(124);
    expect(byChange.get('make ines optional')).toBe(4);
  });

  it('the Lisbon office with a screen and a phone gets Tejo, the room with both in Lisbon', async () => {
    const r = await meet(
      ws,
      { with: ['lisbon-office'], lengthMinutes: 30, window: week, needs: ['screen', 'phone'], options: 3 },
      opts,
    );
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.options.length).toBeGreaterThan(0);
    for (const o of r.value.options) expect(o.room).toBe('tejo');
  });

  it('refuses an unknown attendee with an issue naming it', async () => {
    const r = await meet(ws, { with: ['maren', 'nobody'], lengthMinutes: 30, window: week }, opts);
    expect(r).toEqual({
      ok: false,
      issues: [
        {
          code: 'unknown_attendee',
          path: ['with', 1],
          message: "'nobody' is neither a person nor a group of this workspace",
        },
      ],
    });
  });
});
