import { SlotwrightError } from '../../errors.ts';
import {
  type PlacedSession,
  type WeekAttendee,
  type WeekRequest,
  type WeekSeries,
  ZERO_WEIGHTS,
} from './week-request.ts';

/** A curriculum-based course timetabling instance (the `.ctt` text format of ITC-2007 track 3). */
export interface CbcttInstance {
  readonly name: string;
  readonly days: number;
  readonly periodsPerDay: number;
  readonly courses: readonly {
    readonly id: string;
    readonly teacher: string;
    readonly lectures: number;
    readonly minDays: number;
    readonly students: number;
  }[];
  readonly rooms: readonly { readonly id: string; readonly capacity: number }[];
  readonly curricula: readonly { readonly id: string; readonly courses: readonly string[] }[];
  readonly unavailable: readonly { readonly course: string; readonly day: number; readonly period: number }[];
}

function bad(message: string, line: number): never {
  throw new SlotwrightError('bad_argument', `cbctt line ${line}: ${message}`);
}

/** Parses the `.ctt` text format; throws a SlotwrightError naming the line that is wrong. */
export function parseCbctt(text: string): CbcttInstance {
  const header = new Map<string, string>();
  const courses: { id: string; teacher: string; lectures: number; minDays: number; students: number }[] = [];
  const rooms: { id: string; capacity: number }[] = [];
  const curricula: { id: string; courses: string[] }[] = [];
  const unavailable: { course: string; day: number; period: number }[] = [];
  let section = '';
  const int = (s: string | undefined, line: number): number => {
    if (s === undefined || !/^\d+$/.test(s)) bad(`expected a whole number, got '${s ?? ''}'`, line);
    return Number(s);
  };
  text.split(/\r?\n/).forEach((raw, i) => {
    const line = i + 1;
    const t = raw.trim();
    if (t === '' || t === 'END.') return;
    const head = /^([A-Za-z_]+):\s*(.*)$/.exec(t);
    if (head !== null) {
      if (head[2] === '') section = head[1]!.toUpperCase();
      else header.set(head[1]!, head[2]!);
      return;
    }
    const f = t.split(/\s+/);
    if (section === 'COURSES') {
      if (f.length !== 5) bad('a course line is "<course> <teacher> <lectures> <min_days> <students>"', line);
      courses.push({
        id: f[0]!,
        teacher: f[1]!,
        lectures: int(f[2], line),
        minDays: int(f[3], line),
        students: int(f[4], line),
      });
    } else if (section === 'ROOMS') {
      if (f.length !== 2) bad('a room line is "<room> <capacity>"', line);
      rooms.push({ id: f[0]!, capacity: int(f[1], line) });
    } else if (section === 'CURRICULA') {
      const n = int(f[1], line);
      if (f.length !== n + 2) bad(`curriculum ${f[0]} lists ${f.length - 2} courses, not ${n}`, line);
      curricula.push({ id: f[0]!, courses: f.slice(2) });
    } else if (section === 'UNAVAILABILITY_CONSTRAINTS') {
      if (f.length !== 3) bad('an unavailability line is "<course> <day> <period>"', line);
      unavailable.push({ course: f[0]!, day: int(f[1], line), period: int(f[2], line) });
    } else bad(`unexpected line outside a known section: '${t}'`, line);
  });
  const days = Number(header.get('Days'));
  const periodsPerDay = Number(header.get('Periods_per_day'));
  if (!(days > 0) || !(periodsPerDay > 0)) bad('the header needs Days and Periods_per_day', 1);
  return { name: header.get('Name') ?? '', days, periodsPerDay, courses, rooms, curricula, unavailable };
}

/** The benchmark's weights on our preference kinds (room capacity, minimum working days, compactness, room stability). */
export const CBCTT_WEIGHTS = { ...ZERO_WEIGHTS, seats: 1, spread: 5, isolated: 2, roomStability: 1 } as const;

/**
 * Turns an instance into a week-plan request: a course is a series of `lectures` one-period sessions
 * over at least `min_working_days` days; its teacher and each curriculum it belongs to attend all of
 * them; curricula opt in to compactness; unavailable periods are hard; seats are a cost.
 */
export function cbcttToWeekRequest(inst: CbcttInstance): WeekRequest {
  const P = inst.periodsPerDay;
  const hour = 3_600_000;
  const cells = Array.from({ length: inst.days * P }, (_, c) => {
    const day = Math.floor(c / P);
    // a synthetic timeline: day d starts at d * 24 h, period p is the p-th hour of it
    const start = day * 24 * hour + (c % P) * hour;
    return { start, end: start + hour, day };
  });
  const attendees: WeekAttendee[] = [];
  const index = new Map<string, number>();
  const attendee = (id: string, compact: boolean): number => {
    const key = `${compact ? 'q' : 't'}:${id}`;
    let i = index.get(key);
    if (i === undefined) {
      i = attendees.length;
      attendees.push({ id, compact });
      index.set(key, i);
    }
    return i;
  };
  const curriculaOf = new Map<string, number[]>();
  for (const q of inst.curricula) {
    const a = attendee(q.id, true);
    for (const c of q.courses) curriculaOf.set(c, [...(curriculaOf.get(c) ?? []), a]);
  }
  const blocked = new Map<string, Set<number>>();
  for (const u of inst.unavailable) {
    const s = blocked.get(u.course) ?? new Set<number>();
    s.add(u.day * P + u.period);
    blocked.set(u.course, s);
  }
  const series: WeekSeries[] = inst.courses.map((c) => {
    const no = blocked.get(c.id);
    return {
      id: c.id,
      attendees: [attendee(c.teacher, false), ...(curriculaOf.get(c.id) ?? [])],
      sessions: c.lectures,
      minDays: c.minDays,
      length: 1,
      ...(no === undefined ? {} : { allowed: cells.map((_, i) => !no.has(i)) }),
      room: { seats: c.students, features: [] },
    };
  });
  return {
    cells,
    days: inst.days,
    rooms: inst.rooms.map((r) => ({ id: r.id, seats: r.capacity, features: [] })),
    attendees,
    series,
    weights: CBCTT_WEIGHTS,
    seatsHard: false,
  };
}

/** Writes placed sessions in the benchmark's solution format, `<course> <room> <day> <period>` per line. */
export function formatCbcttSolution(inst: CbcttInstance, sessions: readonly PlacedSession[]): string {
  return sessions
    .map(
      (s) =>
        `${s.series} ${s.room ?? ''} ${Math.floor(s.cell / inst.periodsPerDay)} ${s.cell % inst.periodsPerDay}`,
    )
    .join('\n')
    .concat(sessions.length > 0 ? '\n' : '');
}
