import { isSlow, workingReply } from '../../conversation.ts';
import {
  type BotDeps,
  type ChatWebApi,
  postThenUpdate,
  toMessage,
  unknownUserReply,
} from '../../slack-adapter.ts';

/** Answers text typed in a channel mention or a direct message; shared by both event listeners. */
export async function answerChatText(
  deps: BotDeps,
  client: ChatWebApi,
  where: { channel: string; threadTs?: string },
  userId: string,
  text: string,
): Promise<void> {
  const actor = await deps.people.actor(client, userId, deps.now());
  if (!actor.ok) {
    const m = toMessage(unknownUserReply(actor.issues));
    await client.chat.postMessage({
      channel: where.channel,
      text: m.text,
      blocks: m.blocks,
      ...thread(where),
    });
    return;
  }
  const parsed = deps.conversation.parse(actor.value, text, deps.now());
  if (parsed.ok && isSlow(parsed.value)) {
    const intent = parsed.value;
    await postThenUpdate(client, where, workingReply(intent), () =>
      deps.conversation.run(actor.value, intent, deps.now()),
    );
    return;
  }
  const m = toMessage(await deps.conversation.command(actor.value, text, deps.now()));
  await client.chat.postMessage({ channel: where.channel, text: m.text, blocks: m.blocks, ...thread(where) });
}

function thread(where: { threadTs?: string }): { thread_ts?: string } {
  return where.threadTs === undefined ? {} : { thread_ts: where.threadTs };
}

/** The text after the bot's own mention ("<@UBOT> meet 30m …" gives "meet 30m …"). */
export function textAfterMention(text: string): string {
  return text.replace(/^\s*<@[A-Z0-9]+(?:\|[^>]*)?>[\s:,]*/, '').trim();
}
