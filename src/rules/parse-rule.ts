import * as chrono from 'chrono-node';
import { Temporal } from 'temporal-polyfill';
import { instantToZoned } from '../time/zoned.ts';
import { describeRule, formatClock } from './describe-rule.ts';
import {
  type DayPart,
  type NamedEntity,
  type Rule,
  type RuleBody,
  type RuleContext,
  type RuleIssue,
  type RuleParse,
  type RuleSubject,
  ruleSchema,
  type TimeSpan,
} from './rule.ts';
import { suggestFor } from './suggestions.ts';
import { CITY_ZONES, canonicalZone } from './zone-names.ts';

/**
 * Earliest and latest plausible meeting clock times, in minutes: [07:00, 22:00). A bare hour without
 * am/pm ("before 9") is read as whichever of its two readings falls in this band; when both do (7, 8
 * and 9, with or without minutes) the sentence is ambiguous and we ask. In a range ("between 6 and
 * 10") the end may also be 22:00 and the start must come before the end; exactly one surviving
 * combination is taken, more than one is asked about. "12" alone is noon since midnight is not plausible.
 */
export const PLAUSIBLE_HOURS = { from: 7 * 60, to: 22 * 60 } as const;

const MONTH =
  '(?:jan(?:uary)?|feb(?:ruary)?|mar(?:ch)?|apr(?:il)?|may|june?|july?|aug(?:ust)?|sep(?:t(?:ember)?)?|oct(?:ober)?|nov(?:ember)?|dec(?:ember)?)';
const MONTH_INDEX = ['jan', 'feb', 'mar', 'apr', 'may', 'jun', 'jul', 'aug', 'sep', 'oct', 'nov', 'dec'];
const NUM =
  '(\\d+(?:\\.\\d+)?|an?|one|two|three|four|five|six|seven|eight|nine|ten|eleven|twelve|fifteen|twenty|thirty|forty[- ]five|sixty|ninety|half\\s+an?)';
const UNIT = '(minutes?|mins?|hours?|hrs?|h|days?|weeks?)';
const AT_MOST =
  '(?:at\\s+most|no\\s+more\\s+than|not\\s+more\\s+than|max(?:imum)?(?:\\s+of)?|a\\s+maximum\\s+of|up\\s+to|only)';
const CLOCK =
  "(noon|midday|midnight|\\d{1,2}(?::\\d{2})?(?:\\s*(?:am|pm|a\\.m\\.?|p\\.m\\.?|o'?clock)(?![a-z])|(?![\\d:]|\\s*(?:st|nd|rd|th)\\b|(?:st|nd|rd|th)\\b|\\s*" +
  MONTH +
  '\\b|\\s*(?:minutes?|mins?|hours?|hrs?|days?|weeks?|meetings?|calls?)\\b)))';
const STRICT_CLOCK = '(noon|midday|midnight|\\d{1,2}(?::\\d{2})?\\s*(?:am|pm|a\\.m\\.?|p\\.m\\.?)(?![a-z]))';
const WEEKDAY =
  '(mon(?:day)?|tue(?:s(?:day)?)?|wed(?:nesday)?|thu(?:r(?:s(?:day)?)?)?|fri(?:day)?|sat(?:urday)?|sun(?:day)?)s?';
const WORD_NUMBERS: Readonly<Record<string, number>> = {
  a: 1,
  an: 1,
  one: 1,
  two: 2,
  three: 3,
  four: 4,
  five: 5,
  six: 6,
  seven: 7,
  eight: 8,
  nine: 9,
  ten: 10,
  eleven: 11,
  twelve: 12,
  fifteen: 15,
  twenty: 20,
  thirty: 30,
  'forty five': 45,
  'forty-five': 45,
  sixty: 60,
  ninety: 90,
};

/** Words that carry no meaning of their own in a rule ("I", "meetings", "please"). */
const FILLER = new Set(
  (
    "i i'm im i'll i've me my we us our you please any anything meetings meeting calls call meet meets " +
    'have having had book booked booking schedule scheduled be been is are am to on in the a an at for ' +
    'of and or with do does doing time times it that there get set put want need will would like all ' +
    "from during available free every each so also just really let lets let's myself ever anymore " +
    'booked start starting started take taken can could slot slots'
  ).split(' '),
);

type ClockRead = { exact: number } | { midnight: true } | { bare: readonly [number, number] } | undefined;

