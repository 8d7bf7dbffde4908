import { Temporal } from 'temporal-polyfill';
import { meet } from '../../app/meet.ts';
import { loadWorkspace, type Workspace } from '../../config/index.ts';
import type { MeetOutcome } from '../../scheduling/index.ts';
import { instantToZoned, zonedToInstant } from '../../time/index.ts';
import { intOption, listOption, parseVerbArgs, stringOption } from '../args.ts';
import { parseDuration } from '../duration.ts';
import { type CliIo, UsageError } from '../io.ts';
import type { CliCommand } from '../main.ts';

const USAGE = `Usage: slotwright meet --workspace <dir> --with <id,...> --length <45m|1h30m> [options]

Proposes ranked meeting options for people and groups, or says who and what blocks it.

Options:
  --workspace  folder with workspace.yaml (required)
  --with       required people or groups, comma-separated (required)
  --optional   optional people or groups, comma-separated
  --length     45m, 1h30m, or minutes (90) (required)
  --from       start of the window: a date (YYYY-MM-DD, 00:00 in the workspace zone) or an instant
               with an offset (2026-12-07T14:00Z) (default: now)
  --to         end of the window, exclusive, in the same forms (default: --from + the workspace horizon)
  --seats      seats the room needs; asks for a room
  --needs      room features, comma-separated (screen,phone); asks for a room
  --buffer     minutes kept free before and after in attendees' calendars (default 0)
  --options    number of options (default 5)
  --now        the current instant, for scripts and tests (default: the clock)
  --json       print one JSON object

Exit codes: 0 options found, 3 none fit (blockers and relaxations printed), 1 unreadable input,
2 bad arguments.`;

const DAY_MS = 86_400_000;

/** Reads a window edge: a date is 00:00 in the zone; an instant needs Z or an offset. */
function parseEdge(text: string, option: string, zone: string): number {
  const t = text.trim();
  if (/^\d{4}-\d{2}-\d{2}$/.test(t)) {
    try {
      return zonedToInstant(Temporal.PlainDate.from(t).toString(), 0, zone);
    } catch {
      throw new UsageError(`--${option} '${text}' is not a date; use YYYY-MM-DD`);
    }
  }
  try {
    return Temporal.Instant.from(t).epochMilliseconds;
  } catch {
    throw new UsageError(
      `--${option} '${text}' is neither a date (YYYY-MM-DD) nor an instant with an offset (2026-12-07T14:00Z)`,
    );
  }
}

function when(ms: number, zone: string): string {
  const r = instantToZoned(ms, zone);
  const day = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'][r.weekday - 1];
  const hh = String(Math.floor(r.minutes / 60)).padStart(2, '0');
  const mm = String(r.minutes % 60).padStart(2, '0');
  return `${day} ${r.date} ${hh}:${mm}`;
}

/** The plain-text rendering of an outcome, times in the workspace zone. */
function render(ws: Workspace, outcome: MeetOutcome): string[] {
  const lines: string[] = [];
  for (const w of outcome.warnings) lines.push(`warning: ${w}`);
  outcome.options.forEach((o, i) => {
    const end = instantToZoned(o.end, ws.zone);
    const endText = `${String(Math.floor(end.minutes / 60)).padStart(2, '0')}:${String(end.minutes % 60).padStart(2, '0')}`;
    lines.push(
      `${i + 1}. ${when(o.start, ws.zone)}-${endText} ${ws.zone}${o.room === null ? '' : `, room ${o.room}`}  score ${o.score}`,
    );
    for (const b of o.breakdown) lines.push(`     ${b.points} ${b.why}`);
  });
  if (outcome.options.length === 0) {
    lines.push('Nothing fits.');
    if (outcome.blockers.length > 0) {
      lines.push('Blocked by:');
      for (const b of outcome.blockers) lines.push(`  - ${b.detail}`);
    }
    if (outcome.relaxations.length > 0) {
      lines.push('Would open options:');
      for (const r of outcome.relaxations) lines.push(`  - ${r.change} (${r.opens} starts)`);
    }
  }
  return lines;
}

