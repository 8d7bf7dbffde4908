// Public surface of src/jobs: named exports only, no `export *`.
export {
  type HoldReleaser,
  type HoldSweeper,
  type HoldSweeperOptions,
  startHoldSweeper,
} from './hold-sweeper.ts';
