/**
 * The neutral reply model: handlers build these, and one renderer turns them into Block Kit while
 * another turns them into terminal text. Nothing here knows about either surface.
 */

/** A piece of inline text; times and people are kept as data so each surface can render them. */
export type Span =
  | string
  | { readonly kind: 'time'; readonly start: number; readonly end?: number }
  | { readonly kind: 'person'; readonly name: string; readonly chatId?: string }
  | { readonly kind: 'code'; readonly text: string }
  | { readonly kind: 'strong'; readonly text: string };

/** A button in chat, a numbered choice in the terminal. */
export interface ReplyAction {
  /** One of the ACTION ids; tells the handler what to do. */
  readonly id: string;
  readonly label: string;
  /** Opaque payload handed back when chosen (at most 2000 characters, the platform's limit). */
  readonly value: string;
  readonly style?: 'primary' | 'danger';
}

/** One block of a reply. */
export type ReplyBlock =
  | { readonly kind: 'heading'; readonly text: string }
  | { readonly kind: 'text'; readonly spans: readonly Span[] }
  | { readonly kind: 'list'; readonly items: readonly (readonly Span[])[] }
  | { readonly kind: 'note'; readonly spans: readonly Span[] }
  | { readonly kind: 'actions'; readonly actions: readonly ReplyAction[] }
  | { readonly kind: 'divider' };

/** A whole reply: a one-line summary for notifications plus its blocks. */
export interface Reply {
  /** Plain one-line summary (notification text and screen-reader fallback). */
  readonly summary: string;
  readonly blocks: readonly ReplyBlock[];
  /** Shown only to the asker where the surface allows it. @default false */
  readonly private?: boolean;
}

/** Ids of every button the bot sends. */
export const ACTION = {
  bookOption: 'slot_book_option',
  holdOption: 'slot_hold_option',
  cancelBooking: 'slot_cancel_booking',
  confirmRule: 'slot_confirm_rule',
  tryRelaxation: 'slot_try_relaxation',
  openRequest: 'slot_open_request',
  lockWeek: 'slot_lock_week',
} as const;

/** Callback id of the new-request modal. */
export const NEW_REQUEST_VIEW = 'slot_new_request';

/** Plain text of spans without any surface formatting (times as UTC ISO), for summaries and logs. */
export function plainText(spans: readonly Span[]): string {
  return spans
    .map((s) => {
      if (typeof s === 'string') return s;
      if (s.kind === 'time') return new Date(s.start).toISOString();
      if (s.kind === 'person') return s.name;
      return s.text;
    })
    .join('');
}

/** A reply holding one line of text. */
export function textReply(summary: string, spans: readonly Span[] = [summary]): Reply {
  return { summary, blocks: [{ kind: 'text', spans }] };
}
