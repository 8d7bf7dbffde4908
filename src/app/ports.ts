// Ports: the calls the use cases make on outer adapters, and nothing more. Each section belongs to the
// part of the code that implements it; edit only your own section.

// --- store (bookings, holds, deliveries, audit) ---

/**
 * Holds, bookings and cancellations; SqlBookingStore implements it. The record types live with the
 * store (src/store/booking-records.ts) so the store does not import the app layer.
 */
export interface BookingStore {
  /** Holds or books an option in one write transaction; the same idempotency key gives the same booking. */
  reserve(
    input: import('../store/index.ts').ReserveInput,
  ): Promise<import('../store/index.ts').ReserveOutcome>;
  /** Cancels a booking or releases a hold, raising its SEQUENCE. */
  cancel(
    id: string,
    options: { readonly now: number; readonly reason?: string },
  ): Promise<import('../store/index.ts').CancelOutcome>;
  /** One booking by id, in any state. */
  get(id: string): Promise<import('../store/index.ts').BookingRecord | undefined>;
  /** Releases holds whose expiry is at or before `now`; returns how many. */
  releaseExpiredHolds(now: number): Promise<number>;
  /** Bookings of one person or room overlapping a window. */
  listFor(
    who: { readonly kind: 'person' | 'room'; readonly id: string },
    window: { readonly start: number; readonly end: number },
    states?: readonly ('held' | 'booked' | 'cancelled')[],
  ): Promise<import('../store/index.ts').BookingRecord[]>;
}

/** The audit log: who did what to which thing, and how it ended. SqlLedgerStore implements it. */
export interface AuditLog {
  /** Appends one entry. */
  audit(entry: import('../store/index.ts').AuditEntry): Promise<void>;
}

/** Who a subscription-feed token opens; SqlLedgerStore implements it. */
export interface SubscriptionTokens {
  /** The owner of a live token, or undefined. */
  lookupSubscriptionToken(token: string): Promise<import('../store/index.ts').SubscriptionOwner | undefined>;
}

// --- rules ---

/**
 * One saved rule. `ownerId` is whom it binds: a person id, or `room:<id>` / `group:<id>` for rooms
 * and groups (see ruleOwnerId in src/app/rules.ts).
 */
export interface StoredRule {
  readonly id: string;
  readonly ownerId: string;
  readonly rule: import('../rules/index.ts').Rule;
  /** The normalized sentence shown when the rule was confirmed. */
  readonly text: string;
  /** When it was saved, epoch ms. */
  readonly createdAt: number;
}

/** Saved rules; InMemoryRuleStore implements it for tests and the console, the store an SQL one. */
export interface RuleStore {
  /** The rules of one owner, oldest first. */
  list(ownerId: string): Promise<readonly StoredRule[]>;
  /** Saves a rule; its id is new. */
  add(rule: StoredRule): Promise<void>;
  /** Removes one rule of an owner; false when that owner has no rule with that id. */
  remove(ownerId: string, ruleId: string): Promise<boolean>;
}

// --- calendar feeds ---

/**
 * Where each feed's last good busy time and fetch status are kept between refreshes.
 * InMemoryFeedStateStore (src/calendar) implements it; an SQL one can implement the same two calls.
 */
export interface FeedStateStore {
  /** The saved state of a feed, or undefined before its first refresh. */
  load(feedId: string): Promise<import('../calendar/index.ts').FeedState | undefined>;
  /** Saves the state of a feed, replacing the previous one. */
  save(feedId: string, state: import('../calendar/index.ts').FeedState): Promise<void>;
}

// --- chat ---

/** Where a chat message went, so it can be updated in place later. */
export interface ChatMessageRef {
  readonly channel: string;
  readonly ts: string;
}

/** A chat user's profile as the platform reports it. */
export interface ChatUserProfile {
  readonly chatId: string;
  readonly email?: string;
  /** IANA zone from the profile, when the platform gives one. */
  readonly zone?: string;
  readonly displayName?: string;
}

/**
 * The calls use cases and jobs make on a chat platform. `message` is the surface's own rendering of a
 * reply (Block Kit for Slack, text for the console); the transport does not look inside it.
 */
export interface ChatTransport {
  /** Posts a message to a channel or a user's direct-message channel. */
  post(
    channel: string,
    message: { readonly text: string; readonly blocks?: readonly unknown[] },
  ): Promise<ChatMessageRef>;
  /** Replaces a posted message. */
  update(
    ref: ChatMessageRef,
    message: { readonly text: string; readonly blocks?: readonly unknown[] },
  ): Promise<void>;
  /** Looks a user up; undefined when the platform does not know them. */
  userProfile(chatId: string): Promise<ChatUserProfile | undefined>;
}

/**
 * Remembers which chat deliveries (event ids, button clicks) were already processed, so a retried
 * delivery or a repeated click runs once. Must be shared by all replicas to hold across them.
 */
export interface DeliveryLog {
  /** True the first time a key is seen, false on every later call with the same key. */
  claim(key: string, atMs: number): Promise<boolean>;
}

// --- week plan (fairness history) ---

/** Off-hours tallies per person and ISO week, for fair rotation; SqlLedgerStore implements it. */
export interface FairnessLedger {
  /** Adds `count` (may be negative, to correct a re-planned week) to a person's tally for a week. */
  addOffHours(person: string, isoWeek: string, count: number): Promise<void>;
  /** Tallies of some people in some weeks; weeks without a row are absent. */
  offHours(
    people: readonly string[],
    weeks: readonly string[],
  ): Promise<{ person: string; isoWeek: string; count: number }[]>;
}
