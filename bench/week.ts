// Week-plan benchmark: the seven public curriculum-based course timetabling instances (ITC-2007
// track 3, bench/data/cbctt/README.md) and a seeded synthetic organization week, all solved by the
// same planWeek code path the workspaces use.
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { basename, join } from 'node:path';
import { parseArgs } from 'node:util';
import { MAX_THREADS, planWeekOnThreads } from '../src/app/week-threads.ts';
import {
  buildPlaceModel,
  cbcttToWeekRequest,
  formatCbcttSolution,
  parseCbctt,
  planWeek,
  syntheticWeek,
  type WeekPlan,
  type WeekRequest,
  WeekSpace,
} from '../src/scheduling/week/index.ts';
import { solve } from '../src/solver/index.ts';

const DATA = join(import.meta.dirname, 'data', 'cbctt');

// Best-known costs as listed in bench/data/cbctt/README.md (from memory there, not verified).
const BEST_KNOWN: Readonly<Record<string, number>> = {
  comp01: 5,
  comp02: 24,
  comp03: 64,
  comp04: 35,
  comp05: 284,
  comp06: 27,
  comp07: 6,
};

const clock = (): number => performance.now();

/** Time of the plain baseline (static order, natural values, no propagation) on the construction model. */
function baselineMs(request: WeekRequest, capMs: number): { ms: number; solved: boolean } {
  const space = new WeekSpace(request);
  const model = buildPlaceModel(
    space,
    request.series.map((_, i) => i),
  );
  const t = clock();
  const r = solve(model.model, {
    propagation: 'none',
    variableOrder: 'static',
    valueOrder: 'natural',
    budget: { timeMs: capMs, clock },
  });
  return { ms: clock() - t, solved: r.status === 'solved' };
}

/** One run of one instance: its soft cost by our scorer, and its hard violations (placed and not). */
interface InstanceRun {
  readonly name: string;
  readonly seed: number;
  readonly soft: number;
  readonly hard: number;
  readonly solution: string;
}

/**
 * One run: on this thread, or with `threads` > 1 as that many independent runs (seeds `seed` to
 * `seed + threads - 1`) on worker threads, the best kept.
 */
async function runInstance(
  file: string,
  seconds: number,
  seed: number,
  threads: number,
): Promise<InstanceRun> {
  const name = basename(file).replace(/\.ctt$/, '');
  const inst = parseCbctt(readFileSync(file, 'utf8'));
  const request = cbcttToWeekRequest(inst);
  const lectures = request.series.reduce((n, s) => n + s.sessions, 0);
  let plan: WeekPlan;
  let threadNote = '';
  if (threads === 1) plan = planWeek(request, { timeMs: seconds * 1000, clock, seed });
  else {
    const t = await planWeekOnThreads(request, { threads, timeMs: seconds * 1000, seed });
    plan = t.plan;
    threadNote = `  threads ${threads}: soft ${t.runs.map((r) => (r.violations + r.unplaced > 0 ? `${r.total}(hard)` : r.total)).join(' ')}, seed ${t.seed} kept`;
  }
  const missing = lectures - plan.sessions.length;
  const hard = plan.violations + missing;
  const best = BEST_KNOWN[name];
  const base = baselineMs(request, 2000);
  const p = plan.score.parts;
  process.stdout.write(
    `${name.padEnd(8)} lectures ${String(lectures).padStart(3)}  hard ${hard} (missing ${missing})  ` +
      `soft ${plan.score.total} [capacity ${p.seats}, min days ${p.spread}, compactness ${p.isolated}, stability ${p.roomStability}]  ` +
      `best known ${best ?? '?'}  ratio ${best === undefined ? '?' : (plan.score.total / best).toFixed(2)}  ` +
      `first feasible ${plan.stats.feasibleMs.toFixed(0)} ms (plain backtracking baseline: ${base.solved ? `${base.ms.toFixed(0)} ms, ${(base.ms / Math.max(1, plan.stats.feasibleMs)).toFixed(1)}x slower` : `no plan within ${base.ms.toFixed(0)} ms`})  ` +
      `initial ${plan.stats.initialCost} -> ${plan.score.total} in ${plan.stats.moves} moves, ${plan.stats.rounds} rounds (${threads > 1 ? `seeds ${seed}-${seed + threads - 1}` : `seed ${seed}`})${threadNote}\n`,
  );
  return { name, seed, soft: plan.score.total, hard, solution: formatCbcttSolution(inst, plan.sessions) };
}

/** The middle value (the mean of the two middle ones for an even count). */
function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 === 1 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

