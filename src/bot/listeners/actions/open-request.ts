import type { BotDeps, ChatWebApi } from '../../slack-adapter.ts';
import { newRequestView } from '../views/new-request-view.ts';
import type { ButtonArgs } from './button.ts';

/** "New request" on the home tab: opens the request modal (trigger ids live three seconds, so first). */
export function openRequest(_deps: BotDeps) {
  return async function onOpenRequest({ ack, body, client }: ButtonArgs): Promise<void> {
    await ack();
    await (client as unknown as ChatWebApi).views.open({
      trigger_id: body.trigger_id,
      view: newRequestView(),
    });
  };
}
