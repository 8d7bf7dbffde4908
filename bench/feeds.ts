// Benchmark of feed reading: a generated feed of 10,000 VEVENTs (500 weekly series, each with a
// moved and a cancelled instance, and single events) read over 8 weeks. It measures ical.js parsing
// alone (a), the whole busy-time pipeline (b, which includes that parse) and, for reference, the
// least an ical.js user does to list instance times (c: parse, wrap, expand recurring events to the
// window end) in the same run, and reports b/a and c/a; absolute times depend on the machine.
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import ICAL from 'ical.js';
import { busyFromIcs } from '../src/calendar/index.ts';

interface Row {
  readonly name: string;
  readonly medianMs: number;
  readonly minMs: number;
  readonly heapAfterRunMb: number;
  readonly retainedMb: number;
  readonly ratioToParse?: number;
  readonly busyIntervals?: number;
}

const EVENTS = 10_000;
const SERIES = 500;
const WINDOW = { start: Date.UTC(2026, 11, 7), end: Date.UTC(2026, 11, 7) + 8 * 7 * 86_400_000 };

function pad(n: number): string {
  return String(n).padStart(2, '0');
}

/** The generated feed; deterministic (no randomness) so runs compare. */
export function generateFeed(): string {
  const zones = ['Europe/Lisbon', 'America/Halifax', 'Pacific/Auckland'];
  const lines = ['BEGIN:VCALENDAR', 'VERSION:2.0', 'PRODID:-//slotwright//bench//EN'];
  let count = 0;
  for (let s = 0; s < SERIES; s++) {
    const zone = zones[s % 3]!;
    const day = 2 + (s % 5);
    const hour = 8 + (s % 9);
    const uid = `series-${s}@bench.example`;
    lines.push(
      'BEGIN:VEVENT',
      `UID:${uid}`,
      'DTSTAMP:20261101T000000Z',
      `DTSTART;TZID=${zone}:202611${pad(day)}T${pad(hour)}0000`,
      `DTEND;TZID=${zone}:202611${pad(day)}T${pad(hour)}3000`,
      'RRULE:FREQ=WEEKLY',
      `SUMMARY:Weekly series ${s}`,
      'DESCRIPTION:A recurring meeting with a description long enough to be realistic.',
      'END:VEVENT',
      // moved instance in the window
      'BEGIN:VEVENT',
      `UID:${uid}`,
      'DTSTAMP:20261101T000000Z',
      `RECURRENCE-ID;TZID=${zone}:202612${pad(day + 7)}T${pad(hour)}0000`,
      `DTSTART;TZID=${zone}:202612${pad(day + 7)}T${pad(hour + 1)}0000`,
      `DTEND;TZID=${zone}:202612${pad(day + 7)}T${pad(hour + 1)}3000`,
      `SUMMARY:Weekly series ${s} (moved)`,
      'END:VEVENT',
      // cancelled instance
      'BEGIN:VEVENT',
      `UID:${uid}`,
      'DTSTAMP:20261101T000000Z',
      `RECURRENCE-ID;TZID=${zone}:202612${pad(day + 14)}T${pad(hour)}0000`,
      `DTSTART;TZID=${zone}:202612${pad(day + 14)}T${pad(hour)}0000`,
      'STATUS:CANCELLED',
      'END:VEVENT',
    );
    count += 3;
  }
  for (let i = 0; count < EVENTS; i++, count++) {
    const zone = zones[i % 3]!;
    // single events spread over a year around the window
    const start = Date.UTC(2026, 8, 1) + (i % 365) * 86_400_000 + (8 + (i % 10)) * 3_600_000;
    const d = new Date(start);
    const stamp = `${d.getUTCFullYear()}${pad(d.getUTCMonth() + 1)}${pad(d.getUTCDate())}T${pad(d.getUTCHours())}${pad(d.getUTCMinutes())}00`;
    lines.push(
      'BEGIN:VEVENT',
      `UID:single-${i}@bench.example`,
      'DTSTAMP:20261101T000000Z',
      `DTSTART;TZID=${zone}:${stamp}`,
      'DURATION:PT45M',
      i % 7 === 0 ? 'STATUS:TENTATIVE' : 'STATUS:CONFIRMED',
      `SUMMARY:Single event ${i}`,
      `LOCATION:Room ${i % 12}`,
      `ATTENDEE;PARTSTAT=ACCEPTED:mailto:person${i % 40}@bench.example`,
      'END:VEVENT',
    );
  }
  lines.push('END:VCALENDAR');
  return lines.join('\r\n');
}

// The least a careful ical.js user does to get instance times: parse, wrap every VEVENT on its own
// (wrapped inside the calendar, ical.js looks each unknown TZID up across all components, which took
// 38-48 s per run on this feed), read start and end, expand recurring ones up to the window end. No
// zones, merging or exception handling.
function icalExpandOnly(text: string): number {
  const jcal = ICAL.parse(text) as unknown as [string, unknown[], unknown[][]];
  const end = ICAL.Time.fromJSDate(new Date(WINDOW.end), true);
  let n = 0;
  for (const child of jcal[2]) {
    if (child[0] !== 'vevent') continue;
    const e = new ICAL.Event(new ICAL.Component(child as never));
    if (e.isRecurring()) {
      const it = e.iterator();
      for (let t = it.next(); t && t.compare(end) < 0; t = it.next()) n++;
    } else if (e.startDate !== null && e.endDate !== null) n++;
  }
  return n;
}

