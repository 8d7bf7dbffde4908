import type { ChatMessageRef, ChatTransport, ChatUserProfile } from '../app/ports.ts';
import { SlotwrightError } from '../errors.ts';
import { type ChatWebApi, profileOf } from './slack-adapter.ts';

/** ChatTransport over the Slack Web API (jobs such as the weekly plan post through it). */
export class SlackChatTransport implements ChatTransport {
  readonly #api: ChatWebApi;

  /** @param api Bolt's `app.client`, or any client with the same calls. */
  constructor(api: ChatWebApi) {
    this.#api = api;
  }

  /** Posts to a channel id, or to a user id (their direct messages with the app). */
  async post(
    channel: string,
    message: { readonly text: string; readonly blocks?: readonly unknown[] },
  ): Promise<ChatMessageRef> {
    const r = (await this.#call(() =>
      this.#api.chat.postMessage({
        channel,
        text: message.text,
        ...(message.blocks === undefined ? {} : { blocks: message.blocks }),
      }),
    )) as { ts?: unknown; channel?: unknown };
    if (typeof r.ts !== 'string')
      throw new SlotwrightError('chat_api', 'chat.postMessage answered without a ts');
    return { channel: typeof r.channel === 'string' ? r.channel : channel, ts: r.ts };
  }

  /** Replaces a posted message. */
  async update(
    ref: ChatMessageRef,
    message: { readonly text: string; readonly blocks?: readonly unknown[] },
  ): Promise<void> {
    await this.#call(() =>
      this.#api.chat.update({
        channel: ref.channel,
        ts: ref.ts,
        text: message.text,
        ...(message.blocks === undefined ? {} : { blocks: message.blocks }),
      }),
    );
  }

  /** users.info, read field by field; undefined for a user the platform does not know. */
  async userProfile(chatId: string): Promise<ChatUserProfile | undefined> {
    try {
      return profileOf(chatId, await this.#api.users.info({ user: chatId }));
    } catch (error) {
      if ((error as { data?: { error?: unknown } }).data?.error === 'user_not_found') return undefined;
      throw new SlotwrightError('chat_api', `users.info failed for ${chatId}`, { cause: error });
    }
  }

  async #call(f: () => Promise<unknown>): Promise<unknown> {
    try {
      return await f();
    } catch (error) {
      if (error instanceof SlotwrightError) throw error;
      const code = (error as { data?: { error?: unknown } }).data?.error;
      throw new SlotwrightError(
        'chat_api',
        `the chat platform refused the call${typeof code === 'string' ? `: ${code}` : ''}`,
        {
          cause: error,
        },
      );
    }
  }
}
