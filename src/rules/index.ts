// Public surface of src/rules: named exports only, no `export *`.
export type { RuleEffect, RuleStrength } from './effect.ts';
