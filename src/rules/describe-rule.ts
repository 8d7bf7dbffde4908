import type { Rule, RuleBody, RuleSubject, TimeSpan } from './rule.ts';

const DAY_NAMES = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'] as const;

/** A clock time in minutes since midnight as we say it: "10am", "4:30pm", "noon", "midnight". */
export function formatClock(minutes: number): string {
  if (minutes === 720) return 'noon';
  if (minutes === 0 || minutes === 1440) return 'midnight';
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  const h12 = h % 12 === 0 ? 12 : h % 12;
  const suffix = h < 12 ? 'am' : 'pm';
  return m === 0 ? `${h12}${suffix}` : `${h12}:${String(m).padStart(2, '0')}${suffix}`;
}

/** A duration in minutes as we say it: "45 minutes", "1 hour", "3 hours", "90 minutes". */
export function formatDuration(minutes: number): string {
  if (minutes % 60 === 0) {
    const h = minutes / 60;
    return h === 1 ? '1 hour' : `${h} hours`;
  }
  return minutes === 1 ? '1 minute' : `${minutes} minutes`;
}

function joinList(items: readonly string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

function dayList(weekdays: readonly number[], plural: boolean): string {
  const sorted = [...new Set(weekdays)].sort((a, b) => a - b);
  if (sorted.join() === '1,2,3,4,5') return plural ? 'weekdays' : 'weekday';
  if (sorted.join() === '6,7') return plural ? 'weekends' : 'weekend';
  return joinList(sorted.map((d) => `${DAY_NAMES[d - 1]}${plural ? 's' : ''}`));
}

function clockPhrase(span: { from: number; to: number }): string {
  if (span.from === 0) return `before ${formatClock(span.to)}`;
  if (span.to === 1440) return `after ${formatClock(span.from)}`;
  return `between ${formatClock(span.from)} and ${formatClock(span.to)}`;
}

/** "on Tuesday mornings", "on Fridays after 3pm", "in the afternoon", plus a named zone. */
function whenPhrase(
  weekdays: readonly number[] | undefined,
  times: TimeSpan | undefined,
  zone?: string,
): string {
  const parts: string[] = [];
  if (times !== undefined && 'part' in times) {
    parts.push(
      weekdays === undefined ? `in the ${times.part}` : `on ${dayList(weekdays, false)} ${times.part}s`,
    );
  } else {
    if (weekdays !== undefined) parts.push(`on ${dayList(weekdays, true)}`);
    if (times !== undefined) parts.push(clockPhrase(times));
  }
  if (zone !== undefined) parts.push(`${zone} time`);
  return parts.join(' ');
}

function dateRangePhrase(from: string, to: string): string {
  return from === to ? `on ${from}` : `from ${from} to ${to}`;
}

function subjectPrefix(subject: RuleSubject): string {
  switch (subject.kind) {
    case 'speaker':
      return '';
    case 'person':
      return `For ${subject.id}: `;
    case 'room':
      return `For room ${subject.id}: `;
    case 'group':
      return `For group ${subject.id}: `;
  }
}

function bodySentence(body: RuleBody, preference: boolean): string {
  const lead = (hard: string, soft: string): string => (preference ? soft : hard);
  switch (body.kind) {
    case 'window': {
      const when = whenPhrase(body.weekdays, body.times, body.zone);
      return body.mode === 'avoid'
        ? `${lead('No meetings', 'Prefer no meetings')} ${when}`
        : `${lead('Meetings only', 'Prefer meetings')} ${when}`;
    }
    case 'dates': {
      const extra = body.times === undefined ? '' : ` ${whenPhrase(undefined, body.times, body.zone)}`;
      const zoneOnly = body.times === undefined && body.zone !== undefined ? ` ${body.zone} time` : '';
      const when = `${dateRangePhrase(body.from, body.to)}${extra}${zoneOnly}`;
      return body.mode === 'avoid'
        ? `${lead('No meetings', 'Prefer no meetings')} ${when}`
        : `${lead('Meetings only', 'Prefer meetings')} ${when}`;
    }
    case 'keep-free': {
      let what: string;
      if (body.times !== undefined && 'part' in body.times) {
        what =
          body.weekdays === undefined
            ? `${body.times.part}s`
            : `${dayList(body.weekdays, false)} ${body.times.part}s`;
      } else {
        const bits: string[] = [];
        if (body.weekdays !== undefined) bits.push(dayList(body.weekdays, true));
        if (body.times !== undefined) bits.push(clockPhrase(body.times));
        what = bits.join(' ');
      }
      const zone = body.zone === undefined ? '' : ` ${body.zone} time`;
      return `${lead('Keep', 'Prefer to keep')} ${what}${zone} free`;
    }
    case 'daily-limit': {
      const limits: string[] = [];
      if (body.maxMeetings !== undefined)
        limits.push(`${body.maxMeetings} ${body.maxMeetings === 1 ? 'meeting' : 'meetings'}`);
      if (body.maxMinutes !== undefined) limits.push(`${formatDuration(body.maxMinutes)} of meetings`);
      const days = body.weekdays === undefined ? '' : ` on ${dayList(body.weekdays, true)}`;
      return `${lead('At most', 'Prefer at most')} ${limits.join(' and ')} per day${days}`;
    }
    case 'gap':
      return `${lead('At least', 'Prefer at least')} ${formatDuration(body.minutes)} between meetings`;
    case 'notice':
      return `${lead('At least', 'Prefer at least')} ${formatDuration(body.minutes)} notice`;
    case 'max-length':
      return `${lead('No meetings', 'Prefer no meetings')} longer than ${formatDuration(body.minutes)}`;
  }
}

/**
 * The normalized sentence of a rule in our own words. parseRule reads it back to the same structure
 * (given the same named people, rooms and groups), which the tests check for every phrasing.
 */
export function describeRule(rule: Rule): string {
  return `${subjectPrefix(rule.subject)}${bodySentence(rule.body, rule.strength === 'preference')}`;
}
