import type { Interval } from '../time/interval.ts';

/** Whether a rule must hold (hard rule) or is only wished for (preference). */
export type RuleStrength = 'hard' | 'preference';

/**
 * What one rule means for one person or room over one search window, in UTC epoch milliseconds,
 * ready for the scheduling layer. Produced by the rules module, consumed by `meet` and the week plan.
 */
export interface RuleEffect {
  /** Stable id of the rule this came from (for explanations). */
  readonly ruleId: string;
  /** The rule's normalized sentence, for blockers and breakdowns. */
  readonly text: string;
  readonly strength: RuleStrength;
  /** Time ranges a meeting may not overlap (as a preference: should not). */
  readonly avoid: readonly Interval[];
  /** Longest allowed meeting, in minutes. */
  readonly maxLengthMinutes?: number;
  /** Minutes to keep free between this person's meetings (before and after busy time). */
  readonly gapMinutes?: number;
  /** Limits per local day, counting existing busy time plus the new meeting. */
  readonly dailyLimit?: {
    /** Zone whose calendar days are counted. */
    readonly zone: string;
    readonly maxMeetings?: number;
    readonly maxMinutes?: number;
    /** ISO weekdays (1 = Monday .. 7 = Sunday) the limit applies to; all days when absent. */
    readonly weekdays?: readonly number[];
  };
}
