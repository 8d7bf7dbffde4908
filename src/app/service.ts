/**
 * The facade of use cases the chat bot calls. The bot speaks only these plain, serialisable types;
 * each method returns `{ ok: false, issues }` for expected failures, including a use case that is
 * not wired into this build (`not_available`).
 */
import type { Issue, Result } from '../errors.ts';
import type { ChatUserProfile } from './ports.ts';

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
