import { DEFAULT_DAY_PARTS, type Rule } from '../../../src/rules/rule.ts';
import type { BusyInterval } from '../../../src/time/interval.ts';

// An independent judge of rules for tests: reads wall clocks with the runtime's ICU time-zone data
// (Intl.DateTimeFormat), not Temporal and not src/time, and decides from the rule's structure alone.

const MIN = 60_000;
const formatters = new Map<string, Intl.DateTimeFormat>();

/** Local date, ISO weekday and minutes since midnight of an instant, from ICU. */
export function wall(t: number, zone: string): { date: string; weekday: number; minutes: number } {
  let f = formatters.get(zone);
  if (f === undefined) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone: zone,
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      weekday: 'short',
      hourCycle: 'h23',
    });
    formatters.set(zone, f);
  }
  const p = Object.fromEntries(f.formatToParts(new Date(t)).map((x) => [x.type, x.value]));
  return {
    date: `${p.year}-${p.month}-${p.day}`,
    weekday: ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'].indexOf(p.weekday!) + 1,
    minutes: Number(p.hour) * 60 + Number(p.minute),
  };
}

/** Whether a meeting [start, end) of a person in `zone` breaks `rule`, given their busy time. */
export function breaksRule(
  rule: Rule,
  meeting: { readonly start: number; readonly end: number },
  zone: string,
  now: number,
  busy: readonly BusyInterval[],
): boolean {
  const b = rule.body;
  switch (b.kind) {
    case 'notice':
      return meeting.start < now + b.minutes * MIN;
    case 'max-length':
      return meeting.end - meeting.start > b.minutes * MIN;
    case 'gap':
      return busy.some(
        (x) => x.start < meeting.end + b.minutes * MIN && x.end > meeting.start - b.minutes * MIN,
      );
    case 'daily-limit': {
      const day = wall(meeting.start, zone);
      if (b.weekdays !== undefined && !b.weekdays.includes(day.weekday)) return false;
      const same = busy.filter((x) => wall(x.start, zone).date === day.date);
      const minutes =
        same.reduce((n, x) => n + (x.end - x.start) / MIN, 0) + (meeting.end - meeting.start) / MIN;
      return (
        (b.maxMeetings !== undefined && same.length + 1 > b.maxMeetings) ||
        (b.maxMinutes !== undefined && minutes > b.maxMinutes)
      );
    }
    default: {
      const z = b.zone ?? zone;
      const span =
        b.times === undefined
          ? { from: 0, to: 1440 }
          : 'part' in b.times
            ? DEFAULT_DAY_PARTS[b.times.part]
            : b.times;
      // meetings start and end on the 5-minute grid, so checking every 5 minutes covers every minute
      for (let t = meeting.start; t < meeting.end; t += 5 * MIN) {
        const w = wall(t, z);
        const inDays =
          b.kind === 'dates'
            ? w.date >= b.from && w.date <= b.to
            : b.weekdays === undefined || b.weekdays.includes(w.weekday);
        const inside = inDays && w.minutes >= span.from && w.minutes < span.to;
        if (b.kind === 'keep-free' || b.mode === 'avoid' ? inside : !inside) return true;
      }
      return false;
    }
  }
}
