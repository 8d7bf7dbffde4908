import type { ChatUserProfile } from '../app/ports.ts';
import type { ServicePerson } from '../app/service.ts';
import { normalizeError, type Result } from '../errors.ts';
import type { Conversation } from './conversation.ts';
import { userMessage } from './messages.ts';
import { type BlockKitMessage, renderBlockKit } from './render-block-kit.ts';
import type { Reply } from './reply.ts';

/** The few Web API calls the listeners make, typed loosely so tests and Bolt's client both fit. */
export interface ChatWebApi {
  readonly users: { info(args: { user: string }): Promise<unknown> };
  readonly chat: {
    postMessage(args: Record<string, unknown> & { channel: string; text: string }): Promise<unknown>;
    update(args: Record<string, unknown> & { channel: string; ts: string; text: string }): Promise<unknown>;
  };
  readonly views: {
    open(args: Record<string, unknown> & { trigger_id: string }): Promise<unknown>;
    publish(args: Record<string, unknown> & { user_id: string }): Promise<unknown>;
  };
}

/** What every listener needs. */
export interface BotDeps {
  readonly conversation: Conversation;
  /** Current instant in epoch ms. */
  readonly now: () => number;
  readonly log: (text: string) => void;
  /** Maps chat users to people (cached users.info lookups). */
  readonly people: ChatPeople;
}

/** How long a users.info answer is trusted, in ms. */
const PROFILE_TTL_MS = 10 * 60_000;

/** Resolves chat user ids to workspace people through users.info, caching each profile briefly. */
export class ChatPeople {
  readonly #cache = new Map<string, { at: number; profile: ChatUserProfile }>();
  readonly #conversation: Conversation;

  constructor(conversation: Conversation) {
    this.#conversation = conversation;
  }

  /** The person behind a chat user id; an unknown user is an issue with a clear message. */
  async actor(client: ChatWebApi, userId: string, nowMs: number): Promise<Result<ServicePerson>> {
    const service = this.#conversation.service;
    // Known chat ids need no platform call at all.
    const direct = await service.identify({ chatId: userId });
    if (direct.ok) return direct;
    let hit = this.#cache.get(userId);
    if (hit === undefined || nowMs - hit.at > PROFILE_TTL_MS) {
      let answer: unknown;
      try {
        answer = await client.users.info({ user: userId });
      } catch (error) {
        // A user the platform does not know is an unknown person, not a failure of ours.
        if ((error as { data?: { error?: unknown } }).data?.error !== 'user_not_found') throw error;
        answer = undefined;
      }
      hit = { at: nowMs, profile: profileOf(userId, answer) };
      this.#cache.set(userId, hit);
    }
    return service.identify(hit.profile);
  }
}

/** Reads the fields we use from a users.info answer (unknown input, checked field by field). */
export function profileOf(userId: string, answer: unknown): ChatUserProfile {
  const user = (answer as { user?: { tz?: unknown; profile?: { email?: unknown; display_name?: unknown } } })
    ?.user;
  const email = user?.profile?.email;
  const tz = user?.tz;
  const name = user?.profile?.display_name;
  return {
    chatId: userId,
    ...(typeof email === 'string' && email !== '' ? { email } : {}),
    ...(typeof tz === 'string' && tz !== '' ? { zone: tz } : {}),
    ...(typeof name === 'string' && name !== '' ? { displayName: name } : {}),
  };
}

/** A reply as a chat message. */
export function toMessage(reply: Reply): BlockKitMessage {
  return renderBlockKit(reply);
}

/** The text shown for an issue-less failure of a chat user lookup or a thrown error. */
export function errorReply(error: unknown): { code: string; text: string } {
  const e = normalizeError(error);
  return { code: e.code, text: userMessage(e) };
}

/** Reply for a chat user that maps to no workspace person. */
export function unknownUserReply(issues: readonly { message: string }[]): Reply {
  return {
    summary: issues[0]?.message ?? 'I do not know you in this workspace.',
    private: true,
    blocks: [{ kind: 'text', spans: [issues.map((i) => i.message).join('; ')] }],
  };
}

/** Posts a "working" note, computes the reply, and puts the reply in place of the note. */
export async function postThenUpdate(
  client: ChatWebApi,
  target: { channel: string; threadTs?: string },
  working: Reply,
  compute: () => Promise<Reply>,
): Promise<void> {
  const note = toMessage(working);
  const posted = (await client.chat.postMessage({
    channel: target.channel,
    text: note.text,
    blocks: note.blocks,
    ...(target.threadTs === undefined ? {} : { thread_ts: target.threadTs }),
  })) as { ts?: string; channel?: string };
  const reply = toMessage(await compute());
  if (typeof posted.ts !== 'string') {
    await client.chat.postMessage({ channel: target.channel, text: reply.text, blocks: reply.blocks });
    return;
  }
  await client.chat.update({
    channel: posted.channel ?? target.channel,
    ts: posted.ts,
    text: reply.text,
    blocks: reply.blocks,
  });
}
