// Public surface of src/calendar: named exports only, no `export *`.
export { type BusyOptions, type BusyReport, busyFromIcs } from './busy-from-ics.ts';
