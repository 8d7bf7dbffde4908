import type { ErrorCode, SlotwrightError } from '../errors.ts';

/** What the bot tells a person when something fails, by error code; never internal details. */
const MESSAGES: Readonly<Partial<Record<ErrorCode, string>>> = {
  internal: 'Something went wrong on my side. Nothing was booked or changed. Please try again.',
  bad_argument: 'I could not use that input.',
  not_found: 'I could not find that.',
  unauthorized: 'You are not allowed to do that here.',
  config_invalid: 'The workspace setup has a mistake; an admin needs to fix it.',
  config_unreadable: 'I could not read the workspace setup; an admin needs to check it.',
  feed_unreadable: 'I could not read that calendar feed.',
  feed_refused: 'That calendar feed address is not allowed (only public http(s) addresses are).',
  feed_too_large: 'That calendar feed is too large.',
  feed_timeout: 'That calendar feed took too long to answer.',
  feed_http: 'That calendar feed answered with an error.',
  ics_invalid: 'That calendar feed is not valid iCalendar.',
  zone_unknown: 'That time zone is not one I know.',
  rule_unreadable: 'I could not read that rule.',
  rule_ambiguous: 'That rule can be read more than one way; please say it more exactly.',
  model_invalid: 'That request cannot be turned into a schedule.',
  budget_exhausted: 'That took too long to solve; try a narrower time range or fewer people.',
  store_unavailable:
    'The booking store is not reachable right now. Nothing was booked. Please try again soon.',
  conflict: 'That time was just taken. Nothing was booked; ask again for fresh options.',
  hold_expired: 'That hold has lapsed. Ask again for fresh options.',
  chat_signature: 'That request could not be verified.',
  chat_unknown_user:
    'I do not know you in this workspace yet. Ask an admin to add your chat id or email to the workspace people.',
  chat_api: 'The chat platform did not accept my reply.',
};

/** The text shown to a person for an error; falls back to the general message. */
export function userMessage(error: SlotwrightError): string {
  return MESSAGES[error.code] ?? MESSAGES.internal!;
}
