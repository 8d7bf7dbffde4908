import { randomUUID } from 'node:crypto';
import { createInterface } from 'node:readline';
import type { Readable } from 'node:stream';
import type { ServicePerson } from '../app/service.ts';
import { normalizeError } from '../errors.ts';
import { type Conversation, isSlow, workingReply } from './conversation.ts';
import { userMessage } from './messages.ts';
import { renderText } from './render-text.ts';
import type { ReplyAction } from './reply.ts';

/** What the terminal console reads from and writes to. */
export interface ConsoleOptions {
  readonly conversation: Conversation;
  /** The person typing. */
  readonly actor: ServicePerson;
  /** One command per line; the console ends at end of input. */
  readonly input: Readable;
  readonly out: (text: string) => void;
  /** Prompts and "working" notes are printed only on a terminal. @default false */
  readonly isTty?: boolean;
  /** Current instant in epoch ms. */
  readonly now: () => number;
  /** Logs errors for the operator (code and message). @default no logging */
  readonly log?: (text: string) => void;
}

/**
 * A chat in the terminal using the same conversation as the chat platform. Buttons become numbered
 * choices: typing the number is the click. A choice is carried out once, however often it is typed,
 * as a repeated click is in chat.
 */
export async function runConsole(options: ConsoleOptions): Promise<number> {
  const { conversation, actor, out, now } = options;
  const tty = options.isTty ?? false;
  const service = conversation.service;
  // Delivery keys of this session must not collide with another session's in a shared store.
  const sessionId = randomUUID();
  // Choices are numbered across the whole session and never reused, so typing a number twice means
  // the same button twice (done once), never some other button of a newer reply.
  const choices = new Map<number, ReplyAction>();
  let nextChoice = 1;

  const show = (reply: Parameters<typeof renderText>[0]): void => {
    const r = renderText(reply, actor.zone, nextChoice);
    r.choices.forEach((c, i) => {
      choices.set(nextChoice + i, c);
    });
    nextChoice += r.choices.length;
    out(r.text);
  };

  out(
    `slotwright console · ${service.workspaceName} · you are ${actor.name} (@${actor.id}, ${actor.zone}). Type 'help' for what I can do${tty ? ", 'quit' to leave" : ''}.`,
  );
  const rl = createInterface({ input: options.input, terminal: false, crlfDelay: Number.POSITIVE_INFINITY });
  const prompt = (): void => {
    if (tty) process.stdout.write('> ');
  };
  prompt();
  for await (const raw of rl) {
    const line = raw.trim().replace(/^\/slot\s+/, '');
    if (line === '' || line.startsWith('#')) {
      prompt();
      continue;
    }
    if (line === 'quit' || line === 'exit') break;
    try {
      if (/^\d+$/.test(line)) {
        const n = Number(line);
        const choice = choices.get(n);
        if (choice === undefined) {
          out(
            choices.size === 0
              ? 'There is nothing to choose right now.'
              : `There is no choice ${n}; type one of the numbers shown in [brackets].`,
          );
        } else if (!(await service.claimDelivery(`console:${sessionId}:${n}`, now()))) {
          out(`Choice ${n} was already carried out.`);
        } else {
          out(`> ${choice.label}`);
          show(await conversation.action(actor, choice.id, choice.value, now()));
        }
      } else {
        const parsed = conversation.parse(actor, line, now());
        if (parsed.ok && tty && isSlow(parsed.value))
          out(renderText(workingReply(parsed.value), actor.zone).text);
        show(await conversation.command(actor, line, now()));
      }
    } catch (error) {
      const e = normalizeError(error);
      options.log?.(`console: ${e.code}: ${e.message}`);
      out(`${userMessage(e)} [${e.code}]`);
    }
    prompt();
  }
  rl.close();
  return 0;
}
