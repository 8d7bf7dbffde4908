// Public surface of src/rules: named exports only, no `export *`.
export type { RuleEffect, RuleStrength } from './effect.ts';
export { REST_CAUTION, type RestBreach, type RestOptions, restBreaches, restEffect } from './rest.ts';
