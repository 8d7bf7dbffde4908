/**
 * The facade of use cases the chat bot calls. The bot speaks only these plain, serialisable types;
 * each method returns `{ ok: false, issues }` for expected failures, including a use case that is
 * not wired into this build (`not_available`).
 */
import { createHmac, randomUUID, timingSafeEqual } from 'node:crypto';
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import { redactUrl } from '../calendar/index.ts';
import type { Workspace } from '../config/index.ts';
import { type Issue, type Result, SlotwrightError } from '../errors.ts';
import { describeSeries, parseSeriesSentence, ruleEffect, type SeriesDraft } from '../rules/index.ts';
import {
  findOptions,
  isoWeekOf,
  type MeetOutcome,
  type MeetRequest,
  mondayOfIsoWeek,
  type SchedulingContext,
  WIDEN_DAYS,
} from '../scheduling/index.ts';
import type { WeekProgress } from '../scheduling/week/index.ts';
import { workspaceWeek } from '../scheduling/week/index.ts';
import type { BookingRecord } from '../store/index.ts';
import {
  addDays,
  type BusyInterval,
  type Interval,
  instantToZoned,
  isValidZone,
  zonedToInstant,
} from '../time/index.ts';
import type { BookingService, BusyOf } from './book.ts';
import { fairnessWeightsFor } from './fairness.ts';
import { busyByOwner, type FeedSpec, type FeedsDeps, refreshFeeds } from './feeds.ts';
import type {
  BookingStore,
  ChatUserProfile,
  DeliveryLog,
  FairnessLedger,
  FeedStateStore,
  RuleStore,
} from './ports.ts';
import { forgetRule, listRules, previewRule, type RuleDeps, saveRule } from './rules.ts';
import type { SolvePool } from './solve-pool.ts';
import {
  diffWeekPlans,
  nextIsoWeek,
  type PlannedSession,
  type PlanWorkspaceWeekOptions,
  planWorkspaceWeek,
  WEEK_SEARCH_MS,
  type WorkspaceWeekPlan,
  weekContext,
} from './week.ts';
import { describeWeekLock, type LockedWeek, lockWeek, type WeekInvite } from './week-lock.ts';
import { usualHoursOf, withWorkspaceRest } from './week-post.ts';
import { fileBusy, workspaceContext } from './workspace.ts';

/** A workspace person as the bot sees them. */
export interface ServicePerson {
  readonly id: string;
  readonly name: string;
  readonly zone: string;
  readonly email?: string;
  readonly chat?: string;
  readonly admin: boolean;
}

/** A person named in a request: a chat user id or a typed handle (person id or first name). */
export interface PersonQuery {
  readonly kind: 'chat' | 'name';
  readonly id: string;
}

/** A meeting request in the bot's words. */
export interface MeetQuery {
  readonly lengthMinutes: number;
  readonly required: readonly PersonQuery[];
  readonly optional: readonly PersonQuery[];
  /** Inclusive dates `YYYY-MM-DD` in the asker's zone; absent: the workspace horizon from now. */
  readonly window?: { readonly from: string; readonly to: string };
  readonly roomFor?: number;
  readonly features: readonly string[];
}

/** One part of an option's fit score. */
export interface ScorePart {
  readonly label: string;
  readonly points: number;
}

/** One candidate time (and room). `token` is what book/hold take back. */
export interface MeetOption {
  readonly token: string;
  readonly start: number;
  readonly end: number;
  readonly room?: { readonly id: string; readonly name: string };
  readonly score: number;
  readonly breakdown: readonly ScorePart[];
}

/** Who or what stands in the way, in plain words. */
export interface MeetBlocker {
  readonly subject: string;
  readonly reason: string;
}

/** A change that would open options, ready to be tried as a new query. */
export interface MeetRelaxation {
  readonly label: string;
  readonly query: MeetQuery;
}

/** The answer to a meeting request. */
export interface MeetAnswer {
  readonly query: MeetQuery;
  /** People the request was resolved to, required first. */
  readonly attendees: readonly ServicePerson[];
  readonly options: readonly MeetOption[];
  readonly blockers: readonly MeetBlocker[];
  readonly relaxations: readonly MeetRelaxation[];
  readonly warnings: readonly string[];
}

/** A booking or hold as the bot shows it (never another person's event titles). */
export interface BookingView {
  readonly id: string;
  readonly state: 'held' | 'booked' | 'cancelled';
  readonly start: number;
  readonly end: number;
  readonly room?: string;
  readonly attendees: readonly string[];
  /** When a hold lapses, for holds. */
  readonly expiresAt?: number;
}

/** A saved rule. */
export interface RuleView {
  readonly id: string;
  readonly text: string;
  readonly strength: 'hard' | 'preference';
}

/** What a typed rule would mean, before it is saved; `token` confirms it. */
export interface RulePreview {
  readonly description: string;
  readonly strength: 'hard' | 'preference';
  readonly token: string;
  /** The structured form as labelled lines. */
  readonly fields: readonly { readonly label: string; readonly value: string }[];
  /** How it relates to rules already saved (repeats, overlaps, contradicts). */
  readonly related: readonly string[];
  /** The yes/no question to put to the person. */
  readonly question: string;
}

/** A calendar feed and how fresh its busy time is. */
export interface FeedView {
  readonly label: string;
  readonly owner: string;
  readonly freshness: 'fresh' | 'stale' | 'failed' | 'never';
  readonly fetchedAt?: number;
  readonly note?: string;
}

/** One placed session of a week plan. */
export interface WeekSession {
  /** Series name. */
  readonly series: string;
  readonly seriesId: string;
  readonly start: number;
  readonly end: number;
  /** Room name. */
  readonly room?: string;
}

/** How a session differs from the locked plan of the week before (same local weekday and time). */
export interface WeekChange {
  readonly series: string;
  readonly change: 'moved' | 'added' | 'removed';
  /** Last week's time moved onto the planned week. */
  readonly before?: number;
  readonly after?: number;
}

/** A week plan, or what could not be placed. */
export interface WeekPlanView {
  /** Monday `YYYY-MM-DD` of the planned week. */
  readonly weekOf: string;
  readonly isoWeek: string;
  readonly sessions: readonly WeekSession[];
  readonly unplaced: readonly {
    readonly series: string;
    readonly reason: string;
    /** People, series and rooms in the way, in plain words. */
    readonly blockers: readonly string[];
  }[];
  /** Preference cost of the plan (lower is better) and its non-zero parts. */
  readonly cost: { readonly total: number; readonly parts: readonly ScorePart[] };
  /** Changes against the locked plan of the week before; undefined when that week was not locked. */
  readonly diff?: readonly WeekChange[];
  /** The week already has a locked plan; locking this one re-books what changed. */
  readonly relock: boolean;
  /** Hands the plan to `lockWeek`; absent when the plan cannot be kept (no week plan store). */
  readonly lockToken?: string;
  readonly warnings: readonly string[];
}

/** Progress of a week plan being solved. */
export interface WeekProgressView {
  readonly elapsedMs: number;
  /** Best preference cost so far. */
  readonly best: number;
  /** Series not placed yet. */
  readonly unplaced: number;
  readonly phase: WeekProgress['phase'];
}

