import type { App } from '@slack/bolt';
import type { BotDeps } from '../../slack-adapter.ts';
import { SLOT_COMMAND, slotCommand } from './slot-command.ts';

/** Registers the slash command listeners. */
export function registerCommands(app: App, deps: BotDeps): void {
  app.command(SLOT_COMMAND, slotCommand(deps));
}

export { SLOT_COMMAND };
