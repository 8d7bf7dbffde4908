import type { AllMiddlewareArgs, SlackCommandMiddlewareArgs } from '@slack/bolt';
import type { ServicePerson } from '../../../app/service.ts';
import { normalizeError } from '../../../errors.ts';
import { weekProgressReply, workingReply } from '../../conversation.ts';
import type { ChatIntent } from '../../parse-command.ts';
import { type BotDeps, type ChatWebApi, toMessage, unknownUserReply } from '../../slack-adapter.ts';

/** The slash command this app answers. */
export const SLOT_COMMAND = '/slot';

/**
 * `/slot <verb> …`: acknowledges at once with a short note (the platform allows three seconds), then
 * answers through response_url once the service is done. A week plan takes seconds, so it is posted
 * to the channel as a "working" message that shows the search's progress and then becomes the plan.
 */
export function slotCommand(deps: BotDeps) {
  return async function onSlotCommand({
    command,
    ack,
    respond,
    client,
  }: SlackCommandMiddlewareArgs & AllMiddlewareArgs): Promise<void> {
    await ack({ response_type: 'ephemeral', text: 'Working on it…' });
    const api = client as unknown as ChatWebApi;
    const actor = await deps.people.actor(api, command.user_id, deps.now());
    if (!actor.ok) {
      await respond({ response_type: 'ephemeral', ...toMessage(unknownUserReply(actor.issues)) } as never);
      return;
    }
    // The ack already said we are working on it; the answer follows through response_url.
    const parsed = deps.conversation.parse(actor.value, command.text, deps.now());
    if (parsed.ok && parsed.value.verb === 'week') {
      const done = await weekInChannel(deps, api, command.channel_id, actor.value, parsed.value);
      if (done) return;
    }
    const reply = parsed.ok
      ? await deps.conversation.run(actor.value, parsed.value, deps.now())
      : await deps.conversation.command(actor.value, command.text, deps.now());
    await respond({ response_type: 'ephemeral', ...toMessage(reply) } as never);
  };
}

/**
 * Posts the "working" message in the channel, updates it with each progress report (the service sends
 * them about once a second) and finally replaces it with the plan. False when the message could not
 * be posted (e.g. the app is not in the channel), so the caller answers through response_url instead.
 */
async function weekInChannel(
  deps: BotDeps,
  api: ChatWebApi,
  channel: string,
  actor: ServicePerson,
  intent: Extract<ChatIntent, { verb: 'week' }>,
): Promise<boolean> {
  const note = toMessage(workingReply(intent));
  let ts: string;
  let where = channel;
  try {
    const posted = (await api.chat.postMessage({ channel, text: note.text, blocks: note.blocks })) as {
      ts?: unknown;
      channel?: unknown;
    };
    if (typeof posted.ts !== 'string') return false;
    ts = posted.ts;
    if (typeof posted.channel === 'string') where = posted.channel;
  } catch (error) {
    deps.log(`week: could not post in ${channel}: ${normalizeError(error).message}`);
    return false;
  }
  // Updates go out one at a time and in order; a failed one is logged and the next one tries again.
  let chain: Promise<void> = Promise.resolve();
  const update = (m: ReturnType<typeof toMessage>) => {
    chain = chain
      .then(async () => {
        await api.chat.update({ channel: where, ts, text: m.text, blocks: m.blocks });
      })
      .catch((error: unknown) => deps.log(`week: progress update failed: ${normalizeError(error).message}`));
    return chain;
  };
  const reply = await deps.conversation.week(actor, intent.weekOf, deps.now(), (p) => {
    void update(toMessage(weekProgressReply(p)));
  });
  await update(toMessage(reply));
  return true;
}