/** `slotwright meet`: ranked options for a group, or blockers and relaxations. */
export const command: CliCommand = {
  name: 'meet',
  summary: 'propose and rank meeting times for people and groups',
  usage: USAGE,
  async run(args: readonly string[], io: CliIo): Promise<number> {
    const { values } = parseVerbArgs(args, {
      workspace: { type: 'string' },
      with: { type: 'string' },
      optional: { type: 'string' },
      length: { type: 'string' },
      from: { type: 'string' },
      to: { type: 'string' },
      seats: { type: 'string' },
      needs: { type: 'string' },
      buffer: { type: 'string' },
      options: { type: 'string' },
      now: { type: 'string' },
      json: { type: 'boolean' },
    });
    const dir = stringOption(values, 'workspace', true);
    const withIds = listOption(values, 'with');
    if (withIds.length === 0) throw new UsageError('--with is required (people or groups, comma-separated)');
    const optional = listOption(values, 'optional');
    const lengthMinutes = parseDuration(stringOption(values, 'length', true));
    const nowText = stringOption(values, 'now');
    let now = io.now();
    if (nowText !== undefined) {
      try {
        now = Temporal.Instant.from(nowText).epochMilliseconds;
      } catch {
        throw new UsageError(`--now '${nowText}' is not an instant; use e.g. 2026-12-01T12:00:00Z`);
      }
    }
    const seatsText = stringOption(values, 'seats');
    const seats = seatsText === undefined ? undefined : intOption(values, 'seats', 1, 1);
    const needs = listOption(values, 'needs');
    const bufferMinutes = intOption(values, 'buffer', 0, 0);
    const wanted = intOption(values, 'options', 5, 1);

    const loaded = loadWorkspace(dir, { now });
    if (!loaded.ok) {
      for (const i of loaded.issues) io.err(i.message);
      return 1;
    }
    const ws = loaded.value;
    const fromText = stringOption(values, 'from');
    const toText = stringOption(values, 'to');
    const from = fromText === undefined ? now : parseEdge(fromText, 'from', ws.zone);
    const to = toText === undefined ? from + ws.horizon * DAY_MS : parseEdge(toText, 'to', ws.zone);
    if (to <= from) throw new UsageError(`--to must come after --from`);

    const result = await meet(
      ws,
      {
        with: withIds,
        optional,
        lengthMinutes,
        window: { start: from, end: to },
        ...(seats === undefined ? {} : { seats }),
        needs,
        bufferMinutes,
        options: wanted,
      },
      { now },
    );
    if (!result.ok) {
      const bad = result.issues.find((i) =>
        ['unknown_attendee', 'room_as_attendee', 'no_attendees'].includes(i.code),
      );
      if (bad !== undefined) {
        const flag = bad.path[0] === 'optional' ? '--optional' : '--with';
        throw new UsageError(`${flag}: ${bad.message}`);
      }
      const bounds = result.issues.find((i) => i.code.startsWith('bad_'));
      if (bounds !== undefined) throw new UsageError(bounds.message);
      for (const i of result.issues) io.err(i.message);
      return 1;
    }
    const outcome = result.value;
    if (values.json === true) {
      io.out(
        JSON.stringify({
          options: outcome.options.map((o) => ({
            start: new Date(o.start).toISOString(),
            end: new Date(o.end).toISOString(),
            room: o.room,
            score: o.score,
            breakdown: o.breakdown.map((b) => ({ why: b.why, points: b.points })),
          })),
          blockers: outcome.blockers.map((b) => ({ who: b.who, kind: b.kind, detail: b.detail })),
          relaxations: outcome.relaxations.map((r) => ({ change: r.change, opens: r.opens })),
          warnings: outcome.warnings,
        }),
      );
    } else {
      for (const line of render(ws, outcome)) io.out(line);
    }
    return outcome.options.length > 0 ? 0 : 3;
  },
};
