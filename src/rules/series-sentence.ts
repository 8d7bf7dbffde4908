import type { Issue, Result } from '../errors.ts';
import { addDays, instantToZoned, weekdayOf } from '../time/zoned.ts';
import { formatDuration } from './describe-rule.ts';
import { type DayParts, DEFAULT_DAY_PARTS } from './rule.ts';
import {
  CLOCK_PATTERN,
  clockText,
  LENGTH_PATTERN,
  NUMBER_PATTERN,
  numberWord,
  PART_OF_DAY_WORDS,
  readClock,
  readLength,
  WEEKDAY_NAMES,
  WEEKDAY_PATTERN,
  type WeekdayName,
  WORKING_WEEK,
  weekdayWord,
} from './series-sentence-words.ts';
import { CITY_ZONES, canonicalZone } from './zone-names.ts';

/** Room needs of a series: seats (the attendee count when absent) and equipment. */
export interface SeriesRoomDraft {
  readonly seats?: number;
  readonly features: readonly string[];
}

/**
 * A series as read from a sentence, field for field the `series:` entry of a workspace
 * (src/config/series-schema.ts validates it at the edge; this layer may not import config).
 */
export interface SeriesDraft {
  readonly id: string;
  readonly name: string;
  /** Person ids and group ids. */
  readonly attendees: readonly string[];
  /** Length of each session in minutes. */
  readonly minutes: number;
  /** Sessions per week. */
  readonly sessions: number;
  /** Distinct days the sessions should spread over; the schema's default (`sessions`) when absent. */
  readonly minDays?: number;
  readonly days?: readonly WeekdayName[];
  readonly preferredDays?: readonly WeekdayName[];
  /** Local hour ranges "HH:MM-HH:MM" a session must lie in. */
  readonly hours?: readonly string[];
  readonly preferredHours?: readonly string[];
  /** Zone of the hour ranges. */
  readonly zone?: string;
  readonly room?: SeriesRoomDraft;
  readonly weights?: { readonly preferredDays?: number; readonly preferredHours?: number };
}

/** A person the sentence may mention. */
export interface SeriesPerson {
  readonly id: string;
  readonly name?: string;
  /** Chat user id, as in a `<@U0123>` mention. */
  readonly chat?: string;
}

/** A group the sentence may mention with `@group-id`. */
export interface SeriesGroup {
  readonly id: string;
  readonly members: readonly string[];
}

/** A room of the workspace; only its equipment words are used. */
export interface SeriesRoom {
  readonly id: string;
  readonly name?: string;
  readonly features: readonly string[];
}

/** Options of `parseSeriesSentence`. */
export interface SeriesSentenceOptions {
  /** The moment the sentence was said, UTC epoch ms (for "starting next week"). */
  readonly now: number;
  /** The speaker's IANA zone: hours in the sentence are read on this clock unless it names another. */
  readonly zone: string;
  readonly people: readonly SeriesPerson[];
  /** @default [] */
  readonly groups?: readonly SeriesGroup[];
  /** @default [] */
  readonly rooms?: readonly SeriesRoom[];
  /** Ids already taken by other series; a new id gets a numeric suffix. @default [] */
  readonly existingIds?: readonly string[];
  /** Clock bands of "mornings", "afternoons", "evenings". @default DEFAULT_DAY_PARTS */
  readonly dayParts?: DayParts;
}

/** What a series sentence says: the series, an echo in our words, and the first week when given. */
export interface ParsedSeries {
  readonly series: SeriesDraft;
  /** Normalized restatement for the person to confirm. */
  readonly echo: string;
  /** Monday (`YYYY-MM-DD`, speaker's zone) of the first week, when the sentence names one. */
  readonly startsOn?: string;
}

/** Weight put on a preference said with "strongly" or "really" (three times the workspace default of 2). */
const STRONG_WEIGHT = 6;

const PREFERENCE_RE =
  /\b(if possible|where possible|when possible|if we can|ideally|preferably|preferred|prefer(?:ring)?|would be nice|would like|nice to have|strongly prefer(?:red)?|really prefer)\b/g;
