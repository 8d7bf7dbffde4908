import { ACTION } from '../../reply.ts';
import type { BotDeps } from '../../slack-adapter.ts';
import { type ButtonArgs, runButton } from './button.ts';

/** Book this option. */
export function bookOption(deps: BotDeps) {
  return async function onBookOption(args: ButtonArgs): Promise<void> {
    await runButton(deps, ACTION.bookOption, args);
  };
}
