import type { App } from '@slack/bolt';
import { NEW_REQUEST_VIEW } from '../../reply.ts';
import type { BotDeps } from '../../slack-adapter.ts';
import { newRequestSubmitted } from './new-request-submitted.ts';

/** Registers the modal submission listeners by callback id. */
export function registerViews(app: App, deps: BotDeps): void {
  app.view(NEW_REQUEST_VIEW, newRequestSubmitted(deps));
}
