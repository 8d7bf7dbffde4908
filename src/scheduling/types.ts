import type { RuleEffect } from '../rules/effect.ts';
import type { BusyInterval, Interval } from '../time/interval.ts';
import type { WeeklyHours } from '../time/working-hours.ts';

/** A person as scheduling sees them: their zone, hours, holidays, busy time and rule effects. */
export interface SchedulingPerson {
  readonly id: string;
  readonly zone: string;
  readonly workingHours: WeeklyHours;
  /** date-holidays region ("PT", "CA-NS"); no public holidays when absent. */
  readonly holidayRegion?: string;
  /** Busy time from all their feeds, over at least the search window. */
  readonly busy: readonly BusyInterval[];
  /** Their rules' effects over at least the search window. */
  readonly rules: readonly RuleEffect[];
}

/** A room as scheduling sees it. */
export interface SchedulingRoom {
  readonly id: string;
  readonly capacity: number;
  readonly features: readonly string[];
  readonly zone: string;
  /** Busy time from the room's feeds; tentative room time counts as taken. */
  readonly busy: readonly BusyInterval[];
  /** Hard rules of the room (preferences of rooms are not scored). */
  readonly rules: readonly RuleEffect[];
}

/** Everything a request is solved against. */
export interface SchedulingContext {
  /** Workspace zone: options are spread over its calendar days. */
  readonly zone: string;
  /** Minutes between candidate starts. */
  readonly gridMinutes: number;
  /** How tentative busy time of people counts. */
  readonly tentative: 'penalty' | 'hard';
  /** Current instant; no option starts before it. */
  readonly now: number;
  readonly people: readonly SchedulingPerson[];
  readonly rooms: readonly SchedulingRoom[];
  readonly groups: readonly { readonly id: string; readonly members: readonly string[] }[];
  /** Busy time and rule effects are known up to here, so "widen the window" can be counted. @default the window end */
  readonly knownUntil?: number;
  /** Notes from loading (stale or unreadable feeds), passed through to the outcome. @default [] */
  readonly warnings?: readonly string[];
}

/** A meeting to place. */
export interface MeetRequest {
  /** Required attendees: person ids or group ids (groups expand to their members). */
  readonly with: readonly string[];
  /** Optional attendees: covered when possible, scored, never required. @default [] */
  readonly optional?: readonly string[];
  readonly lengthMinutes: number;
  /** Where starts may lie; the meeting must end by `window.end`. */
  readonly window: Interval;
  /** Seats the room needs; a room is chosen only when `seats` or `needs` is given. @default the attendee count */
  readonly seats?: number;
  /** Features the room needs (all of them). @default [] */
  readonly needs?: readonly string[];
  /** Minutes kept free in attendees' calendars before and after the meeting. @default 0 */
  readonly bufferMinutes?: number;
  /** Options wanted. @default 5 */
  readonly options?: number;
}

/** One named part of an option's score. */
export interface ScorePart {
  readonly why: string;
  /** Points added to the base of 100 (zero or negative). */
  readonly points: number;
}

/** One candidate time (and room). */
export interface MeetOption {
  readonly start: number;
  readonly end: number;
  readonly room: string | null;
  /** 100 plus the points of the breakdown; higher is better. */
  readonly score: number;
  readonly breakdown: readonly ScorePart[];
}

/** One reason nothing fits. */
export interface Blocker {
  /** A person id, or "rooms". */
  readonly who: string;
  readonly kind: 'person' | 'room' | 'rule';
  readonly detail: string;
}

/** A change that would open options, with how many starts it opens. */
export interface Relaxation {
  readonly change: string;
  readonly opens: number;
}

/** What meet answers: ranked options, or blockers and relaxations when none fit. */
export interface MeetOutcome {
  readonly options: readonly MeetOption[];
  readonly blockers: readonly Blocker[];
  readonly relaxations: readonly Relaxation[];
  readonly warnings: readonly string[];
}
