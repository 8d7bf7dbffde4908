import type { AllMiddlewareArgs, SlackEventMiddlewareArgs } from '@slack/bolt';
import type { BotDeps, ChatWebApi } from '../../slack-adapter.ts';
import { toMessage, unknownUserReply } from '../../slack-adapter.ts';

/** Publishes the home tab of one user: their rules, feeds with freshness, and upcoming bookings. */
export async function publishHome(deps: BotDeps, client: ChatWebApi, userId: string): Promise<void> {
  const actor = await deps.people.actor(client, userId, deps.now());
  const reply = actor.ok
    ? await deps.conversation.home(actor.value, deps.now())
    : unknownUserReply(actor.issues);
  // The home tab holds at most 100 blocks.
  await client.views.publish({
    user_id: userId,
    view: { type: 'home', blocks: toMessage(reply).blocks.slice(0, 100) },
  });
}

/** Opening the app's home tab. */
export function appHomeOpened(deps: BotDeps) {
  return async function onAppHomeOpened({
    event,
    client,
  }: SlackEventMiddlewareArgs<'app_home_opened'> & AllMiddlewareArgs): Promise<void> {
    if (event.tab !== 'home') return;
    await publishHome(deps, client as unknown as ChatWebApi, event.user);
  };
}
