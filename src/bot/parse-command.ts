import { Temporal } from 'temporal-polyfill';
import type { Issue, Result } from '../errors.ts';

/** A person named in chat: a platform mention (`<@U123>`) or a typed handle (`@maren`). */
export interface Handle {
  readonly kind: 'chat' | 'name';
  /** Chat user id for `chat`, the typed word (without `@`) for `name`. */
  readonly id: string;
}

/** Inclusive range of calendar dates `YYYY-MM-DD` in the asker's zone. */
export interface DateWindow {
  readonly from: string;
  readonly to: string;
}

/** What a meeting request typed in chat asks for. */
export interface MeetIntent {
  readonly verb: 'meet';
  readonly lengthMinutes: number;
  readonly required: readonly Handle[];
  readonly optional: readonly Handle[];
  /** Absent: the workspace's default horizon. */
  readonly window?: DateWindow;
  /** Seats needed in a room; absent: no room. */
  readonly roomFor?: number;
  /** Room features asked for ("screen"); checked against the workspace later, not here. */
  readonly features: readonly string[];
}

/** One chat command, parsed. */
export type ChatIntent =
  | MeetIntent
  | { readonly verb: 'rule'; readonly text: string }
  | { readonly verb: 'rules' }
  | { readonly verb: 'forget'; readonly ruleId: string }
  | { readonly verb: 'feed'; readonly url: string }
  | { readonly verb: 'feeds' }
  | { readonly verb: 'series'; readonly text: string }
  | { readonly verb: 'week'; readonly weekOf?: string }
  | { readonly verb: 'why' }
  | { readonly verb: 'help'; readonly topic?: string };

/** Verbs the chat understands, in the order help lists them. */
export const CHAT_VERBS = [
  'meet',
  'rule',
  'rules',
  'forget',
  'feed',
  'feeds',
  'series',
  'week',
  'why',
  'help',
] as const;

/** What relative words ("tomorrow", "next week") are measured from. */
export interface ParseContext {
  /** Today's date `YYYY-MM-DD` in the asker's zone. */
  readonly today: string;
}

const DATE = /^\d{4}-\d{2}-\d{2}$/;
const MENTION = /^<@([A-Z0-9]+)(?:\|[^>]*)?>$/;
const TYPED = /^@([A-Za-z0-9._-]+)$/;
const MAX_MEETING_MINUTES = 8 * 60;

/** Parses the text after `/slot` (or after the bot's mention). Unreadable parts are named, never guessed. */
export function parseChatCommand(text: string, context: ParseContext): Result<ChatIntent> {
  const trimmed = text.trim();
  const space = trimmed.search(/\s/);
  const verb = (space < 0 ? trimmed : trimmed.slice(0, space)).toLowerCase();
  const rest = space < 0 ? '' : trimmed.slice(space + 1).trim();
  switch (verb) {
    case '':
    case 'help':
      return ok(rest === '' ? { verb: 'help' } : { verb: 'help', topic: rest.toLowerCase() });
    case 'meet':
      return parseMeet(rest, context);
    case 'rule':
      return rest === ''
        ? bad('rule_missing', ['text'], "say the rule after 'rule', e.g. 'rule no meetings before 10:00'")
        : ok({ verb: 'rule', text: rest });
    case 'rules':
      return noArgs(rest, { verb: 'rules' });
    case 'forget':
      return /^\S+$/.test(rest)
        ? ok({ verb: 'forget', ruleId: rest })
        : bad(
            'rule_id_missing',
            ['ruleId'],
            "say which rule to forget by its id, e.g. 'forget r1' (see 'rules')",
          );
    case 'feed':
      return /^\S+$/.test(rest)
        ? ok({ verb: 'feed', url: rest.replace(/^<(.*)>$/, '$1').split('|')[0]! })
        : bad(
            'feed_missing',
            ['url'],
            "give one calendar feed address after 'feed', e.g. 'feed https://…/me.ics'",
          );
    case 'feeds':
      return noArgs(rest, { verb: 'feeds' });
    case 'series':
      return ok({ verb: 'series', text: rest });
    case 'week': {
      if (rest === '' || rest.toLowerCase() === 'next') return ok({ verb: 'week' });
      const date = rest.replace(/^of\s+/, '');
      if (/^\d{4}-W(0[1-9]|[1-4]\d|5[0-3])$/i.test(date))
        return ok({ verb: 'week', weekOf: date.toUpperCase() });
      return DATE.test(date) && validDate(date)
        ? ok({ verb: 'week', weekOf: date })
        : bad(
            'date_unreadable',
            ['weekOf'],
            `'${rest}' is not a week; write 'next', an ISO week such as 2026-W50, or a date such as 2026-12-07`,
          );
    }
    case 'why':
      return noArgs(rest, { verb: 'why' });
    default:
      return bad(
        'verb_unknown',
        ['verb'],
        `'${verb}' is not something I know; try one of: ${CHAT_VERBS.join(', ')} (or 'help')`,
      );
  }
}

