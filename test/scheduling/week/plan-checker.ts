// An independent checker of week-plan hard rules, written against the request's instants rather than
// the engine's value encoding: every session inside its attendees' and room's free time, no person
// or room in two sessions at once, sessions of one series apart, each series placed whole or not at all.
import type { PlacedSession, WeekRequest } from '../../../src/scheduling/week/index.ts';

export function planProblems(request: WeekRequest, sessions: readonly PlacedSession[]): string[] {
  const problems: string[] = [];
  const series = new Map(request.series.map((s) => [s.id, s]));
  const rooms = new Map(request.rooms.map((r, i) => [r.id, { ...r, index: i }]));
  const spans = sessions.map((p, k) => {
    const s = series.get(p.series);
    if (s === undefined) {
      problems.push(`session ${k}: unknown series ${p.series}`);
      return null;
    }
    const first = request.cells[p.cell];
    const last = request.cells[p.cell + s.length - 1];
    if (first === undefined || last === undefined) {
      problems.push(`session ${k} (${p.series}): runs off the grid`);
      return null;
    }
    // the cells must be back to back on one day
    for (let c = p.cell + 1; c < p.cell + s.length; c++) {
      if (request.cells[c]!.start !== request.cells[c - 1]!.end || request.cells[c]!.day !== first.day)
        problems.push(`session ${k} (${p.series}): crosses a gap or a day`);
    }
    if (s.allowed !== undefined && s.allowed[p.cell] !== true)
      problems.push(`session ${k} (${p.series}): start not allowed`);
    for (const a of s.attendees) {
      const free = request.attendees[a]!.free;
      for (let c = p.cell; c < p.cell + s.length; c++)
        if (free !== undefined && free[c] !== true)
          problems.push(`session ${k} (${p.series}): ${request.attendees[a]!.id} is not free`);
    }
    if (s.room === undefined) {
      if (p.room !== null) problems.push(`session ${k} (${p.series}): takes a room it does not need`);
    } else {
      const r = p.room === null ? undefined : rooms.get(p.room);
      if (r === undefined) problems.push(`session ${k} (${p.series}): needs a room`);
      else {
        if (!s.room.features.every((f) => r.features.includes(f)))
          problems.push(`session ${k}: room lacks a feature`);
        if (request.seatsHard && r.seats < s.room.seats) problems.push(`session ${k}: room too small`);
        if (s.room.only !== undefined && !s.room.only.includes(r.id))
          problems.push(`session ${k}: room not allowed`);
        for (let c = p.cell; c < p.cell + s.length; c++)
          if (r.free !== undefined && r.free[c] !== true) problems.push(`session ${k}: room ${r.id} is busy`);
      }
    }
    return { series: s, start: first.start, end: last.end, room: p.room };
  });
  for (let i = 0; i < spans.length; i++)
    for (let j = i + 1; j < spans.length; j++) {
      const a = spans[i];
      const b = spans[j];
      if (a == null || b == null || a.end <= b.start || b.end <= a.start) continue;
      if (a.series === b.series) problems.push(`sessions ${i} and ${j} of ${a.series.id} overlap`);
      const shared = a.series.attendees.filter((x) => b.series.attendees.includes(x));
      if (shared.length > 0)
        problems.push(
          `sessions ${i} (${a.series.id}) and ${j} (${b.series.id}) overlap for ${request.attendees[shared[0]!]!.id}`,
        );
      if (a.room !== null && a.room === b.room)
        problems.push(`sessions ${i} and ${j} double-book room ${a.room}`);
    }
  for (const s of request.series) {
    const n = sessions.filter((p) => p.series === s.id).length;
    if (n !== 0 && n !== s.sessions) problems.push(`series ${s.id}: ${n} of ${s.sessions} sessions placed`);
  }
  return problems;
}