/** Where one weekly invite went. */
export interface WeekInviteView {
  readonly series: string;
  readonly method: 'REQUEST' | 'CANCEL';
  readonly uid: string;
  /** A path or address where the .ics can be picked up; absent when no outbox is wired. */
  readonly where?: string;
}

/** What locking a week did, in plain words and as data. */
export interface WeekLockView {
  readonly isoWeek: string;
  /** describeWeekLock's lines. */
  readonly lines: readonly string[];
  readonly booked: readonly (WeekSession & { readonly bookingId: string })[];
  readonly pending: number;
  readonly invites: readonly WeekInviteView[];
}

/** A recurring meeting definition, as listed. */
export interface SeriesView {
  readonly id: string;
  readonly description: string;
}

/** The use cases the bot calls. */
export interface SlotwrightService {
  /** Name of the workspace, for greetings and the home tab. */
  readonly workspaceName: string;
  /** Maps a chat user to a workspace person: by chat id, else by email. */
  identify(profile: ChatUserProfile): Promise<Result<ServicePerson>>;
  /** A person by workspace id. */
  person(id: string): ServicePerson | undefined;
  /** The person the console acts as when none is named: the first admin. */
  defaultPerson(): ServicePerson;
  meet(actor: ServicePerson, query: MeetQuery, nowMs: number): Promise<Result<MeetAnswer>>;
  /** The actor's last answered request, for `why`. */
  lastMeet(actorId: string): MeetAnswer | undefined;
  hold(actor: ServicePerson, optionToken: string, nowMs: number): Promise<Result<BookingView>>;
  book(actor: ServicePerson, optionToken: string, nowMs: number): Promise<Result<BookingView>>;
  cancel(actor: ServicePerson, bookingId: string, nowMs: number): Promise<Result<BookingView>>;
  upcoming(actor: ServicePerson, nowMs: number): Promise<Result<readonly BookingView[]>>;
  previewRule(actor: ServicePerson, text: string, nowMs: number): Promise<Result<RulePreview>>;
  confirmRule(actor: ServicePerson, token: string, nowMs: number): Promise<Result<RuleView>>;
  rules(actor: ServicePerson): Promise<Result<readonly RuleView[]>>;
  forgetRule(actor: ServicePerson, ruleId: string, nowMs: number): Promise<Result<RuleView>>;
  addFeed(actor: ServicePerson, url: string, nowMs: number): Promise<Result<FeedView>>;
  feeds(actor: ServicePerson, nowMs: number): Promise<Result<readonly FeedView[]>>;
  series(actor: ServicePerson, text: string, nowMs: number): Promise<Result<readonly SeriesView[]>>;
  /**
   * Plans one week (`weekOf`: a date or `YYYY-Www`; default next week). `onProgress` hears how the
   * search is going about once per `weekProgressMs`.
   */
  week(
    actor: ServicePerson,
    weekOf: string | undefined,
    nowMs: number,
    onProgress?: (p: WeekProgressView) => void,
  ): Promise<Result<WeekPlanView>>;
  /** Books a planned week (the token from `week`), keeps it as the week's locked plan and sends invites. */
  lockWeek(actor: ServicePerson, token: string, nowMs: number): Promise<Result<WeekLockView>>;
  /** True the first time a delivery key is seen (see DeliveryLog). */
  claimDelivery(key: string, nowMs: number): Promise<boolean>;
}

/** The issue a use case that is not part of this build answers with. */
export function notAvailable(what: string): Result<never> {
  return {
    ok: false,
    issues: [{ code: 'not_available', path: [], message: `${what} is not available in this build yet` }],
  };
}

/** A failed result with one issue. */
export function failure(code: string, message: string, path: Issue['path'] = []): Result<never> {
  return { ok: false, issues: [{ code, path, message }] };
}

/** Result of resolving the people a request names. */
export interface ResolvedPeople {
  readonly required: readonly ServicePerson[];
  readonly optional: readonly ServicePerson[];
}

/** Finds workspace people by chat id, email, person id, first name or group. */
export class PeopleDirectory {
  readonly #people: readonly ServicePerson[];
  readonly #groups: ReadonlyMap<string, readonly string[]>;

  constructor(people: readonly ServicePerson[], groups: ReadonlyMap<string, readonly string[]> = new Map()) {
    this.#people = people;
    this.#groups = groups;
  }

  /** Everyone, in workspace order. */
  get all(): readonly ServicePerson[] {
    return this.#people;
  }

  /** A person by id. */
  byId(id: string): ServicePerson | undefined {
    return this.#people.find((p) => p.id === id);
  }

  /** Maps a chat user to a person: by chat id, else by email (case-insensitive). */
  identify(profile: ChatUserProfile): Result<ServicePerson> {
    const byChat = this.#people.find((p) => p.chat === profile.chatId);
    if (byChat !== undefined) return { ok: true, value: byChat };
    const email = profile.email?.toLowerCase();
    const byEmail =
      email === undefined ? undefined : this.#people.find((p) => p.email?.toLowerCase() === email);
    if (byEmail !== undefined) return { ok: true, value: byEmail };
    return failure(
      'chat_unknown_user',
      `I do not know chat user ${profile.chatId}${email === undefined ? '' : ` (${email})`} in this workspace; ask an admin to add your chat id or email to the workspace people`,
      ['user'],
    );
  }

  /** Resolves the people of a request; every name that matches nobody, or several people, is an issue. */
  resolve(required: readonly PersonQuery[], optional: readonly PersonQuery[]): Result<ResolvedPeople> {
    const issues: Issue[] = [];
    const take = (qs: readonly PersonQuery[], where: string): ServicePerson[] => {
      const out: ServicePerson[] = [];
      qs.forEach((q, i) => {
        const found = this.#find(q);
        if (found.ok) out.push(...found.value);
        else issues.push(...found.issues.map((x) => ({ ...x, path: [where, i] })));
      });
      return out;
    };
    const req = unique(take(required, 'required'));
    const opt = unique(take(optional, 'optional')).filter((p) => !req.some((r) => r.id === p.id));
    return issues.length > 0 ? { ok: false, issues } : { ok: true, value: { required: req, optional: opt } };
  }

  #find(q: PersonQuery): Result<readonly ServicePerson[]> {
    if (q.kind === 'chat') {
      const p = this.#people.find((x) => x.chat === q.id);
      return p === undefined
        ? failure('person_unknown', `<@${q.id}> is not one of the workspace people`)
        : { ok: true, value: [p] };
    }
    const id = q.id.toLowerCase();
    const exact = this.#people.find((p) => p.id.toLowerCase() === id);
    if (exact !== undefined) return { ok: true, value: [exact] };
    const group = this.#groups.get(id);
    if (group !== undefined) {
      return {
        ok: true,
        value: group.map((m) => this.byId(m)).filter((p): p is ServicePerson => p !== undefined),
      };
    }
    const byFirst = this.#people.filter((p) => p.name.split(/\s+/)[0]!.toLowerCase() === id);
    if (byFirst.length === 1) return { ok: true, value: byFirst };
    if (byFirst.length > 1) {
      return failure(
        'person_ambiguous',
        `@${q.id} could be ${byFirst.map((p) => `@${p.id}`).join(' or ')}; use the id`,
      );
    }
    return failure('person_unknown', `@${q.id} is not a person or group of this workspace`);
  }
}

