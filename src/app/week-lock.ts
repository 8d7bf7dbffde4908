import { Temporal } from 'temporal-polyfill';
import {
  type InviteAttendee,
  type InviteParty,
  inviteCancel,
  inviteSeries,
  type WeekdayCode,
} from '../calendar/index.ts';
import type { Workspace } from '../config/load-workspace.ts';
import type { UsualHours } from '../scheduling/fairness.ts';
import type { SchedulingContext } from '../scheduling/types.ts';
import { type PastSession, planWeek, workspaceWeek } from '../scheduling/week/index.ts';
import type { BookingAttendee } from '../store/index.ts';
import type { BusyInterval } from '../time/interval.ts';
import { instantToZoned } from '../time/zoned.ts';
import type { BookedValue, BookingResult, DirectChoice } from './book.ts';
import { recordWeekOffHours } from './fairness.ts';
import type { BookingStore, FairnessLedger } from './ports.ts';
import type { PlannedSession, WorkspaceWeekPlan } from './week.ts';

/** A session booked by a lock, with the invite identity that later updates reuse. */
export interface LockedSession extends PlannedSession {
  readonly bookingId: string;
  /** UID stem of the session's weekly invite (`<uidStem>@<domain>`). */
  readonly uidStem: string;
  /** RFC 5545 SEQUENCE of the last invite sent for it. */
  readonly sequence: number;
}

/** What a lock leaves behind; keep it (e.g. with the week plan) and pass it to the next lock of the week. */
export interface LockedWeek {
  readonly isoWeek: string;
  readonly sessions: readonly LockedSession[];
}

/** A session that was taken since the plan was made and went to another time. */
export interface MovedSession {
  readonly series: string;
  readonly from: PlannedSession;
  readonly to: LockedSession;
  /** People and rooms that were taken at the planned time. */
  readonly takenBy: readonly string[];
}

/** A session that could not be booked; the week is not complete until it is. */
export interface PendingSession {
  readonly series: string;
  readonly start: number;
  readonly end: number;
  readonly room: string | null;
  readonly reason: string;
}

/** One invite message to send: a REQUEST per series with changes, a CANCEL per dropped session. */
export interface WeekInvite {
  readonly series: string;
  readonly method: 'REQUEST' | 'CANCEL';
  readonly uid: string;
  readonly sequence: number;
  readonly ics: string;
}

/** What a lock did. */
export interface WeekLockOutcome {
  readonly locked: LockedWeek;
  /** Sessions booked by this call at their planned time. */
  readonly booked: readonly LockedSession[];
  /** Sessions already booked by an earlier lock and unchanged. */
  readonly kept: readonly LockedSession[];
  /** Sessions re-placed because their planned time was taken. */
  readonly moved: readonly MovedSession[];
  /** Sessions left unbooked, with the reason. */
  readonly pending: readonly PendingSession[];
  /** Series the plan itself could not place; nothing of them is booked. */
  readonly unplaced: readonly { readonly series: string; readonly reason: string }[];
  /** Bookings of an earlier lock cancelled because their session moved. */
  readonly cancelled: readonly string[];
  readonly invites: readonly WeekInvite[];
  /** Off-hours sessions per person recorded for fairness, when a ledger is wired. */
  readonly offHours?: Readonly<Record<string, number>>;
}

/** What `lockWeek` needs from outside. */
export interface WeekLockDeps {
  /** The booking flow (BookingService): every session is booked through it. */
  readonly booking: {
    bookDirect(actor: string, choice: DirectChoice): Promise<BookingResult<BookedValue>>;
    cancel(actor: string, bookingId: string): Promise<BookingResult<BookedValue>>;
  };
  /** Reads what others booked since the plan was made. */
  readonly store: Pick<BookingStore, 'listFor'>;
  /** Current instant (epoch ms) for invite DTSTAMPs. */
  readonly now: () => number;
  /** Clock for the re-plan's time budget. */
  readonly clock: () => number;
  /** Where fairness history goes; nothing is recorded when absent. @default undefined */
  readonly fairness?: {
    readonly ledger: FairnessLedger;
    readonly usual: Readonly<Record<string, UsualHours>>;
  };
}

