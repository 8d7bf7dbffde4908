import type { ZoneClock } from '../time/working-hours.ts';
import { hasBit, runEndAt, runStartAt } from './bits.ts';
import { type AttendeeView, type Prepared, padTicks } from './prepare.ts';
import type { ScorePart } from './types.ts';

// The fit score of an option is 100 plus the points of its parts; every part is zero or negative, so
// 100 means nothing counts against it. The solver minimises the same sum as a cost (cost = -points).
// Weights are our own plain choices, kept here in one place.

/** Minutes at either end of a working stretch that count as early or late. */
export const EDGE_MINUTES = 60;
/** Points per minute of meeting inside the early or late edge of someone's working stretch. */
export const EDGE_POINTS_PER_MINUTE = 0.1;
/** Points per day between the window opening and the start (sooner over later). */
export const LATER_POINTS_PER_DAY = 0.5;
/** A free gap shorter than this, left before or after the meeting, fragments a day. */
export const SHORT_GAP_MINUTES = 30;
/** Points per short gap left in someone's day. */
export const SHORT_GAP_POINTS = 2;
/** Points when the meeting splits a long free stretch in two (both sides stay usable). */
export const SPLIT_POINTS = 1;
/** Points per optional attendee who cannot come. */
export const OPTIONAL_MISSING_POINTS = 10;
/** Points per attendee whose tentative time the meeting overlaps. */
export const TENTATIVE_POINTS = 8;
/** Points per preference the option goes against. */
export const PREFERENCE_POINTS = 10;
/** Points per spare seat in the chosen room, at most ROOM_SPARE_CAP in all. */
export const ROOM_SPARE_POINTS = 0.25;
/** Largest penalty for a room bigger than needed. */
export const ROOM_SPARE_CAP = 5;
/** Points for a room in a zone where none of the attendees is (likely another office). */
export const ROOM_AWAY_POINTS = 20;

const DAY_MS = 86_400_000;

function round2(x: number): number {
  return Math.round(x * 100) / 100;
}

function names(list: readonly string[]): string {
  return list.length <= 4 ? list.join(', ') : `${list.slice(0, 4).join(', ')} and ${list.length - 4} more`;
}