function unique(ps: readonly ServicePerson[]): ServicePerson[] {
  const seen = new Set<string>();
  return ps.filter((p) => {
    if (seen.has(p.id)) return false;
    seen.add(p.id);
    return true;
  });
}

/** What the default service is built from. */
export interface ServiceOptions {
  readonly workspace: Workspace;
  /** Shared record of processed chat deliveries. */
  readonly deliveries: DeliveryLog;
  /** Holds, bookings and cancellations. */
  readonly bookings: BookingService;
  /** The store behind `bookings`, read for upcoming bookings and for busy time already booked. */
  readonly bookingStore: BookingStore;
  /** Rules said in chat. */
  readonly rules: RuleStore;
  /** Key that signs option tokens, so a button cannot be forged into another booking. */
  readonly tokenKey: string;
  /** Solves on worker threads; in process when absent. @default undefined */
  readonly pool?: SolvePool;
  /** Makes request ids. @default crypto.randomUUID */
  readonly newId?: () => string;
  /**
   * The feed cache (last good busy time per feed, shared by replicas). Feeds missing or stale in it
   * are refreshed before a request is solved. Without it, file feeds are read on every request.
   * @default undefined
   */
  readonly feedStates?: FeedStateStore;
  /** Clock of the feed cache. @default Date.now */
  readonly clock?: () => number;
  /** Feeds people add in chat (URLs stored sealed); adding is refused without it. @default undefined */
  readonly chatFeeds?: ChatFeedStore;
  /** Fetches feed URLs (the safe fetcher of src/calendar by default; tests pass a stub). @default fetchFeed */
  readonly fetchFeed?: FeedsDeps['fetch'];
  /** Keeps week plans, so a Lock button works on any replica and a re-lock knows the last lock. @default undefined (no Lock button) */
  readonly weekPlans?: WeekPlanStore;
  /** Fairness history of off-hours sessions, recorded at each lock and weighed in each plan. @default undefined */
  readonly fairness?: FairnessLedger;
  /** Where weekly invites go. @default undefined (the lock reply lists them as not sent) */
  readonly inviteOutbox?: InviteOutbox;
  /** Domain of invite UIDs. @default 'slotwright.invalid' */
  readonly inviteDomain?: string;
  /** Search time of a week plan in ms. @default 5000 */
  readonly weekTimeMs?: number;
  /** Least time between two progress reports of a week plan, in ms. @default 1000 */
  readonly weekProgressMs?: number;
}

/** Where week plans are kept (SqlWorkspaceStore implements it): proposals to lock and locked weeks. */
export interface WeekPlanStore {
  saveWeekPlan(p: {
    readonly id: string;
    readonly isoWeek: string;
    readonly body: unknown;
    readonly at: number;
  }): Promise<void>;
  weekPlans(isoWeek: string): Promise<readonly { readonly id: string; readonly body: unknown }[]>;
}

/** Takes one weekly invite and says where it can be picked up. */
export type InviteOutbox = (isoWeek: string, invite: WeekInvite) => Promise<string>;

/** An outbox that writes each invite to `<dir>/<isoWeek>/<uid>.ics` for download. */
export function fileInviteOutbox(dir: string): InviteOutbox {
  return async (isoWeek, invite) => {
    const folder = join(dir, isoWeek);
    await mkdir(folder, { recursive: true });
    const file = join(folder, `${invite.uid.replace(/[^A-Za-z0-9._-]/g, '_')}.ics`);
    await writeFile(file, invite.ics, 'utf8');
    return file;
  };
}

/** Where feeds added in chat are kept (SqlWorkspaceStore implements it, sealing the URLs). */
export interface ChatFeedStore {
  addFeed(feed: { readonly id: string; readonly owner: string; readonly url: string }): Promise<void>;
  feeds(
    owner?: string,
  ): Promise<readonly { readonly id: string; readonly owner: string; readonly url: string }[]>;
}

const DAY_MS = 86_400_000;
const UPCOMING_DAYS = 60;

/** The option a token stands for (what BookingService needs), signed by the service. */
interface OptionPayload {
  readonly requestId: string;
  readonly optionId: string;
  readonly organizer: string;
  readonly title: string;
  readonly start: number;
  readonly end: number;
  readonly room?: string;
  readonly attendees: readonly { readonly id: string; readonly role: 'required' | 'optional' }[];
}

/** The service over one workspace, calling each use case that this build has. */
export class DefaultSlotwrightService implements SlotwrightService {
  readonly workspaceName: string;
  readonly #o: ServiceOptions;
  /** The workspace, with zones learnt from chat profiles for people who have none of their own. */
  #ws: Workspace;
  #people: PeopleDirectory;
  readonly #last = new Map<string, MeetAnswer>();
  readonly #newId: () => string;

  constructor(options: ServiceOptions) {
    this.#o = options;
    this.#ws = options.workspace;
    this.workspaceName = options.workspace.name ?? 'workspace';
    this.#people = directoryOf(options.workspace);
    this.#newId = options.newId ?? randomUUID;
  }

  /** The workspace this service answers for. */
  get workspace(): Workspace {
    return this.#ws;
  }

