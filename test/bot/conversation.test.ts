import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Conversation } from '../../src/bot/conversation.ts';
import { ACTION, type Reply, type ReplyAction } from '../../src/bot/reply.ts';
import { type OpenedService, openService } from '../../src/main.ts';
import { NOW, writeTestWorkspace } from './support.ts';

let opened: OpenedService;
let chat: Conversation;
beforeAll(async () => {
  opened = await openService(writeTestWorkspace(), { now: () => NOW, database: ':memory:', pool: false });
  chat = new Conversation(opened.service);
});
afterAll(() => opened.close());

const actions = (r: Reply): ReplyAction[] =>
  r.blocks.flatMap((b) => (b.kind === 'actions' ? [...b.actions] : []));

describe('conversation', () => {
  it('offers relaxations as buttons, and a click asks again with that change', async () => {
    const ines = opened.service.person('ines')!;
    const none = await chat.command(ines, 'meet 8h with @teo tomorrow', NOW);
    expect(none.summary).toBe('Nothing fits for 8 h with Ines, Teo');
    const relax = actions(none).filter((a) => a.id === ACTION.tryRelaxation);
    expect(relax.length).toBeGreaterThan(0);
    const shorten = relax.find((a) => a.label.startsWith('shorten to 60 minutes'))!;
    const retry = await chat.action(ines, shorten.id, shorten.value, NOW);
    expect(retry.summary).toMatch(/^\d option\(s\) for 1 h with Ines, Teo$/);
  });

  it('explains why with the blockers of the last request, per person', async () => {
    const teo = opened.service.person('teo')!;
    expect((await chat.command(teo, 'why', NOW)).summary).toBe(
      "You have not asked for a meeting yet. Try 'meet 30m with @someone'.",
    );
    const ines = opened.service.person('ines')!;
    expect((await chat.command(ines, 'why', NOW)).summary).toMatch(
      /^Your last request \(1 h with Ines, Teo\) had \d option\(s\); nothing blocked it\.$/,
    );
  });

  it('names unreadable parts and changes nothing', async () => {
    const ines = opened.service.person('ines')!;
    const r = await chat.command(ines, 'meet 30m with @teo someday', NOW);
    expect(r.summary).toBe(
      "I could not read all of that. Nothing was changed. I could not read 'someday'; see 'help meet' for what a request can say",
    );
  });
});
