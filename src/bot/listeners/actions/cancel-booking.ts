import { ACTION } from '../../reply.ts';
import type { BotDeps } from '../../slack-adapter.ts';
import { type ButtonArgs, runButton } from './button.ts';

/** Cancel a booking or release a hold. */
export function cancelBooking(deps: BotDeps) {
  return async function onCancelBooking(args: ButtonArgs): Promise<void> {
    await runButton(deps, ACTION.cancelBooking, args);
  };
}
