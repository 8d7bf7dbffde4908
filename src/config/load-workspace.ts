import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { isMap, isPair, isScalar, LineCounter, type Node, parseDocument } from 'yaml';
import type { z } from 'zod';
import type { Issue, Result } from '../errors.ts';
import type { RestSettings } from '../rules/rest-settings.ts';
import {
  type DailyRange,
  DEFAULT_WORKING_HOURS,
  WEEKDAY_KEYS,
  type WeekdayKey,
  type WeeklyHours,
} from '../time/working-hours.ts';
import type { SeriesConfig, WeekPlanSettings } from './series-schema.ts';
import type { WeekPostSettings } from './week-post-schema.ts';
import { WORKSPACE_KEYS, workspaceSchema } from './workspace-schema.ts';

/** Where a feed comes from: a file inside the workspace folder or an https URL. */
export type FeedRef =
  | { readonly kind: 'file'; readonly ref: string; readonly path: string }
  | { readonly kind: 'url'; readonly ref: string; readonly url: string };

/** A person of the workspace, with the workspace defaults filled in. */
export interface WorkspacePerson {
  readonly id: string;
  readonly name: string;
  readonly email?: string;
  readonly chat?: string;
  readonly zone: string;
  /** True when the person has no zone of their own and `zone` is the workspace's. */
  readonly zoneFromWorkspace?: true;
  readonly workingHours: WeeklyHours;
  /** date-holidays region code ("PT", "CA-NS"); no public holidays are applied when absent. */
  readonly holidays?: string;
  readonly feeds: readonly FeedRef[];
  /** Rules in plain words, as written. */
  readonly rules: readonly string[];
  /** This person's rest between days, when set on them. */
  readonly rest?: RestSettings;
}

/** A bookable room. */
export interface WorkspaceRoom {
  readonly id: string;
  readonly name: string;
  readonly capacity: number;
  readonly features: readonly string[];
  readonly zone: string;
  readonly feeds: readonly FeedRef[];
  readonly rules: readonly string[];
}

/** A named set of people. */
export interface WorkspaceGroup {
  readonly id: string;
  readonly name?: string;
  readonly members: readonly string[];
}

/** A validated workspace folder. */
export interface Workspace {
  /** Absolute path of the folder. */
  readonly dir: string;
  /** Absolute path of the file read (workspace.yaml, or workspace.json when there is no yaml). */
  readonly file: string;
  readonly name?: string;
  readonly zone: string;
  /** Minutes between candidate start times. */
  readonly grid: number;
  /** Days searched when a request names no window. */
  readonly horizon: number;
  readonly workingHours: WeeklyHours;
  /** How tentative busy time counts: a penalty in the score, or as busy. */
  readonly tentative: 'penalty' | 'hard';
  readonly admins: readonly string[];
  readonly people: readonly WorkspacePerson[];
  readonly rooms: readonly WorkspaceRoom[];
  readonly groups: readonly WorkspaceGroup[];
  readonly series: readonly SeriesConfig[];
  readonly weekPlan: WeekPlanSettings;
  /** When and where the week plan is posted (`weekPlan.post`, `.channel`, `.zone`); no post when absent. */
  readonly weekPost?: WeekPostSettings;
  /** Rest between days for everyone, when set (`rest:`). */
  readonly rest?: RestSettings;
  /** Things that loaded but look wrong (unknown keys); never errors. */
  readonly warnings: readonly string[];
}

/** Options of loadWorkspace and parseWorkspace. */
export interface LoadWorkspaceOptions {
  /** Current instant (epoch ms); kept for rules read relative to today. */
  readonly now: number;
}

function pathText(path: readonly PropertyKey[]): string {
  let out = '';
  for (const p of path) out += typeof p === 'number' ? `[${p}]` : out === '' ? String(p) : `.${String(p)}`;
  return out === '' ? '(top level)' : out;
}

/** The line of the deepest node of `path` that exists in the document (1-based). */
function lineOf(
  doc: ReturnType<typeof parseDocument>,
  lc: LineCounter,
  path: readonly PropertyKey[],
  key?: string,
): number {
  for (let n = path.length; n >= 0; n--) {
    const head = path.slice(0, n) as (string | number)[];
    const node = (n === 0 ? doc.contents : doc.getIn(head, true)) as Node | null | undefined;
    if (node?.range == null) continue;
    if (key !== undefined && n === path.length && isMap(node)) {
      const pair = node.items.find((i) => isPair(i) && isScalar(i.key) && i.key.value === key);
      const k = pair?.key as Node | undefined;
      if (k?.range != null) return lc.linePos(k.range[0]).line;
    }
    return lc.linePos(node.range[0]).line;
  }
  return 1;
}

function hoursOf(h: Readonly<Record<string, readonly DailyRange[] | undefined>>): WeeklyHours {
  const out: Partial<Record<WeekdayKey, readonly DailyRange[]>> = {};
  for (const d of WEEKDAY_KEYS) {
    const ranges = h[d];
    if (ranges !== undefined) out[d] = ranges;
  }
  return out;
}

function feedRef(dir: string, ref: string): FeedRef {
  return /^https:\/\//i.test(ref)
    ? { kind: 'url', ref, url: ref }
    : { kind: 'file', ref, path: join(dir, ref) };
}

/**
 * Validates workspace text (YAML 1.2; JSON is valid YAML). Issues name the file, the line and the key
 * path, and say what was expected.
 */
