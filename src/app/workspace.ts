import { readFileSync } from 'node:fs';
import { busyFromIcs } from '../calendar/index.ts';
import type { Workspace } from '../config/index.ts';
import type { Issue, Result } from '../errors.ts';
import { type OwnedRule, parseWorkspaceRules, type RuleEffect, ruleEffect } from '../rules/index.ts';
import type { SchedulingContext } from '../scheduling/index.ts';
import type { BusyInterval, Interval } from '../time/index.ts';
import type { BusyOf } from './book.ts';

/** A feed whose cached copy is older than wanted; the caller (feed cache) knows this, not the files. */
export interface StaleFeed {
  /** Person or room id. */
  readonly owner: string;
  /** The feed as written in the workspace. */
  readonly feed: string;
  /** Minutes since the copy was fetched. */
  readonly ageMinutes: number;
}

/** Options of workspaceContext. */
export interface WorkspaceContextOptions {
  /** Current instant (epoch ms). */
  readonly now: number;
  /** Busy time and rules are read over this stretch. */
  readonly span: Interval;
  /** Fresh busy time by id; the default reads each file feed with busyFromIcs. @default file feeds */
  readonly busyOf?: BusyOf;
  /** Feeds known to be stale; each becomes a warning. @default [] */
  readonly stale?: readonly StaleFeed[];
}

/** Parses every rules: sentence of the workspace (once per load, so it is cheap to call per request). */
export function workspaceRules(ws: Workspace, now: number): Result<readonly OwnedRule[]> {
  const owners = [
    ...ws.people.map((p) => ({
      kind: 'person' as const,
      id: p.id,
      name: p.name,
      zone: p.zone,
      rules: p.rules,
    })),
    ...ws.rooms.map((r) => ({ kind: 'room' as const, id: r.id, name: r.name, zone: r.zone, rules: r.rules })),
  ];
  const parsed = parseWorkspaceRules(owners, {
    now,
    people: ws.people.map((p) => ({ id: p.id, name: p.name })),
    rooms: ws.rooms.map((r) => ({ id: r.id, name: r.name })),
    groups: ws.groups.map((g) => ({ id: g.id, ...(g.name === undefined ? {} : { name: g.name }) })),
  });
  if (!parsed.ok)
    return {
      ok: false,
      issues: parsed.issues.map((i) => ({
        code: 'config_invalid',
        path: i.path,
        message: `${ws.file}: ${i.message}`,
      })),
    };
  return { ok: true, value: parsed.rules };
}

/**
 * Busy time from the file feeds of people and rooms, read with busyFromIcs. A URL feed is not fetched
 * here: its owner gets a warning that their busy time is missing, so nobody trusts a gap we could not see.
 */
export function fileBusy(
  ws: Workspace,
  ids: readonly string[],
  span: Interval,
): Result<{ busy: ReadonlyMap<string, readonly BusyInterval[]>; warnings: readonly string[] }> {
  const busy = new Map<string, BusyInterval[]>();
  const warnings: string[] = [];
  const issues: Issue[] = [];
  for (const id of ids) {
    const person = ws.people.find((p) => p.id === id);
    const owner = person ?? ws.rooms.find((r) => r.id === id);
    if (owner === undefined) continue;
    const list: BusyInterval[] = [];
    for (const feed of owner.feeds) {
      if (feed.kind === 'url') {
        warnings.push(
          `${id}'s feed ${feed.ref} is a URL and was not fetched here; ${id}'s busy time from it is missing`,
        );
        continue;
      }
      let text: string;
      try {
        text = readFileSync(feed.path, 'utf8');
      } catch (error) {
        issues.push({
          code: 'feed_unreadable',
          path: [id, 'feeds', feed.ref],
          message: `cannot read ${id}'s feed ${feed.ref} (${(error as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : error instanceof Error ? error.message : String(error)}); fix the path in ${ws.file}`,
        });
        continue;
      }
      try {
        const report = busyFromIcs(text, {
          window: span,
          zone: owner.zone,
          ...(person?.email === undefined ? {} : { ownerEmail: person.email }),
        });
        list.push(...report.busy);
        for (const w of report.warnings) warnings.push(`${id}'s feed ${feed.ref}: ${w}`);
      } catch (error) {
        issues.push({
          code: 'ics_invalid',
          path: [id, 'feeds', feed.ref],
          message: `${id}'s feed ${feed.ref} is not a readable calendar (${error instanceof Error ? error.message : String(error)})`,
        });
      }
    }
    busy.set(id, list);
  }
  return issues.length > 0 ? { ok: false, issues } : { ok: true, value: { busy, warnings } };
}

/**
 * Everything scheduling needs from a workspace over one stretch: people and rooms with their busy
 * time, working hours, holiday regions and rule effects. Bad rules and unreadable feeds are issues.
 */
export async function workspaceContext(
  ws: Workspace,
  options: WorkspaceContextOptions,
): Promise<Result<SchedulingContext>> {
  const rules = workspaceRules(ws, options.now);
  if (!rules.ok) return rules;
  const ids = [...ws.people.map((p) => p.id), ...ws.rooms.map((r) => r.id)];
  let busy: ReadonlyMap<string, readonly BusyInterval[]>;
  const warnings: string[] = [];
  if (options.busyOf !== undefined) busy = await options.busyOf(ids, options.span);
  else {
    const read = fileBusy(ws, ids, options.span);
    if (!read.ok) return read;
    busy = read.value.busy;
    warnings.push(...read.value.warnings);
  }
  for (const s of options.stale ?? [])
    warnings.push(
      `${s.owner}'s feed ${s.feed} was last read ${Math.round(s.ageMinutes)} minutes ago; recent changes may be missing`,
    );
  const effects = (kind: 'person' | 'room', id: string, zone: string): RuleEffect[] =>
    rules.value
      .filter((r) => r.ownerKind === kind && r.ownerId === id)
      .map((r) =>
        ruleEffect(r.rule, {
          zone,
          from: options.span.start,
          to: options.span.end,
          now: options.now,
          id: `${id}-${r.index + 1}`,
        }),
      );
  return {
    ok: true,
    value: {
      zone: ws.zone,
      gridMinutes: ws.grid,
      tentative: ws.tentative,
      now: options.now,
      people: ws.people.map((p) => ({
        id: p.id,
        zone: p.zone,
        workingHours: p.workingHours,
        ...(p.holidays === undefined ? {} : { holidayRegion: p.holidays }),
        busy: busy.get(p.id) ?? [],
        rules: effects('person', p.id, p.zone),
      })),
      rooms: ws.rooms.map((r) => ({
        id: r.id,
        capacity: r.capacity,
        features: r.features,
        zone: r.zone,
        busy: busy.get(r.id) ?? [],
        rules: effects('room', r.id, r.zone),
      })),
      groups: ws.groups,
      knownUntil: options.span.end,
      warnings,
    },
  };
}