/** Options of `lockWeek`. */
export interface WeekLockOptions {
  /** The person locking (an admin, or the booking flow refuses sessions they do not attend). */
  readonly actor: string;
  /** Domain of invite UIDs, e.g. `slotwright.saltline.example`. */
  readonly domain: string;
  /** The earlier lock of the same week, for a re-lock. @default undefined */
  readonly previous?: LockedWeek;
  /** Weeks the invites repeat (RRULE COUNT). @default 12 */
  readonly weeks?: number;
  /** Re-plan rounds when slots keep getting taken. @default 3 */
  readonly rounds?: number;
  /** Time budget of each re-plan, in ms. @default 3000 */
  readonly timeMs?: number;
  /** Seed of the re-plan. @default 1 */
  readonly seed?: number;
  /** Local-search moves of each re-plan, so its result does not depend on machine speed. @default 20000 */
  readonly moves?: number;
}

const DEFAULTS = {
  weeks: 12,
  rounds: 3,
  timeMs: 3000,
  seed: 1,
  moves: 20_000,
} satisfies Partial<WeekLockOptions>;
const DAY_CODES: readonly WeekdayCode[] = ['MO', 'TU', 'WE', 'TH', 'FR', 'SA', 'SU'];
const UNPLACED_TEXT: Readonly<Record<string, string>> = {
  no_free_start: 'the attendees have no common free time left for it this week',
  conflict: 'it does not fit together with the booked sessions',
  budget: 'the re-plan ran out of time; lock again to retry',
};
// Keeps sessions that are already booked where they are when the affected ones are re-placed.
const PINNED_MOVES_WEIGHT = 1000;

const same = (a: PlannedSession, b: PlannedSession) =>
  a.series === b.series && a.start === b.start && a.room === b.room;

/**
 * Locks a week plan: books every session through the booking flow. When a slot was taken since the
 * plan was made, only the affected series are re-planned (every booked session stays fixed) and the
 * new times are booked; sessions that still cannot be booked are listed as pending, never dropped
 * silently. Each series gets a weekly invite (RRULE); a re-lock that moves a session sends an update
 * with the same UID and SEQUENCE + 1, and a CANCEL for a session that no longer has a time.
 */