  async identify(profile: ChatUserProfile): Promise<Result<ServicePerson>> {
    const found = this.#people.identify(profile);
    if (!found.ok || profile.zone === undefined || !isValidZone(profile.zone)) return found;
    const person = this.#ws.people.find((p) => p.id === found.value.id);
    if (person?.zoneFromWorkspace !== true || person.zone === profile.zone) return found;
    // The workspace gives this person no zone: their chat profile's zone is the better guess of
    // where their working hours are, so it replaces the workspace default from now on.
    const zone = profile.zone;
    this.#ws = {
      ...this.#ws,
      people: this.#ws.people.map((p) => {
        if (p.id !== person.id) return p;
        const { zoneFromWorkspace: _default, ...own } = p;
        return { ...own, zone };
      }),
    };
    this.#people = directoryOf(this.#ws);
    return { ok: true, value: this.#people.byId(person.id)! };
  }

  person(id: string): ServicePerson | undefined {
    return this.#people.byId(id);
  }

  defaultPerson(): ServicePerson {
    const admin = this.#ws.admins.map((a) => this.#people.byId(a)).find((p) => p !== undefined);
    const first = admin ?? this.#people.all[0];
    if (first === undefined) throw new SlotwrightError('config_invalid', 'the workspace has no people');
    return first;
  }

  /** The workspace's feeds as the feed use cases name them (`<owner>:<n>`), plus feeds added in chat. */
  async #feedSpecs(ownerIds?: readonly string[]): Promise<FeedSpec[]> {
    const ws = this.#ws;
    const owners = [
      ...ws.people.map((p) => ({ id: p.id, zone: p.zone, email: p.email, feeds: p.feeds })),
      ...ws.rooms.map((r) => ({ id: r.id, zone: r.zone, email: undefined, feeds: r.feeds })),
    ].filter((o) => ownerIds === undefined || ownerIds.includes(o.id));
    const specs: FeedSpec[] = owners.flatMap((o) =>
      o.feeds.map((f, i) => ({
        id: `${o.id}:${i}`,
        ownerId: o.id,
        source: f.kind === 'url' ? f.url : f.path,
        zone: o.zone,
        ...(o.email === undefined ? {} : { ownerEmail: o.email }),
      })),
    );
    for (const f of (await this.#o.chatFeeds?.feeds()) ?? []) {
      const o = owners.find((x) => x.id === f.owner);
      if (o === undefined) continue;
      specs.push({
        id: f.id,
        ownerId: f.owner,
        source: f.url,
        zone: o.zone,
        ...(o.email === undefined ? {} : { ownerEmail: o.email }),
      });
    }
    return specs;
  }

  #feedDeps(states: FeedStateStore): FeedsDeps {
    return {
      states,
      clock: this.#o.clock ?? Date.now,
      ...(this.#o.fetchFeed === undefined ? {} : { fetch: this.#o.fetchFeed }),
    };
  }

  /** Feed busy time by owner: from the feed cache (refreshing what is missing or stale), else the files. */
  async #feedBusy(
    ids: readonly string[],
    span: Interval,
  ): Promise<Result<{ busy: ReadonlyMap<string, readonly BusyInterval[]>; warnings: readonly string[] }>> {
    const states = this.#o.feedStates;
    if (states === undefined) return fileBusy(this.#ws, ids, span);
    const deps = this.#feedDeps(states);
    const specs = await this.#feedSpecs(ids);
    const before = await busyByOwner(specs, span, deps);
    const stale = new Set(
      [...before.values()].flatMap((o) => o.feeds.filter((f) => f.stale).map((f) => f.feedId)),
    );
    const after =
      stale.size === 0
        ? before
        : await (async () => {
            await refreshFeeds(
              specs.filter((f) => stale.has(f.id)),
              deps,
            );
            return busyByOwner(specs, span, deps);
          })();
    const warnings: string[] = [];
    const busy = new Map<string, readonly BusyInterval[]>();
    for (const [owner, o] of after) {
      busy.set(owner, o.busy);
      warnings.push(...o.warnings.map((w) => `${owner}: ${w}`));
      for (const f of o.feeds)
        if (f.stale)
          warnings.push(
            `${owner}'s feed ${f.feedId} is stale${f.error === undefined ? '' : ` (${f.error})`}; recent changes may be missing`,
          );
    }
    return { ok: true, value: { busy, warnings } };
  }

  /** Busy time of people and rooms: their feeds plus what is already held or booked here. */
  async #busy(
    ids: readonly string[],
    span: Interval,
  ): Promise<Result<{ busy: Map<string, BusyInterval[]>; warnings: readonly string[] }>> {
    const files = await this.#feedBusy(ids, span);
    if (!files.ok) return files;
    const busy = new Map<string, BusyInterval[]>();
    for (const id of ids) {
      const list = [...(files.value.busy.get(id) ?? [])];
      const kind = this.#ws.rooms.some((r) => r.id === id) ? 'room' : 'person';
      for (const b of await this.#o.bookingStore.listFor({ kind, id }, span, ['held', 'booked']))
        list.push({ start: b.start, end: b.end, kind: 'busy' });
      busy.set(id, list);
    }
    return { ok: true, value: { busy, warnings: files.value.warnings } };
  }

  async meet(actor: ServicePerson, query: MeetQuery, nowMs: number): Promise<Result<MeetAnswer>> {
    const named = this.#people.resolve(query.required, query.optional);
    if (!named.ok) return named;
    // The asker attends their own meeting unless they named themselves optional.
    const asker = named.value.optional.some((p) => p.id === actor.id) ? [] : [actor];
    const people: { ok: true; value: ResolvedPeople } = {
      ok: true,
      value: {
        required: [...asker, ...named.value.required.filter((p) => p.id !== actor.id)],
        optional: named.value.optional,
      },
    };
    const ws = this.#ws;
    const window =
      query.window === undefined
        ? { start: nowMs, end: nowMs + ws.horizon * DAY_MS }
        : {
            start: zonedToInstant(query.window.from, 0, actor.zone),
            end: zonedToInstant(addDays(query.window.to, 1), 0, actor.zone),
          };
    if (window.end <= nowMs)
      return failure('window_past', 'that time range is already over; ask for a later one', ['window']);
    const span = { start: Math.min(window.start, nowMs), end: window.end + WIDEN_DAYS * DAY_MS };
    const ids = [...ws.people.map((p) => p.id), ...ws.rooms.map((r) => r.id)];
    const busy = await this.#busy(ids, span);
    if (!busy.ok) return busy;
    const base = await workspaceContext(ws, { now: nowMs, span, busyOf: async () => busy.value.busy });
    if (!base.ok) return base;
    // Rules said in chat join the workspace's own rules.
    const people2 = await Promise.all(
      base.value.people.map(async (p) => {
        const stored = await this.#o.rules.list(p.id);
        if (stored.length === 0) return p;
        const extra = stored.map((r) =>
          ruleEffect(r.rule, { zone: p.zone, from: span.start, to: span.end, now: nowMs, id: r.id }),
        );
        return { ...p, rules: [...p.rules, ...extra] };
      }),
    );
    const context: SchedulingContext = withWorkspaceRest(
      ws,
      {
        ...base.value,
        people: people2,
        warnings: [...(base.value.warnings ?? []), ...busy.value.warnings],
      },
      span,
    );
    const request: MeetRequest = {
      with: people.value.required.map((p) => p.id),
      optional: people.value.optional.map((p) => p.id),
      lengthMinutes: query.lengthMinutes,
      window,
      ...(query.roomFor === undefined ? {} : { seats: query.roomFor }),
      needs: query.features,
      options: 5,
    };
    const outcome =
      this.#o.pool === undefined
        ? findOptions(context, request)
        : (await this.#o.pool.run({ kind: 'meet', context, request })).outcome;
    if (!outcome.ok) return outcome;
    const answer = this.#answer(actor, query, people.value, outcome.value, nowMs);
    this.#last.set(actor.id, answer);
    return { ok: true, value: answer };
  }

  #answer(
    actor: ServicePerson,
    query: MeetQuery,
    people: ResolvedPeople,
    outcome: MeetOutcome,
    nowMs: number,
  ): MeetAnswer {
    const requestId = this.#newId();
    const attendees = [...people.required, ...people.optional];
    const title = `Meeting: ${attendees.map((p) => p.name.split(/\s+/)[0]).join(', ')}`;
    const roomName = (id: string) => this.#ws.rooms.find((r) => r.id === id)?.name ?? id;
    const options = outcome.options.map((o, i): MeetOption => {
      const payload: OptionPayload = {
        requestId,
        optionId: `o${i + 1}`,
        organizer: actor.id,
        title,
        start: o.start,
        end: o.end,
        ...(o.room === null ? {} : { room: o.room }),
        attendees: [
          ...people.required.map((p) => ({ id: p.id, role: 'required' as const })),
          ...people.optional.map((p) => ({ id: p.id, role: 'optional' as const })),
        ],
      };
      return {
        token: this.#sign(payload),
        start: o.start,
        end: o.end,
        ...(o.room === null ? {} : { room: { id: o.room, name: roomName(o.room) } }),
        score: o.score,
        breakdown: o.breakdown.map((b) => ({ label: b.why, points: b.points })),
      };
    });
    const blockers = outcome.blockers.map((b) => ({
      subject: b.kind === 'person' ? (this.#people.byId(b.who)?.name ?? b.who) : b.who,
      reason: b.detail,
    }));
    const relaxations = outcome.relaxations
      .filter((r) => r.opens > 0)
      .flatMap((r) => {
        const q = relaxedQuery(query, people, r.change, actor.zone, nowMs);
        return q === undefined
          ? []
          : [{ label: `${r.change} (${r.opens} start${r.opens === 1 ? '' : 's'})`, query: q }];
      });
    const unbuttoned = outcome.relaxations
      .filter((r) => r.opens > 0 && relaxedQuery(query, people, r.change, actor.zone, nowMs) === undefined)
      .map((r) => `would also help: ${r.change}`);
    return {
      query,
      attendees,
      options,
      blockers,
      relaxations,
      warnings: [...outcome.warnings, ...unbuttoned],
    };
  }

  #sign(payload: OptionPayload): string {
    const body = Buffer.from(JSON.stringify(payload), 'utf8').toString('base64url');
    const mac = createHmac('sha256', this.#o.tokenKey).update(body).digest('base64url').slice(0, 22);
    return `${body}.${mac}`;
  }

  #open(token: string): OptionPayload | undefined {
    const dot = token.lastIndexOf('.');
    if (dot < 0) return undefined;
    const body = token.slice(0, dot);
    const mac = Buffer.from(token.slice(dot + 1));
    const want = Buffer.from(
      createHmac('sha256', this.#o.tokenKey).update(body).digest('base64url').slice(0, 22),
    );
    if (mac.length !== want.length || !timingSafeEqual(mac, want)) return undefined;
    try {
      return JSON.parse(Buffer.from(body, 'base64url').toString('utf8')) as OptionPayload;
    } catch {
      return undefined;
    }
  }

  lastMeet(actorId: string): MeetAnswer | undefined {
    return this.#last.get(actorId);
  }

  #view(b: BookingRecord): BookingView {
    const room = b.room === null ? undefined : (this.#ws.rooms.find((r) => r.id === b.room)?.name ?? b.room);
    return {
      id: b.id,
      state: b.state,
      start: b.start,
      end: b.end,
      attendees: b.attendees.map((a) => this.#people.byId(a.id)?.name ?? a.id),
      ...(room === undefined ? {} : { room }),
      ...(b.state === 'held' && b.holdExpiresAt !== null ? { expiresAt: b.holdExpiresAt } : {}),
    };
  }

  async #reserve(kind: 'hold' | 'book', actor: ServicePerson, token: string): Promise<Result<BookingView>> {
    const payload = this.#open(token);
    if (payload === undefined)
      return failure('token_invalid', 'that option is not one I offered; ask again', ['option']);
    const r = await this.#o.bookings[kind](actor.id, payload);
    if (!r.ok) return r;
    return { ok: true, value: this.#view(r.value.booking) };
  }

  async hold(actor: ServicePerson, token: string, _nowMs: number): Promise<Result<BookingView>> {
    return this.#reserve('hold', actor, token);
  }

  async book(actor: ServicePerson, token: string, _nowMs: number): Promise<Result<BookingView>> {
    if (token.startsWith('hold:')) {
      const held = await this.#o.bookingStore.get(token.slice('hold:'.length));
      if (held === undefined || held.requestId === null || held.optionId === null)
        return failure('not_found', 'that hold is gone; ask again for fresh options', ['hold']);
      const r = await this.#o.bookings.book(actor.id, {
        requestId: held.requestId,
        optionId: held.optionId,
        organizer: held.organizer,
        title: held.title,
        start: held.start,
        end: held.end,
        ...(held.room === null ? {} : { room: held.room }),
        attendees: held.attendees,
      });
      return r.ok ? { ok: true, value: this.#view(r.value.booking) } : r;
    }
    return this.#reserve('book', actor, token);
  }

  async cancel(actor: ServicePerson, bookingId: string, _nowMs: number): Promise<Result<BookingView>> {
    const r = await this.#o.bookings.cancel(actor.id, bookingId);
    return r.ok ? { ok: true, value: this.#view(r.value.booking) } : r;
  }

  async upcoming(actor: ServicePerson, nowMs: number): Promise<Result<readonly BookingView[]>> {
    const list = await this.#o.bookingStore.listFor(
      { kind: 'person', id: actor.id },
      { start: nowMs, end: nowMs + UPCOMING_DAYS * DAY_MS },
      ['held', 'booked'],
    );
    return { ok: true, value: [...list].sort((a, b) => a.start - b.start).map((b) => this.#view(b)) };
  }

  #ruleDeps(): RuleDeps {
    const ws = this.#ws;
    return {
      store: this.#o.rules,
      people: ws.people.map((p) => ({ id: p.id, name: p.name })),
      rooms: ws.rooms.map((r) => ({ id: r.id, name: r.name })),
      groups: ws.groups.map((g) => ({ id: g.id, ...(g.name === undefined ? {} : { name: g.name }) })),
      newId: () => `r${this.#newId().replace(/-/g, '').slice(0, 6)}`,
    };
  }

  async previewRule(actor: ServicePerson, text: string, nowMs: number): Promise<Result<RulePreview>> {
    const r = await previewRule(this.#ruleDeps(), actor, text, nowMs);
    if (!r.ok) return { ok: false, issues: r.issues };
    const v = r.value;
    return {
      ok: true,
      value: {
        description: v.text,
        strength: v.rule.strength,
        token: v.token,
        fields: v.fields.map((f) => ({ label: f.label, value: f.value })),
        related: v.related.map((c) => c.message),
        question: v.question,
      },
    };
  }

  async confirmRule(actor: ServicePerson, token: string, nowMs: number): Promise<Result<RuleView>> {
    const r = await saveRule(this.#ruleDeps(), actor, token, nowMs);
    if (!r.ok) return { ok: false, issues: r.issues };
    return { ok: true, value: { id: r.value.id, text: r.value.text, strength: r.value.rule.strength } };
  }

  async rules(actor: ServicePerson): Promise<Result<readonly RuleView[]>> {
    const r = await listRules(this.#ruleDeps(), actor);
    if (!r.ok) return { ok: false, issues: r.issues };
    return { ok: true, value: r.value.map((x) => ({ id: x.id, text: x.text, strength: x.rule.strength })) };
  }

  async forgetRule(actor: ServicePerson, ruleId: string, _nowMs: number): Promise<Result<RuleView>> {
    const r = await forgetRule(this.#ruleDeps(), actor, ruleId);
    if (!r.ok) return { ok: false, issues: r.issues };
    return { ok: true, value: { id: r.value.id, text: r.value.text, strength: r.value.rule.strength } };
  }

  async addFeed(actor: ServicePerson, url: string, nowMs: number): Promise<Result<FeedView>> {
    const store = this.#o.chatFeeds;
    const states = this.#o.feedStates;
    if (store === undefined || states === undefined)
      return failure(
        'not_available',
        'adding feeds in chat needs SLOTWRIGHT_SECRET_KEY (feed addresses are stored encrypted); ask an admin',
      );
    if (!/^https:\/\/[^\s/]+/i.test(url))
      return failure(
        'feed_refused',
        'give the https address of an .ics calendar, e.g. https://calendar.example/me.ics',
        ['url'],
      );
    const mine = (await store.feeds(actor.id)).length;
    const spec: FeedSpec = {
      id: `${actor.id}:chat:${mine + 1}`,
      ownerId: actor.id,
      source: url,
      zone: actor.zone,
      ...(actor.email === undefined ? {} : { ownerEmail: actor.email }),
    };
    // Read it once before keeping it, so a wrong or refused address is reported now, not later.
    const [first] = await refreshFeeds([spec], this.#feedDeps(states));
    if (first === undefined || first.error !== undefined)
      return failure(
        'feed_unreadable',
        `that feed could not be read: ${first?.error ?? 'no answer'}; nothing was saved`,
        ['url'],
      );
    await store.addFeed({ id: spec.id, owner: actor.id, url });
    return {
      ok: true,
      value: { label: redactUrl(url), owner: actor.id, freshness: 'fresh', fetchedAt: nowMs },
    };
  }

  async feeds(actor: ServicePerson, nowMs: number): Promise<Result<readonly FeedView[]>> {
    const p = this.#ws.people.find((x) => x.id === actor.id);
    if (p === undefined) return { ok: true, value: [] };
    const states = this.#o.feedStates;
    if (states === undefined) {
      // Without a feed cache the files are read on every request, so they are as fresh as the files.
      return {
        ok: true,
        value: p.feeds.map((f) =>
          f.kind === 'file'
            ? {
                label: f.ref,
                owner: actor.id,
                freshness: 'fresh',
                note: 'read from the workspace folder on each request',
              }
            : {
                label: redactUrl(f.url),
                owner: actor.id,
                freshness: 'never',
                note: 'URL feeds need the feed cache',
              },
        ),
      };
    }
    const specs = await this.#feedSpecs([actor.id]);
    const byOwner = await busyByOwner(specs, { start: nowMs, end: nowMs + DAY_MS }, this.#feedDeps(states));
    const fresh = byOwner.get(actor.id)?.feeds ?? [];
    return {
      ok: true,
      value: specs.map((spec): FeedView => {
        const st = fresh.find((x) => x.feedId === spec.id);
        const freshness =
          st === undefined || st.ageMs === undefined
            ? 'never'
            : st.error !== undefined
              ? 'failed'
              : st.stale
                ? 'stale'
                : 'fresh';
        const wsFeed = p.feeds.find((_, i) => spec.id === `${actor.id}:${i}`);
        const label = wsFeed?.kind === 'file' ? wsFeed.ref : redactUrl(spec.source);
        return {
          label,
          owner: actor.id,
          freshness,
          ...(st?.ageMs === undefined ? {} : { fetchedAt: nowMs - st.ageMs }),
          ...(st?.error === undefined ? {} : { note: st.error }),
        };
      }),
    };
  }

  async series(actor: ServicePerson, text: string, nowMs: number): Promise<Result<readonly SeriesView[]>> {
    const ws = this.#ws;
    if (text.trim() !== '') {
      // A sentence is read back so the person sees how it would be understood; series are saved in
      // the workspace file by an admin, not from chat.
      const parsed = parseSeriesSentence(text, {
        now: nowMs,
        zone: actor.zone,
        people: ws.people.map((p) => ({
          id: p.id,
          name: p.name,
          ...(p.chat === undefined ? {} : { chat: p.chat }),
        })),
        groups: ws.groups.map((g) => ({ id: g.id, members: g.members })),
        rooms: ws.rooms.map((r) => ({ id: r.id, name: r.name, features: r.features })),
        existingIds: ws.series.map((x) => x.id),
      });
      if (!parsed.ok) return parsed;
      return {
        ok: true,
        value: [
          {
            id: parsed.value.series.id,
            description: `${parsed.value.echo} (not saved: an admin adds series to the workspace file)`,
          },
        ],
      };
    }
    return {
      ok: true,
      value: ws.series.map((x) => ({
        id: x.id,
        description: describeSeries(withoutUndefined(x) as SeriesDraft),
      })),
    };
  }

  /** The week's scheduling context: file feeds, what is booked here, workspace rules and rest. */
  async #weekContext(
    isoWeek: string,
    nowMs: number,
  ): Promise<{ context: SchedulingContext; window: Interval }> {
    const ws = this.#ws;
    const monday = mondayOfIsoWeek(isoWeek);
    const window = {
      start: zonedToInstant(monday, 0, ws.zone) - DAY_MS,
      end: zonedToInstant(addDays(monday, 8), 0, ws.zone),
    };
    const base = weekContext(ws, nowMs, window);
    // Bookings made here (earlier locks, meetings) are busy time too, except this week's own lock,
    // which a re-lock replaces.
    const ownLock = new Set((await this.#lockedWeek(isoWeek))?.sessions.map((x) => x.bookingId) ?? []);
    const withBooked = async <T extends { id: string; busy: readonly BusyInterval[] }>(
      x: T,
      kind: 'person' | 'room',
    ): Promise<T> => {
      const booked = (await this.#o.bookingStore.listFor({ kind, id: x.id }, window, ['held', 'booked']))
        .filter((b) => !ownLock.has(b.id))
        .map((b) => ({ start: b.start, end: b.end, kind: 'busy' as const }));
      return booked.length === 0
        ? x
        : { ...x, busy: [...x.busy, ...booked].sort((a, b) => a.start - b.start) };
    };
    const context: SchedulingContext = {
      ...base,
      people: await Promise.all(base.people.map((p) => withBooked(p, 'person'))),
      rooms: await Promise.all(base.rooms.map((r) => withBooked(r, 'room'))),
    };
    return { context: withWorkspaceRest(ws, context, window), window };
  }

  async #lockedWeek(isoWeek: string): Promise<LockedWeek | undefined> {
    const row = (await this.#o.weekPlans?.weekPlans(isoWeek))?.find((r) => r.id === `locked:${isoWeek}`);
    const body = row?.body as { kind?: string; locked?: LockedWeek } | undefined;
    return body?.kind === 'locked' ? body.locked : undefined;
  }

  /** Solves in a worker thread when progress is wanted or a pool is configured, so chat keeps answering. */
  async #planWeek(
    context: SchedulingContext,
    options: Omit<PlanWorkspaceWeekOptions, 'clock' | 'onProgress'>,
    onProgress?: (p: WeekProgressView) => void,
  ): Promise<Result<WeekProposal>> {
    const ws = this.#ws;
    if (onProgress === undefined && this.#o.pool === undefined) {
      const r = planWorkspaceWeek(ws, context, { ...options, clock: () => performance.now() });
      if (!r.ok) return r;
      const { plan: _plan, ...proposal } = r.value;
      return { ok: true, value: proposal };
    }
    return planWeekInWorker(ws, context, options, this.#o.weekProgressMs ?? 1000, onProgress);
  }

  async week(
    _actor: ServicePerson,
    weekOf: string | undefined,
    nowMs: number,
    onProgress?: (p: WeekProgressView) => void,
  ): Promise<Result<WeekPlanView>> {
    const ws = this.#ws;
    if (ws.series.length === 0)
      return failure('no_series', 'this workspace has no recurring meetings to plan');
    let isoWeek: string;
    try {
      isoWeek =
        weekOf === undefined
          ? nextIsoWeek(nowMs, ws.zone)
          : /^\d{4}-W\d{2}$/.test(weekOf)
            ? isoWeekOf(mondayOfIsoWeek(weekOf))
            : isoWeekOf(weekOf);
    } catch (error) {
      return failure('date_unreadable', error instanceof Error ? error.message : String(error), ['weekOf']);
    }
    const before = isoWeekOf(addDays(mondayOfIsoWeek(isoWeek), -7));
    const lastLocked = await this.#lockedWeek(before);
    const { context } = await this.#weekContext(isoWeek, nowMs);
    const offHoursWeights =
      this.#o.fairness === undefined
        ? undefined
        : await fairnessWeightsFor(
            this.#o.fairness,
            ws.people.map((p) => p.id),
            isoWeek,
          );
    const planned = await this.#planWeek(
      context,
      {
        now: nowMs,
        isoWeek,
        timeMs: this.#o.weekTimeMs ?? WEEK_SEARCH_MS,
        ...(offHoursWeights === undefined ? {} : { offHoursWeights }),
        // Last week's locked sessions make moving a session cost something, so weeks stay alike.
        ...(lastLocked === undefined
          ? {}
          : {
              lastWeek: lastLocked.sessions.map((x) => ({ series: x.series, start: x.start, room: x.room })),
            }),
      },
      onProgress,
    );
    if (!planned.ok) return planned;
    const r = planned.value;
    const nameOf = (id: string) => ws.series.find((x) => x.id === id)?.name ?? id;
    const view = (x: PlannedSession): WeekSession => {
      const room = x.room === null ? undefined : (ws.rooms.find((y) => y.id === x.room)?.name ?? x.room);
      return {
        series: nameOf(x.series),
        seriesId: x.series,
        start: x.start,
        end: x.end,
        ...(room === undefined ? {} : { room }),
      };
    };
    const diff =
      lastLocked === undefined
        ? undefined
        : diffWeekPlans(ws.zone, lastLocked.sessions, r.sessions)
            .filter((d) => d.change !== 'kept')
            .map(
              (d): WeekChange => ({
                series: nameOf(d.series),
                change: d.change as WeekChange['change'],
                ...(d.before === undefined ? {} : { before: d.before.start }),
                ...(d.after === undefined ? {} : { after: d.after.start }),
              }),
            );
    let lockToken: string | undefined;
    if (this.#o.weekPlans !== undefined) {
      lockToken = this.#newId();
      await this.#o.weekPlans.saveWeekPlan({
        id: `proposal:${lockToken}`,
        isoWeek,
        at: nowMs,
        body: { kind: 'proposal', isoWeek, sessions: r.sessions, unplaced: r.unplaced, score: r.score },
      });
    }
    const parts = Object.entries(r.score.parts)
      .filter(([, v]) => v !== 0)
      .map(([k, v]) => ({ label: SCORE_LABELS[k] ?? k, points: v }));
    return {
      ok: true,
      value: {
        weekOf: mondayOfIsoWeek(isoWeek),
        isoWeek,
        sessions: r.sessions.map(view),
        unplaced: r.unplaced.map((u) => ({
          series: nameOf(u.series),
          reason: u.reason,
          blockers: u.blockers.map((b) => blockerWords(b, ws)),
        })),
        cost: { total: r.score.total, parts },
        ...(diff === undefined ? {} : { diff }),
        relock: (await this.#lockedWeek(isoWeek)) !== undefined,
        ...(lockToken === undefined ? {} : { lockToken: `${isoWeek}:${lockToken}` }),
        warnings: [...(context.warnings ?? [])].slice(0, 5),
      },
    };
  }

  async lockWeek(actor: ServicePerson, token: string, nowMs: number): Promise<Result<WeekLockView>> {
    const ws = this.#ws;
    const store = this.#o.weekPlans;
    if (store === undefined) return notAvailable('locking a week plan');
    if (!actor.admin)
      return failure('unauthorized', 'only a workspace admin locks a week plan; ask an admin', ['actor']);
    const m = /^(\d{4}-W\d{2}):(.+)$/.exec(token);
    const row =
      m === null ? undefined : (await store.weekPlans(m[1]!)).find((x) => x.id === `proposal:${m[2]}`);
    const body = row?.body as
      | {
          kind: 'proposal';
          isoWeek: string;
          sessions: PlannedSession[];
          unplaced: WorkspaceWeekPlan['unplaced'];
        }
      | undefined;
    if (m === null || body?.kind !== 'proposal')
      return failure('not_found', "that week plan is gone; ask for it again with 'week'", ['token']);
    const isoWeek = body.isoWeek;
    const { context } = await this.#weekContext(isoWeek, nowMs);
    // The engine's model of the week is rebuilt here (no solving) so the lock can re-plan what was taken.
    const built = workspaceWeek({ context, series: ws.series, settings: ws.weekPlan, isoWeek });
    if (!built.ok) return built;
    if (nowMs >= built.value.window.end)
      return failure('week_over', `${isoWeek} is already over; plan a later week`, ['token']);
    const plan = {
      isoWeek,
      sessions: body.sessions,
      unplaced: body.unplaced,
      week: built.value,
    } as unknown as WorkspaceWeekPlan;
    const previous = await this.#lockedWeek(isoWeek);
    const outcome = await lockWeek(
      {
        booking: this.#o.bookings,
        store: this.#o.bookingStore,
        now: () => nowMs,
        clock: () => performance.now(),
        ...(this.#o.fairness === undefined
          ? {}
          : { fairness: { ledger: this.#o.fairness, usual: usualHoursOf(ws) } }),
      },
      ws,
      context,
      plan,
      {
        actor: actor.id,
        domain: this.#o.inviteDomain ?? 'slotwright.invalid',
        ...(previous === undefined ? {} : { previous }),
      },
    );
    await store.saveWeekPlan({
      id: `locked:${isoWeek}`,
      isoWeek,
      at: nowMs,
      body: { kind: 'locked', locked: outcome.locked, by: actor.id },
    });
    const outbox = this.#o.inviteOutbox;
    const invites: WeekInviteView[] = [];
    for (const i of outcome.invites) {
      const where = outbox === undefined ? undefined : await outbox(isoWeek, i);
      invites.push({
        series: ws.series.find((x) => x.id === i.series)?.name ?? i.series,
        method: i.method,
        uid: i.uid,
        ...(where === undefined ? {} : { where }),
      });
    }
    const nameOf = (id: string) => ws.series.find((x) => x.id === id)?.name ?? id;
    const roomName = (id: string | null) =>
      id === null ? undefined : (ws.rooms.find((x) => x.id === id)?.name ?? id);
    return {
      ok: true,
      value: {
        isoWeek,
        lines: describeWeekLock(outcome, ws.zone),
        booked: outcome.locked.sessions.map((x) => {
          const room = roomName(x.room);
          return {
            series: nameOf(x.series),
            seriesId: x.series,
            start: x.start,
            end: x.end,
            bookingId: x.bookingId,
            ...(room === undefined ? {} : { room }),
          };
        }),
        pending: outcome.pending.length,
        invites,
      },
    };
  }

  claimDelivery(key: string, nowMs: number): Promise<boolean> {
    return this.#o.deliveries.claim(key, nowMs);
  }
}

/** The request with one relaxation applied, or undefined when it cannot be said as a request. */
export function relaxedQuery(
  query: MeetQuery,
  people: ResolvedPeople,
  change: string,
  zone: string,
  nowMs: number,
): MeetQuery | undefined {
  const req = people.required.map((p) => p.id);
  const opt = people.optional.map((p) => p.id);
  const as = (ids: readonly string[]): PersonQuery[] => ids.map((id) => ({ kind: 'name', id }));
  const base = { ...query, required: as(req), optional: as(opt) };
  const moveOptional = (ids: readonly string[]): MeetQuery => ({
    ...base,
    required: as(req.filter((id) => !ids.includes(id))),
    optional: as([...opt, ...ids.filter((id) => req.includes(id))]),
  });
  let m = /^make (\S+) optional$/.exec(change);
  if (m !== null) return moveOptional([m[1]!]);
  m = /^make the .* optional \(([^)]*)\)$/.exec(change);
  if (m !== null) return moveOptional(m[1]!.split(',').map((s) => s.trim()));
  m = /^shorten to (\d+) minutes$/.exec(change);
  if (m !== null) return { ...base, lengthMinutes: Number(m[1]) };
  m = /^widen the window by \d+ days \(to (\d{4}-\d{2}-\d{2})\)$/.exec(change);
  if (m !== null) {
    const today = instantToZoned(nowMs, zone).date;
    return { ...base, window: { from: query.window?.from ?? today, to: addDays(m[1]!, -1) } };
  }
  if (/^accept a room with fewer than \d+ seats$/.test(change)) {
    const { roomFor: _drop, ...rest } = base;
    return rest;
  }
  m = /^drop the need for (.+)$/.exec(change);
  if (m !== null) return { ...base, features: query.features.filter((f) => f !== m![1]) };
  return undefined;
}

/** Feed busy time of a workspace for the booking re-check (the store checks its own bookings). */
export function feedBusyOf(workspace: Workspace): BusyOf {
  return async (ids, interval) => {
    const r = fileBusy(workspace, ids, interval);
    if (!r.ok) throw new SlotwrightError('feed_unreadable', r.issues.map((i) => i.message).join('; '));
    return r.value.busy;
  };
}

/** People of a loaded workspace as the bot sees them. */
export function directoryOf(workspace: Workspace): PeopleDirectory {
  const people = workspace.people.map(
    (p): ServicePerson => ({
      id: p.id,
      name: p.name,
      zone: p.zone,
      admin: workspace.admins.includes(p.id),
      ...(p.email === undefined ? {} : { email: p.email }),
      ...(p.chat === undefined ? {} : { chat: p.chat }),
    }),
  );
  return new PeopleDirectory(people, new Map(workspace.groups.map((g) => [g.id.toLowerCase(), g.members])));
}

/** A copy without keys whose value is undefined (schema output to exact optional types). */
function withoutUndefined<T extends object>(o: T): T {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as T;
}

/** A week plan as the solve returns it: everything but the search state. */
type WeekProposal = Omit<WorkspaceWeekPlan, 'plan'>;

/** Plain words for the week plan's score parts (preference costs). */
const SCORE_LABELS: Readonly<Record<string, string>> = {
  spread: 'sessions on too few days',
  isolated: 'lone meetings in a day',
  roomStability: 'room changes',
  preferredDays: 'outside preferred days',
  preferredHours: 'outside preferred hours',
  usualHours: 'outside usual hours',
  moves: 'moved from last week',
  seats: 'seats short',
  rules: 'preferences of people',
};

function blockerWords(b: WorkspaceWeekPlan['unplaced'][number]['blockers'][number], ws: Workspace): string {
  switch (b.kind) {
    case 'attendee':
      return `${ws.people.find((p) => p.id === b.id)?.name ?? b.id}'s free time`;
    case 'series':
      return `series ${ws.series.find((x) => x.id === b.id)?.name ?? b.id}`;
    case 'rooms':
      return 'the rooms that fit';
    case 'series-hours':
      return "the series' allowed days and hours";
  }
}

// Runs in a worker thread: loads the TypeScript modules, plans, and posts throttled progress.
const WEEK_WORKER_SOURCE = `
const { parentPort, workerData } = require('node:worker_threads');
(async () => {
  // The solve pool's entry registers the TypeScript loader for this thread.
  await import(workerData.entry);
  const { planWorkspaceWeek } = await import(workerData.week);
  let last = -Infinity;
  const r = planWorkspaceWeek(workerData.workspace, workerData.context, {
    ...workerData.options,
    clock: () => performance.now(),
    onProgress: (p) => {
      if (p.elapsedMs - last < workerData.everyMs) return;
      last = p.elapsedMs;
      parentPort.postMessage({ kind: 'progress', progress: p });
    },
  });
  if (r.ok) {
    const { plan: _plan, ...value } = r.value;
    parentPort.postMessage({ kind: 'done', result: { ok: true, value } });
  } else parentPort.postMessage({ kind: 'done', result: r });
})().catch((e) => parentPort.postMessage({ kind: 'error', message: String((e && e.stack) || e) }));
`;

/** Plans a week on its own worker thread, passing progress reports on as they arrive. */
function planWeekInWorker(
  workspace: Workspace,
  context: SchedulingContext,
  options: Omit<PlanWorkspaceWeekOptions, 'clock' | 'onProgress'>,
  everyMs: number,
  onProgress?: (p: WeekProgressView) => void,
): Promise<Result<WeekProposal>> {
  const entry = new URL('./solve-worker.mjs', import.meta.url).href;
  const week = new URL('./week.ts', import.meta.url).href;
  return new Promise((resolve, reject) => {
    const worker = new Worker(WEEK_WORKER_SOURCE, {
      eval: true,
      workerData: { entry, week, workspace, context, options, everyMs },
    });
    let settled = false;
    worker.on(
      'message',
      (m: { kind: string; progress?: WeekProgress; result?: Result<WeekProposal>; message?: string }) => {
        if (m.kind === 'progress' && m.progress !== undefined) {
          const p = m.progress;
          onProgress?.({ elapsedMs: p.elapsedMs, best: p.best, unplaced: p.unplaced, phase: p.phase });
        } else if (m.kind === 'done' && m.result !== undefined) {
          settled = true;
          resolve(m.result);
          void worker.terminate();
        } else if (m.kind === 'error') {
          settled = true;
          reject(new SlotwrightError('internal', `planning the week failed: ${m.message ?? 'unknown'}`));
          void worker.terminate();
        }
      },
    );
    worker.on('error', (error) => {
      if (settled) return;
      settled = true;
      reject(new SlotwrightError('internal', `planning the week failed: ${error.message}`, { cause: error }));
    });
    worker.on('exit', (code) => {
      if (!settled) reject(new SlotwrightError('internal', `the week plan worker stopped (exit ${code})`));
    });
  });
}
