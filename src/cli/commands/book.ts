import { randomBytes } from 'node:crypto';
import { Temporal } from 'temporal-polyfill';
import { BookingService, type BusyOf, fileBusy, LOCAL_OPERATOR } from '../../app/index.ts';
import { loadWorkspace, type Workspace } from '../../config/index.ts';
import { SlotwrightError } from '../../errors.ts';
import { openStoreFromEnv, SqlBookingStore, SqlLedgerStore, type StoreHandle } from '../../store/index.ts';
import { listOption, parseVerbArgs, stringOption } from '../args.ts';
import { parseDuration } from '../duration.ts';
import type { CliIo } from '../io.ts';
import { UsageError } from '../io.ts';
import type { CliCommand } from '../main.ts';

const USAGE = `Usage: slotwright book --workspace <dir> --with <id,...> --start <instant> --length <dur>
                       [--room <id>] [--as <person-id>] [--title <text>] [--json]

Books a time directly, for admins and scripts. Refuses when a person or the room is already taken
by a booking, a live hold, or busy time in their feeds.

  --workspace  folder with workspace.yaml
  --with       people (or groups) who attend, comma-separated ids
  --start      an instant with an offset or zone: 2026-12-07T14:00Z, 2026-12-07T15:00+01:00,
               2026-12-07T10:00[America/Halifax]
  --length     45m, 1h30m, or minutes (90)
  --room       room id
  --as         person acting; must attend or be a workspace admin (default: the local operator)
  --title      meeting title (default: Meeting)
  --json       print JSON

Store: SLOTWRIGHT_DATABASE_URL (postgres://... or a SQLite file), else data/slotwright.sqlite
under the current folder.
Exit codes: 0 booked, 1 unreadable input or refused, 2 bad arguments, 3 someone is taken.`;

/** Reads an instant; a bare local time without an offset or zone is refused, not guessed. */
export function parseInstant(text: string, option = 'start'): number {
  const t = text.trim();
  try {
    if (t.includes('[')) return Temporal.ZonedDateTime.from(t).epochMilliseconds;
    return Temporal.Instant.from(t).epochMilliseconds;
  } catch {
    throw new UsageError(
      `--${option} '${text}' is not an instant; add Z, an offset or a zone, e.g. 2026-12-07T14:00Z or 2026-12-07T10:00[America/Halifax]`,
    );
  }
}

/** Loads the workspace or throws config_unreadable/config_invalid with the first issues. */
export function loadWorkspaceOrThrow(dir: string, now: number): Workspace {
  const ws = loadWorkspace(dir, { now });
  if (ws.ok) return ws.value;
  const first = ws.issues
    .slice(0, 3)
    .map((i) => i.message)
    .join('; ');
  const code = ws.issues.some((i) => i.code === 'config_unreadable') ? 'config_unreadable' : 'config_invalid';
  throw new SlotwrightError(code, first);
}

/** Expands person and group ids to person ids; unknown ids are a UsageError listing what exists. */
export function resolveAttendees(ws: Workspace, ids: readonly string[]): string[] {
  const people = new Set(ws.people.map((p) => p.id));
  const out: string[] = [];
  for (const id of ids) {
    const group = ws.groups.find((g) => g.id === id);
    if (people.has(id)) out.push(id);
    else if (group !== undefined) out.push(...group.members);
    else throw new UsageError(`--with: no person or group '${id}' in the workspace`);
  }
  return [...new Set(out)];
}

/**
 * Busy time from the workspace's file feeds (read by the app's fileBusy). A URL feed is not fetched
 * by this command, so an attendee or room with one stops the booking rather than being booked over
 * time we could not see.
 */
