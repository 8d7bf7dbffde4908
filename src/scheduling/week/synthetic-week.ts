import type { WeekAttendee, WeekRequest, WeekRoom, WeekSeries, WeekWeights } from './week-request.ts';

/** Options of the synthetic organization week. */
export interface SyntheticWeekOptions {
  /** @default 300 */
  readonly series?: number;
  /** @default 200 */
  readonly people?: number;
  /** @default 25 */
  readonly rooms?: number;
  /** UTC offsets in hours of the offices. @default [-4, 0, 13] */
  readonly zones?: readonly number[];
  /** Chance that a person has a one-hour busy block on a given day (from their other meetings). @default 0.4 */
  readonly busyChance?: number;
  /** @default 1 */
  readonly seed?: number;
}

const FEATURES = ['screen', 'phone', 'whiteboard'] as const;

/** Weights of the synthetic week (invented, moderate). */
export const SYNTHETIC_WEIGHTS: WeekWeights = {
  spread: 5,
  isolated: 1,
  roomStability: 1,
  preferredDays: 2,
  preferredHours: 2,
  usualHours: 1,
  moves: 3,
  seats: 1,
  rules: 1,
};

/**
 * A seeded, invented organization week for benchmarks: offices in several zones, working hours 09-17
 * local with core hours 10-16, a busy hour on some days, teams meeting mostly within an office, some across
 * offices whose hours overlap. Five days of 48 half-hour cells (UTC).
 */
export function syntheticWeek(options: SyntheticWeekOptions = {}): WeekRequest {
  const o = { series: 300, people: 200, rooms: 25, zones: [-4, 0, 13], busyChance: 0.4, seed: 1, ...options };
  let state = o.seed >>> 0;
  const rnd = (): number => {
    // mulberry32
    state = (state + 0x6d2b79f5) | 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const int = (n: number): number => Math.floor(rnd() * n);
  const days = 5;
  const perDay = 48;
  const half = 1_800_000;
  // Monday 2026-12-07 00:00 UTC as the week's origin (any fixed instant would do)
  const origin = Date.UTC(2026, 11, 7);
  const cells = Array.from({ length: days * perDay }, (_, c) => ({
    start: origin + c * half,
    end: origin + (c + 1) * half,
    day: Math.floor(c / perDay),
  }));
  const localHour = (c: number, zone: number): number => ((((c % perDay) / 2 + zone) % 24) + 24) % 24;
  const zoneOf: number[] = [];
  const attendees: WeekAttendee[] = [];
  for (let p = 0; p < o.people; p++) {
    const z = p % o.zones.length;
    zoneOf.push(z);
    const zone = o.zones[z]!;
    const free = cells.map((_, c) => {
      const h = localHour(c, zone);
      return h >= 9 && h < 17;
    });
    for (let d = 0; d < days; d++) {
      if (rnd() >= o.busyChance) continue;
      // one busy hour at a random half-hour of the local working day
      const first = cells.findIndex((_, c) => Math.floor(c / perDay) === d && free[c] === true);
      if (first < 0) continue;
      const at = first + int(15);
      for (const c of [at, at + 1]) if (free[c] !== undefined) free[c] = false;
    }
    const offHours = cells.map((_, c) => {
      const h = localHour(c, zone);
      return h >= 10 && h < 16 ? 0 : 1;
    });
    attendees.push({ id: `p${p}`, free, offHours, compact: rnd() < 0.2 });
  }
  const rooms: WeekRoom[] = Array.from({ length: o.rooms }, (_, r) => ({
    id: `room${r}`,
    seats: 4 + int(17),
    features: FEATURES.filter(() => rnd() < 0.5),
  }));
  const byZone = o.zones.map((_, z) => attendees.map((_, i) => i).filter((i) => zoneOf[i] === z));
  const series: WeekSeries[] = [];
  for (let s = 0; s < o.series; s++) {
    const size = 2 + int(6);
    const z = int(o.zones.length);
    // one series in five mixes in people of the other office whose hours overlap (the first two)
    const cross = rnd() < 0.2 && o.zones.length > 1 && z < 2 ? 1 - z : z;
    const pool = [...byZone[z]!, ...(cross === z ? [] : byZone[cross]!.slice(0, 20))];
    const chosen = new Set<number>();
    while (chosen.size < Math.min(size, pool.length)) chosen.add(pool[int(pool.length)]!);
    const sessions = 1 + int(3);
    const needsRoom = rnd() < 0.6;
    const feature = FEATURES[int(FEATURES.length)]!;
    const preferred = Array.from({ length: days }, () => rnd() < 0.6);
    series.push({
      id: `s${s}`,
      attendees: [...chosen],
      sessions,
      minDays: sessions,
      length: 1 + int(2),
      preferredDays: preferred,
      ...(needsRoom
        ? {
            room: {
              seats: chosen.size,
              // ask for a feature only when some room with it seats everyone
              features:
                rnd() < 0.3 && rooms.some((r) => r.features.includes(feature) && r.seats >= chosen.size)
                  ? [feature]
                  : [],
            },
          }
        : {}),
    });
  }
  return { cells, days, rooms, attendees, series, weights: SYNTHETIC_WEIGHTS, seatsHard: true };
}
