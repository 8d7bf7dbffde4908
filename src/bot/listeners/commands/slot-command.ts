import type { AllMiddlewareArgs, SlackCommandMiddlewareArgs } from '@slack/bolt';
import { type BotDeps, type ChatWebApi, toMessage, unknownUserReply } from '../../slack-adapter.ts';

/** The slash command this app answers. */
export const SLOT_COMMAND = '/slot';

/**
 * `/slot <verb> …`: acknowledges at once with a short note (the platform allows three seconds), then
 * answers through response_url once the service is done.
 */
export function slotCommand(deps: BotDeps) {
  return async function onSlotCommand({
    command,
    ack,
    respond,
    client,
  }: SlackCommandMiddlewareArgs & AllMiddlewareArgs): Promise<void> {
    await ack({ response_type: 'ephemeral', text: 'Working on it…' });
    const actor = await deps.people.actor(client as unknown as ChatWebApi, command.user_id, deps.now());
    if (!actor.ok) {
      await respond({ response_type: 'ephemeral', ...toMessage(unknownUserReply(actor.issues)) } as never);
      return;
    }
    // The ack already said we are working on it; the answer follows through response_url.
    const parsed = deps.conversation.parse(actor.value, command.text, deps.now());
    const reply = parsed.ok
      ? await deps.conversation.run(actor.value, parsed.value, deps.now())
      : await deps.conversation.command(actor.value, command.text, deps.now());
    await respond({ response_type: 'ephemeral', ...toMessage(reply) } as never);
  };
}