export async function lockWeek(
  deps: WeekLockDeps,
  workspace: Workspace,
  context: SchedulingContext,
  plan: WorkspaceWeekPlan,
  options: WeekLockOptions,
): Promise<WeekLockOutcome> {
  const o = { ...DEFAULTS, ...options };
  const people = plan.week.people;
  const attendeesOf = (series: string): BookingAttendee[] =>
    (people[series] ?? []).map((id) => ({ id, role: 'required' }));
  const seriesName = (id: string) => workspace.series.find((s) => s.id === id)?.name ?? id;
  const previous = o.previous?.isoWeek === plan.isoWeek ? o.previous.sessions : [];

  const locked: LockedSession[] = [];
  const booked: LockedSession[] = [];
  const kept: LockedSession[] = [];
  const moved: MovedSession[] = [];
  const cancelled: string[] = [];
  // Invite identities freed by sessions that moved, reused by the series' new sessions in order.
  const freed = new Map<string, { uidStem: string; sequence: number }[]>();
  const usedStems = new Set(previous.map((p) => p.uidStem));
  const identityFor = (series: string): { uidStem: string; sequence: number } => {
    const reuse = freed.get(series)?.shift();
    if (reuse !== undefined) return { uidStem: reuse.uidStem, sequence: reuse.sequence + 1 };
    let k = 0;
    while (usedStems.has(`${series}-${plan.isoWeek}-${k}`)) k++;
    const uidStem = `${series}-${plan.isoWeek}-${k}`;
    usedStems.add(uidStem);
    return { uidStem, sequence: 0 };
  };

  // A re-lock keeps what is unchanged and cancels what moved, before booking anything new.
  let todo: PlannedSession[] = [];
  for (const s of plan.sessions) {
    const prev = previous.find((p) => same(p, s));
    if (prev !== undefined) {
      locked.push(prev);
      kept.push(prev);
    } else todo.push(s);
  }
  for (const p of previous) {
    if (locked.includes(p)) continue;
    const out = await deps.booking.cancel(o.actor, p.bookingId);
    if (out.ok) cancelled.push(p.bookingId);
    freed.set(p.series, [...(freed.get(p.series) ?? []), { uidStem: p.uidStem, sequence: p.sequence }]);
  }

  const bookOne = async (
    s: PlannedSession,
  ): Promise<{ ok: true; value: LockedSession } | { ok: false; with: readonly string[]; reason: string }> => {
    const out = await deps.booking.bookDirect(o.actor, {
      title: seriesName(s.series),
      start: s.start,
      end: s.end,
      ...(s.room === null ? {} : { room: s.room }),
      attendees: attendeesOf(s.series),
    });
    if (!out.ok) {
      const issue = out.issues[0];
      return { ok: false, with: issue?.with ?? [], reason: issue?.message ?? 'not booked' };
    }
    return { ok: true, value: { ...s, bookingId: out.value.booking.id, ...identityFor(s.series) } };
  };

  const pending: PendingSession[] = [];
  // The planned time of each session still to book, so a move can say where it came from.
  let origin = new Map<PlannedSession, { from: PlannedSession; takenBy: readonly string[] }>();
  for (let round = 0; todo.length > 0; round++) {
    const conflicts: { session: PlannedSession; with: readonly string[]; reason: string }[] = [];
    for (const s of todo) {
      const r = await bookOne(s);
      if (r.ok) {
        locked.push(r.value);
        const from = origin.get(s);
        if (from === undefined) booked.push(r.value);
        else moved.push({ series: s.series, from: from.from, to: r.value, takenBy: from.takenBy });
      } else if (r.with.length === 0) {
        pending.push({ series: s.series, start: s.start, end: s.end, room: s.room, reason: r.reason });
      } else conflicts.push({ session: s, with: r.with, reason: r.reason });
    }
    if (conflicts.length === 0) break;
    if (round >= o.rounds) {
      for (const c of conflicts) {
        pending.push({
          ...c.session,
          reason: `taken by other bookings of ${c.with.join(', ')} in ${o.rounds} re-plans in a row`,
        });
      }
      break;
    }
    const replan = await replanAffected(deps, workspace, context, plan, locked, conflicts, o);
    const nextOrigin = new Map<PlannedSession, { from: PlannedSession; takenBy: readonly string[] }>();
    todo = [];
    for (const [series, list] of replan.placed) {
      const conflicted = conflicts.filter((c) => c.session.series === series);
      list.forEach((s, i) => {
        const c = conflicted[i]!;
        const first = origin.get(c.session) ?? { from: c.session, takenBy: c.with };
        nextOrigin.set(s, first);
        todo.push(s);
      });
    }
    for (const p of replan.unplaced) {
      const first = origin.get(p.session)?.from ?? p.session;
      pending.push({ ...first, reason: p.reason });
    }
    origin = nextOrigin;
  }

  const invites = seriesInvites(workspace, plan, locked, previous, o, deps.now());
  const offHours =
    deps.fairness === undefined
      ? undefined
      : await recordWeekOffHours(
          deps.fairness.ledger,
          plan.isoWeek,
          locked.map((s) => ({ start: s.start, end: s.end, attendees: people[s.series] ?? [] })),
          deps.fairness.usual,
        );
  const sorted = [...locked].sort((a, b) => a.start - b.start || a.series.localeCompare(b.series));
  return {
    locked: { isoWeek: plan.isoWeek, sessions: sorted },
    booked,
    kept,
    moved,
    pending,
    unplaced: plan.unplaced.map((u) => ({ series: u.series, reason: u.reason })),
    cancelled,
    invites,
    ...(offHours === undefined ? {} : { offHours }),
  };
}