function hhmm(instant: number, clock: ZoneClock): string {
  const m = Math.floor(((((instant + clock.offsetAt(instant)) % DAY_MS) + DAY_MS) % DAY_MS) / 60_000);
  return `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;
}

/** Attendees who take part at a start: every required one, and optional ones whose hard layer allows it. */
function present(p: Prepared, s: number): AttendeeView[] {
  return p.attendees.filter((a) => a.required || hasBit(a.ok, s));
}

/**
 * The named parts of the score of start index `s` (people's side). With `words` false the parts carry
 * no text (the solver only needs the sum), which keeps the cost table cheap to fill.
 */
export function startParts(p: Prepared, s: number, words: boolean): ScorePart[] {
  const parts: ScorePart[] = [];
  const tickMin = p.grid.tickMs / 60_000;
  const startAt = p.grid.origin + s * p.grid.tickMs;
  // on the padded grid of workTicks and freeTicks
  const sx = s + padTicks(p.grid);
  const ex = sx + p.lengthTicks; // one past the last tick
  const edgeTicks = EDGE_MINUTES / tickMin;
  const who = present(p, s);

  const daysOut = (startAt - p.grid.origin) / DAY_MS;
  const later = round2(-LATER_POINTS_PER_DAY * daysOut);
  if (later !== 0)
    parts.push({ why: words ? `${daysOut.toFixed(1)} days after the window opens` : '', points: later });

  let edge = 0;
  const edgeWho: string[] = [];
  let gaps = 0;
  const gapWho: string[] = [];
  let splits = 0;
  const splitWho: string[] = [];
  for (const a of who) {
    if (hasBit(a.workTicks, sx) && runEndAt(a.workTicks, sx) >= ex) {
      const ws = runStartAt(a.workTicks, sx);
      const we = runEndAt(a.workTicks, sx);
      const early = Math.max(0, Math.min(ex, ws + edgeTicks) - sx);
      const late = Math.max(0, ex - Math.max(sx, we - edgeTicks));
      const minutes = (early + late) * tickMin;
      if (minutes > 0) {
        edge += minutes * EDGE_POINTS_PER_MINUTE;
        if (words) edgeWho.push(`${a.person.id} (${hhmm(startAt, a.clock)} ${a.person.zone})`);
      }
    }
    if (hasBit(a.freeTicks, sx) && runEndAt(a.freeTicks, sx) >= ex) {
      const fs = runStartAt(a.freeTicks, sx);
      const fe = runEndAt(a.freeTicks, sx);
      const before = (sx - fs) * tickMin;
      const after = (fe - ex) * tickMin;
      let short = 0;
      if (before > 0 && before < SHORT_GAP_MINUTES) short++;
      if (after > 0 && after < SHORT_GAP_MINUTES) short++;
      if (short > 0) {
        gaps += short;
        if (words) gapWho.push(a.person.id);
      } else if (before >= SHORT_GAP_MINUTES && after >= SHORT_GAP_MINUTES) {
        splits++;
        if (words) splitWho.push(a.person.id);
      }
    }
  }
  if (edge > 0)
    parts.push({ why: words ? `early or late in the day for ${names(edgeWho)}` : '', points: round2(-edge) });
  if (gaps > 0)
    parts.push({
      why: words ? `leaves gaps under ${SHORT_GAP_MINUTES} minutes for ${names(gapWho)}` : '',
      points: round2(-gaps * SHORT_GAP_POINTS),
    });
  if (splits > 0)
    parts.push({
      why: words ? `splits a long free stretch for ${names(splitWho)}` : '',
      points: round2(-splits * SPLIT_POINTS),
    });

  const missing = p.attendees.filter((a) => !a.required && !hasBit(a.ok, s));
  if (missing.length > 0)
    parts.push({
      why: words ? `optional ${names(missing.map((a) => a.person.id))} cannot come` : '',
      points: -missing.length * OPTIONAL_MISSING_POINTS,
    });
  const tentative = who.filter((a) => a.tentative !== null && hasBit(a.tentative, s));
  if (tentative.length > 0)
    parts.push({
      why: words ? `overlaps tentative time of ${names(tentative.map((a) => a.person.id))}` : '',
      points: -tentative.length * TENTATIVE_POINTS,
    });
  for (const a of who) {
    for (const pref of a.prefs) {
      if (hasBit(pref.clash, s))
        parts.push({
          why: words ? `against ${a.person.id}'s preference: ${pref.text}` : '',
          points: -PREFERENCE_POINTS,
        });
    }
  }
  return parts;
}

/** The room's part of the score: spare seats beyond what is needed. */
export function roomParts(p: Prepared, room: number, words: boolean): ScorePart[] {
  if (p.rooms === null) return [];
  const r = p.rooms[room]!.room;
  const parts: ScorePart[] = [];
  const spare = r.capacity - p.seats;
  if (spare > 0) {
    const points = round2(-Math.min(ROOM_SPARE_CAP, spare * ROOM_SPARE_POINTS));
    parts.push({ why: words ? `${r.id} has ${spare} more seats than needed` : '', points });
  }
  // a room in a zone none of the attendees works in is most likely in another office
  if (!p.attendees.some((a) => a.person.zone === r.zone))
    parts.push({
      why: words ? `${r.id} is in ${r.zone}, where none of the attendees is` : '',
      points: -ROOM_AWAY_POINTS,
    });
  return parts;
}

/** Sum of the points of parts, as a non-negative cost for the solver. */
export function costOf(parts: readonly ScorePart[]): number {
  let c = 0;
  for (const part of parts) c -= part.points;
  return round2(c);
}

/** The score and breakdown of start index `s` with room index `room` (-1 for none). */
export function scoreOf(
  p: Prepared,
  s: number,
  room: number,
): { readonly score: number; readonly breakdown: ScorePart[] } {
  const breakdown = [...startParts(p, s, true), ...(room >= 0 ? roomParts(p, room, true) : [])];
  return { score: round2(100 - costOf(breakdown)), breakdown };
}
