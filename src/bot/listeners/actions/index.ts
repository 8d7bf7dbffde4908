import type { App } from '@slack/bolt';
import { ACTION } from '../../reply.ts';
import type { BotDeps } from '../../slack-adapter.ts';
import { bookOption } from './book-option.ts';
import { cancelBooking } from './cancel-booking.ts';
import { confirmRule } from './confirm-rule.ts';
import { holdOption } from './hold-option.ts';
import { lockWeekPlan } from './lock-week.ts';
import { openRequest } from './open-request.ts';
import { tryRelaxation } from './try-relaxation.ts';

/** Matches an action id with or without the position suffix the renderer adds. */
function id(kind: string): RegExp {
  return new RegExp(`^${kind}(?::\\d+)?$`);
}

/** Registers the button listeners by action id. */
export function registerActions(app: App, deps: BotDeps): void {
  app.action(id(ACTION.bookOption), bookOption(deps));
  app.action(id(ACTION.holdOption), holdOption(deps));
  app.action(id(ACTION.cancelBooking), cancelBooking(deps));
  app.action(id(ACTION.confirmRule), confirmRule(deps));
  app.action(id(ACTION.tryRelaxation), tryRelaxation(deps));
  app.action(id(ACTION.openRequest), openRequest(deps));
  app.action(id(ACTION.lockWeek), lockWeekPlan(deps));
}
