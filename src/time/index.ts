// Public surface of src/time: named exports only, no `export *`.
export { type BusyInterval, type BusyKind, type Interval, mergeIntervals } from './interval.ts';
export {
  addDays,
  instantToZoned,
  isValidZone,
  weekdayOf,
  type ZonedReading,
  zonedToInstant,
} from './zoned.ts';
