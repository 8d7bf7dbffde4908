import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { busyFromIcs } from '../../src/calendar/busy-from-ics.ts';
import { SlotwrightError } from '../../src/errors.ts';

// Bounded fuzzing: valid feeds (the demo fixtures) are mutated line by line and character by
// character. Whatever comes in, the reader returns a well-formed report or throws its own
// SlotwrightError, and each call ends well within a time bound (expansion has a 2 s budget).
const DIR = join(import.meta.dirname, '..', '..', 'fixtures', 'demo', 'feeds');
const FEEDS = readdirSync(DIR)
  .filter((f) => f.endsWith('.ics'))
  .map((f) => readFileSync(join(DIR, f), 'utf8'));
const WINDOW = { start: Date.UTC(2026, 11, 7), end: Date.UTC(2026, 11, 28) };
const JUNK = [
  'RRULE:FREQ=SECONDLY',
  'RRULE:FREQ=DAILY;BYDAY=FR;BYMONTHDAY=-2,-1',
  'RRULE:FREQ=YEARLY;BYMONTH=2;BYMONTHDAY=30',
  'RRULE:FREQ=MINUTELY;COUNT=1000000000',
  'RRULE:FREQ=WEEKLY;INTERVAL=0',
  'RRULE:BYDAY=XX',
  'DTSTART:99999999T999999',
  'DTSTART;TZID=Nowhere/Land:20261208T250000',
  'DTEND;VALUE=DATE:19000101',
  'DURATION:-P100W',
  'DURATION:PXYZ',
  'EXDATE:garbage',
  'RDATE;VALUE=PERIOD:20261208T100000Z/20261207T100000Z',
  'FREEBUSY:nonsense',
  'BEGIN:VEVENT',
  'END:VEVENT',
  'END:VCALENDAR',
  'BEGIN:VTIMEZONE',
  'RECURRENCE-ID:20261208T090000Z',
  'ATTENDEE;PARTSTAT=DECLINED:mailto:',
  ';;;:::',
  '\u0000\uFFFF',
  ' folded continuation',
];

const mutation = fc.oneof(
  fc.record({ kind: fc.constant('delete' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('duplicate' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('swap' as const), at: fc.nat(), to: fc.nat() }),
  fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), line: fc.constantFrom(...JUNK) }),
  fc.record({ kind: fc.constant('insertRandom' as const), at: fc.nat(), line: fc.string({ maxLength: 40 }) }),
  fc.record({
    kind: fc.constant('char' as const),
    at: fc.nat(),
    ch: fc.string({ minLength: 1, maxLength: 1 }),
  }),
  fc.record({ kind: fc.constant('truncate' as const), at: fc.nat() }),
);

interface Mutation {
  readonly kind: string;
  readonly at: number;
  readonly to?: number;
  readonly line?: string;
  readonly ch?: string;
}

function apply(text: string, muts: readonly Mutation[]): string {
  let lines = text.split('\r\n');
  for (const m of muts) {
    const i = lines.length === 0 ? 0 : m.at % lines.length;
    switch (m.kind) {
      case 'delete':
        lines.splice(i, 1);
        break;
      case 'duplicate':
        lines.splice(i, 0, lines[i] ?? '');
        break;
      case 'swap': {
        const j = lines.length === 0 ? 0 : (m.to ?? 0) % lines.length;
        [lines[i], lines[j]] = [lines[j] ?? '', lines[i] ?? ''];
        break;
      }
      case 'insert':
      case 'insertRandom':
        lines.splice(i, 0, m.line ?? '');
        break;
      case 'char': {
        const l = lines[i] ?? '';
        const k = l.length === 0 ? 0 : m.at % l.length;
        lines[i] = l.slice(0, k) + (m.ch ?? '') + l.slice(k + 1);
        break;
      }
      case 'truncate':
        lines = lines.slice(0, i);
        break;
    }
  }
  return lines.join('\r\n');
}

describe('fuzzed feeds', () => {
  it('never throw anything but SlotwrightError, give well-formed busy time and stay within a time bound', () => {
    let reports = 0;
    let refusals = 0;
    let slowest = 0;
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: FEEDS.length - 1 }),
        fc.array(mutation, { minLength: 1, maxLength: 6 }),
        (feed, muts) => {
          const text = apply(FEEDS[feed]!, muts);
          const t0 = performance.now();
          try {
            const r = busyFromIcs(text, {
              window: WINDOW,
              zone: 'America/Halifax',
              ownerEmail: 'maren@saltline.example',
            });
            reports++;
            for (let i = 0; i < r.busy.length; i++) {
              const b = r.busy[i]!;
              expect(b.start).toBeLessThan(b.end);
              expect(b.start).toBeGreaterThanOrEqual(WINDOW.start);
              expect(b.end).toBeLessThanOrEqual(WINDOW.end);
              if (i > 0) expect(b.start).toBeGreaterThanOrEqual(r.busy[i - 1]!.start);
            }
            expect(r.skipped).toBeGreaterThanOrEqual(0);
            // warnings never carry event titles from the fixtures
            expect(r.warnings.join(' ')).not.toMatch(/stand-up|Survey planning|Leave|Booked:/);
          } catch (error) {
            expect(error).toBeInstanceOf(SlotwrightError);
            expect((error as SlotwrightError).code).toBe('ics_invalid');
            refusals++;
          }
          slowest = Math.max(slowest, performance.now() - t0);
          expect(performance.now() - t0).toBeLessThan(6000);
        },
      ),
      { numRuns: 200, seed: 5545 },
    );
    expect(reports).toBeGreaterThan(130);
    expect(refusals + reports).toBe(200);
    expect(slowest).toBeLessThan(6000);
  });
});
