import { Temporal } from 'temporal-polyfill';
import type { Reply, ReplyAction, Span } from './reply.ts';

/** A reply as terminal text plus the numbered choices its buttons became. */
export interface TextRendering {
  readonly text: string;
  /** Choice n (1-based) is `choices[n - 1]`. */
  readonly choices: readonly ReplyAction[];
}

const WEEKDAYS = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'] as const;

/** Formats an instant on the viewer's wall clock, e.g. `Tue 2026-12-08 14:00`. */
export function formatLocal(ms: number, zone: string): string {
  const z = Temporal.Instant.fromEpochMilliseconds(ms).toZonedDateTimeISO(zone);
  const hh = String(z.hour).padStart(2, '0');
  const mm = String(z.minute).padStart(2, '0');
  return `${WEEKDAYS[z.dayOfWeek - 1]} ${z.toPlainDate().toString()} ${hh}:${mm}`;
}

function span(s: Span, zone: string): string {
  if (typeof s === 'string') return s;
  switch (s.kind) {
    case 'time': {
      if (s.end === undefined) return formatLocal(s.start, zone);
      const end = formatLocal(s.end, zone);
      const sameDay = end.slice(0, 14) === formatLocal(s.start, zone).slice(0, 14);
      return `${formatLocal(s.start, zone)}–${sameDay ? end.slice(15) : end}`;
    }
    case 'person':
      return s.name;
    case 'code':
      return s.text;
    case 'strong':
      return s.text;
  }
}

/**
 * Renders a reply for the terminal in the viewer's zone. Buttons become numbered choices, counted
 * from `firstChoice` so a reader can type the number.
 */
export function renderText(reply: Reply, zone: string, firstChoice = 1): TextRendering {
  const lines: string[] = [];
  const choices: ReplyAction[] = [];
  const line = (spans: readonly Span[]): string => spans.map((s) => span(s, zone)).join('');
  for (const b of reply.blocks) {
    switch (b.kind) {
      case 'heading':
        lines.push(b.text);
        break;
      case 'text':
        lines.push(line(b.spans));
        break;
      case 'list':
        for (const item of b.items) lines.push(`  - ${line(item)}`);
        break;
      case 'note':
        lines.push(`  (${line(b.spans)})`);
        break;
      case 'actions':
        for (const a of b.actions) {
          choices.push(a);
          lines.push(`  [${firstChoice + choices.length - 1}] ${a.label}`);
        }
        break;
      case 'divider':
        lines.push('');
        break;
    }
  }
  return { text: lines.join('\n'), choices };
}
