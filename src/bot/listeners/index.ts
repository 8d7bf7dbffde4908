import type { App } from '@slack/bolt';
import type { BotDeps } from '../slack-adapter.ts';
import { registerActions } from './actions/index.ts';
import { registerCommands } from './commands/index.ts';
import { registerEvents } from './events/index.ts';
import { registerViews } from './views/index.ts';

/** Registers every listener of the bot on a Bolt app. */
export function registerListeners(app: App, deps: BotDeps): void {
  registerCommands(app, deps);
  registerEvents(app, deps);
  registerActions(app, deps);
  registerViews(app, deps);
}
