import { ACTION } from '../../reply.ts';
import type { BotDeps } from '../../slack-adapter.ts';
import { type ButtonArgs, runButton } from './button.ts';

/** Hold this option for a short while. */
export function holdOption(deps: BotDeps) {
  return async function onHoldOption(args: ButtonArgs): Promise<void> {
    await runButton(deps, ACTION.holdOption, args);
  };
}
