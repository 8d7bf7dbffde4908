import type { AllMiddlewareArgs, SlackEventMiddlewareArgs } from '@slack/bolt';
import type { BotDeps, ChatWebApi } from '../../slack-adapter.ts';
import { answerChatText, textAfterMention } from './chat-text.ts';

/** `@slotwright meet 30m with @ana tomorrow` in a channel: answers in a thread. */
export function appMention(deps: BotDeps) {
  return async function onAppMention({
    event,
    body,
    client,
  }: SlackEventMiddlewareArgs<'app_mention'> & AllMiddlewareArgs): Promise<void> {
    // A retried delivery carries the same event_id; the shared log lets only the first one through.
    if (!(await deps.conversation.service.claimDelivery(`event:${body.event_id}`, deps.now()))) return;
    if (event.user === undefined) return;
    await answerChatText(
      deps,
      client as unknown as ChatWebApi,
      { channel: event.channel, threadTs: event.thread_ts ?? event.ts },
      event.user,
      textAfterMention(event.text),
    );
  };
}
