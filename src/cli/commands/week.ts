import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { Temporal } from 'temporal-polyfill';
import {
  diffWeekPlans,
  nextIsoWeek,
  type PlannedSession,
  planWorkspaceWeek,
  planWorkspaceWeekOnThreads,
  weekContext,
  weekPlanIcs,
} from '../../app/week.ts';
import { withWorkspaceRest } from '../../app/week-post.ts';
import { MAX_THREADS } from '../../app/week-threads.ts';
import { loadWorkspace } from '../../config/load-workspace.ts';
import { SlotwrightError } from '../../errors.ts';
import { mondayOfIsoWeek } from '../../scheduling/fairness.ts';
import { addDays, instantToZoned, zonedToInstant } from '../../time/zoned.ts';
import { parseVerbArgs, stringOption } from '../args.ts';
import { UsageError } from '../io.ts';
import type { CliCommand } from '../main.ts';

const USAGE = [
  'Usage: slotwright week --workspace <dir> [--week 2026-W50] [--seconds N] [--seed S] [--threads T] [--now <instant>]',
  '                       [--last <plan.json>] [--ics <dir>] [--json]',
  '',
  'Places every series of the workspace for one week, together: nobody in two sessions at once, no room',
  'taken twice, every session inside its attendees\u2019 free time; then improves the preferences for',
  'N seconds. Prints the plan, the series left out with what blocks them, and the cost by kind.',
  '',
  '  --workspace <dir>  folder with workspace.yaml',
  '  --week <YYYY-Www>  ISO week to plan (default: the week after --now)',
  '  --seconds <N>      search time (default 5)',
  '  --seed <S>         seed of the search (default 1); same seed and budget, same plan',
  '  --threads <T>      T independent searches at once on T threads, seeds S to S+T-1, each for N',
  '                     seconds; the best plan is kept (default 1; use spare cores only)',
  '  --now <instant>    current time, e.g. 2026-12-01T09:00:00Z (default: the clock)',
  '  --last <file>      last week\u2019s plan as printed by --json; moves against it cost, and a diff is shown',
  '  --ics <dir>        write one .ics per series (weekly RRULE with BYDAY) into this folder',
  '  --json             print {"sessions","unplaced","score","complete"} as JSON',
  '',
  'Exit codes: 0 every series placed, 3 some series left out, 1 unreadable input, 2 bad arguments.',
].join('\n');

function parseNow(text: string): number {
  try {
    return Temporal.Instant.from(text).epochMilliseconds;
  } catch {
    throw new UsageError(`--now takes an instant with a zone, such as 2026-12-01T09:00:00Z, got '${text}'`);
  }
}

function readLast(file: string): PlannedSession[] {
  let data: unknown;
  try {
    data = JSON.parse(readFileSync(file, 'utf8'));
  } catch (error) {
    throw new SlotwrightError('config_unreadable', `--last ${file} is not a readable JSON plan`, {
      cause: error,
    });
  }
  const sessions = (data as { sessions?: unknown }).sessions;
  if (!Array.isArray(sessions))
    throw new SlotwrightError(
      'config_invalid',
      `--last ${file} has no "sessions" list; pass a file written by week --json`,
    );
  return sessions.map((s: unknown, i) => {
    const o = s as { series?: unknown; start?: unknown; end?: unknown; room?: unknown };
    const start = typeof o.start === 'string' ? Date.parse(o.start) : Number.NaN;
    const end = typeof o.end === 'string' ? Date.parse(o.end) : Number.NaN;
    if (
      typeof o.series !== 'string' ||
      Number.isNaN(start) ||
      Number.isNaN(end) ||
      !(o.room === null || typeof o.room === 'string')
    )
      throw new SlotwrightError(
        'config_invalid',
        `--last ${file}: sessions[${i}] needs series, start, end (instants) and room`,
      );
    return { series: o.series, start, end, room: o.room as string | null };
  });
}

const iso = (ms: number): string => new Date(ms).toISOString().replace('.000Z', 'Z');
const round = (x: number): number => Math.round(x * 1000) / 1000;