/** Re-plans only the series whose sessions were taken, with every locked session fixed in place. */
async function replanAffected(
  deps: WeekLockDeps,
  workspace: Workspace,
  context: SchedulingContext,
  plan: WorkspaceWeekPlan,
  locked: readonly LockedSession[],
  conflicts: readonly { session: PlannedSession; with: readonly string[] }[],
  o: Required<Pick<WeekLockOptions, 'timeMs' | 'seed' | 'moves'>>,
): Promise<{
  placed: Map<string, PlannedSession[]>;
  unplaced: { session: PlannedSession; reason: string }[];
}> {
  const window = plan.week.window;
  const ours = new Set(locked.map((l) => l.bookingId));
  // What others booked since the plan was made becomes busy time of those people and rooms.
  const extra = new Map<string, BusyInterval[]>();
  const roomIds = new Set(workspace.rooms.map((r) => r.id));
  for (const id of new Set(conflicts.flatMap((c) => c.with))) {
    const list = await deps.store.listFor({ kind: roomIds.has(id) ? 'room' : 'person', id }, window, [
      'held',
      'booked',
    ]);
    extra.set(
      id,
      list.filter((b) => !ours.has(b.id)).map((b) => ({ start: b.start, end: b.end, kind: 'busy' as const })),
    );
  }
  const withExtra = <T extends { id: string; busy: readonly BusyInterval[] }>(x: T): T =>
    extra.has(x.id) ? { ...x, busy: [...x.busy, ...extra.get(x.id)!].sort((a, b) => a.start - b.start) } : x;
  const context2: SchedulingContext = {
    ...context,
    people: context.people.map(withExtra),
    rooms: context.rooms.map(withExtra),
  };
  const affected = new Set(conflicts.map((c) => c.session.series));
  const inPlan = new Set(plan.sessions.map((s) => s.series));
  const series = workspace.series.filter((s) => inPlan.has(s.id));
  // Locked sessions enter as "last week" (one week earlier on the wall clock) with a heavy move cost,
  // so the engine keeps the affected series' booked sessions too.
  const lastWeek: PastSession[] = locked.map((l) => ({
    series: l.series,
    start: Temporal.Instant.fromEpochMilliseconds(l.start)
      .toZonedDateTimeISO(workspace.zone)
      .subtract({ weeks: 1 }).epochMilliseconds,
    room: l.room,
  }));
  const built = workspaceWeek({
    context: context2,
    series,
    settings: {
      ...workspace.weekPlan,
      weights: { ...workspace.weekPlan.weights, moves: PINNED_MOVES_WEIGHT },
    },
    isoWeek: plan.isoWeek,
    lastWeek,
    offHoursWeights: Object.fromEntries(
      plan.week.request.attendees.map((a) => [a.id, a.offHoursWeight ?? 1]),
    ),
  });
  const placed = new Map<string, PlannedSession[]>();
  const unplaced: { session: PlannedSession; reason: string }[] = [];
  if (!built.ok) {
    for (const c of conflicts)
      unplaced.push({ session: c.session, reason: built.issues.map((i) => i.message).join('; ') });
    return { placed, unplaced };
  }
  const week = built.value;
  // Series with nothing taken are pinned hard: each may start only where it is booked.
  const request = {
    ...week.request,
    series: week.request.series.map((s) => {
      if (affected.has(s.id)) return s;
      const starts = new Set(locked.filter((l) => l.series === s.id).map((l) => l.start));
      return {
        ...s,
        allowed: week.request.cells.map((c, i) => starts.has(c.start) && (s.allowed?.[i] ?? true)),
      };
    }),
  };
  const result = planWeek(request, { timeMs: o.timeMs, clock: deps.clock, seed: o.seed, moves: o.moves });
  for (const id of affected) {
    const mine = conflicts.filter((c) => c.session.series === id);
    const lockedHere = locked.filter((l) => l.series === id);
    const candidates = result.sessions
      .filter((s) => s.series === id)
      .map((s) => {
        const start = week.request.cells[s.cell]!.start;
        return { series: id, start, end: start + week.minutes[id]! * 60_000, room: s.room };
      })
      .filter((s) => !lockedHere.some((l) => l.start < s.end && l.end > s.start))
      .filter((s) => !mine.some((c) => same(c.session, s)))
      .sort((a, b) => a.start - b.start);
    const take = candidates.slice(0, mine.length);
    placed.set(id, take);
    const why = result.unplaced.find((u) => u.series === id);
    for (const c of mine.slice(take.length)) {
      unplaced.push({
        session: c.session,
        reason:
          why === undefined
            ? `no other time fits the series once ${c.with.join(', ')} was taken`
            : `no other time fits: ${UNPLACED_TEXT[why.code] ?? why.code}`,
      });
    }
  }
  return { placed, unplaced };
}

