import { ACTION } from '../../reply.ts';
import type { BotDeps } from '../../slack-adapter.ts';
import { type ButtonArgs, runButton } from './button.ts';

/** Ask again with one relaxation applied. */
export function tryRelaxation(deps: BotDeps) {
  return async function onTryRelaxation(args: ButtonArgs): Promise<void> {
    await runButton(deps, ACTION.tryRelaxation, args);
  };
}
