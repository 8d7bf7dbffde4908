// Public surface of src/rules: named exports only, no `export *`.

export {
  type CompareOptions,
  compareRules,
  type RuleComparison,
  type RuleRelation,
} from './compare-rules.ts';
export { describeRule, formatClock, formatDuration } from './describe-rule.ts';
export type { RuleEffect, RuleStrength } from './effect.ts';
export { PLAUSIBLE_HOURS, parseRule } from './parse-rule.ts';
export { REST_CAUTION, type RestBreach, type RestOptions, restBreaches, restEffect } from './rest.ts';
export { type RestSettings, type RestSubject, restSettingsSchema, withRestEffects } from './rest-settings.ts';
export {
  type DayPart,
  type DayParts,
  DEFAULT_DAY_PARTS,
  type NamedEntity,
  type Rule,
  type RuleBody,
  type RuleContext,
  type RuleIssue,
  type RuleParse,
  type RuleSubject,
  ruleSchema,
  type TimeSpan,
} from './rule.ts';
export { type RuleConfirmation, type RuleField, ruleConfirmation, ruleFields } from './rule-confirmation.ts';
export { type RuleEffectContext, ruleEffect } from './rule-effect.ts';
export {
  describeSeries,
  type ParsedSeries,
  parseSeriesSentence,
  type SeriesDraft,
  type SeriesGroup,
  type SeriesPerson,
  type SeriesRoom,
  type SeriesRoomDraft,
  type SeriesSentenceOptions,
} from './series-sentence.ts';
export { WEEKDAY_NAMES, type WeekdayName } from './series-sentence-words.ts';
export { EXAMPLE_RULES } from './suggestions.ts';
export {
  type OwnedRule,
  parseWorkspaceRules,
  type RuleOwner,
  type WorkspaceRuleContext,
} from './workspace-rules.ts';
export { CITY_ZONES } from './zone-names.ts';
