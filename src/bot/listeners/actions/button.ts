import type { AllMiddlewareArgs, BlockAction, ButtonAction, SlackActionMiddlewareArgs } from '@slack/bolt';
import type { Reply } from '../../reply.ts';
import { type BotDeps, type ChatWebApi, toMessage, unknownUserReply } from '../../slack-adapter.ts';
import { publishHome } from '../events/app-home-opened.ts';

/** Arguments Bolt passes to a block_actions listener for a button. */
export type ButtonArgs = SlackActionMiddlewareArgs<BlockAction<ButtonAction>> & AllMiddlewareArgs;

/**
 * The common path of every button: acknowledge, let one click through per message and button (a
 * repeated click is dropped), run the conversation, and answer in the message's thread or, from the
 * home tab, by direct message with the home tab refreshed.
 */
export async function runButton(deps: BotDeps, kind: string, args: ButtonArgs): Promise<void> {
  const { ack, body, action, client, respond } = args;
  await ack();
  const api = client as unknown as ChatWebApi;
  const where = body.container as { message_ts?: string; view_id?: string; channel_id?: string } | undefined;
  const place = where?.message_ts ?? where?.view_id ?? body.trigger_id;
  const key = `action:${where?.channel_id ?? body.user.id}:${place}:${action.action_id}:${action.value ?? ''}`;
  if (!(await deps.conversation.service.claimDelivery(key, deps.now()))) return;
  const actor = await deps.people.actor(api, body.user.id, deps.now());
  const reply: Reply = actor.ok
    ? await deps.conversation.action(actor.value, kind, action.value ?? '', deps.now())
    : unknownUserReply(actor.issues);
  const m = toMessage(reply);
  if (body.response_url !== undefined && body.view?.type !== 'home') {
    await respond({
      replace_original: false,
      response_type: 'ephemeral',
      text: m.text,
      blocks: m.blocks,
    } as never);
    return;
  }
  await api.chat.postMessage({ channel: body.user.id, text: m.text, blocks: m.blocks });
  if (body.view?.type === 'home') await publishHome(deps, api, body.user.id);
}