const HARD_RE = /\b(only|must|has to|have to|always|strictly)\b/g;
const STRONG_RE = /\b(strongly|really)\b/;
// Words that carry no meaning of their own once the parts around them are read.
const FILLERS = new Set([
  'with',
  'and',
  'or',
  'a',
  'an',
  'the',
  'each',
  'for',
  'of',
  'in',
  'on',
  'at',
  'to',
  'per',
  'session',
  'sessions',
  'meeting',
  'meetings',
  'long',
  'plus',
  'please',
  'also',
  'all',
  'be',
  'is',
  'it',
  'should',
  'we',
  'us',
  'need',
  'needs',
  'people',
  'time',
  'times',
  'but',
  'that',
  'are',
  'is',
  'days',
]);
const LEAD_RE =
  /^\s*(?:please\s+)?(?:(?:set up|create|add|schedule|plan|start|make|new)\s+)?(?:(?:a|an|the|new)\s+)*(?:recurring\s+)?(?:series\s+)?(?:(?:called|named)\s+)?/i;

interface Span {
  readonly start: number;
  readonly end: number;
}

interface DayPhrase {
  readonly kind: 'every' | 'on' | 'not';
  readonly days: readonly WeekdayName[];
  readonly clause: number;
  readonly at: number;
}

interface HourPhrase {
  readonly kind: 'range' | 'at';
  readonly start: number;
  readonly end: number;
  readonly clause: number;
  readonly at: number;
}

class Reader {
  readonly text: string;
  readonly lower: string;
  readonly used: boolean[];
  readonly issues: Issue[] = [];
  readonly clauseStarts: number[];

  constructor(text: string) {
    this.text = text.normalize('NFC');
    const lower = this.text.toLowerCase();
    // Lower-casing may change the length of rare letters; then read the lower-cased text throughout.
    this.lower = lower;
    if (lower.length !== this.text.length) this.text = lower;
    this.used = new Array<boolean>(this.lower.length).fill(false);
    this.clauseStarts = [0];
    for (const m of this.lower.matchAll(/[,;]|\bbut\b/g)) this.clauseStarts.push(m.index + m[0].length);
  }

  clauseOf(at: number): number {
    let c = 0;
    for (let i = 0; i < this.clauseStarts.length; i++) if (this.clauseStarts[i]! <= at) c = i;
    return c;
  }

  free(span: Span): boolean {
    for (let i = span.start; i < span.end; i++) if (this.used[i]) return false;
    return true;
  }

  mark(span: Span): void {
    for (let i = span.start; i < span.end; i++) this.used[i] = true;
  }

  /** Runs `fn` on each match of `re` that touches no part already read; marks it read when `fn` says so. */
  take(re: RegExp, fn: (m: RegExpMatchArray, span: Span) => boolean): void {
    const global = new RegExp(re.source, re.flags.includes('g') ? re.flags : `${re.flags}g`);
    for (const m of this.lower.matchAll(global)) {
      const span = { start: m.index, end: m.index + m[0].length };
      if (span.end > span.start && this.free(span) && fn(m, span)) this.mark(span);
    }
  }

  unreadable(at: number, message: string): void {
    this.issues.push({ code: 'series_unreadable', path: ['text', at], message });
  }

  ask(at: number, message: string): void {
    this.issues.push({ code: 'series_ambiguous', path: ['text', at], message });
  }
}

function slug(name: string): string {
  const s = name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 40)
    .replace(/-+$/, '');
  return s === '' ? 'series' : s;
}

function uniqueId(base: string, taken: readonly string[]): string {
  if (!taken.includes(base)) return base;
  for (let n = 2; ; n++) if (!taken.includes(`${base}-${n}`)) return `${base}-${n}`;
}

function dayList(text: string): WeekdayName[] {
  const out: WeekdayName[] = [];
  for (const w of text.split(/[^a-z.]+/)) {
    const d = weekdayWord(w);
    if (d !== undefined && !out.includes(d)) out.push(d);
  }
  return out.sort((a, b) => WEEKDAY_NAMES.indexOf(a) - WEEKDAY_NAMES.indexOf(b));
}

function zoneNamed(words: string): string | undefined {
  const w = words.trim().toLowerCase().replace(/\s+/g, ' ');
  // City names as the rules module knows them, else any IANA name ("America/Halifax").
  return CITY_ZONES[w] ?? (w.includes('/') || w === 'utc' ? canonicalZone(w) : undefined);
}

