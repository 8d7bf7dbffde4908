// An independent checker of the curriculum-based course timetabling rules (ITC-2007 track 3, the UD2
// formulation as written in bench/data/cbctt/README.md), kept deliberately simple and separate from
// src/ so it can catch mistakes in our own model and scorer. It reads the instance and the solution
// as plain text.

/** The counts a solution gets under the benchmark's rules. */
export interface CbcttVerdict {
  /** Lectures not placed, or placed more often than the course has. */
  readonly missing: number;
  /** Two lectures in one room in one period (per extra lecture). */
  readonly roomClashes: number;
  /** Two lectures of one teacher, one curriculum or one course in one period (per pair). */
  readonly conflicts: number;
  /** Lectures in a period unavailable to their course. */
  readonly unavailable: number;
  readonly hard: number;
  readonly capacity: number;
  readonly minDays: number;
  readonly compactness: number;
  readonly stability: number;
  readonly soft: number;
}

export function checkCbctt(instanceText: string, solutionText: string): CbcttVerdict {
  const lines = instanceText.split('\n').map((l) => l.trim());
  const sectionLines = (name: string): string[][] => {
    const from = lines.indexOf(`${name}:`);
    const out: string[][] = [];
    for (
      let i = from + 1;
      i < lines.length && lines[i] !== '' && !lines[i]!.endsWith(':') && lines[i] !== 'END.';
      i++
    )
      out.push(lines[i]!.split(/\s+/));
    return out;
  };
  const courses = new Map(
    sectionLines('COURSES').map((f) => [
      f[0]!,
      { teacher: f[1]!, lectures: +f[2]!, minDays: +f[3]!, students: +f[4]! },
    ]),
  );
  const capacity = new Map(sectionLines('ROOMS').map((f) => [f[0]!, +f[1]!]));
  const curricula = sectionLines('CURRICULA').map((f) => f.slice(2));
  const blocked = new Set(sectionLines('UNAVAILABILITY_CONSTRAINTS').map((f) => `${f[0]} ${f[1]} ${f[2]}`));
  const placed = solutionText
    .split('\n')
    .map((l) => l.trim())
    .filter((l) => l !== '')
    .map((l) => {
      const [course, room, day, period] = l.split(/\s+/);
      return { course: course!, room: room!, day: +day!, period: +period! };
    });

  let missing = 0;
  for (const [id, c] of courses)
    missing += Math.abs(c.lectures - placed.filter((p) => p.course === id).length);
  let roomClashes = 0;
  const roomUse = new Map<string, number>();
  for (const p of placed) {
    const k = `${p.room} ${p.day} ${p.period}`;
    roomUse.set(k, (roomUse.get(k) ?? 0) + 1);
  }
  for (const n of roomUse.values()) roomClashes += n - 1;
  // conflicts: every pair of lectures in the same period that share a course, a teacher or a curriculum
  let conflicts = 0;
  for (let i = 0; i < placed.length; i++)
    for (let j = i + 1; j < placed.length; j++) {
      const a = placed[i]!;
      const b = placed[j]!;
      if (a.day !== b.day || a.period !== b.period) continue;
      const same =
        a.course === b.course ||
        courses.get(a.course)!.teacher === courses.get(b.course)!.teacher ||
        curricula.some((q) => q.includes(a.course) && q.includes(b.course));
      if (same) conflicts++;
    }
  const unavailable = placed.filter((p) => blocked.has(`${p.course} ${p.day} ${p.period}`)).length;

  let cap = 0;
  for (const p of placed) cap += Math.max(0, courses.get(p.course)!.students - capacity.get(p.room)!);
  let minDays = 0;
  let stability = 0;
  for (const [id, c] of courses) {
    const mine = placed.filter((p) => p.course === id);
    const days = new Set(mine.map((p) => p.day)).size;
    minDays += 5 * Math.max(0, c.minDays - days);
    stability += Math.max(0, new Set(mine.map((p) => p.room)).size - 1);
  }
  let compactness = 0;
  for (const q of curricula) {
    const mine = placed.filter((p) => q.includes(p.course));
    for (const p of mine) {
      const neighbour = mine.some(
        (o) => o !== p && o.day === p.day && (o.period === p.period - 1 || o.period === p.period + 1),
      );
      if (!neighbour) compactness += 2;
    }
  }
  return {
    missing,
    roomClashes,
    conflicts,
    unavailable,
    hard: missing + roomClashes + conflicts + unavailable,
    capacity: cap,
    minDays,
    compactness,
    stability,
    soft: cap + minDays + compactness + stability,
  };
}
