import type { App } from '@slack/bolt';
import type { BotDeps } from '../../slack-adapter.ts';
import { appHomeOpened, publishHome } from './app-home-opened.ts';
import { appMention } from './app-mention.ts';
import { directMessage } from './direct-message.ts';

/** Registers the event listeners. */
export function registerEvents(app: App, deps: BotDeps): void {
  app.event('app_mention', appMention(deps));
  app.event('app_home_opened', appHomeOpened(deps));
  app.message(directMessage(deps));
}

export { publishHome };