function readClock(raw: string): ClockRead {
  const s = raw.trim();
  if (s === 'noon' || s === 'midday') return { exact: 720 };
  if (s === 'midnight') return { midnight: true };
  const m = /^(\d{1,2})(?::(\d{2}))?\s*(am|pm|a\.m\.?|p\.m\.?|o'?clock)?$/.exec(s);
  if (m === null) return undefined;
  const h = Number(m[1]);
  const min = m[2] === undefined ? 0 : Number(m[2]);
  if (min > 59) return undefined;
  const suffix = m[3]?.replace(/\./g, '');
  if (suffix === 'am' || suffix === 'pm') {
    if (h < 1 || h > 12) return undefined;
    return { exact: ((h % 12) + (suffix === 'pm' ? 12 : 0)) * 60 + min };
  }
  if (h > 24 || (h === 24 && min > 0)) return undefined;
  if (h === 0 || h >= 13 || m[1]!.startsWith('0')) return { exact: h * 60 + min };
  return { bare: [(h % 12) * 60 + min, ((h % 12) + 12) * 60 + min] };
}

function candidates(read: ClockRead, role: 'start' | 'end'): number[] {
  if (read === undefined) return [];
  if ('exact' in read) return [read.exact];
  if ('midnight' in read) return [role === 'start' ? 0 : 1440];
  return [...read.bare];
}

function plausible(minutes: number, role: 'start' | 'end' | 'point'): boolean {
  if (role === 'end') return minutes > PLAUSIBLE_HOURS.from && minutes <= PLAUSIBLE_HOURS.to;
  return minutes >= PLAUSIBLE_HOURS.from && minutes < PLAUSIBLE_HOURS.to;
}

/** Readings of a bare-or-exact clock in one role; exact times are never filtered by plausibility. */
function readings(read: ClockRead, role: 'start' | 'end' | 'point'): number[] {
  const all = candidates(read, role === 'end' ? 'end' : 'start');
  if (read !== undefined && 'bare' in read) return all.filter((m) => plausible(m, role));
  return all;
}

function parseNumber(raw: string): number {
  const s = raw.replace(/\s+/g, ' ').trim();
  if (/^half an?$/.test(s)) return 0.5;
  const w = WORD_NUMBERS[s];
  return w ?? Number(s);
}

function unitMinutes(unit: string): number {
  if (unit.startsWith('m')) return 1;
  if (unit.startsWith('h')) return 60;
  if (unit.startsWith('d')) return 1440;
  return 10080;
}

const DAY_INDEX: Readonly<Record<string, number>> = {
  mon: 1,
  tue: 2,
  wed: 3,
  thu: 4,
  fri: 5,
  sat: 6,
  sun: 7,
};

function weekdayNumber(word: string): number {
  return DAY_INDEX[word.slice(0, 3)]!;
}

/** What the scan found in a sentence, before it is turned into one rule body. */
interface Found {
  subject?: RuleSubject;
  subjects: Set<string>;
  preference: boolean;
  avoid: boolean;
  only: boolean;
  keepFree: boolean;
  maxMeetings?: number;
  maxMinutes?: number;
  perDay: boolean;
  gap?: number;
  gapUnsized: boolean;
  notice?: number;
  maxLength?: number;
  dates: { from: string; to: string }[];
  clocks: { span: { from: number; to: number }; text: string }[];
  parts: Set<DayPart>;
  weekdays: Set<number>;
  zone?: string;
}

/** The sentence with every understood piece blanked out, so what is left is what we could not read. */
class Scan {
  work: string;
  readonly issues: RuleIssue[] = [];

  constructor(readonly original: string) {
    // same length as the original for ASCII text, so unread parts can be quoted in the person's own
    // casing; `slice` falls back to the lowered text when a letter changes length when lowered
    this.work = original.toLowerCase().replace(/[’‘`]/g, "'").replace(/#/g, ' ');
  }

  /** Runs a global regex over what is left; `fn` returns false to leave a match unconsumed. */
  take(source: string, fn: (m: RegExpExecArray) => unknown): void {
    const re = new RegExp(source, 'g');
    const matches = [...this.work.matchAll(re)];
    for (const m of matches) {
      if (m[0].length === 0) continue;
      if (fn(m as RegExpExecArray) === false) continue;
      this.blank(m.index, m[0].length);
    }
  }

  blank(index: number, length: number): void {
    this.work = this.work.slice(0, index) + '#'.repeat(length) + this.work.slice(index + length);
  }

  /** The original wording of a stretch of the normalized text. */
  slice(index: number, length: number): string {
    return this.original.length === this.work.length
      ? this.original.slice(index, index + length)
      : this.work.slice(index, index + length);
  }

  /** Contiguous stretches of meaningful words nobody consumed, in the original wording. */
  unread(): string[] {
    const tokens = [...this.work.matchAll(/[a-z0-9][a-z0-9'./:_-]*/g)].filter(
      (t) => !FILLER.has(t[0].replace(/[.:]+$/, '')),
    );
    const groups: { start: number; end: number }[] = [];
    for (const t of tokens) {
      const start = t.index;
      const end = start + t[0].length;
      const last = groups[groups.length - 1];
      // words separated only by filler words belong to one unread stretch
      if (last !== undefined && !/#/.test(this.work.slice(last.end, start))) last.end = end;
      else groups.push({ start, end });
    }
    return groups.map((g) => this.slice(g.start, g.end - g.start).replace(/[.,;:!?]+$/, ''));
  }
}

function escapeRe(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}

interface EntityName {
  readonly key: string;
  readonly subject: RuleSubject;
}

function entityNames(ctx: RuleContext): EntityName[] {
  const out: EntityName[] = [];
  const people = ctx.people ?? [];
  const firstNames = new Map<string, number>();
  for (const p of people) {
    const first = p.name?.split(/\s+/)[0]?.toLowerCase();
    if (first !== undefined) firstNames.set(first, (firstNames.get(first) ?? 0) + 1);
  }
  const add = (key: string | undefined, subject: RuleSubject): void => {
    if (key !== undefined && key.trim() !== '') out.push({ key: key.toLowerCase().trim(), subject });
  };
  for (const p of people) {
    const subject: RuleSubject = p.id === ctx.speaker ? { kind: 'speaker' } : { kind: 'person', id: p.id };
    add(p.id, subject);
    add(p.name, subject);
    const first = p.name?.split(/\s+/)[0]?.toLowerCase();
    if (first !== undefined && firstNames.get(first) === 1) add(first, subject);
  }
  const addAll = (list: readonly NamedEntity[] | undefined, kind: 'room' | 'group'): void => {
    for (const e of list ?? []) {
      add(e.id, { kind, id: e.id });
      add(e.id.replace(/[-_]/g, ' '), { kind, id: e.id });
      add(e.name, { kind, id: e.id });
    }
  };
  addAll(ctx.rooms, 'room');
  addAll(ctx.groups, 'group');
  return out.sort((a, b) => b.key.length - a.key.length);
}

function subjectKey(s: RuleSubject): string {
  return s.kind === 'speaker' ? 'speaker' : `${s.kind}:${s.id}`;
}

function scanSubject(scan: Scan, ctx: RuleContext, found: Found): void {
  for (const { key, subject } of entityNames(ctx)) {
    const kindWord =
      subject.kind === 'room' ? 'room' : subject.kind === 'group' ? '(?:group|team)' : 'person';
    const re = `\\b(?:for\\s+)?(?:${kindWord}\\s+)?(?:the\\s+)?${escapeRe(key)}(?:'s)?(?:\\s+${kindWord})?\\b\\s*:?`;
    scan.take(re, () => {
      found.subjects.add(subjectKey(subject));
      found.subject = subject;
    });
  }
}

function scanAmounts(scan: Scan, found: Found): void {
  const minutesOf = (num: string, unit: string): number => parseNumber(num) * unitMinutes(unit);
  // notice: "at least 24 hours notice", "a day's notice", "less than 2 hours ahead"
  scan.take(
    `\\b(?:less|sooner|fewer)\\s+than\\s+${NUM}\\s+${UNIT}\\s+(?:ahead|in\\s+advance|away|from\\s+now|before(?:\\s+(?:it|they)\\s+starts?)?)\\b`,
    (m) => {
      found.notice = minutesOf(m[1]!, m[2]!);
    },
  );
  scan.take(
    `\\b(?:at\\s+least\\s+|with\\s+)?(?:a\\s+minimum\\s+of\\s+)?${NUM}\\s+${UNIT}(?:'s|')?\\s+(?:of\\s+)?(?:advance\\s+)?(?:notice|warning|in\\s+advance|ahead(?:\\s+of\\s+time)?)\\b`,
    (m) => {
      found.notice = minutesOf(m[1]!, m[2]!);
    },
  );
  scan.take(`\\bwithin\\s+(?:the\\s+next\\s+)?${NUM}\\s+${UNIT}\\b`, (m) => {
    found.notice = minutesOf(m[1]!, m[2]!);
  });
  // gaps: "at least 15 minutes between meetings", "a 10 minute break between meetings"
  scan.take(
    `\\b(?:a\\s+)?(?:gap|break|buffer|pause)\\s+of\\s+(?:at\\s+least\\s+)?${NUM}\\s+${UNIT}(?:\\s+between\\s+(?:meetings?|calls?))?`,
    (m) => {
      found.gap = minutesOf(m[1]!, m[2]!);
    },
  );
  scan.take(
    `\\b(?:at\\s+least\\s+|leave\\s+|keep\\s+)?(?:a\\s+)?${NUM}[-\\s]+${UNIT}(?:\\s+(?:of\\s+)?(?:gap|break|buffer|breather|pause|free\\s+time))?\\s+(?:between|in\\s+between|after|around)\\s+(?:each\\s+|two\\s+|my\\s+|consecutive\\s+)?(?:meetings?|calls?)\\b`,
    (m) => {
      found.gap = minutesOf(m[1]!, m[2]!);
    },
  );
  scan.take('\\bback[-\\s]to[-\\s]back\\b', () => {
    found.gapUnsized = true;
  });
  // lengths: "no meetings longer than 45 minutes", "keep meetings under 30 minutes"
  scan.take(
    `\\b(?:longer|more)\\s+than\\s+${NUM}\\s+${UNIT}(?!\\s+(?:of\\s+)?(?:meetings?|calls?))(?:\\s+long)?\\b`,
    (m) => {
      found.maxLength = minutesOf(m[1]!, m[2]!);
    },
  );
  scan.take(
    `\\b(?:keep\\s+)?(?:meetings?|calls?)\\s+(?:to\\s+)?(?:at\\s+most|no\\s+more\\s+than|no\\s+longer\\s+than|under|up\\s+to|shorter\\s+than|below)\\s+${NUM}\\s+${UNIT}(?:\\s+long)?\\b(?!\\s+(?:of\\s+)?(?:meetings?|calls?)|\\s+(?:a|per|each)\\s+day)`,
    (m) => {
      found.maxLength = minutesOf(m[1]!, m[2]!);
    },
  );
  // daily limits: "at most 4 meetings a day", "no more than 3 hours of meetings on Fridays"
  scan.take(`\\b(?:${AT_MOST}\\s+)?${NUM}\\s+${UNIT}\\s+(?:of\\s+)?(?:meetings?|calls?)\\b`, (m) => {
    found.maxMinutes = minutesOf(m[1]!, m[2]!);
  });
  scan.take(`\\b${AT_MOST}\\s+${NUM}\\s+(?:meetings?|calls?)\\b`, (m) => {
    found.maxMeetings = parseNumber(m[1]!);
  });
  scan.take(`\\b${NUM}\\s+(?:meetings?|calls?)(?=\\s+(?:a|per|each)\\s+day\\b)`, (m) => {
    found.maxMeetings = parseNumber(m[1]!);
  });
  scan.take('\\b(?:(?:a|per|each|every|in\\s+a|on\\s+any)\\s+day|daily)\\b', () => {
    found.perDay = true;
  });
}

function todayIn(ctx: RuleContext): Temporal.PlainDate {
  return Temporal.PlainDate.from(instantToZoned(ctx.now, ctx.zone).date);
}

/** The first date on or after `from` whose day of month is `day` (and month is `month` when given). */
function nextDate(from: Temporal.PlainDate, day: number, month?: number): Temporal.PlainDate | undefined {
  for (let k = 0; k < 60; k++) {
    const ym = from.toPlainYearMonth().add({ months: k });
    if (month !== undefined && ym.month !== month) continue;
    if (day > ym.daysInMonth) continue;
    const d = ym.toPlainDate({ day });
    if (Temporal.PlainDate.compare(d, from) >= 0) return d;
  }
  return undefined;
}

function monthNumber(word: string | undefined): number | undefined {
  if (word === undefined) return undefined;
  return MONTH_INDEX.indexOf(word.slice(0, 3)) + 1;
}

function scanDates(scan: Scan, ctx: RuleContext, found: Found): void {
  const today = todayIn(ctx);
  const SEP = '\\s*(?:to|until|till|through|thru|-|–)\\s*';
  const UNTIL = '\\b(?:until|till|through|thru)\\s+';
  // "until the 5th", "through 2027-01-04": from today to that date, both included
  scan.take(`${UNTIL}(\\d{4}-\\d{2}-\\d{2})\\b`, (m) => {
    try {
      const to = Temporal.PlainDate.from(m[1]!, { overflow: 'reject' });
      if (Temporal.PlainDate.compare(to, today) < 0) {
        scan.issues.push({
          code: 'rule_unreadable',
          path: ['dates'],
          message: `I could not read '${m[0].trim()}': that date has passed`,
          suggestions: [],
        });
        return;
      }
      found.dates.push({ from: today.toString(), to: to.toString() });
    } catch {
      scan.issues.push({
        code: 'rule_unreadable',
        path: ['dates'],
        message: `I could not read '${m[0].trim()}': it is not a calendar date (use YYYY-MM-DD)`,
        suggestions: [],
      });
    }
  });
  scan.take(`${UNTIL}(?:the\\s+)?(\\d{1,2})(?:st|nd|rd|th)(?:\\s+(?:of\\s+)?(${MONTH}))?\\b`, (m) => {
    const end = nextDate(today, Number(m[1]), monthNumber(m[2]));
    if (end === undefined) return false;
    found.dates.push({ from: today.toString(), to: end.toString() });
    return true;
  });
  scan.take(`\\b(?:from\\s+)?(\\d{4}-\\d{2}-\\d{2})(?:${SEP}(\\d{4}-\\d{2}-\\d{2}))?\\b`, (m) => {
    try {
      const from = Temporal.PlainDate.from(m[1]!, { overflow: 'reject' });
      const to = m[2] === undefined ? from : Temporal.PlainDate.from(m[2], { overflow: 'reject' });
      if (Temporal.PlainDate.compare(to, from) < 0) {
        scan.issues.push({
          code: 'rule_unreadable',
          path: ['dates'],
          message: `I could not read '${m[0].trim()}': the range ends before it starts`,
          suggestions: [`from ${to} to ${from}`],
        });
        return;
      }
      found.dates.push({ from: from.toString(), to: to.toString() });
    } catch {
      scan.issues.push({
        code: 'rule_unreadable',
        path: ['dates'],
        message: `I could not read '${m[0].trim()}': it is not a calendar date (use YYYY-MM-DD)`,
        suggestions: [],
      });
    }
  });
  const ORD = `(?:the\\s+)?(\\d{1,2})(?:st|nd|rd|th)(?:\\s+(?:of\\s+)?(${MONTH}))?`;
  scan.take(`\\b(?:from\\s+)?${ORD}(?:${SEP}${ORD})?\\b`, (m) => {
    const fromDay = Number(m[1]);
    const fromMonth = monthNumber(m[2]);
    const start = nextDate(today, fromDay, fromMonth);
    if (start === undefined) {
      scan.issues.push({
        code: 'rule_unreadable',
        path: ['dates'],
        message: `I could not read '${m[0].trim()}': no month has that day`,
        suggestions: [],
      });
      return;
    }
    let end = start;
    if (m[3] !== undefined) {
      const e = nextDate(start, Number(m[3]), monthNumber(m[4]));
      if (e === undefined) {
        scan.issues.push({
          code: 'rule_unreadable',
          path: ['dates'],
          message: `I could not read '${m[0].trim()}': no month has that end day`,
          suggestions: [],
        });
        return;
      }
      end = e;
    }
    found.dates.push({ from: start.toString(), to: end.toString() });
  });
}

function scanClocks(scan: Scan, found: Found): void {
  const ambiguous = (text: string, options: readonly string[]): void => {
    scan.issues.push({
      code: 'rule_ambiguous',
      path: ['times'],
      message: `'${text}' could mean ${options.join(' or ')}; say which (with am/pm or as 24-hour time)`,
      suggestions: options.map((o) => replaceOnce(scan.original, text, o)),
    });
  };
  const unreadable = (text: string): void => {
    scan.issues.push({
      code: 'rule_unreadable',
      path: ['times'],
      message: `I could not read the time '${text}'; write it like 9am, 4:30pm or 16:30`,
      suggestions: [],
    });
  };
  const range = (m: RegExpExecArray, lead: string): void => {
    const text = scan.slice(m.index, m[0].length).trim();
    const a = readClock(m[1]!);
    const b = readClock(m[2]!);
    if (a === undefined || b === undefined) {
      unreadable(text);
      return;
    }
    const combos: { from: number; to: number }[] = [];
    for (const f of readings(a, 'start'))
      for (const t of readings(b, 'end')) if (f < t) combos.push({ from: f, to: t });
    if (combos.length === 1) {
      found.clocks.push({ span: combos[0]!, text });
      return;
    }
    if (combos.length === 0) {
      const exactA = candidates(a, 'start');
      const exactB = candidates(b, 'end');
      if (exactA.length === 1 && exactB.length === 1 && exactA[0]! > exactB[0]!) {
        scan.issues.push({
          code: 'rule_unreadable',
          path: ['times'],
          message: `I could not read '${text}': it ends before it starts; split a range over midnight into two rules`,
          suggestions: [],
        });
        return;
      }
      unreadable(text);
      return;
    }
    ambiguous(
      text,
      combos.map((c) => `${lead} ${formatClock(c.from)} and ${formatClock(c.to)}`),
    );
  };
  scan.take(`\\b(?:between|from)\\s+${CLOCK}\\s*(?:and|to|until|till|through|-|–)\\s*${CLOCK}`, (m) =>
    range(m, 'between'),
  );
  scan.take(`\\b${CLOCK}\\s*(?:-|–|to|until|till)\\s*${CLOCK}`, (m) => range(m, 'between'));
  const single = (m: RegExpExecArray, kind: 'before' | 'after' | 'at'): void => {
    const text = scan.slice(m.index, m[0].length).trim();
    const read = readClock(m[1]!);
    if (read === undefined) {
      unreadable(text);
      return;
    }
    const role = kind === 'before' ? 'end' : 'start';
    const values =
      read !== undefined && 'bare' in read
        ? read.bare.filter((v) => plausible(v, 'point'))
        : candidates(read, role);
    if (values.length !== 1) {
      const word = kind === 'at' ? 'at' : kind;
      ambiguous(
        text,
        candidates(read, role).map((v) => `${word} ${formatClock(v)}`),
      );
    }
    const v = values[0]!;
    if ((kind === 'before' && (v === 0 || v === 1440)) || (kind === 'after' && (v === 0 || v === 1440))) {
      scan.issues.push({
        code: 'rule_ambiguous',
        path: ['times'],
        message: `'${text}' covers the whole day; give both ends, like 'between midnight and 6am'`,
        suggestions: [replaceOnce(scan.original, text, 'between midnight and 6am')],
      });
      return;
    }
    if (kind === 'before') found.clocks.push({ span: { from: 0, to: v === 0 ? 1440 : v }, text });
    else if (kind === 'after') found.clocks.push({ span: { from: v === 1440 ? 0 : v, to: 1440 }, text });
    else found.clocks.push({ span: { from: v, to: Math.min(1440, v + 60) }, text });
  };
  scan.take(`\\b(?:before|until|till|earlier\\s+than|up\\s+to)\\s+${CLOCK}`, (m) => single(m, 'before'));
  scan.take(`\\b(?:after|later\\s+than|past|from)\\s+${CLOCK}(?:\\s+on(?:wards?)?)?`, (m) =>
    single(m, 'after'),
  );
  scan.take(`\\b(?:at|around)\\s+${CLOCK}`, (m) => single(m, 'at'));
  scan.take(`\\b${STRICT_CLOCK}(?=\\s+(?:meetings?|calls?)\\b)`, (m) => single(m, 'at'));
  scan.take('\\b(noon|midday)\\b', (m) => single(m, 'at'));
}

function replaceOnce(text: string, part: string, by: string): string {
  const i = text.toLowerCase().indexOf(part.toLowerCase());
  return i < 0 ? text : text.slice(0, i) + by + text.slice(i + part.length);
}

function scanZone(scan: Scan, found: Found): void {
  const setZone = (zone: string): void => {
    found.zone = zone;
  };
  scan.take('\\b(?:in\\s+)?([a-z]+(?:/[a-z0-9_+-]+)+)(?:\\s+time)?\\b', (m) => {
    const zone = canonicalZone(m[1]!);
    if (zone === undefined) {
      scan.issues.push({
        code: 'rule_unreadable',
        path: ['zone'],
        message: `I could not read the zone '${m[1]}'; use an IANA name such as Europe/Lisbon`,
        suggestions: [],
      });
      return;
    }
    setZone(zone);
  });
  // two-word cities first ("new york time"); a phrase that is not one is left for the one-word pass
  scan.take("\\b(?:in\\s+)?([a-z']+\\s+[a-z']+)\\s+time\\b", (m) => {
    const zone = CITY_ZONES[m[1]!.replace(/\s+/g, ' ')];
    if (zone === undefined) return false;
    setZone(zone);
    return true;
  });
  scan.take("\\b(?:in\\s+)?([a-z']+)\\s+time\\b", (m) => {
    const word = m[1]!;
    const zone = CITY_ZONES[word];
    if (zone !== undefined) {
      setZone(zone);
      return true;
    }
    // "my time" and "local time" mean the speaker's own zone, which is the default
    if (['my', 'local', 'own'].includes(word)) return true;
    if (
      ['lunch', 'any', 'free', 'meeting', 'the', 'same', 'of', 'that', 'this', 'in', 'on', 'at'].includes(
        word,
      )
    )
      return false;
    scan.issues.push({
      code: 'rule_unreadable',
      path: ['zone'],
      message: `I could not read the zone '${word} time'; use an IANA name such as Europe/Lisbon`,
      suggestions: [],
    });
    return true;
  });
  scan.take('\\b(?:in\\s+)?(utc|gmt)\\b', () => setZone('UTC'));
}

/** "this week", "next week", "this weekend", "next weekend", "this month", "next month" as date ranges. */
function scanPeriods(scan: Scan, ctx: RuleContext, found: Found): void {
  const today = todayIn(ctx);
  const monday = today.subtract({ days: today.dayOfWeek - 1 });
  const later = (a: Temporal.PlainDate, b: Temporal.PlainDate): Temporal.PlainDate =>
    Temporal.PlainDate.compare(a, b) >= 0 ? a : b;
  scan.take('\\b(this|next|coming)\\s+(week|weekend|month)\\b', (m) => {
    const which = m[1] === 'this' || (m[1] === 'coming' && m[2] === 'weekend') ? 0 : 1;
    let from: Temporal.PlainDate;
    let to: Temporal.PlainDate;
    if (m[2] === 'week') {
      from = which === 0 ? today : monday.add({ days: 7 });
      to = monday.add({ days: 7 * which + 6 });
    } else if (m[2] === 'weekend') {
      // like chrono-node's "next Friday", "next weekend" is the weekend of next week
      from = later(today, monday.add({ days: 7 * which + 5 }));
      to = monday.add({ days: 7 * which + 6 });
    } else {
      const first = today.toPlainYearMonth().add({ months: which }).toPlainDate({ day: 1 });
      from = which === 0 ? today : first;
      to = first.add({ months: 1 }).subtract({ days: 1 });
    }
    found.dates.push({ from: from.toString(), to: to.toString() });
  });
}

function scanDays(scan: Scan, found: Found): void {
  scan.take('\\b(?:in\\s+the\\s+|during\\s+the\\s+|on\\s+|the\\s+)?(morning|afternoon|evening)s?\\b', (m) => {
    found.parts.add(m[1] as DayPart);
  });
  scan.take('\\b(?:on\\s+)?(?:week\\s?days?|workdays?|working\\s+days?)\\b', () => {
    for (const d of [1, 2, 3, 4, 5]) found.weekdays.add(d);
  });
  scan.take('\\b(?:on\\s+)?(?:the\\s+)?week-?ends?\\b', () => {
    found.weekdays.add(6);
    found.weekdays.add(7);
  });
  scan.take(
    `(?<!(?:next|this|coming|last)\\s+)\\b(?:from\\s+)?${WEEKDAY}\\s*(?:-|–|to|through|thru|until|till)\\s*${WEEKDAY}\\b`,
    (m) => {
      const a = weekdayNumber(m[1]!);
      const b = weekdayNumber(m[2]!);
      for (let d = a, n = 0; n < 7; d = (d % 7) + 1, n++) {
        found.weekdays.add(d);
        if (d === b) break;
      }
    },
  );
  scan.take(`(?<!(?:next|this|coming|last)\\s+)\\b(?:on\\s+)?${WEEKDAY}\\b`, (m) => {
    found.weekdays.add(weekdayNumber(m[1]!));
  });
}

const RELATIVE_DATE = new RegExp(`\\d|${MONTH}|\\b(?:next|this|coming|tomorrow|today)\\b`);

function scanChrono(scan: Scan, ctx: RuleContext, found: Found): void {
  const today = todayIn(ctx);
  // Chrono reads components on the reference's calendar; noon UTC of our local date with offset 0
  // keeps its calendar equal to the speaker's local calendar whatever the machine's zone.
  const ref = { instant: new Date(Date.UTC(today.year, today.month - 1, today.day, 12)), timezone: 0 };
  const results = chrono.parse(scan.work, ref, { forwardDate: true });
  for (const r of results) {
    if (!RELATIVE_DATE.test(r.text)) continue;
    if (/\b(?:weeks?|weekends?|months?|years?)\b/.test(r.text)) {
      scan.issues.push({
        code: 'rule_ambiguous',
        path: ['dates'],
        message: `'${r.text.trim()}' does not name the days exactly; say the first and last day, like 'from the 21st to the 2nd'`,
        suggestions: [],
      });
      scan.blank(r.index, r.text.length);
      continue;
    }
    const slash = /\b(\d{1,2})[/.](\d{1,2})\b/.exec(r.text);
    if (slash !== null && Number(slash[1]) <= 12 && Number(slash[2]) <= 12 && slash[1] !== slash[2]) {
      scan.issues.push({
        code: 'rule_ambiguous',
        path: ['dates'],
        message: `'${r.text}' could be read day-first or month-first; write the date as YYYY-MM-DD or with the month's name`,
        suggestions: [],
      });
      scan.blank(r.index, r.text.length);
      continue;
    }
    const toDate = (c: chrono.ParsedComponents): Temporal.PlainDate =>
      Temporal.PlainDate.from({ year: c.get('year')!, month: c.get('month')!, day: c.get('day')! });
    const until = /\b(?:until|till|through|thru)\s+$/.exec(scan.work.slice(0, r.index));
    const single = r.end === null || r.end === undefined;
    const start = until !== null && single ? today : toDate(r.start);
    let end = single ? toDate(r.start) : toDate(r.end!);
    if (until !== null && single) scan.blank(until.index, until[0].length);
    if (Temporal.PlainDate.compare(end, start) < 0) {
      end = r.end?.isCertain('month') === true ? end.add({ years: 1 }) : end.add({ months: 1 });
    }
    found.dates.push({ from: start.toString(), to: end.toString() });
    scan.blank(r.index, r.text.length);
  }
}

function scanMarkers(scan: Scan, found: Found): void {
  scan.take(
    "\\b(?:i'?d\\s+prefer|i\\s+would\\s+prefer|would\\s+prefer|prefer(?:ably|red|s)?|i'?d\\s+rather|i\\s+would\\s+rather|would\\s+rather|rather|ideally|if\\s+possible|where\\s+possible|when\\s+possible|if\\s+you\\s+can|i'?d\\s+like|i\\s+would\\s+like|would\\s+like|like\\s+to|try\\s+to|try\\s+and|try|wish|hope)\\b",
    () => {
      found.preference = true;
    },
  );
  scan.take('\\bkeep\\b', () => {
    found.keepFree = true;
  });
  scan.take('\\b(?:block(?:\\s+(?:off|out))?|protect)\\b', () => {
    found.keepFree = true;
    found.avoid = true;
  });
  scan.take(
    "\\b(?:no|never|not|nothing|none|can'?t|cannot|won'?t|don'?t|doesn'?t|isn'?t|aren'?t|shouldn'?t|avoid|without|out|off|away|unavailable|busy|[a-z]+n't)\\b",
    () => {
      found.avoid = true;
    },
  );
  scan.take('\\b(?:only|must|has\\s+to|have\\s+to|should|always|need\\s+to|within)\\b', () => {
    found.only = true;
  });
}

function emptyFound(): Found {
  return {
    subjects: new Set(),
    preference: false,
    avoid: false,
    only: false,
    keepFree: false,
    perDay: false,
    gapUnsized: false,
    dates: [],
    clocks: [],
    parts: new Set(),
    weekdays: new Set(),
  };
}

function issue(
  code: RuleIssue['code'],
  path: string,
  message: string,
  suggestions: readonly string[],
): RuleIssue {
  return { code, path: [path], message, suggestions };
}

/** Turns what the scan found into one rule body, or explains why it cannot. */
function assemble(text: string, f: Found): RuleBody | RuleIssue {
  const weekdays = f.weekdays.size === 0 ? undefined : [...f.weekdays].sort((a, b) => a - b);
  const amountKinds = [
    f.maxMeetings !== undefined || f.maxMinutes !== undefined ? 'daily-limit' : undefined,
    f.gap !== undefined || f.gapUnsized ? 'gap' : undefined,
    f.notice !== undefined ? 'notice' : undefined,
    f.maxLength !== undefined ? 'max-length' : undefined,
  ].filter((k) => k !== undefined);
  if (amountKinds.length > 1)
    return issue(
      'rule_ambiguous',
      'kind',
      `'${text}' holds more than one rule (${amountKinds.join(', ')}); say them one at a time`,
      suggestFor(text),
    );
  if (f.clocks.length > 1)
    return issue(
      'rule_ambiguous',
      'times',
      `'${text}' names more than one time range (${f.clocks.map((c) => `'${c.text}'`).join(', ')}); say one range per rule`,
      f.clocks.map((c) => `No meetings ${c.text}`),
    );
  if (f.parts.size === 1 && f.clocks.length === 1)
    return issue(
      'rule_ambiguous',
      'times',
      `'${text}' names both a part of the day and a clock time ('${f.clocks[0]!.text}'); say one of them`,
      [`No meetings in the ${[...f.parts][0]!}`, `No meetings ${f.clocks[0]!.text}`],
    );
  if (f.parts.size > 1)
    return issue(
      'rule_ambiguous',
      'times',
      `'${text}' names more than one part of the day; say one part or one clock range per rule`,
      [...f.parts].map((p) => `No meetings in the ${p}`),
    );
  let times: TimeSpan | undefined;
  if (f.clocks.length === 1) times = f.clocks[0]!.span;
  else if (f.parts.size === 1) times = { part: [...f.parts][0]! };
  const hasWhen = weekdays !== undefined || times !== undefined || f.dates.length > 0 || f.zone !== undefined;
  const positive = (n: number | undefined, what: string): RuleIssue | undefined =>
    n !== undefined && (!Number.isInteger(n) || n < 1)
      ? issue(
          'rule_unreadable',
          what,
          `I could not read '${text}': ${what} must be a whole number of at least 1`,
          [],
        )
      : undefined;
  const kind = amountKinds[0];
  if (kind !== undefined) {
    const extra = kind === 'daily-limit' ? times !== undefined || f.dates.length > 0 : hasWhen;
    if (extra)
      return issue(
        'rule_ambiguous',
        'kind',
        `'${text}' mixes a ${kind} rule with days or times; say them as two rules`,
        suggestFor(text),
      );
  }
  switch (kind) {
    case 'daily-limit': {
      const bad = positive(f.maxMeetings, 'meetings') ?? positive(f.maxMinutes, 'minutes');
      if (bad !== undefined) return bad;
      if (!f.perDay && weekdays === undefined)
        return issue(
          'rule_ambiguous',
          'daily-limit',
          `'${text}' gives a limit but not over what; say 'per day' or name the weekdays`,
          [`${text} per day`],
        );
      return {
        kind: 'daily-limit',
        ...(f.maxMeetings === undefined ? {} : { maxMeetings: f.maxMeetings }),
        ...(f.maxMinutes === undefined ? {} : { maxMinutes: f.maxMinutes }),
        ...(weekdays === undefined ? {} : { weekdays }),
      };
    }
    case 'gap':
      if (f.gap === undefined)
        return issue('rule_ambiguous', 'gap', `How many minutes should stay free between meetings?`, [
          'At least 10 minutes between meetings',
          'At least 15 minutes between meetings',
        ]);
      return positive(f.gap, 'minutes') ?? { kind: 'gap', minutes: f.gap };
    case 'notice':
      return positive(f.notice, 'minutes') ?? { kind: 'notice', minutes: f.notice! };
    case 'max-length':
      return positive(f.maxLength, 'minutes') ?? { kind: 'max-length', minutes: f.maxLength! };
  }
  if (f.dates.length > 1)
    return issue(
      'rule_ambiguous',
      'dates',
      `'${text}' names more than one date or range; say one per rule`,
      f.dates.map((d) =>
        d.from === d.to ? `No meetings on ${d.from}` : `No meetings from ${d.from} to ${d.to}`,
      ),
    );
  const zone = f.zone === undefined ? {} : { zone: f.zone };
  const timesField = times === undefined ? {} : { times };
  if (f.dates.length === 1) {
    if (weekdays !== undefined)
      return issue('rule_ambiguous', 'dates', `'${text}' names both dates and weekdays; say one of them`, []);
    const mode = f.avoid || f.keepFree ? 'avoid' : f.only || f.preference ? 'only' : undefined;
    if (mode === undefined)
      return issue(
        'rule_ambiguous',
        'mode',
        `Should '${text}' keep meetings off those dates, or only on them?`,
        [`No meetings ${dateWords(f.dates[0]!)}`, `Meetings only ${dateWords(f.dates[0]!)}`],
      );
    return { kind: 'dates', mode, ...f.dates[0]!, ...timesField, ...zone };
  }
  if (weekdays === undefined && times === undefined)
    return issue('rule_unreadable', 'text', `I could not read '${text}' as a rule`, suggestFor(text));
  if (f.keepFree)
    return { kind: 'keep-free', ...(weekdays === undefined ? {} : { weekdays }), ...timesField, ...zone };
  const mode = f.avoid ? 'avoid' : f.only || f.preference ? 'only' : undefined;
  if (mode === undefined) {
    const when = describeRule({
      subject: { kind: 'speaker' },
      strength: 'hard',
      body: {
        kind: 'window',
        mode: 'avoid',
        ...(weekdays === undefined ? {} : { weekdays }),
        ...timesField,
        ...zone,
      },
    }).replace(/^No meetings /, '');
    return issue(
      'rule_ambiguous',
      'mode',
      `Should '${text}' keep meetings out of that time, or only in it?`,
      [`No meetings ${when}`, `Meetings only ${when}`],
    );
  }
  return { kind: 'window', mode, ...(weekdays === undefined ? {} : { weekdays }), ...timesField, ...zone };
}

function dateWords(d: { from: string; to: string }): string {
  return d.from === d.to ? `on ${d.from}` : `from ${d.from} to ${d.to}`;
}

/**
 * Reads one rule said in plain words. Stable behaviour the config loader relies on: the same text,
 * context and `now` always give the same result; nothing is guessed silently (a bare hour that could
 * be am or pm, a sentence holding two rules, or a time range with no 'no'/'only' is returned as a
 * `rule_ambiguous` issue); any word we cannot place is named in a `rule_unreadable` issue with the
 * closest sentences we understand. Relative dates ("the 24th", "next Friday") are read on the
 * calendar of `context.zone` at `context.now`.
 */
export function parseRule(text: string, context: RuleContext): RuleParse {
  const trimmed = text.trim().replace(/[.!]+$/, '');
  if (trimmed === '')
    return {
      ok: false,
      issues: [issue('rule_unreadable', 'text', 'I could not read an empty rule', suggestFor(''))],
    };
  const scan = new Scan(trimmed);
  const found = emptyFound();
  scanSubject(scan, context, found);
  scanAmounts(scan, found);
  scanDates(scan, context, found);
  scanClocks(scan, found);
  scanZone(scan, found);
  scanPeriods(scan, context, found);
  scanDays(scan, found);
  scanChrono(scan, context, found);
  scanMarkers(scan, found);
  if (scan.issues.length > 0) return { ok: false, issues: scan.issues };
  const unread = scan.unread();
  if (unread.length > 0)
    return {
      ok: false,
      issues: [
        issue(
          'rule_unreadable',
          'text',
          `I could not read ${unread.map((u) => `'${u}'`).join(' and ')} in '${trimmed}'`,
          suggestFor(trimmed),
        ),
      ],
    };
  if (found.subjects.size > 1)
    return {
      ok: false,
      issues: [
        issue(
          'rule_ambiguous',
          'subject',
          `'${trimmed}' names more than one person, room or group; say one per rule`,
          [],
        ),
      ],
    };
  const body = assemble(trimmed, found);
  if ('code' in body) return { ok: false, issues: [body] };
  const candidate: Rule = {
    subject: found.subject ?? { kind: 'speaker' },
    strength: found.preference ? 'preference' : 'hard',
    body,
  };
  const checked = ruleSchema.safeParse(candidate);
  if (!checked.success)
    return {
      ok: false,
      issues: [
        issue(
          'rule_unreadable',
          'text',
          `I could not read '${trimmed}': ${checked.error.issues[0]?.message ?? 'it does not form a rule'}`,
          suggestFor(trimmed),
        ),
      ],
    };
  return { ok: true, rule: checked.data, text: describeRule(checked.data) };
}
