import type { AllMiddlewareArgs, SlackViewMiddlewareArgs, ViewSubmitAction } from '@slack/bolt';
import { textReply } from '../../reply.ts';
import {
  type BotDeps,
  type ChatWebApi,
  postThenUpdate,
  toMessage,
  unknownUserReply,
} from '../../slack-adapter.ts';
import { readNewRequest } from './new-request-view.ts';

/** Submitting the request modal: field errors go back into the modal, the options to a direct message. */
export function newRequestSubmitted(deps: BotDeps) {
  return async function onNewRequestSubmitted({
    ack,
    body,
    view,
    client,
  }: SlackViewMiddlewareArgs<ViewSubmitAction> & AllMiddlewareArgs): Promise<void> {
    const read = readNewRequest(view.state.values as never);
    if (!read.ok) {
      await ack({ response_action: 'errors', errors: read.errors });
      return;
    }
    await ack();
    const api = client as unknown as ChatWebApi;
    const userId = body.user.id;
    const actor = await deps.people.actor(api, userId, deps.now());
    if (!actor.ok) {
      const m = toMessage(unknownUserReply(actor.issues));
      await api.chat.postMessage({ channel: userId, text: m.text, blocks: m.blocks });
      return;
    }
    await postThenUpdate(api, { channel: userId }, textReply('Looking for times…'), () =>
      deps.conversation.meet(actor.value, read.query, deps.now()),
    );
  };
}