function parseMeet(rest: string, context: ParseContext): Result<ChatIntent> {
  const tokens = rest.split(/\s+/).filter((t) => t !== '');
  const issues: Issue[] = [];
  const required: Handle[] = [];
  const optional: Handle[] = [];
  const features: string[] = [];
  let window: DateWindow | undefined;
  let roomFor: number | undefined;

  const first = tokens[0];
  const lengthMinutes = first === undefined ? undefined : parseLength(first);
  if (lengthMinutes === undefined) {
    issues.push({
      code: 'length_unreadable',
      path: ['length'],
      message:
        first === undefined
          ? "say how long, e.g. 'meet 45m with @ana @bo'"
          : `'${first}' is not a meeting length; write e.g. 30m, 1h or 1h30m (up to 8h)`,
    });
  }
  const setWindow = (w: DateWindow, at: number): void => {
    if (window !== undefined) {
      issues.push({ code: 'window_twice', path: ['window', at], message: 'give only one time range' });
    }
    window = w;
  };

  let i = lengthMinutes === undefined ? 0 : 1;
  while (i < tokens.length) {
    const t = tokens[i]!;
    const lower = t.toLowerCase();
    const next = tokens[i + 1]?.toLowerCase();
    if (lower === 'with' || lower === 'optional' || lower === 'and') {
      const target = lower === 'optional' ? optional : required;
      let j = i + 1;
      while (j < tokens.length && handleOf(tokens[j]!) !== undefined) {
        target.push(handleOf(tokens[j]!)!);
        j++;
      }
      if (j > i + 1) {
        i = j;
        continue;
      }
      if (lower === 'with' && next !== undefined && /^[a-z][a-z-]*$/.test(next)) {
        // "with screen" or "with screen and phone": room features, read word by word.
        j = i + 1;
        const word = /^[a-z][a-z-]*,?$/i;
        while (j < tokens.length && word.test(tokens[j]!)) {
          const t = tokens[j]!;
          features.push(t.toLowerCase().replace(/,$/, ''));
          j++;
          if (t.endsWith(',')) continue;
          if (tokens[j]?.toLowerCase() === 'and' && word.test(tokens[j + 1] ?? '')) {
            j++;
            continue;
          }
          break;
        }
        i = j;
        continue;
      }
      issues.push({
        code: 'people_missing',
        path: ['text', i],
        message: `'${t}' must be followed by people, e.g. '${lower} @ana'`,
      });
      i++;
      continue;
    }
    const h = handleOf(t);
    if (h !== undefined) {
      required.push(h);
      i++;
      continue;
    }
    if (lower === 'today' || lower === 'tomorrow') {
      const d = lower === 'today' ? context.today : addDays(context.today, 1);
      setWindow({ from: d, to: d }, i);
      i++;
      continue;
    }
    if ((lower === 'next' || lower === 'this') && next === 'week') {
      const monday = addDays(context.today, 1 - weekday(context.today) + (lower === 'next' ? 7 : 0));
      const from = lower === 'this' && context.today > monday ? context.today : monday;
      setWindow({ from, to: addDays(monday, 6) }, i);
      i += 2;
      continue;
    }
    if (lower === 'on' && next !== undefined) {
      const d = readDate(tokens[i + 1]!, i + 1, issues);
      if (d !== undefined) setWindow({ from: d, to: d }, i);
      i += 2;
      continue;
    }
    if (lower === 'between' && tokens[i + 2]?.toLowerCase() === 'and' && tokens[i + 3] !== undefined) {
      const a = readDate(tokens[i + 1]!, i + 1, issues);
      const b = readDate(tokens[i + 3]!, i + 3, issues);
      if (a !== undefined && b !== undefined) {
        if (b < a) {
          issues.push({
            code: 'window_reversed',
            path: ['window', i],
            message: `${b} is before ${a}; put the earlier date first`,
          });
        } else setWindow({ from: a, to: b }, i);
      }
      i += 4;
      continue;
    }
    if (lower === 'room' && next === 'for' && tokens[i + 2] !== undefined) {
      const n = tokens[i + 2]!;
      if (/^\d{1,4}$/.test(n) && Number(n) >= 1) roomFor = Number(n);
      else
        issues.push({
          code: 'seats_unreadable',
          path: ['roomFor'],
          message: `'${n}' is not a number of seats; write e.g. 'room for 6'`,
        });
      i += 3;
      if (tokens[i]?.toLowerCase() === 'people') i++;
      continue;
    }
    issues.push({
      code: 'part_unreadable',
      path: ['text', i],
      message: `I could not read '${t}'; see 'help meet' for what a request can say`,
    });
    i++;
  }
  if (required.length === 0 && issues.every((x) => x.code !== 'people_missing')) {
    issues.push({
      code: 'people_missing',
      path: ['required'],
      message: "say who should attend, e.g. 'with @ana @bo'",
    });
  }
  if (issues.length > 0 || lengthMinutes === undefined) return { ok: false, issues };
  const intent: MeetIntent = {
    verb: 'meet',
    lengthMinutes,
    required: dedupe(required),
    optional: dedupe(optional).filter((o) => !required.some((r) => r.kind === o.kind && r.id === o.id)),
    features: [...new Set(features)],
    ...(window === undefined ? {} : { window }),
    ...(roomFor === undefined ? {} : { roomFor }),
  };
  return ok(intent);
}

