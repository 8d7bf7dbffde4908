import { ACTION } from '../../reply.ts';
import type { BotDeps } from '../../slack-adapter.ts';
import { type ButtonArgs, runButton } from './button.ts';

/** Save a rule after its preview. */
export function confirmRule(deps: BotDeps) {
  return async function onConfirmRule(args: ButtonArgs): Promise<void> {
    await runButton(deps, ACTION.confirmRule, args);
  };
}
