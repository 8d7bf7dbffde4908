/**
 * The week plan's input, already reduced to a coarse grid of cells: who is free when, which rooms
 * exist, and which series to place. Workspaces and the timetabling benchmark both turn into this.
 */

/** One cell of the coarse grid: a half-open UTC range [start, end) in epoch ms on plan day `day`. */
export interface WeekCell {
  readonly start: number;
  readonly end: number;
  /** Index of the plan day (0 = first day of the week) the cell belongs to. */
  readonly day: number;
}

/** A room that sessions may take. */
export interface WeekRoom {
  readonly id: string;
  readonly seats: number;
  readonly features: readonly string[];
  /** Per cell: true when the room is free. All free when absent. */
  readonly free?: readonly boolean[];
}

/** A person, or a group that stands for its members as one attendee (a benchmark curriculum). */
export interface WeekAttendee {
  readonly id: string;
  /** Per cell: true when the attendee may meet then (busy time, working hours, holidays, hard rules). All free when absent. */
  readonly free?: readonly boolean[];
  /** Opts in to back-to-back meetings: each meeting with no other of theirs right before or after it costs `weights.isolated`. @default false */
  readonly compact?: boolean;
  /** Per cell: share of the cell (0..1) outside the attendee's usual hours. */
  readonly offHours?: readonly number[];
  /** Multiplies this attendee's off-hours cost, so inconvenience can be rotated across weeks. @default 1 */
  readonly offHoursWeight?: number;
  /** Per cell: cost from this attendee's preference rules (already weighted). */
  readonly ruleCost?: readonly number[];
}

/** Weights of the preferences; each is the cost of one unit of the named miss. */
export interface WeekWeights {
  /** Per day missing below a series' `minDays`. */
  readonly spread: number;
  /** Per isolated meeting of an attendee who opted in to compactness. */
  readonly isolated: number;
  /** Per room beyond the first used by a series. */
  readonly roomStability: number;
  /** Per session on a day the series does not prefer. */
  readonly preferredDays: number;
  /** Per session starting outside the series' preferred hours. */
  readonly preferredHours: number;
  /** Per attendee-hour outside usual hours (times the attendee's `offHoursWeight`). */
  readonly usualHours: number;
  /** Per session not at last week's start and room. */
  readonly moves: number;
  /** Per missing seat, when seats are not a hard rule. */
  readonly seats: number;
  /** Multiplies the attendees' `ruleCost`. */
  readonly rules: number;
}

/** A recurring meeting to place in this week. */
export interface WeekSeries {
  readonly id: string;
  /** Indexes into `WeekRequest.attendees`. */
  readonly attendees: readonly number[];
  /** Sessions this week. */
  readonly sessions: number;
  /** Distinct days the sessions should spread over (a preference). */
  readonly minDays: number;
  /** Length of each session in cells. */
  readonly length: number;
  /** Per start cell: false where a session may not start (allowed days and hours, hard rules of the series). */
  readonly allowed?: readonly boolean[];
  /** Per plan day: true on preferred days. No day preference when absent. */
  readonly preferredDays?: readonly boolean[];
  /** Per start cell: true when a session starting there lies in the preferred hours. No hour preference when absent. */
  readonly preferredStarts?: readonly boolean[];
  /** Room needs; the sessions take no room when absent. */
  readonly room?: {
    readonly seats: number;
    readonly features: readonly string[];
    /** Only these room ids; any room with the features when absent. */
    readonly only?: readonly string[];
  };
  /** Per-series overrides of the request's weights. */
  readonly weights?: Partial<
    Pick<
      WeekWeights,
      'spread' | 'roomStability' | 'preferredDays' | 'preferredHours' | 'usualHours' | 'moves'
    >
  >;
}

/** A placed session: its series, start cell and room (null when it takes none). */
export interface PlacedSession {
  readonly series: string;
  readonly cell: number;
  readonly room: string | null;
}

/** Everything the week plan needs, on one grid. */
export interface WeekRequest {
  /** Cells in time order; cells of one day are consecutive. */
  readonly cells: readonly WeekCell[];
  /** Number of plan days. */
  readonly days: number;
  readonly rooms: readonly WeekRoom[];
  readonly attendees: readonly WeekAttendee[];
  readonly series: readonly WeekSeries[];
  readonly weights: WeekWeights;
  /** True when a room with too few seats may not be taken; false makes each missing seat a cost. */
  readonly seatsHard: boolean;
  /** Last week's sessions mapped onto this week's cells; moves against it cost `weights.moves`. */
  readonly lastWeek?: readonly PlacedSession[];
}

/** Weights that switch every preference off; start from it and set what you need. */
export const ZERO_WEIGHTS: WeekWeights = {
  spread: 0,
  isolated: 0,
  roomStability: 0,
  preferredDays: 0,
  preferredHours: 0,
  usualHours: 0,
  moves: 0,
  seats: 0,
  rules: 0,
};