function gcFunction(): (() => void) | undefined {
  try {
    setFlagsFromString('--expose-gc');
    return runInNewContext('gc') as () => void;
  } catch {
    return undefined;
  }
}

interface Sample {
  times: number[];
  heapAfter: number;
  retained: number;
  last: unknown;
}

// One measured run of fn, with the heap it grew by right after (an upper-bound view of what the run
// held, before any collection) and after a collection.
function sampleOnce(s: Sample, fn: () => unknown, gc: (() => void) | undefined): void {
  gc?.();
  const before = process.memoryUsage().heapUsed;
  const t0 = performance.now();
  s.last = fn();
  s.times.push(performance.now() - t0);
  s.heapAfter = Math.max(s.heapAfter, process.memoryUsage().heapUsed - before);
  gc?.();
  s.retained = Math.max(s.retained, process.memoryUsage().heapUsed - before);
}

// The measured paths take turns, run by run, so a change in the machine's speed during the
// benchmark (other load, clock changes) falls on all of them alike and the ratios stay fair.
function measureInTurns(
  runs: number,
  paths: readonly { name: string; fn: () => unknown }[],
  gc: (() => void) | undefined,
): (Row & { last: unknown })[] {
  const samples: Sample[] = paths.map(() => ({ times: [], heapAfter: 0, retained: 0, last: undefined }));
  for (let i = 0; i < runs; i++)
    for (let k = 0; k < paths.length; k++) sampleOnce(samples[k]!, paths[k]!.fn, gc);
  const mb = (b: number) => Math.round((b / 1048576) * 10) / 10;
  return samples.map((s, k) => {
    const times = [...s.times].sort((a, b) => a - b);
    return {
      name: paths[k]!.name,
      medianMs: Math.round(times[Math.floor(times.length / 2)]! * 10) / 10,
      minMs: Math.round(times[0]! * 10) / 10,
      heapAfterRunMb: mb(s.heapAfter),
      retainedMb: mb(s.retained),
      last: s.last,
    };
  });
}

/** Runs the feed benchmark; `--json` prints the rows as one JSON array on the last line. */
export async function run(args: readonly string[]): Promise<number> {
  const json = args.includes('--json');
  const runsArg = args.find((a) => a.startsWith('--runs='));
  const runs = runsArg === undefined ? 21 : Math.max(1, Number(runsArg.slice(7)));
  const text = generateFeed();
  const gc = gcFunction();
  const pipeline = () =>
    busyFromIcs(text, { window: WINDOW, zone: 'Europe/Lisbon', expansionTimeBudgetMs: 60_000 });
  // warm both paths once so the first measured run is not the JIT's
  ICAL.parse(text);
  pipeline();
  const [a, b] = measureInTurns(
    runs,
    [
      { name: 'a: ical.js parse', fn: () => ICAL.parse(text) },
      { name: 'b: whole pipeline', fn: pipeline },
    ],
    gc,
  ) as [Row & { last: unknown }, Row & { last: unknown }];
  // c runs after a and b: the ical.js Event API it uses would otherwise make ical.js code that the
  // pipeline shares with it polymorphic before b is measured, which no reader of feeds here does.
  const [c] = measureInTurns(runs, [{ name: 'c: ical.js expand', fn: () => icalExpandOnly(text) }], gc) as [
    Row & { last: unknown },
  ];
  const report = b.last as ReturnType<typeof busyFromIcs>;
  const rows: Row[] = [
    {
      name: a.name,
      medianMs: a.medianMs,
      minMs: a.minMs,
      heapAfterRunMb: a.heapAfterRunMb,
      retainedMb: a.retainedMb,
    },
    {
      name: c.name,
      medianMs: c.medianMs,
      minMs: c.minMs,
      heapAfterRunMb: c.heapAfterRunMb,
      retainedMb: c.retainedMb,
      ratioToParse: Math.round((c.medianMs / a.medianMs) * 100) / 100,
    },
    {
      name: b.name,
      medianMs: b.medianMs,
      minMs: b.minMs,
      heapAfterRunMb: b.heapAfterRunMb,
      retainedMb: b.retainedMb,
      ratioToParse: Math.round((b.medianMs / a.medianMs) * 100) / 100,
      busyIntervals: report.busy.length,
    },
  ];
  const out = (s: string) => process.stdout.write(`${s}\n`);
  out(
    `feed: ${EVENTS} VEVENTs (${SERIES} weekly series with a moved and a cancelled instance), ${text.length} chars`,
  );
  out(
    `window: 8 weeks from 2026-12-07; ${runs} runs each, taking turns; gc ${gc === undefined ? 'not available' : 'forced between runs'}`,
  );
  for (const r of rows)
    out(
      `${r.name.padEnd(20)} median ${String(r.medianMs).padStart(8)} ms  min ${String(r.minMs).padStart(8)} ms  heap after run ${r.heapAfterRunMb} MB  retained ${r.retainedMb} MB${r.ratioToParse === undefined ? '' : `  /a ${r.ratioToParse}`}`,
    );
  if (report.warnings.length > 0) out(`warnings: ${report.warnings.length} (first: ${report.warnings[0]})`);
  if (json) out(JSON.stringify(rows));
  return 0;
}
