// `npm run bench -- meet [--json] [--runs N]`: time to the best 5 options (model building + solve, from
// busy intervals made before timing starts) for 5, 20 and 100 attendees over 2 and 4 weeks on a
// 5-minute grid with 30 rooms, against a plain scan of every start measured in the same run.
import {
  findOptions,
  type SchedulingContext,
  type SchedulingPerson,
  type SchedulingRoom,
} from '../src/scheduling/index.ts';
import type { BusyInterval, Interval } from '../src/time/index.ts';
import { DEFAULT_WORKING_HOURS, workingIntervals } from '../src/time/index.ts';

const MIN = 60_000;
const DAY = 86_400_000;
const NOW = Date.parse('2026-12-01T12:00:00Z');
const ZONES = ['Europe/Lisbon', 'America/Halifax', 'Europe/Berlin', 'America/New_York'] as const;

/** Small deterministic generator (mulberry32) so every run times the same data. */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function busyFor(r: () => number, window: Interval, zone: string, crowd: number): BusyInterval[] {
  // two to four meetings of 30-90 minutes a working day, kept out of 13:00-16:00 UTC (the hours the
  // offices share) except with chance 2 / crowd, so large groups still have some common free time;
  // one in six is tentative
  const out: BusyInterval[] = [];
  for (const w of workingIntervals(DEFAULT_WORKING_HOURS, zone, window)) {
    const n = 2 + Math.floor(r() * 3);
    const dayUtc = Math.floor(w.start / DAY) * DAY;
    const shared = { start: dayUtc + 13 * 3_600_000, end: dayUtc + 16 * 3_600_000 };
    for (let i = 0; i < n; i++) {
      const start = w.start + Math.floor((r() * (w.end - w.start)) / (15 * MIN)) * 15 * MIN;
      const end = Math.min(w.end, start + (30 + 15 * Math.floor(r() * 5)) * MIN);
      if (start < shared.end && end > shared.start && r() >= 2 / crowd) continue;
      out.push({ start, end, kind: r() < 1 / 6 ? 'tentative' : 'busy' });
    }
  }
  return out.sort((a, b) => a.start - b.start);
}

/** The generated workspace of one case (exported for profiling). */
export function workspace(
  attendees: number,
  weeks: number,
  seed: number,
): { context: SchedulingContext; window: Interval } {
  const r = rng(seed);
  const window = { start: NOW, end: NOW + weeks * 7 * DAY };
  const people: SchedulingPerson[] = Array.from({ length: attendees }, (_, i) => {
    // most attendees in Lisbon and Berlin, a few across the Atlantic, so common hours exist but are narrow
    const zone = ZONES[i % 7 === 3 ? 1 : i % 7 === 5 ? 3 : i % 2 === 0 ? 0 : 2]!;
    return {
      id: `p${i}`,
      zone,
      workingHours: DEFAULT_WORKING_HOURS,
      busy: busyFor(r, window, zone, attendees),
      rules: [],
    };
  });
  const rooms: SchedulingRoom[] = Array.from({ length: 30 }, (_, i) => ({
    id: `room-${i}`,
    capacity: 4 + Math.floor(r() * 120),
    features: r() < 0.5 ? ['screen'] : ['phone'],
    zone: 'Europe/Lisbon',
    busy: busyFor(r, window, 'Europe/Lisbon', 30),
    rules: [],
  }));
  return {
    context: {
      zone: 'Europe/Lisbon',
      gridMinutes: 5,
      tentative: 'penalty',
      now: NOW,
      people,
      rooms,
      groups: [],
    },
    window,
  };
}

