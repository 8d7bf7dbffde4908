import { ACTION } from '../../reply.ts';
import type { BotDeps } from '../../slack-adapter.ts';
import { type ButtonArgs, runButton } from './button.ts';

/** Lock this week plan: book every session, keep the plan, send the weekly invites. */
export function lockWeekPlan(deps: BotDeps) {
  return async function onLockWeek(args: ButtonArgs): Promise<void> {
    await runButton(deps, ACTION.lockWeek, args);
  };
}