/**
 * Runs one instance with `seeds` consecutive seeds from `seed` (the seed-to-seed spread is wide,
 * so one run says little about a setting); with more than one, prints the median and its ratio to
 * the best known. Writes the solution of the cheapest run without hard violations to `out`.
 */
async function runSeeds(
  file: string,
  seconds: number,
  seed: number,
  seeds: number,
  threads: number,
  out: string | undefined,
): Promise<boolean> {
  const runs: InstanceRun[] = [];
  // with threads, run k takes the seeds after those of run k - 1
  for (let k = 0; k < seeds; k++) runs.push(await runInstance(file, seconds, seed + k * threads, threads));
  const clean = runs.filter((r) => r.hard === 0);
  const cheapest = clean.reduce<InstanceRun | undefined>(
    (b, r) => (b === undefined || r.soft < b.soft ? r : b),
    undefined,
  );
  if (out !== undefined && cheapest !== undefined) writeFileSync(out, cheapest.solution);
  if (seeds > 1) {
    const name = runs[0]!.name;
    const best = BEST_KNOWN[name];
    const mid = median(runs.map((r) => r.soft));
    process.stdout.write(
      `${name.padEnd(8)} ${threads > 1 ? `runs of ${threads} threads, ` : ''}seeds ${seed}-${seed + seeds * threads - 1}: soft ${runs.map((r) => r.soft).join(' ')}  ` +
        `median ${mid}  ratio ${best === undefined ? '?' : (mid / best).toFixed(2)} of best known ${best ?? '?'}  ` +
        `runs with hard violations ${runs.length - clean.length}\n`,
    );
  }
  return clean.length === runs.length;
}

function runSynthetic(seconds: number, seed: number): boolean {
  const request = syntheticWeek({ seed });
  const sessions = request.series.reduce((n, s) => n + s.sessions, 0);
  const plan = planWeek(request, { timeMs: seconds * 1000, clock, seed });
  const base = baselineMs(request, 2000);
  process.stdout.write(
    `synthetic (300 series, 200 people, 25 rooms, 3 zones, seed ${seed}) sessions ${sessions}  placed ${plan.sessions.length}  ` +
      `unplaced series ${plan.unplaced.length}  hard ${plan.violations}  first feasible ${plan.stats.feasibleMs.toFixed(0)} ms  ` +
      `(plain backtracking baseline: ${base.solved ? `${base.ms.toFixed(0)} ms` : `no plan within ${base.ms.toFixed(0)} ms`})  ` +
      `cost ${plan.stats.initialCost} -> ${plan.score.total}\n`,
  );
  return plan.complete && plan.violations === 0;
}

/** `npm run bench -- week [--instance f] [--seconds s] [--out file] [--seed n] [--seeds k] [--threads t] [--synthetic]`. */
export async function run(args: readonly string[]): Promise<number> {
  const { values } = parseArgs({
    args: [...args],
    options: {
      instance: { type: 'string' },
      seconds: { type: 'string', default: '10' },
      out: { type: 'string' },
      seed: { type: 'string', default: '1' },
      seeds: { type: 'string', default: '1' },
      threads: { type: 'string', default: '1' },
      synthetic: { type: 'boolean', default: false },
    },
  });
  const seconds = Number(values.seconds);
  const seed = Number(values.seed);
  const seeds = Number(values.seeds);
  const threads = Number(values.threads);
  if (
    !(seconds > 0) ||
    !Number.isInteger(seed) ||
    !(Number.isInteger(seeds) && seeds >= 1) ||
    !(Number.isInteger(threads) && threads >= 1 && threads <= MAX_THREADS)
  ) {
    process.stderr.write(
      'usage: npm run bench -- week [--instance f.ctt] [--seconds s] [--out file] [--seed n] [--seeds k] [--threads t] [--synthetic]\n' +
        `  --seconds must be above 0, --seed a whole number, --seeds a whole number of at least 1 and --threads one from 1 to ${MAX_THREADS}\n`,
    );
    return 2;
  }
  let ok = true;
  if (values.synthetic) return runSynthetic(Math.min(seconds, 2), seed) ? 0 : 1;
  if (values.instance !== undefined)
    return (await runSeeds(values.instance, seconds, seed, seeds, threads, values.out)) ? 0 : 1;
  for (const f of readdirSync(DATA)
    .filter((x) => x.endsWith('.ctt'))
    .sort()) {
    const out = values.out === undefined ? undefined : join(values.out, f.replace(/\.ctt$/, '.sol'));
    ok = (await runSeeds(join(DATA, f), seconds, seed, seeds, threads, out)) && ok;
  }
  ok = runSynthetic(2, seed) && ok;
  return ok ? 0 : 1;
}