/** Reads "45m", "1h", "1h30m", "90min"; undefined when it is not a length of 5 minutes to 8 hours. */
export function parseLength(token: string): number | undefined {
  const m = /^(?:(\d{1,2})h)?(?:(\d{1,3})(?:m|min))?$/i.exec(token);
  if (m === null || (m[1] === undefined && m[2] === undefined)) return undefined;
  const minutes = Number(m[1] ?? 0) * 60 + Number(m[2] ?? 0);
  return minutes >= 5 && minutes <= MAX_MEETING_MINUTES ? minutes : undefined;
}

function handleOf(token: string): Handle | undefined {
  const clean = token.replace(/,$/, '');
  const m = MENTION.exec(clean);
  if (m !== null) return { kind: 'chat', id: m[1]! };
  const t = TYPED.exec(clean);
  if (t !== null)
    return /^U[A-Z0-9]{6,}$/.test(t[1]!) ? { kind: 'chat', id: t[1]! } : { kind: 'name', id: t[1]! };
  return undefined;
}

function readDate(token: string, at: number, issues: Issue[]): string | undefined {
  if (DATE.test(token) && validDate(token)) return token;
  issues.push({
    code: 'date_unreadable',
    path: ['text', at],
    message: `'${token}' is not a date; write it as YYYY-MM-DD, e.g. 2026-12-08`,
  });
  return undefined;
}

function validDate(s: string): boolean {
  try {
    return Temporal.PlainDate.from(s, { overflow: 'reject' }).toString() === s;
  } catch {
    return false;
  }
}

function addDays(date: string, days: number): string {
  return Temporal.PlainDate.from(date).add({ days }).toString();
}

function weekday(date: string): number {
  return Temporal.PlainDate.from(date).dayOfWeek;
}

function dedupe(hs: readonly Handle[]): Handle[] {
  const seen = new Set<string>();
  return hs.filter((h) => {
    const k = `${h.kind}:${h.id}`;
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
}

function noArgs(rest: string, intent: ChatIntent): Result<ChatIntent> {
  return rest === ''
    ? ok(intent)
    : bad('part_unreadable', ['text'], `'${intent.verb}' takes nothing after it; I could not read '${rest}'`);
}

function ok(value: ChatIntent): Result<ChatIntent> {
  return { ok: true, value };
}

function bad(code: string, path: (string | number)[], message: string): Result<ChatIntent> {
  return { ok: false, issues: [{ code, path, message }] };
}