export function parseWorkspace(
  text: string,
  where: { readonly file: string; readonly dir: string },
  _options: LoadWorkspaceOptions,
): Result<Workspace> {
  const name = where.file.split(/[\\/]/).pop() ?? where.file;
  const lc = new LineCounter();
  const doc = parseDocument(text, { lineCounter: lc, prettyErrors: true, uniqueKeys: true });
  if (doc.errors.length > 0) {
    return {
      ok: false,
      issues: doc.errors.map((e) => ({
        code: 'yaml_syntax',
        path: [],
        message: `${name}:${e.linePos?.[0].line ?? 1}: ${e.message.split('\n')[0]!.replace(/ at line \d+, column \d+:?$/, '')}`,
      })),
    };
  }
  const raw: unknown = doc.toJS();
  if (raw === null || typeof raw !== 'object' || Array.isArray(raw)) {
    return {
      ok: false,
      issues: [
        {
          code: 'config_invalid',
          path: [],
          message: `${name}:1: expected a mapping of keys such as zone:, people:`,
        },
      ],
    };
  }
  const parsed = workspaceSchema.safeParse(raw);
  if (!parsed.success) {
    const issues: Issue[] = [];
    for (const i of parsed.error.issues as z.core.$ZodIssue[]) {
      const path = i.path as (string | number)[];
      if (i.code === 'unrecognized_keys') {
        for (const key of i.keys) {
          issues.push({
            code: 'config_invalid',
            path: [...path, key],
            message: `${name}:${lineOf(doc, lc, path, key)}: ${pathText([...path, key])}: unknown key '${key}' (check the spelling)`,
          });
        }
        continue;
      }
      const missing = i.code === 'invalid_type' && i.input === undefined;
      const message = missing ? `is required (${i.message.replace(/^Invalid input: /, '')})` : i.message;
      issues.push({
        code: 'config_invalid',
        path,
        message: `${name}:${lineOf(doc, lc, path)}: ${pathText(path)}: ${message}`,
      });
    }
    return { ok: false, issues };
  }
  const ws = parsed.data;
  const warnings = Object.keys(raw)
    .filter((k) => !WORKSPACE_KEYS.includes(k))
    .map((k) => `${name}:${lineOf(doc, lc, [], k)}: unknown top-level key '${k}' was ignored`);
  // The post settings ride in `weekPlan:` as written but are the chat side's, not the engine's.
  const { post, channel, zone: postZone, ...engineSettings } = ws.weekPlan;
  const defaultHours = ws.workingHours === undefined ? DEFAULT_WORKING_HOURS : hoursOf(ws.workingHours);
  const value: Workspace = {
    dir: where.dir,
    file: where.file,
    ...(ws.name === undefined ? {} : { name: ws.name }),
    zone: ws.zone,
    grid: ws.grid,
    horizon: ws.horizon,
    workingHours: defaultHours,
    tentative: ws.tentative,
    admins: ws.admins,
    people: ws.people.map((p) => ({
      id: p.id,
      name: p.name,
      ...(p.email === undefined ? {} : { email: p.email }),
      ...(p.chat === undefined ? {} : { chat: p.chat }),
      zone: p.zone ?? ws.zone,
      ...(p.zone === undefined ? { zoneFromWorkspace: true as const } : {}),
      workingHours: p.workingHours === undefined ? defaultHours : hoursOf(p.workingHours),
      ...(p.holidays === undefined ? {} : { holidays: p.holidays.toUpperCase() }),
      feeds: p.feeds.map((f) => feedRef(where.dir, f)),
      rules: p.rules,
      ...(p.rest === undefined ? {} : { rest: p.rest }),
    })),
    rooms: ws.rooms.map((r) => ({
      id: r.id,
      name: r.name,
      capacity: r.capacity,
      features: r.features,
      zone: r.zone ?? ws.zone,
      feeds: r.feeds.map((f) => feedRef(where.dir, f)),
      rules: r.rules,
    })),
    groups: ws.groups.map((g) => ({
      id: g.id,
      ...(g.name === undefined ? {} : { name: g.name }),
      members: g.members,
    })),
    series: ws.series,
    weekPlan: engineSettings,
    ...(post === undefined || channel === undefined || postZone === undefined
      ? {}
      : { weekPost: { post, channel, zone: postZone } }),
    ...(ws.rest === undefined ? {} : { rest: ws.rest }),
    warnings,
  };
  return { ok: true, value };
}

/**
 * Loads and validates a workspace folder: workspace.yaml, or workspace.json when there is no yaml.
 * Feeds are only named here (their paths resolved), not read.
 */
export function loadWorkspace(dir: string, options: LoadWorkspaceOptions): Result<Workspace> {
  const abs = resolve(dir);
  const yamlFile = join(abs, 'workspace.yaml');
  const jsonFile = join(abs, 'workspace.json');
  const file = existsSync(yamlFile) ? yamlFile : existsSync(jsonFile) ? jsonFile : null;
  if (file === null) {
    return {
      ok: false,
      issues: [
        {
          code: 'config_unreadable',
          path: [],
          message: `${abs}: no workspace.yaml (or workspace.json) in this folder; pass the folder that holds it`,
        },
      ],
    };
  }
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    return {
      ok: false,
      issues: [
        {
          code: 'config_unreadable',
          path: [],
          message: `${file}: cannot be read (${error instanceof Error ? error.message : String(error)})`,
        },
      ],
    };
  }
  return parseWorkspace(text, { file, dir: abs }, options);
}
