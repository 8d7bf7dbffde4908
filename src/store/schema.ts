import type { Generated } from 'kysely';

/** Which SQL engine a store runs on; the only place code branches on it is the migration and errors. */
export type StoreDialect = 'sqlite' | 'postgres';

/** Booking and occupancy states; `cancelled` also covers released and expired holds. */
export type BookingState = 'held' | 'booked' | 'cancelled';

/** A workspace person as stored. */
export interface PersonTable {
  id: string;
  name: string;
  email: string | null;
  zone: string;
  /** The rest of the person's workspace entry, as JSON text. */
  data: string;
}

/** A workspace room as stored. */
export interface RoomTable {
  id: string;
  name: string;
  capacity: number | null;
  zone: string | null;
  data: string;
}

/** A workspace group as stored; members as a JSON array of person ids. */
export interface GroupTable {
  id: string;
  members: string;
}

/** A rule someone set: its owner, the sentence they typed, and the parsed structure as JSON. */
export interface RuleTable {
  id: string;
  owner: string;
  sentence: string;
  structure: string;
  created_ms: number;
}

/** A feed of a person or room: the URL stays encrypted at rest; fetch state for conditional requests. */
export interface FeedTable {
  id: string;
  owner: string;
  url_encrypted: string;
  etag: string | null;
  last_modified: string | null;
  last_body: string | null;
  last_busy: string | null;
  last_ok_ms: number | null;
  last_err_ms: number | null;
  last_error: string | null;
}

/** Cached busy time of a resource from its feeds. */
export interface BusyCacheTable {
  id: Generated<number>;
  resource: string;
  feed_id: string | null;
  start_ms: number;
  end_ms: number;
  kind: string;
}

/** A meeting request and the options offered for it. */
export interface RequestTable {
  id: string;
  organizer: string;
  body: string;
  options: string;
  created_ms: number;
}

/** A booking or hold; `idem_key` makes booking the same option twice return the same row. */
export interface BookingTable {
  id: string;
  idem_key: string;
  request_id: string | null;
  option_id: string | null;
  series_id: string | null;
  organizer: string;
  title: string;
  start_ms: number;
  end_ms: number;
  room: string | null;
  state: BookingState;
  hold_expires_ms: number | null;
  sequence: number;
  cancel_reason: string | null;
  created_ms: number;
  updated_ms: number;
}

/** An attendee of a booking. */
export interface BookingAttendeeTable {
  booking_id: string;
  person_id: string;
  role: 'required' | 'optional';
}

/**
 * One row per attendee and room of each booking or hold: the table the PostgreSQL exclusion
 * constraint guards, so the database itself refuses two live rows of one resource that overlap.
 */
export interface OccupancyTable {
  id: Generated<number>;
  booking_id: string;
  resource: string;
  start_ms: number;
  end_ms: number;
  state: BookingState;
}

/** A recurring meeting definition. */
export interface SeriesTable {
  id: string;
  owner: string;
  body: string;
  created_ms: number;
}

/** A week plan: the joint placement of all series for one ISO week. */
export interface WeekPlanTable {
  id: string;
  iso_week: string;
  body: string;
  created_ms: number;
}

/** How many off-hours sessions a person had in one ISO week, for fair rotation. */
export interface FairnessTable {
  person_id: string;
  iso_week: string;
  off_hours_count: number;
}

/** A processed chat delivery, so retries are handled once. */
export interface DeliveryTable {
  key: string;
  at_ms: number;
}

/** Who did what, and how it ended. */
export interface AuditTable {
  id: Generated<number>;
  actor: string;
  action: string;
  subject: string;
  outcome: string;
  detail: string | null;
  at_ms: number;
}

/** A subscription-feed token, stored only as its sha-256 hash. */
export interface SubscriptionTokenTable {
  token_hash: string;
  owner_kind: 'person' | 'room';
  owner_id: string;
  created_ms: number;
  revoked_ms: number | null;
}

/** Fetch state of one feed: the last good busy time (JSON) and how the last refresh went. */
export interface FeedStateTable {
  feed_id: string;
  busy: string;
  horizon_start_ms: number;
  horizon_end_ms: number;
  warnings: string;
  skipped: number;
  fetched_ms: number | null;
  attempted_ms: number;
  etag: string | null;
  last_modified: string | null;
  error_code: string | null;
  error_message: string | null;
}

/** The whole schema, one type for both engines. */
export interface StoreSchema {
  person: PersonTable;
  room: RoomTable;
  group_: GroupTable;
  rule: RuleTable;
  feed: FeedTable;
  busy_cache: BusyCacheTable;
  request: RequestTable;
  booking: BookingTable;
  booking_attendee: BookingAttendeeTable;
  occupancy: OccupancyTable;
  series: SeriesTable;
  week_plan: WeekPlanTable;
  fairness: FairnessTable;
  delivery: DeliveryTable;
  audit: AuditTable;
  subscription_token: SubscriptionTokenTable;
  feed_state: FeedStateTable;
}
