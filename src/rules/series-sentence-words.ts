import type { DayPart } from './rule.ts';

// Word lists and small readers for series sentences: numbers, weekdays, clock times and lengths.
// Parts of the day, zone names and durations come from the single-rule modules; these readers were
// written before those landed and could later be folded into one shared module with parse-rule.ts.

/** Weekday names as the series structure writes them, Monday first (index + 1 = ISO weekday). */
export const WEEKDAY_NAMES = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;

/** One weekday name of the series structure. */
export type WeekdayName = (typeof WEEKDAY_NAMES)[number];

/** Monday to Friday, the working week assumed when a sentence says "weekdays" or "not on Fridays". */
export const WORKING_WEEK: readonly WeekdayName[] = ['mon', 'tue', 'wed', 'thu', 'fri'];

const WEEKDAY_WORDS: Readonly<Record<string, WeekdayName>> = {
  mon: 'mon',
  monday: 'mon',
  mondays: 'mon',
  tue: 'tue',
  tues: 'tue',
  tuesday: 'tue',
  tuesdays: 'tue',
  wed: 'wed',
  weds: 'wed',
  wednesday: 'wed',
  wednesdays: 'wed',
  thu: 'thu',
  thur: 'thu',
  thurs: 'thu',
  thursday: 'thu',
  thursdays: 'thu',
  fri: 'fri',
  friday: 'fri',
  fridays: 'fri',
  sat: 'sat',
  saturday: 'sat',
  saturdays: 'sat',
  sun: 'sun',
  sunday: 'sun',
  sundays: 'sun',
};

/** Regex source matching one weekday word (longest forms first so "tuesdays" beats "tue"). */
export const WEEKDAY_PATTERN = Object.keys(WEEKDAY_WORDS)
  .sort((a, b) => b.length - a.length)
  .join('|');

/** The weekday a word names, or undefined. */
export function weekdayWord(word: string): WeekdayName | undefined {
  return WEEKDAY_WORDS[word.toLowerCase().replace(/\.$/, '')];
}

const NUMBER_WORDS: Readonly<Record<string, number>> = {
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
  forty: 40,
  'forty-five': 45,
  fifty: 50,
  sixty: 60,
  ninety: 90,
};

/** Regex source matching a whole number in digits or one of the number words above. */
export const NUMBER_PATTERN = `\\d+|${Object.keys(NUMBER_WORDS)
  .sort((a, b) => b.length - a.length)
  .join('|')}`;

/** Reads a whole number written in digits or as a word. */
export function numberWord(word: string): number | undefined {
  if (/^\d+$/.test(word)) return Number(word);
  return NUMBER_WORDS[word.toLowerCase()];
}

/** Maps the words a sentence may use to a named part of the day (bands in `DayParts`, src/rules/rule.ts). */
export const PART_OF_DAY_WORDS: Readonly<Record<string, DayPart>> = {
  morning: 'morning',
  mornings: 'morning',
  afternoon: 'afternoon',
  afternoons: 'afternoon',
  evening: 'evening',
  evenings: 'evening',
};

/** A clock time as read from a sentence: minutes since midnight, or a question when it is unclear. */
export type ClockReading =
  | { readonly kind: 'time'; readonly minutes: number }
  | { readonly kind: 'ambiguous'; readonly question: string }
  | { readonly kind: 'invalid'; readonly reason: string };

/** Regex source of one clock time: 14:00, 9, 9am, 9.30 pm, noon, midnight. */
export const CLOCK_PATTERN = String.raw`noon|midnight|\d{1,2}(?:[:.h]\d{2})?\s*(?:am|pm|a\.m\.|p\.m\.)?`;

/**
 * Reads a clock time. A bare hour from 1 to 6 without am/pm is ambiguous at work (5 could be 05:00
 * or 17:00), so it becomes a question instead of a guess; 7 to 23 are read on the 24-hour clock.
 */
export function readClock(text: string): ClockReading {
  const t = text.trim().toLowerCase().replace(/\s+/g, '');
  if (t === 'noon') return { kind: 'time', minutes: 12 * 60 };
  if (t === 'midnight') return { kind: 'time', minutes: 0 };
  const m = /^(\d{1,2})(?:[:.h](\d{2}))?(am|pm|a\.m\.|p\.m\.)?$/.exec(t);
  if (m === null) return { kind: 'invalid', reason: `'${text}' is not a clock time` };
  let hour = Number(m[1]);
  const minute = m[2] === undefined ? 0 : Number(m[2]);
  const suffix = m[3]?.replace(/\./g, '');
  if (minute > 59) return { kind: 'invalid', reason: `'${text}' has more than 59 minutes` };
  if (suffix !== undefined) {
    if (hour < 1 || hour > 12)
      return { kind: 'invalid', reason: `'${text}' mixes a 24-hour time with am/pm` };
    if (suffix === 'am' && hour === 12) hour = 0;
    if (suffix === 'pm' && hour !== 12) hour += 12;
    return { kind: 'time', minutes: hour * 60 + minute };
  }
  if (hour > 24 || (hour === 24 && minute > 0))
    return { kind: 'invalid', reason: `'${text}' is past midnight` };
  if (m[2] === undefined && hour >= 1 && hour <= 6) {
    const hh = String(hour).padStart(2, '0');
    return {
      kind: 'ambiguous',
      question: `does '${text}' mean ${hh}:00 or ${hour + 12}:00? write it as ${hh}:00 or ${hour + 12}:00`,
    };
  }
  return { kind: 'time', minutes: hour * 60 + minute };
}

/** Writes minutes since midnight as "HH:MM" (1440 as "24:00"). */
export function clockText(minutes: number): string {
  return `${String(Math.floor(minutes / 60)).padStart(2, '0')}:${String(minutes % 60).padStart(2, '0')}`;
}

/** Regex source of a session length: 45m, 45 min, 1h, 1h30, 1.5 hours, an hour, half an hour. */
export const LENGTH_PATTERN = String.raw`an hour and a half|one and a half hours?|half an hour|quarter of an hour|an hour|one hour|(?:\d+(?:\.\d+)?|${NUMBER_PATTERN})\s*(?:h|hrs?|hours?)(?:\s*(?:and\s+)?\d{1,2}\s*(?:m|mins?|minutes?)|\d{2})?|(?:${NUMBER_PATTERN})\s*(?:m|mins?|minutes?)`;

/** Reads a session length in minutes, or undefined when the text is not one. */
export function readLength(text: string): number | undefined {
  const t = text.trim().toLowerCase().replace(/\s+/g, ' ');
  const fixed: Record<string, number> = {
    'an hour and a half': 90,
    'one and a half hour': 90,
    'one and a half hours': 90,
    'half an hour': 30,
    'quarter of an hour': 15,
    'an hour': 60,
    'one hour': 60,
  };
  if (fixed[t] !== undefined) return fixed[t];
  const hm = /^(\S+?)\s*(?:h|hrs?|hours?)(?:\s*(?:and\s+)?(\d{1,2})\s*(?:m|mins?|minutes?)|(\d{2}))?$/.exec(
    t,
  );
  if (hm !== null) {
    const h = /^\d+(\.\d+)?$/.test(hm[1]!) ? Number(hm[1]) : numberWord(hm[1]!);
    if (h === undefined) return undefined;
    const total = h * 60 + Number(hm[2] ?? hm[3] ?? 0);
    return Number.isInteger(total) ? total : undefined;
  }
  const mm = /^(\S+?)\s*(?:m|mins?|minutes?)$/.exec(t);
  if (mm !== null) return numberWord(mm[1]!);
  return undefined;
}
