import { randomBytes } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { ICalCalendar, ICalCalendarMethod, ICalEventStatus } from 'ical-generator';
import { normalizeError, type SlotwrightError } from '../errors.ts';
import { inviteUid, PRODID } from './invite.ts';

/** Whose bookings a subscription feed shows. */
export interface FeedOwner {
  readonly kind: 'person' | 'room';
  readonly id: string;
}

/** A booking as a subscription feed needs it. */
export interface FeedBooking {
  readonly id: string;
  readonly title: string;
  readonly start: number;
  readonly end: number;
  readonly state: 'held' | 'booked' | 'cancelled';
  readonly sequence: number;
  readonly room: string | null;
}

/** A new subscription token: 32 random bytes, base64url (43 characters). Store only its hash. */
export function newSubscriptionToken(): string {
  return randomBytes(32).toString('base64url');
}

/** Options of a subscription feed. */
export interface SubscriptionFeedOptions {
  /** Domain of UIDs, the same as invites use, so clients match feed events to invites. */
  readonly domain: string;
  /** Calendar name shown by clients. @default 'slotwright' */
  readonly name?: string;
  /** Room display names for LOCATION. @default the room id */
  readonly roomName?: (id: string) => string | undefined;
}

/**
 * A METHOD:PUBLISH calendar of one owner's bookings. A person's feed shows the titles of the
 * meetings they attend; a room's feed shows only that the room is booked, because anyone with the
 * room's link could read it.
 */
export function subscriptionFeed(
  owner: FeedOwner,
  bookings: readonly FeedBooking[],
  stamp: number,
  options: SubscriptionFeedOptions,
): string {
  const cal = new ICalCalendar({
    prodId: PRODID,
    method: ICalCalendarMethod.PUBLISH,
    name: options.name ?? 'slotwright',
  });
  for (const b of bookings) {
    if (b.state !== 'booked') continue;
    const room = b.room === null ? undefined : (options.roomName?.(b.room) ?? b.room);
    cal.createEvent({
      id: inviteUid(b.id, options.domain),
      sequence: b.sequence,
      stamp: new Date(stamp),
      start: new Date(b.start),
      end: new Date(b.end),
      summary: owner.kind === 'person' ? b.title : 'Booked',
      status: ICalEventStatus.CONFIRMED,
      ...(room === undefined ? {} : { location: room }),
    });
  }
  return cal.toString();
}

/** What the HTTP handler needs. */
export interface SubscriptionHandlerDeps {
  /** Who a token opens (the store compares sha-256 hashes), or undefined. */
  readonly lookup: (token: string) => Promise<FeedOwner | undefined>;
  /** Bookings of an owner overlapping a window. */
  readonly bookingsOf: (
    owner: FeedOwner,
    window: { start: number; end: number },
  ) => Promise<readonly FeedBooking[]>;
  /** Current instant in epoch ms. */
  readonly now: () => number;
  readonly feed: SubscriptionFeedOptions;
  /** Days before now the feed reaches back. @default 30 */
  readonly pastDays?: number;
  /** Days after now the feed reaches forward. @default 180 */
  readonly futureDays?: number;
  /** URL path before the token. @default '/feeds/' */
  readonly prefix?: string;
  /** Told about failures (the response only says 500). @default undefined */
  readonly onError?: (error: SlotwrightError) => void;
}

const TOKEN = /^[A-Za-z0-9_-]{43}$/;
const DAY = 86_400_000;

function send(
  res: ServerResponse,
  status: number,
  body: string,
  type = 'text/plain; charset=utf-8',
  head = false,
) {
  res.writeHead(status, {
    'content-type': type,
    'content-length': Buffer.byteLength(body),
    'cache-control': 'private, no-store',
    'x-content-type-options': 'nosniff',
    // The token is in the URL; keep it out of Referer headers of anything the feed links to.
    'referrer-policy': 'no-referrer',
  });
  res.end(head ? undefined : body);
}

/**
 * A plain node:http handler serving `GET <prefix><token>.ics`. Unknown, revoked and malformed
 * tokens all get the same 404, so the answer says nothing about which tokens exist.
 */
export function subscriptionHandler(
  deps: SubscriptionHandlerDeps,
): (req: IncomingMessage, res: ServerResponse) => void {
  const prefix = deps.prefix ?? '/feeds/';
  const past = (deps.pastDays ?? 30) * DAY;
  const future = (deps.futureDays ?? 180) * DAY;
  return (req, res) => {
    void (async () => {
      const head = req.method === 'HEAD';
      if (req.method !== 'GET' && !head) {
        res.setHeader('allow', 'GET, HEAD');
        send(res, 405, 'only GET and HEAD\n');
        return;
      }
      const path = (req.url ?? '').split('?')[0] ?? '';
      const token = path.startsWith(prefix) && path.endsWith('.ics') ? path.slice(prefix.length, -4) : '';
      const owner = TOKEN.test(token) ? await deps.lookup(token) : undefined;
      if (owner === undefined) {
        send(res, 404, 'no such feed\n', undefined, head);
        return;
      }
      const now = deps.now();
      const bookings = await deps.bookingsOf(owner, { start: now - past, end: now + future });
      send(res, 200, subscriptionFeed(owner, bookings, now, deps.feed), 'text/calendar; charset=utf-8', head);
    })().catch((error: unknown) => {
      deps.onError?.(normalizeError(error));
      if (!res.headersSent) send(res, 500, 'feed unavailable\n');
      else res.destroy();
    });
  };
}
