import type { Reply, ReplyAction, Span } from './reply.ts';

/** A Block Kit block as the Web API takes it (kept loose: only our renderer builds these). */
export type BlockKitBlock = Readonly<Record<string, unknown>>;

/** A message ready for chat.postMessage / chat.update / response_url. */
export interface BlockKitMessage {
  readonly text: string;
  readonly blocks: readonly BlockKitBlock[];
}

/** Escapes the three characters mrkdwn treats as control characters. */
export function escapeMrkdwn(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

function utcFallback(ms: number): string {
  return `${new Date(ms).toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

/**
 * A date token the client renders in the viewer's own zone; the text after `|` is shown where the
 * client cannot render it.
 */
export function dateToken(ms: number, format: string): string {
  return `<!date^${Math.floor(ms / 1000)}^${format}|${utcFallback(ms)}>`;
}

function span(s: Span): string {
  if (typeof s === 'string') return escapeMrkdwn(s);
  switch (s.kind) {
    case 'time':
      return s.end === undefined
        ? dateToken(s.start, '{date_short_pretty} {time}')
        : `${dateToken(s.start, '{date_short_pretty} {time}')}–${dateToken(s.end, '{time}')}`;
    case 'person':
      return s.chatId === undefined ? escapeMrkdwn(s.name) : `<@${s.chatId}>`;
    case 'code':
      return `\`${escapeMrkdwn(s.text)}\``;
    case 'strong':
      return `*${escapeMrkdwn(s.text)}*`;
  }
}

function mrkdwn(spans: readonly Span[]): string {
  return spans.map(span).join('');
}

function button(a: ReplyAction, n: number): BlockKitBlock {
  return {
    type: 'button',
    // action_id must be unique within a block, so buttons of one kind carry their position.
    action_id: `${a.id}:${n}`,
    text: { type: 'plain_text', text: a.label.slice(0, 75), emoji: false },
    value: a.value,
    ...(a.style === undefined ? {} : { style: a.style }),
  };
}

/** Renders a reply as Block Kit. Section text is capped at the platform's 3000 characters. */
export function renderBlockKit(reply: Reply): BlockKitMessage {
  const blocks: BlockKitBlock[] = [];
  for (const b of reply.blocks) {
    switch (b.kind) {
      case 'heading':
        blocks.push({ type: 'header', text: { type: 'plain_text', text: b.text.slice(0, 150) } });
        break;
      case 'text':
        blocks.push({ type: 'section', text: { type: 'mrkdwn', text: mrkdwn(b.spans).slice(0, 3000) } });
        break;
      case 'list':
        blocks.push({
          type: 'section',
          text: {
            type: 'mrkdwn',
            text: b.items
              .map((i) => `• ${mrkdwn(i)}`)
              .join('\n')
              .slice(0, 3000),
          },
        });
        break;
      case 'note':
        blocks.push({
          type: 'context',
          elements: [{ type: 'mrkdwn', text: mrkdwn(b.spans).slice(0, 3000) }],
        });
        break;
      case 'actions':
        if (b.actions.length > 0)
          blocks.push({ type: 'actions', elements: b.actions.slice(0, 25).map((a, n) => button(a, n)) });
        break;
      case 'divider':
        blocks.push({ type: 'divider' });
        break;
    }
  }
  return { text: reply.summary, blocks };
}

/** The kind of action a Block Kit action_id stands for (drops the position suffix). */
export function actionKind(actionId: string): string {
  const colon = actionId.indexOf(':');
  return colon < 0 ? actionId : actionId.slice(0, colon);
}
