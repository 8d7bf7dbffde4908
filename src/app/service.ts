/**
 * The facade of use cases the chat bot calls. The bot speaks only these plain, serialisable types;
 * each method returns `{ ok: false, issues }` for expected failures, including a use case that is
 * not wired into this build (`not_available`).
 */
import type { Workspace } from '../config/index.ts';
import { type Issue, type Result, SlotwrightError } from '../errors.ts';
import type { ChatUserProfile, DeliveryLog } from './ports.ts';

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
  readonly series: string;
  readonly start: number;
  readonly end: number;
  readonly room?: string;
}

/** A week plan, or what could not be placed. */
export interface WeekPlanView {
  readonly weekOf: string;
  readonly sessions: readonly WeekSession[];
  readonly unplaced: readonly { readonly series: string; readonly reason: string }[];
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
  week(actor: ServicePerson, weekOf: string | undefined, nowMs: number): Promise<Result<WeekPlanView>>;
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

/** The service over one workspace, calling each use case that this build has. */
export class DefaultSlotwrightService implements SlotwrightService {
  readonly workspaceName: string;
  readonly #workspace: Workspace;
  readonly #people: PeopleDirectory;
  readonly #deliveries: DeliveryLog;
  readonly #last = new Map<string, MeetAnswer>();

  constructor(options: ServiceOptions) {
    this.#workspace = options.workspace;
    this.workspaceName = options.workspace.name ?? 'workspace';
    this.#people = directoryOf(options.workspace);
    this.#deliveries = options.deliveries;
  }

  /** The workspace this service answers for. */
  get workspace(): Workspace {
    return this.#workspace;
  }

  async identify(profile: ChatUserProfile): Promise<Result<ServicePerson>> {
    return this.#people.identify(profile);
  }

  person(id: string): ServicePerson | undefined {
    return this.#people.byId(id);
  }

  defaultPerson(): ServicePerson {
    const admin = this.#workspace.admins.map((a) => this.#people.byId(a)).find((p) => p !== undefined);
    const first = admin ?? this.#people.all[0];
    if (first === undefined) throw new SlotwrightError('config_invalid', 'the workspace has no people');
    return first;
  }

  async meet(actor: ServicePerson, query: MeetQuery, _nowMs: number): Promise<Result<MeetAnswer>> {
    const people = this.#people.resolve(query.required, query.optional);
    if (!people.ok) return people;
    void actor;
    return notAvailable('Finding meeting times');
  }

  lastMeet(actorId: string): MeetAnswer | undefined {
    return this.#last.get(actorId);
  }

  async hold(_actor: ServicePerson, _token: string, _nowMs: number): Promise<Result<BookingView>> {
    return notAvailable('Holding a time');
  }

  async book(_actor: ServicePerson, _token: string, _nowMs: number): Promise<Result<BookingView>> {
    return notAvailable('Booking');
  }

  async cancel(_actor: ServicePerson, _bookingId: string, _nowMs: number): Promise<Result<BookingView>> {
    return notAvailable('Cancelling a booking');
  }

  async upcoming(_actor: ServicePerson, _nowMs: number): Promise<Result<readonly BookingView[]>> {
    return notAvailable('Listing bookings');
  }

  async previewRule(_actor: ServicePerson, _text: string, _nowMs: number): Promise<Result<RulePreview>> {
    return notAvailable('Reading rules');
  }

  async confirmRule(_actor: ServicePerson, _token: string, _nowMs: number): Promise<Result<RuleView>> {
    return notAvailable('Saving rules');
  }

  async rules(_actor: ServicePerson): Promise<Result<readonly RuleView[]>> {
    return notAvailable('Listing rules');
  }

  async forgetRule(_actor: ServicePerson, _ruleId: string, _nowMs: number): Promise<Result<RuleView>> {
    return notAvailable('Forgetting rules');
  }

  async addFeed(_actor: ServicePerson, _url: string, _nowMs: number): Promise<Result<FeedView>> {
    return notAvailable('Adding feeds');
  }

  async feeds(_actor: ServicePerson, _nowMs: number): Promise<Result<readonly FeedView[]>> {
    return notAvailable('Listing feeds');
  }

  async series(_actor: ServicePerson, _text: string, _nowMs: number): Promise<Result<readonly SeriesView[]>> {
    return notAvailable('Listing series');
  }

  async week(
    _actor: ServicePerson,
    _weekOf: string | undefined,
    _nowMs: number,
  ): Promise<Result<WeekPlanView>> {
    return notAvailable('The week plan');
  }

  claimDelivery(key: string, nowMs: number): Promise<boolean> {
    return this.#deliveries.claim(key, nowMs);
  }
}
