import {
  type AttendedSession,
  countOffHours,
  type FairnessWeightOptions,
  offHoursWeights,
  type UsualHours,
  weeksBefore,
} from '../scheduling/fairness.ts';
import type { FairnessLedger } from './ports.ts';

/** Options of `fairnessWeightsFor`. */
export interface FairnessOptions extends FairnessWeightOptions {
  /** How many past weeks of history count. @default 12 */
  readonly lookbackWeeks?: number;
}

/**
 * Per-person off-hours weights for planning `isoWeek`, from the tallies of the weeks before it. Pass
 * the result as each attendee's `offHoursWeight` to the week plan.
 */
export async function fairnessWeightsFor(
  ledger: FairnessLedger,
  people: readonly string[],
  isoWeek: string,
  options: FairnessOptions = {},
): Promise<Record<string, number>> {
  const weeks = weeksBefore(isoWeek, options.lookbackWeeks ?? 12);
  const history = await ledger.offHours(people, weeks);
  return offHoursWeights(people, history, options);
}

/**
 * Stores how many sessions of `isoWeek` each attendee has outside their usual hours. Calling it again
 * for the same week (a re-lock) replaces that week's tallies instead of adding to them.
 */
export async function recordWeekOffHours(
  ledger: FairnessLedger,
  isoWeek: string,
  sessions: readonly AttendedSession[],
  usual: Readonly<Record<string, UsualHours>>,
): Promise<Record<string, number>> {
  const counts = countOffHours(sessions, usual);
  const people = [...new Set([...counts.keys()])];
  const before = new Map((await ledger.offHours(people, [isoWeek])).map((r) => [r.person, r.count]));
  for (const [person, count] of counts) {
    const delta = count - (before.get(person) ?? 0);
    if (delta !== 0 || !before.has(person)) await ledger.addOffHours(person, isoWeek, delta);
  }
  return Object.fromEntries(counts);
}

/** A FairnessLedger in memory, for tests and single-process trials. */
export class InMemoryFairnessLedger implements FairnessLedger {
  readonly #tallies = new Map<string, number>();

  /** Adds to a person's tally for a week. */
  async addOffHours(person: string, isoWeek: string, count: number): Promise<void> {
    const key = `${person}\u0000${isoWeek}`;
    this.#tallies.set(key, (this.#tallies.get(key) ?? 0) + count);
  }

  /** Tallies of some people in some weeks. */
  async offHours(
    people: readonly string[],
    weeks: readonly string[],
  ): Promise<{ person: string; isoWeek: string; count: number }[]> {
    const out: { person: string; isoWeek: string; count: number }[] = [];
    for (const [key, count] of this.#tallies) {
      const [person, isoWeek] = key.split('\u0000') as [string, string];
      if (people.includes(person) && weeks.includes(isoWeek)) out.push({ person, isoWeek, count });
    }
    return out.sort((a, b) => a.person.localeCompare(b.person) || a.isoWeek.localeCompare(b.isoWeek));
  }
}