/** The baseline: every start on the grid, each attendee and room checked against plain interval lists; the first `want` feasible starts (no score, no diversity). */
function plainScan(
  context: SchedulingContext,
  window: Interval,
  lengthMinutes: number,
  seats: number,
  want: number,
): number[] {
  const len = lengthMinutes * MIN;
  const work = context.people.map((p) => workingIntervals(p.workingHours, p.zone, window));
  const found: number[] = [];
  for (let t = window.start; t + len <= window.end; t += 5 * MIN) {
    let ok = true;
    for (let i = 0; ok && i < context.people.length; i++) {
      const p = context.people[i]!;
      if (!work[i]!.some((w) => w.start <= t && t + len <= w.end)) ok = false;
      else if (p.busy.some((b) => b.kind === 'busy' && b.start < t + len && b.end > t)) ok = false;
    }
    if (!ok) continue;
    const room = context.rooms.some(
      (r) =>
        r.capacity >= seats &&
        r.features.includes('screen') &&
        !r.busy.some((b) => b.start < t + len && b.end > t),
    );
    if (room) found.push(t);
  }
  return found.slice(0, want);
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

/** Runs the benchmark; prints a table, and with --json a last line of rows. */
export async function run(args: readonly string[]): Promise<number> {
  const json = args.includes('--json');
  const runsAt = args.indexOf('--runs');
  const runs = runsAt >= 0 ? Math.max(3, Number(args[runsAt + 1])) : 15;
  type Row = {
    case: string;
    variant: string;
    /** Median wall time. */
    ms: number;
    /** Fastest run (least disturbed by other processes). */
    minMs: number;
    /** Median CPU time of this process (user + system) per run. */
    cpuMs: number;
    attendees: number;
    weeks: number;
    options: number;
    ratio?: number;
  };
  const rows: Row[] = [];
  const timed = (fn: () => number): { wall: number; cpu: number; value: number } => {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    const value = fn();
    const wall = performance.now() - t0;
    const c = process.cpuUsage(c0);
    return { wall, cpu: (c.user + c.system) / 1000, value };
  };
  for (const weeks of [2, 4]) {
    for (const attendees of [5, 20, 100]) {
      const { context, window } = workspace(attendees, weeks, attendees * 31 + weeks);
      const request = {
        with: context.people.map((p) => p.id),
        lengthMinutes: 30,
        window,
        seats: attendees,
        needs: ['screen'],
        options: 5,
      };
      const meetRuns: { wall: number; cpu: number; value: number }[] = [];
      const scanRuns: { wall: number; cpu: number; value: number }[] = [];
      for (let i = 0; i < runs + 2; i++) {
        const a = timed(() => {
          const r = findOptions(context, request);
          return r.ok ? r.value.options.length : -1;
        });
        const b = timed(() => plainScan(context, window, 30, attendees, 5).length);
        if (i < 2) continue; // warm-up
        meetRuns.push(a);
        scanRuns.push(b);
      }
      const name = `${attendees} attendees, ${weeks} weeks`;
      const row = (variant: string, xs: typeof meetRuns): Row => ({
        case: name,
        variant,
        ms: round(median(xs.map((x) => x.wall))),
        minMs: round(Math.min(...xs.map((x) => x.wall))),
        cpuMs: round(median(xs.map((x) => x.cpu))),
        attendees,
        weeks,
        options: xs[xs.length - 1]!.value,
      });
      const m = row('meet (bitsets + CSP, best 5, diverse)', meetRuns);
      const p = row('plain scan of every start (first 5 feasible, no score)', scanRuns);
      rows.push({ ...m, ratio: round(m.ms / p.ms) }, p);
    }
  }
  const out = (line: string) => process.stdout.write(`${line}\n`);
  out(`meet benchmark: ${runs} runs each after 2 warm-ups, 30 rooms, 5-minute grid, 30-minute meeting`);
  out(
    `${'case'.padEnd(24)} ${'variant'.padEnd(56)} ${'median'.padStart(9)} ${'fastest'.padStart(9)} ${'cpu'.padStart(9)}`,
  );
  for (const r of rows)
    out(
      `${r.case.padEnd(24)} ${r.variant.padEnd(56)} ${String(r.ms).padStart(9)} ${String(r.minMs).padStart(9)} ${String(r.cpuMs).padStart(9)}  options ${r.options}${r.ratio === undefined ? '' : `  (x${r.ratio} of plain scan)`}`,
    );
  for (const weeks of [2, 4]) {
    const at = (n: number) =>
      rows.find((r) => r.attendees === n && r.weeks === weeks && r.variant.startsWith('meet'))!.minMs;
    out(
      `scaling, ${weeks} weeks (fastest runs): 20/5 attendees x${round(at(20) / at(5))}, 100/20 attendees x${round(at(100) / at(20))} (linear would be x4 and x5)`,
    );
  }
  if (json) out(JSON.stringify(rows));
  return 0;
}

function round(x: number): number {
  return Math.round(x * 1000) / 1000;
}