function seriesInvites(
  workspace: Workspace,
  plan: WorkspaceWeekPlan,
  locked: readonly LockedSession[],
  previous: readonly LockedSession[],
  o: { domain: string; weeks: number },
  stamp: number,
): WeekInvite[] {
  const byId = new Map(workspace.people.map((p) => [p.id, p]));
  const party = (id: string): InviteParty | undefined => {
    const p = byId.get(id);
    return p?.email === undefined ? undefined : { name: p.name, email: p.email };
  };
  // RFC 5546 section 3.2.2: a REQUEST names its ORGANIZER; the first admin with an email organizes.
  const organizer = workspace.admins.map(party).find((p) => p !== undefined);
  if (organizer === undefined) return [];
  const out: WeekInvite[] = [];
  for (const s of locked) {
    const prev = previous.find((p) => p.uidStem === s.uidStem);
    if (prev !== undefined && same(prev, s)) continue;
    const series = workspace.series.find((x) => x.id === s.series);
    const zone = series?.zone ?? workspace.zone;
    const attendees: InviteAttendee[] = (plan.week.people[s.series] ?? [])
      .map(party)
      .filter((p): p is InviteParty => p !== undefined && p.email !== organizer.email)
      .map((p) => ({ ...p, role: 'required' }));
    const room = s.room === null ? undefined : workspace.rooms.find((r) => r.id === s.room);
    out.push({
      series: s.series,
      method: 'REQUEST',
      uid: `${s.uidStem}@${o.domain}`,
      sequence: s.sequence,
      ics: inviteSeries({
        seriesId: s.uidStem,
        domain: o.domain,
        title: series?.name ?? s.series,
        start: s.start,
        end: s.end,
        zone,
        byDay: [DAY_CODES[instantToZoned(s.start, zone).weekday - 1]!],
        count: o.weeks,
        organizer,
        attendees,
        sequence: s.sequence,
        stamp,
        ...(room === undefined ? {} : { location: room.name }),
      }),
    });
  }
  // A session of an earlier lock whose identity nobody reused has no time any more: cancel it.
  for (const p of previous) {
    if (locked.some((l) => l.uidStem === p.uidStem)) continue;
    out.push({
      series: p.series,
      method: 'CANCEL',
      uid: `${p.uidStem}@${o.domain}`,
      sequence: p.sequence + 1,
      ics: inviteCancel({
        bookingId: p.uidStem,
        domain: o.domain,
        title: workspace.series.find((x) => x.id === p.series)?.name ?? p.series,
        start: p.start,
        end: p.end,
        organizer,
        attendees: [],
        sequence: p.sequence + 1,
        stamp,
      }),
    });
  }
  return out;
}

/** The lock's outcome in plain words for the chat reply, one line per fact. */
export function describeWeekLock(outcome: WeekLockOutcome, zone: string): string[] {
  const when = (ms: number) => {
    const z = Temporal.Instant.fromEpochMilliseconds(ms).toZonedDateTimeISO(zone);
    return `${z.toPlainDate().toLocaleString('en', { weekday: 'long' })} ${z.toPlainTime().toString().slice(0, 5)}`;
  };
  const total = outcome.locked.sessions.length + outcome.pending.length;
  const lines = [
    `${outcome.locked.isoWeek}: ${outcome.locked.sessions.length} of ${total} sessions booked (times in ${zone}).`,
  ];
  for (const m of outcome.moved) {
    lines.push(
      `${m.series}: ${when(m.from.start)} was taken (${m.takenBy.join(', ')}), so it moved to ${when(m.to.start)}.`,
    );
  }
  for (const p of outcome.pending)
    lines.push(`${p.series}: ${when(p.start)} is not booked yet: ${p.reason}.`);
  for (const u of outcome.unplaced) lines.push(`${u.series}: the plan found no time for it (${u.reason}).`);
  if (outcome.pending.length + outcome.unplaced.length > 0) {
    lines.push('The week is not fully booked until the sessions above are placed.');
  }
  if (outcome.cancelled.length > 0)
    lines.push(`${outcome.cancelled.length} earlier booking(s) moved and were cancelled.`);
  return lines;
}
