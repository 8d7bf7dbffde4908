// Public surface of src/calendar: named exports only, no `export *`.
export { type BusyOptions, type BusyReport, busyFromIcs } from './busy-from-ics.ts';
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
export {
  type FeedBooking,
  type FeedOwner,
  newSubscriptionToken,
  type SubscriptionFeedOptions,
  type SubscriptionHandlerDeps,
  subscriptionFeed,
  subscriptionHandler,
} from './subscription.ts';
