// Public surface of src/calendar: named exports only, no `export *`.

export { isIpLiteral, refusedAddressReason } from './address-policy.ts';
export { type BusyOptions, type BusyReport, busyFromIcs } from './busy-from-ics.ts';
export { loadSecretKey, openSecret, type SecretKeySource, sealSecret } from './feed-secret.ts';
export { type FeedState, InMemoryFeedStateStore } from './feed-state.ts';
export {
  type FetchFeedOptions,
  type FetchFeedResult,
  fetchFeed,
  type ResolvedAddress,
} from './fetch-feed.ts';
export {
  type InviteAttendee,
  type InviteInput,
  type InviteParty,
  inviteCancel,
  inviteRequest,
  inviteSeries,
  inviteUid,
  PRODID,
  type SeriesInviteInput,
  type WeekdayCode,
} from './invite.ts';
export { vtimezoneFor } from './invite-vtimezone.ts';
export { redactUrl } from './redact-url.ts';
export {
  type FeedBooking,
  type FeedOwner,
  newSubscriptionToken,
  type SubscriptionFeedOptions,
  type SubscriptionHandlerDeps,
  subscriptionFeed,
  subscriptionHandler,
} from './subscription.ts';