function workspaceBusyOf(ws: Workspace): BusyOf {
  return async (ids, interval) => {
    for (const id of ids) {
      const owner = ws.people.find((p) => p.id === id) ?? ws.rooms.find((r) => r.id === id);
      const url = owner?.feeds.find((f) => f.kind === 'url');
      if (url !== undefined)
        throw new SlotwrightError(
          'feed_unreadable',
          `${id}'s feed ${url.ref} is a URL, which this command does not fetch; book through the chat app`,
        );
    }
    const read = fileBusy(ws, ids, interval);
    if (!read.ok)
      throw new SlotwrightError(
        read.issues[0]?.code === 'ics_invalid' ? 'ics_invalid' : 'feed_unreadable',
        read.issues.map((i) => i.message).join('; '),
      );
    return read.value.busy;
  };
}

/** Wires the booking use cases over an open store for one workspace. */
export function cliBookingService(handle: StoreHandle, ws: Workspace, io: CliIo): BookingService {
  return new BookingService(
    {
      store: new SqlBookingStore(handle),
      audit: new SqlLedgerStore(handle),
      busyOf: workspaceBusyOf(ws),
      now: () => io.now(),
      newId: () => `bk-${randomBytes(9).toString('base64url')}`,
      admins: ws.admins,
    },
    { tentative: ws.tentative },
  );
}

/** Checks `--as` names a person of the workspace. */
export function actorOf(ws: Workspace, as: string | undefined): string {
  if (as === undefined) return LOCAL_OPERATOR;
  if (!ws.people.some((p) => p.id === as)) throw new UsageError(`--as: no person '${as}' in the workspace`);
  return as;
}

const iso = (ms: number) => new Date(ms).toISOString();

/** `slotwright book`. */
export const command: CliCommand = {
  name: 'book',
  summary: 'book a time directly, refusing when anyone or the room is taken',
  usage: USAGE,
  async run(args, io) {
    const { values } = parseVerbArgs(args, {
      workspace: { type: 'string' },
      with: { type: 'string' },
      start: { type: 'string' },
      length: { type: 'string' },
      room: { type: 'string' },
      as: { type: 'string' },
      title: { type: 'string' },
      json: { type: 'boolean' },
    });
    const dir = stringOption(values, 'workspace', true);
    const withIds = listOption(values, 'with');
    if (withIds.length === 0) throw new UsageError('--with is required (comma-separated person ids)');
    const start = parseInstant(stringOption(values, 'start', true));
    const minutes = parseDuration(stringOption(values, 'length', true));
    const room = stringOption(values, 'room');
    const title = stringOption(values, 'title');
    const json = values.json === true;
    const ws = loadWorkspaceOrThrow(dir, io.now());
    const attendees = resolveAttendees(ws, withIds);
    if (room !== undefined && !ws.rooms.some((r) => r.id === room))
      throw new UsageError(`--room: no room '${room}' in the workspace`);
    const actor = actorOf(ws, stringOption(values, 'as'));
    const handle = await openStoreFromEnv(io.env, process.cwd());
    try {
      const r = await cliBookingService(handle, ws, io).bookDirect(actor, {
        start,
        end: start + minutes * 60_000,
        ...(room === undefined ? {} : { room }),
        ...(title === undefined ? {} : { title }),
        attendees: attendees.map((id) => ({ id, role: 'required' as const })),
      });
      if (!r.ok) {
        const issue = r.issues[0]!;
        if (json)
          io.out(
            JSON.stringify(
              issue.code === 'conflict'
                ? { error: 'conflict', with: issue.with ?? [] }
                : { error: issue.code, message: issue.message },
            ),
          );
        else io.err(`slotwright book: ${issue.message}`);
        return issue.code === 'conflict' ? 3 : 1;
      }
      const b = r.value.booking;
      if (json)
        io.out(JSON.stringify({ booking: { id: b.id, start: iso(b.start), end: iso(b.end), room: b.room } }));
      else
        io.out(
          `${r.value.created ? 'booked' : 'already booked'} ${b.id}: ${iso(b.start)} to ${iso(b.end)} with ${b.attendees
            .map((a) => a.id)
            .join(', ')}${b.room === null ? '' : ` in ${b.room}`}`,
        );
      return 0;
    } finally {
      await handle.close();
    }
  },
};