const LIST_SEP = String.raw`(?:\s*,\s*|\s*&\s*|\s+and\s+|\s+or\s+|\s*/\s*|\s+)`;
const DAYS = String.raw`(?:${WEEKDAY_PATTERN})\.?(?:${LIST_SEP}(?:${WEEKDAY_PATTERN})\.?)*`;
const FREQ_WORD = String.raw`once|twice|thrice|(?:${NUMBER_PATTERN})\s*(?:x|times?)`;

/**
 * Reads a series said in plain words ("team sync 45m twice a week with @ana @bo @cy on different
 * days, room for 4, mornings if possible") into the series structure, with an echo to confirm.
 * Parts it cannot read are named in `series_unreadable` issues and unclear ones become
 * `series_ambiguous` questions; nothing is guessed.
 */
export function parseSeriesSentence(text: string, options: SeriesSentenceOptions): Result<ParsedSeries> {
  const r = new Reader(text);
  const groups = options.groups ?? [];
  const rooms = options.rooms ?? [];
  const dayParts = options.dayParts ?? DEFAULT_DAY_PARTS;

  let quotedName: string | undefined;
  r.take(/["“‘]([^"”’]{1,80})["”’]/, (_m, span) => {
    if (quotedName !== undefined) return false;
    quotedName = r.text.slice(span.start + 1, span.end - 1).trim();
    return true;
  });

  // First week.
  let startsOn: string | undefined;
  const today = instantToZoned(options.now, options.zone);
  const mondayOf = (date: string) => addDays(date, 1 - weekdayOf(date));
  r.take(
    /\b(?:starting|from|beginning)\s+(?:on\s+)?(?:(this week|next week)|in\s+(\d+|two|three|four)\s+weeks|(\d{4}-\d{2}-\d{2}))\b/,
    (m, span) => {
      if (m[1] === 'this week') startsOn = mondayOf(today.date);
      else if (m[1] === 'next week') startsOn = addDays(mondayOf(today.date), 7);
      else if (m[2] !== undefined) startsOn = addDays(mondayOf(today.date), 7 * (numberWord(m[2]) ?? 0));
      else {
        const d = m[3]!;
        if (Number.isNaN(Date.parse(`${d}T00:00:00Z`))) {
          r.unreadable(span.start, `'${d}' is not a calendar date`);
          return true;
        }
        startsOn = mondayOf(d);
        if (startsOn < mondayOf(today.date))
          r.unreadable(span.start, `${d} is in a past week; give a date from this week on`);
      }
      return true;
    },
  );

  // Attendees: chat mentions, @ids, and plain names after "with".
  const attendees: string[] = [];
  let attendeeIssue = false;
  const attendeeProblem = (at: number, message: string, ask: boolean) => {
    attendeeIssue = true;
    if (ask) r.ask(at, message);
    else r.unreadable(at, message);
  };
  const addAttendee = (id: string) => {
    if (!attendees.includes(id)) attendees.push(id);
  };
  r.take(/<@([a-z0-9]+)(?:\|[^>]*)?>/, (m, span) => {
    const chat = m[1]!;
    const person = options.people.find((p) => p.chat?.toLowerCase() === chat);
    if (person === undefined) {
      attendeeProblem(span.start, `no person in the workspace has chat id ${chat.toUpperCase()}`, false);
    } else addAttendee(person.id);
    return true;
  });
  r.take(/@([a-z0-9][a-z0-9._-]*[a-z0-9]|[a-z0-9])/, (m, span) => {
    const handle = m[1]!;
    const person = options.people.find((p) => p.id.toLowerCase() === handle);
    const group = groups.find((g) => g.id.toLowerCase() === handle);
    if (person !== undefined && group !== undefined) {
      attendeeProblem(span.start, `@${handle} is both a person and a group; which one is meant?`, true);
    } else if (person !== undefined) addAttendee(person.id);
    else if (group !== undefined) addAttendee(group.id);
    else attendeeProblem(span.start, `@${handle} is neither a person nor a group of this workspace`, false);
    return true;
  });
  r.take(/\bwith\s+((?:[a-z][a-z'-]*(?:\s*,\s*|\s+and\s+|\s*&\s*|\s+))*[a-z][a-z'-]*)/, (m, span) => {
    // Plain names are read one by one from the start of the list and stop at the first other word.
    const words = [...m[1]!.matchAll(/[a-z][a-z'-]*/g)];
    let end = span.start + m[0].indexOf(m[1]!);
    let read = 0;
    for (const w of words) {
      const word = w[0];
      if (word === 'and') continue;
      const matches = options.people.filter(
        (p) => p.id.toLowerCase() === word || p.name?.toLowerCase().split(/\s+/)[0] === word,
      );
      const group = groups.find((g) => g.id.toLowerCase() === word);
      const at = span.start + m[0].indexOf(m[1]!) + w.index;
      if (matches.length > 1) {
        attendeeProblem(
          at,
          `'${word}' could be ${matches.map((p) => `@${p.id}`).join(' or ')}; mention the one you mean`,
          true,
        );
      } else if (matches.length === 1) addAttendee(matches[0]!.id);
      else if (group !== undefined) addAttendee(group.id);
      else break;
      read++;
      end = at + word.length;
      r.mark({ start: at, end });
    }
    if (read > 0) r.mark({ start: span.start, end: span.start + 4 });
    return false;
  });

  // Length of each session.
  let minutes: number | undefined;
  r.take(new RegExp(String.raw`\b(?:for\s+)?(${LENGTH_PATTERN})\b(?:\s+(?:long|each))?`), (m, span) => {
    const value = readLength(m[1]!);
    if (value === undefined) return false;
    if (minutes !== undefined && minutes !== value) {
      r.ask(span.start, `the session length is given twice (${minutes} and ${value} minutes); say it once`);
    }
    minutes = value;
    return true;
  });

  // How often.
  let sessions: number | undefined;
  let fixedDays: WeekdayName[] | undefined;
  let sessionsSaid = false;
  const setSessions = (n: number, at: number) => {
    sessionsSaid = true;
    if (sessions !== undefined && sessions !== n) {
      r.ask(at, `the sentence says both ${sessions} and ${n} sessions a week; which is it?`);
    }
    sessions = n;
  };
  r.take(
    /\b(every other week|biweekly|bi-weekly|fortnightly|every two weeks|monthly|every month)\b/,
    (m, span) => {
      r.unreadable(span.start, `'${m[0]}': a series repeats every week; other rhythms are not supported`);
      return true;
    },
  );
  r.take(new RegExp(String.raw`\b(${FREQ_WORD})\s+(?:a|per|each|every)\s+week\b`), (m, span) => {
    const f = m[1]!.replace(/\s*(?:x|times?)$/, '');
    const n = f === 'once' ? 1 : f === 'twice' ? 2 : f === 'thrice' ? 3 : numberWord(f);
    if (n === undefined || n < 1 || n > 20) {
      r.unreadable(span.start, `'${m[0]}' is not a number of sessions from 1 to 20`);
    } else setSessions(n, span.start);
    return true;
  });
  const frequencySpans: Span[] = [];
  r.take(/\b(weekly|every week|once weekly)\b/, (_m, span) => {
    frequencySpans.push(span);
    setSessions(1, span.start);
    return true;
  });
  r.take(/\b(daily|every day|each day|every weekday|every working day|each weekday)\b/, (_m, span) => {
    frequencySpans.push(span);
    setSessions(5, span.start);
    fixedDays = [...WORKING_WEEK];
    return true;
  });

  // Spread over days.
  let minDays: number | 'sessions' | undefined;
  r.take(
    /\b(?:on\s+)?(?:different|separate|distinct)\s+days\b|\bnot on the same day\b|\bspread (?:over|across) the week\b/,
    () => {
      minDays = 'sessions';
      return true;
    },
  );
  r.take(
    /\b(?:(?:the )?same day (?:is )?(?:fine|ok|okay|allowed)|can (?:be on|share) the same day|may share a day)\b/,
    () => {
      minDays = 1;
      return true;
    },
  );

  // Room.
  let room: { seats?: number; features: string[] } | undefined;
  let noRoom = false;
  const featureWords = [...new Set(rooms.flatMap((x) => x.features.map((f) => f.toLowerCase())))];
  const ensureRoom = () => {
    room ??= { features: [] };
    return room;
  };
  r.take(/\b(no room|without a room|remote|online|video call|virtual)\b/, () => {
    noRoom = true;
    return true;
  });
  r.take(/\b(?:a\s+)?room\s+seating\s+(?:every\s+attendee|everyone)\b/, () => {
    ensureRoom();
    return true;
  });
  r.take(
    new RegExp(
      String.raw`\b(?:a\s+)?room\s+for\s+(${NUMBER_PATTERN})(?:\s+(?:people|persons|seats|of us))?\b`,
    ),
    (m, span) => {
      const n = numberWord(m[1]!);
      if (n === undefined || n < 1) r.unreadable(span.start, `'${m[0]}' does not give a number of seats`);
      else ensureRoom().seats = n;
      return true;
    },
  );
  if (featureWords.length > 0) {
    const f = featureWords.map((w) => w.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')).join('|');
    r.take(
      new RegExp(
        String.raw`\b(?:(?:a\s+)?room\s+)?with\s+(?:an?\s+)?(${f})s?(?:(?:\s*,\s*|\s+and\s+)(?:an?\s+)?(?:${f})s?)*\b`,
      ),
      (m) => {
        const found = m[0].match(new RegExp(String.raw`\b(${f})`, 'g')) ?? [];
        const rm = ensureRoom();
        for (const w of found) if (!rm.features.includes(w)) rm.features.push(w);
        return true;
      },
    );
  }
  for (const named of rooms) {
    const names = [named.id, named.name]
      .filter((x): x is string => x !== undefined)
      .map((x) => x.toLowerCase());
    for (const n of names) {
      r.take(
        new RegExp(String.raw`\bin\s+(?:the\s+)?${n.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}\b`),
        (_m, span) => {
          r.unreadable(
            span.start,
            `a series takes any room that fits; instead of naming ${named.name ?? named.id}, say the seats or equipment (for example "room for 6 with a screen")`,
          );
          return true;
        },
      );
    }
  }
  r.take(/\b(?:in\s+)?(?:a\s+)?(?:meeting\s+)?room\b/, () => {
    ensureRoom();
    return true;
  });

  // Zone of the hours.
  let zone: string | undefined;
  const readZone = (m: RegExpMatchArray) => {
    const z = zoneNamed(m[1] ?? m[2]!);
    if (z === undefined) return false;
    zone = z;
    return true;
  };
  r.take(/\b(?:in\s+)?([a-z_]+\s[a-z_]+)\s+time\b/, readZone);
  r.take(/\b(?:in\s+)?([a-z_]+(?:\/[a-z_]+)*)\s+time\b|\(([a-z_]+\/[a-z_/]+|utc)\)/, readZone);
  r.take(/\b(utc|gmt)\b/, () => {
    zone = 'UTC';
    return true;
  });

  // Days.
  const dayPhrases: DayPhrase[] = [];
  r.take(new RegExp(String.raw`\b(?:every|each)\s+(${DAYS})`), (m, span) => {
    dayPhrases.push({ kind: 'every', days: dayList(m[1]!), clause: r.clauseOf(span.start), at: span.start });
    return true;
  });
  r.take(
    new RegExp(
      String.raw`\b(?:not\s+on|not|never\s+on|never|no|except(?:\s+on)?|excluding|avoid(?:ing)?)\s+(${DAYS})`,
    ),
    (m, span) => {
      dayPhrases.push({ kind: 'not', days: dayList(m[1]!), clause: r.clauseOf(span.start), at: span.start });
      return true;
    },
  );
  r.take(/\b(?:on\s+)?weekdays\b/, (_m, span) => {
    dayPhrases.push({ kind: 'on', days: [...WORKING_WEEK], clause: r.clauseOf(span.start), at: span.start });
    return true;
  });
  r.take(new RegExp(String.raw`\b(?:on\s+)?(${DAYS})`), (m, span) => {
    dayPhrases.push({ kind: 'on', days: dayList(m[1]!), clause: r.clauseOf(span.start), at: span.start });
    return true;
  });

  // Hours.
  const hourPhrases: HourPhrase[] = [];
  const clock = (raw: string, at: number): number | undefined => {
    const c = readClock(raw);
    if (c.kind === 'time') return c.minutes;
    if (c.kind === 'ambiguous') r.ask(at, c.question);
    else r.unreadable(at, c.reason);
    return undefined;
  };
  const C = `(${CLOCK_PATTERN})`;
  r.take(
    new RegExp(
      String.raw`\b(?:between\s+${C}\s+and\s+${C}|from\s+${C}\s+(?:to|until|till)\s+${C}|(?:between\s+)?${C}\s*(?:-|–|to)\s*${C})`,
    ),
    (m, span) => {
      const a = m[1] ?? m[3] ?? m[5]!;
      const b = m[2] ?? m[4] ?? m[6]!;
      // "9-11am": an am/pm on the end alone belongs to both ends.
      const suffix = /(am|pm)$/.exec(b.trim())?.[1];
      const aText =
        suffix !== undefined && /^\d{1,2}(?:[:.]\d{2})?$/.test(a.trim()) ? `${a.trim()}${suffix}` : a;
      const start = clock(aText, span.start);
      const end = clock(b, span.start);
      if (start !== undefined && end !== undefined) {
        const e = end === 0 ? 1440 : end;
        if (e <= start)
          r.unreadable(span.start, `'${m[0]}' ends before it starts; write the hours as HH:MM-HH:MM`);
        else
          hourPhrases.push({ kind: 'range', start, end: e, clause: r.clauseOf(span.start), at: span.start });
      }
      return true;
    },
  );
  r.take(new RegExp(String.raw`\b(after|from|before|until|by|(?:starting\s+)?at)\s+${C}`), (m, span) => {
    const t = clock(m[2]!, span.start);
    if (t !== undefined) {
      const word = m[1]!;
      const clause = r.clauseOf(span.start);
      if (word === 'after' || word === 'from')
        hourPhrases.push({ kind: 'range', start: t, end: 1440, clause, at: span.start });
      else if (word === 'before' || word === 'until' || word === 'by') {
        if (t === 0) r.unreadable(span.start, `'${m[0]}' leaves no time in the day`);
        else hourPhrases.push({ kind: 'range', start: 0, end: t, clause, at: span.start });
      } else hourPhrases.push({ kind: 'at', start: t, end: t, clause, at: span.start });
    }
    return true;
  });
  r.take(
    new RegExp(
      String.raw`\b(?:in\s+the\s+|during\s+the\s+|early\s+)?(${Object.keys(PART_OF_DAY_WORDS)
        .sort((a, b) => b.length - a.length)
        .join('|')})\b`,
    ),
    (m, span) => {
      const part = dayParts[PART_OF_DAY_WORDS[m[1]!]!];
      hourPhrases.push({
        kind: 'range',
        start: part.from,
        end: part.to,
        clause: r.clauseOf(span.start),
        at: span.start,
      });
      return true;
    },
  );

  // Strength of each clause: preference markers soften, "only"/"must" harden.
  const softClauses = new Map<number, boolean>();
  const hardClauses = new Set<number>();
  const constrained = new Set([...dayPhrases.map((d) => d.clause), ...hourPhrases.map((h) => h.clause)]);
  r.take(PREFERENCE_RE, (m, span) => {
    const c = r.clauseOf(span.start);
    if (!constrained.has(c)) return false;
    softClauses.set(c, (softClauses.get(c) ?? false) || STRONG_RE.test(m[0]));
    return true;
  });
  r.take(/\b(strongly|really)\b/, (_m, span) => {
    const c = r.clauseOf(span.start);
    if (!softClauses.has(c)) return false;
    softClauses.set(c, true);
    return true;
  });
  r.take(HARD_RE, (_m, span) => {
    const c = r.clauseOf(span.start);
    if (!constrained.has(c)) return false;
    hardClauses.add(c);
    return true;
  });
  for (const c of hardClauses) {
    if (softClauses.has(c)) {
      r.ask(r.clauseStarts[c] ?? 0, 'one part says both "only" and "if possible"; is it a must or a wish?');
    }
  }

  // Name: a quoted name, or the words before the first part that was read.
  let name = quotedName;
  if (name === undefined) {
    const lead = LEAD_RE.exec(r.text)?.[0].length ?? 0;
    // "weekly planning 1h": a leading frequency word followed by more words is also part of the name.
    const leading = frequencySpans.find((f) => f.start === lead);
    let end = leading?.end ?? lead;
    while (end < r.text.length && !r.used[end]) end++;
    if (leading !== undefined && !/[a-z0-9]/i.test(r.text.slice(leading.end, end))) end = lead;
    const raw = r.text.slice(lead, end);
    const trimmed = raw.replace(/[\s,:;-]+$/, '').replace(/\s+(?:for|with|on|at|in|a|an|the)$/i, '');
    if (/[a-z0-9]/i.test(trimmed)) {
      name = trimmed.trim();
      r.mark({ start: 0, end: lead + trimmed.length });
    }
    r.mark({ start: 0, end: lead });
  }

  // Whatever is left and carries meaning is named, never guessed.
  const leftover: Span[] = [];
  for (const m of r.text.matchAll(/[^\s,;.:!?()&/]+/g)) {
    const span = { start: m.index, end: m.index + m[0].length };
    if (!r.free(span) || FILLERS.has(m[0].toLowerCase())) continue;
    const last = leftover[leftover.length - 1];
    if (last !== undefined && /^\s+$/.test(r.text.slice(last.end, span.start))) {
      leftover[leftover.length - 1] = { start: last.start, end: span.end };
    } else leftover.push(span);
  }
  for (const s of leftover) {
    r.unreadable(
      s.start,
      `could not read '${r.text.slice(s.start, s.end)}'; leave it out or say it another way`,
    );
  }

  if (name === undefined)
    r.ask(0, 'what is the series called? put the name first, e.g. "team sync 30m weekly with @ana"');
  if (minutes === undefined) r.ask(0, 'how long is each session? add a length such as 30m or 1h');
  else if (minutes < 5 || minutes > 1440 || minutes % 5 !== 0) {
    r.unreadable(0, `a session of ${minutes} minutes cannot be placed; use 5 to 1440 minutes in steps of 5`);
  }
  if (attendees.length === 0 && !attendeeIssue) {
    r.ask(0, 'who attends? mention people or groups, e.g. "with @ana @bo"');
  }

  // Combine days.
  let days: WeekdayName[] | undefined = fixedDays;
  let preferredDays: WeekdayName[] | undefined;
  let strongDays = false;
  for (const p of dayPhrases) {
    const soft = softClauses.has(p.clause);
    if (soft && softClauses.get(p.clause)) strongDays = true;
    if (p.kind === 'every') {
      if (soft) {
        preferredDays = union(preferredDays, p.days);
        continue;
      }
      if (sessionsSaid && sessions !== p.days.length) {
        r.ask(
          p.at,
          `'every ${p.days.map((d) => DAY_WORDS[d]).join(', ')}' gives ${p.days.length} session${p.days.length === 1 ? '' : 's'} but the sentence also says ${sessions} a week; which is it?`,
        );
      }
      days = union(days === fixedDays ? undefined : days, p.days);
      sessions = p.days.length;
      minDays = p.days.length;
      fixedDays = undefined;
    } else if (p.kind === 'on') {
      if (soft) preferredDays = union(preferredDays, p.days);
      else days = union(days, p.days);
    } else {
      const base = soft ? (preferredDays ?? [...WORKING_WEEK]) : (days ?? [...WORKING_WEEK]);
      const rest = base.filter((d) => !p.days.includes(d));
      if (soft) preferredDays = rest;
      else days = rest;
      if (rest.length === 0)
        r.unreadable(p.at, 'every day is ruled out; name at least one day a session may take');
    }
  }

  // Combine hours.
  const hours: string[] = [];
  const preferredHours: string[] = [];
  let strongHours = false;
  for (const h of hourPhrases) {
    const soft = softClauses.has(h.clause);
    if (soft && softClauses.get(h.clause)) strongHours = true;
    let { start, end } = h;
    if (h.kind === 'at') {
      if (minutes === undefined) continue;
      end = start + minutes;
      if (end > 1440) {
        r.unreadable(h.at, `a session starting at ${clockText(start)} would run past midnight`);
        continue;
      }
    }
    (soft ? preferredHours : hours).push(`${clockText(start)}-${clockText(end)}`);
  }

  const n = sessions ?? 1;
  const resolvedMinDays = minDays === 'sessions' ? n : minDays;
  if (days !== undefined && (resolvedMinDays ?? n) > days.length && n > 1 && minDays !== 1) {
    r.ask(
      dayPhrases[0]?.at ?? 0,
      `${n} sessions on different days do not fit in ${listText(
        days.map((d) => DAY_WORDS[d]),
        'and',
      )}; allow more days or say "same day is fine"`,
    );
  }
  if (noRoom && room !== undefined) r.ask(0, 'the sentence asks for a room and for no room; which is it?');

  if (r.issues.length > 0) return { ok: false, issues: r.issues };

  const weights: { preferredDays?: number; preferredHours?: number } = {};
  if (strongDays && preferredDays !== undefined) weights.preferredDays = STRONG_WEIGHT;
  if (strongHours && preferredHours.length > 0) weights.preferredHours = STRONG_WEIGHT;
  const series: SeriesDraft = {
    id: uniqueId(slug(name!), options.existingIds ?? []),
    name: name!,
    attendees,
    minutes: minutes!,
    sessions: n,
    ...(resolvedMinDays !== undefined && resolvedMinDays !== n ? { minDays: resolvedMinDays } : {}),
    ...(days !== undefined ? { days } : {}),
    ...(preferredDays !== undefined ? { preferredDays } : {}),
    ...(hours.length > 0 ? { hours } : {}),
    ...(preferredHours.length > 0 ? { preferredHours } : {}),
    ...(hours.length > 0 || preferredHours.length > 0 ? { zone: zone ?? options.zone } : {}),
    ...(room !== undefined ? { room } : {}),
    ...(Object.keys(weights).length > 0 ? { weights } : {}),
  };
  return {
    ok: true,
    value: { series, echo: describeSeries(series), ...(startsOn !== undefined ? { startsOn } : {}) },
  };
}

function union(a: readonly WeekdayName[] | undefined, b: readonly WeekdayName[]): WeekdayName[] {
  const s = new Set([...(a ?? []), ...b]);
  return WEEKDAY_NAMES.filter((d) => s.has(d));
}

const DAY_WORDS: Readonly<Record<WeekdayName, string>> = {
  mon: 'Monday',
  tue: 'Tuesday',
  wed: 'Wednesday',
  thu: 'Thursday',
  fri: 'Friday',
  sat: 'Saturday',
  sun: 'Sunday',
};

function listText(items: readonly string[], last = 'and'): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} ${last} ${items[items.length - 1]}`;
}

function rangeText(range: string): string {
  const [a, b] = range.split('-') as [string, string];
  if (a === '00:00') return `before ${b}`;
  if (b === '24:00') return `after ${a}`;
  return `between ${a} and ${b}`;
}

function timesText(n: number): string {
  return n === 1 ? 'once a week' : n === 2 ? 'twice a week' : `${n} times a week`;
}

/**
 * A series restated in slotwright's own words, for the person to confirm before it is saved, e.g.
 * "team sync: 45 minutes, twice a week on 2 different days, with @ana, @bo and @cy; ...".
 */
export function describeSeries(series: SeriesDraft): string {
  const parts: string[] = [];
  const minDays = series.minDays ?? series.sessions;
  let how = `${formatDuration(series.minutes)}, ${timesText(series.sessions)}`;
  if (series.sessions > 1) {
    if (minDays >= series.sessions) how += ' on different days';
    else if (minDays === 1) how += ', the same day allowed';
    else how += ` over at least ${minDays} days`;
  }
  parts.push(how);
  parts.push(`with ${listText(series.attendees.map((a) => `@${a}`))}`);
  const clauses: string[] = [];
  if (series.days !== undefined)
    clauses.push(
      `only on ${listText(
        series.days.map((d) => DAY_WORDS[d]),
        'or',
      )}`,
    );
  if (series.preferredDays !== undefined) {
    clauses.push(
      `${series.weights?.preferredDays !== undefined ? 'strongly preferring' : 'preferably on'} ${listText(
        series.preferredDays.map((d) => DAY_WORDS[d]),
        'or',
      )}`,
    );
  }
  if (series.hours !== undefined) clauses.push(`only ${listText(series.hours.map(rangeText), 'or')}`);
  if (series.preferredHours !== undefined) {
    clauses.push(
      `${series.weights?.preferredHours !== undefined ? 'strongly preferring' : 'preferably'} ${listText(series.preferredHours.map(rangeText), 'or')}`,
    );
  }
  if (series.zone !== undefined) clauses.push(`${series.zone} time`);
  let text = `${series.name}: ${parts.join(', ')}`;
  if (clauses.length > 0) text += `; ${clauses.join(', ')}`;
  if (series.room === undefined) text += '; no room';
  else {
    const seats = series.room.seats === undefined ? 'seating every attendee' : `for ${series.room.seats}`;
    const feats = series.room.features.length > 0 ? `, with ${listText([...series.room.features])}` : '';
    text += `; a room ${seats}${feats}`;
  }
  return `${text}.`;
}
