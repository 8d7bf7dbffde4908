import { Temporal } from 'temporal-polyfill';
import { fileBusy, workspaceRules } from '../../app/workspace.ts';
import { loadWorkspace } from '../../config/index.ts';
import { parseVerbArgs, stringOption } from '../args.ts';
import { type CliIo, UsageError } from '../io.ts';
import type { CliCommand } from '../main.ts';

const USAGE = `Usage: slotwright check --workspace <dir> [--now <instant>]

Validates a workspace folder: workspace.yaml (or workspace.json), every rule sentence, and every file
feed over the next horizon days. Prints a short summary and exits 0, or prints the errors and exits 1.

Options:
  --workspace  folder with workspace.yaml (required)
  --now        the current instant, for scripts and tests (default: the clock)`;

const DAY_MS = 86_400_000;

/** `slotwright check`: validates a workspace folder. */
export const command: CliCommand = {
  name: 'check',
  summary: 'validate a workspace folder (config, rules, feeds)',
  usage: USAGE,
  async run(args: readonly string[], io: CliIo): Promise<number> {
    const { values } = parseVerbArgs(args, { workspace: { type: 'string' }, now: { type: 'string' } });
    const dir = stringOption(values, 'workspace', true);
    const nowText = stringOption(values, 'now');
    let now = io.now();
    if (nowText !== undefined) {
      try {
        now = Temporal.Instant.from(nowText).epochMilliseconds;
      } catch {
        throw new UsageError(`--now '${nowText}' is not an instant; use e.g. 2026-12-01T12:00:00Z`);
      }
    }
    const loaded = loadWorkspace(dir, { now });
    if (!loaded.ok) {
      for (const i of loaded.issues) io.err(i.message);
      return 1;
    }
    const ws = loaded.value;
    const rules = workspaceRules(ws, now);
    const ids = [...ws.people.map((p) => p.id), ...ws.rooms.map((r) => r.id)];
    const feeds = fileBusy(ws, ids, { start: now, end: now + ws.horizon * DAY_MS });
    const errors = [...(rules.ok ? [] : rules.issues), ...(feeds.ok ? [] : feeds.issues)];
    if (errors.length > 0) {
      for (const i of errors) io.err(i.message);
      return 1;
    }
    const feedCount = [...ws.people, ...ws.rooms].reduce((n, o) => n + o.feeds.length, 0);
    const ruleCount = rules.ok ? rules.value.length : 0;
    const name = ws.file.split(/[\\/]/).pop();
    io.out(
      `${name}: ok: ${ws.people.length} people, ${ws.rooms.length} rooms, ${ws.groups.length} groups, ` +
        `${feedCount} feeds, ${ruleCount} rules, ${ws.series.length} series (zone ${ws.zone}, grid ${ws.grid} minutes, horizon ${ws.horizon} days)`,
    );
    for (const w of [...ws.warnings, ...(feeds.ok ? feeds.value.warnings : [])]) io.out(`warning: ${w}`);
    return 0;
  },
};