/** `slotwright week`: the joint week plan of a workspace's series. */
export const command: CliCommand = {
  name: 'week',
  summary: 'plan a week of recurring meetings together',
  usage: USAGE,
  async run(args, io) {
    const { values } = parseVerbArgs(args, {
      workspace: { type: 'string' },
      week: { type: 'string' },
      seconds: { type: 'string' },
      seed: { type: 'string' },
      threads: { type: 'string' },
      now: { type: 'string' },
      last: { type: 'string' },
      ics: { type: 'string' },
      json: { type: 'boolean' },
    });
    const dir = stringOption(values, 'workspace', true);
    const weekArg = stringOption(values, 'week');
    if (weekArg !== undefined) {
      if (!/^\d{4}-W\d{2}$/.test(weekArg))
        throw new UsageError(`--week takes an ISO week such as 2026-W50, got '${weekArg}'`);
      try {
        mondayOfIsoWeek(weekArg);
      } catch (error) {
        throw new UsageError(error instanceof Error ? error.message : String(error));
      }
    }
    const secondsText = stringOption(values, 'seconds') ?? '5';
    if (!/^\d+(\.\d+)?$/.test(secondsText) || Number(secondsText) <= 0)
      throw new UsageError(`--seconds takes a positive number such as 5 or 0.5, got '${secondsText}'`);
    const seedText = stringOption(values, 'seed') ?? '1';
    if (!/^\d+$/.test(seedText) || Number(seedText) > 0xffffffff)
      throw new UsageError(`--seed takes a whole number from 0 to 4294967295, got '${seedText}'`);
    const threadsText = stringOption(values, 'threads') ?? '1';
    if (!/^\d+$/.test(threadsText) || Number(threadsText) < 1 || Number(threadsText) > MAX_THREADS)
      throw new UsageError(`--threads takes a whole number from 1 to ${MAX_THREADS}, got '${threadsText}'`);
    const threads = Number(threadsText);
    if (threads > 1 && Number(seedText) + threads - 1 > 0xffffffff)
      throw new UsageError(
        `--seed plus --threads must stay within 4294967296, got ${seedText} and ${threads}`,
      );
    const nowText = stringOption(values, 'now');
    const now = nowText === undefined ? io.now() : parseNow(nowText);
    const lastFile = stringOption(values, 'last');
    const icsDir = stringOption(values, 'ics');

    const loaded = loadWorkspace(resolve(dir), { now });
    if (!loaded.ok) {
      io.err(`slotwright week: the workspace in ${dir} is not usable:`);
      for (const i of loaded.issues) io.err(`  ${i.message}`);
      return 1;
    }
    const workspace = loaded.value;
    const last = lastFile === undefined ? undefined : readLast(lastFile);
    const isoWeek = weekArg ?? nextIsoWeek(now, workspace.zone);
    // busy time is read a day beyond each end of the week, so zones far from the workspace's are covered
    const monday = mondayOfIsoWeek(isoWeek);
    const window = {
      start: zonedToInstant(addDays(monday, -1), 0, workspace.zone),
      end: zonedToInstant(addDays(monday, 8), 0, workspace.zone),
    };
    // rest between days, when the workspace or a person sets it, as in chat and the weekly post
    const context = withWorkspaceRest(workspace, weekContext(workspace, now, window), window);
    let lastShown = -1;
    const started = io.now();
    const base = {
      isoWeek,
      now,
      timeMs: Number(secondsText) * 1000,
      seed: Number(seedText),
      ...(last === undefined ? {} : { lastWeek: last }),
    };
    let result: ReturnType<typeof planWorkspaceWeek>;
    if (threads > 1) {
      // independent searches on worker threads report no progress of their own: one line before,
      // one after with every search's cost, so the kept seed can be run again alone
      io.err(`week: ${threads} searches on ${threads} threads, ${secondsText} s each`);
      const threaded = await planWorkspaceWeekOnThreads(workspace, context, { ...base, threads });
      if (threaded.ok) {
        const costs = threaded.value.runs
          .map((r) => `seed ${r.seed} ${round(r.total)}${r.unplaced > 0 ? ` (${r.unplaced} left out)` : ''}`)
          .join(', ');
        io.err(`week: ${costs}; kept seed ${threaded.value.seed}`);
      }
      result = threaded;
    } else
      result = planWorkspaceWeek(workspace, context, {
        ...base,
        clock: () => io.now(),
        ...(io.isTty
          ? {
              onProgress: (p) => {
                const t = io.now() - started;
                if (t - lastShown < 500 && p.phase === 'improve') return;
                lastShown = t;
                const best = Number.isNaN(p.best) ? '-' : String(round(p.best));
                io.err(
                  `week: ${(t / 1000).toFixed(1)} s, ${p.phase}, best cost ${best}, unplaced ${p.unplaced}`,
                );
              },
            }
          : {}),
      });
    if (!result.ok) {
      io.err('slotwright week: the series cannot be planned:');
      for (const i of result.issues) io.err(`  ${i.path.join('.')}: ${i.message}`);
      return 1;
    }
    const plan = result.value;
    if (icsDir !== undefined) {
      const files = weekPlanIcs(workspace, plan, { domain: 'slotwright.invalid', stamp: now });
      mkdirSync(icsDir, { recursive: true });
      for (const [id, text] of Object.entries(files)) writeFileSync(join(icsDir, `${id}.ics`), text);
      io.err(`week: wrote ${Object.keys(files).length} .ics files to ${icsDir}`);
    }
    const diff = last === undefined ? undefined : diffWeekPlans(workspace.zone, last, plan.sessions);
    if (values.json === true) {
      io.out(
        JSON.stringify({
          week: plan.isoWeek,
          sessions: plan.sessions.map((s) => ({
            series: s.series,
            start: iso(s.start),
            end: iso(s.end),
            room: s.room,
          })),
          unplaced: plan.unplaced.map((u) => ({
            series: u.series,
            code: u.code,
            blockers: u.blockers,
            reason: u.reason,
          })),
          score: {
            total: round(plan.score.total),
            parts: Object.fromEntries(Object.entries(plan.score.parts).map(([k, v]) => [k, round(v)])),
          },
          complete: plan.complete,
          ...(diff === undefined
            ? {}
            : {
                diff: diff.map((d) => ({
                  series: d.series,
                  change: d.change,
                  ...(d.before === undefined ? {} : { before: iso(d.before.start) }),
                  ...(d.after === undefined ? {} : { after: iso(d.after.start) }),
                })),
              }),
        }),
      );
      return plan.complete ? 0 : 3;
    }
    const zone = workspace.zone;
    const local = (ms: number) => instantToZoned(ms, zone);
    const hm = (m: number) =>
      `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;
    const days = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];
    io.out(`Week plan ${plan.isoWeek} (${workspace.name ?? 'workspace'}, times in ${zone})`);
    io.out('');
    io.out(`${'day'.padEnd(15)}${'time'.padEnd(13)}${'series'.padEnd(20)}room`);
    for (const s of plan.sessions) {
      const a = local(s.start);
      const b = local(s.end);
      io.out(
        `${`${days[a.weekday - 1]} ${a.date}`.padEnd(15)}${`${hm(a.minutes)}-${hm(b.minutes)}`.padEnd(13)}${s.series.padEnd(20)}${s.room ?? '-'}`,
      );
    }
    io.out('');
    const parts = Object.entries(plan.score.parts)
      .filter(([, v]) => v !== 0)
      .map(([k, v]) => `${k} ${round(v)}`)
      .join(', ');
    io.out(`Preference cost ${round(plan.score.total)}${parts === '' ? '' : ` (${parts})`}`);
    if (plan.unplaced.length > 0) {
      io.out('');
      io.out('Left out:');
      for (const u of plan.unplaced) io.out(`  ${u.series}: ${u.reason}`);
    }
    if (diff !== undefined) {
      io.out('');
      io.out('Against last week:');
      for (const d of diff) {
        if (d.change === 'kept') continue;
        const when = (p: PlannedSession | undefined) =>
          p === undefined ? '' : `${days[local(p.start).weekday - 1]} ${hm(local(p.start).minutes)}`;
        io.out(
          `  ${d.series}: ${d.change} ${[when(d.before), when(d.after)].filter((x) => x !== '').join(' -> ')}`,
        );
      }
      const kept = diff.filter((d) => d.change === 'kept').length;
      io.out(`  ${kept} session(s) kept`);
    }
    return plan.complete ? 0 : 3;
  },
};
