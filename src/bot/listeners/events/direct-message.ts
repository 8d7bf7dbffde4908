import type { AllMiddlewareArgs, SlackEventMiddlewareArgs } from '@slack/bolt';
import type { BotDeps, ChatWebApi } from '../../slack-adapter.ts';
import { answerChatText, textAfterMention } from './chat-text.ts';

/** A direct message to the bot: the whole text is one command. */
export function directMessage(deps: BotDeps) {
  return async function onDirectMessage({
    message,
    body,
    client,
  }: SlackEventMiddlewareArgs<'message'> & AllMiddlewareArgs): Promise<void> {
    // Only plain messages people type in the bot's direct-message channel; edits, joins and bots are ignored.
    if (message.channel_type !== 'im' || message.subtype !== undefined) return;
    if (!('user' in message) || typeof message.user !== 'string' || 'bot_id' in message) return;
    const text = 'text' in message && typeof message.text === 'string' ? message.text : '';
    if (!(await deps.conversation.service.claimDelivery(`event:${body.event_id}`, deps.now()))) return;
    await answerChatText(
      deps,
      client as unknown as ChatWebApi,
      { channel: message.channel },
      message.user,
      textAfterMention(text),
    );
  };
}
