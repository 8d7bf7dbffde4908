// Public surface of src/time: named exports only, no `export *`.

export { normalizeBusy } from './busy-set.ts';
export { type Grid, makeGrid, tickStart, ticksCovered, ticksTouched } from './grid.ts';
export { isKnownHolidayRegion, type PublicHoliday, publicHolidays } from './holidays.ts';
export { type BusyInterval, type BusyKind, type Interval, mergeIntervals } from './interval.ts';
export { WINDOWS_ZONES_SOURCE, windowsZoneToIana } from './windows-zones.ts';
export {
  type DailyRange,
  DEFAULT_WORKING_HOURS,
  describeWeeklyHours,
  formatDailyRange,
  isoWeekday,
  nextDate,
  parseDailyRange,
  WEEKDAY_KEYS,
  type WeekdayKey,
  type WeeklyHours,
  workingIntervals,
  type ZoneClock,
  zoneClock,
} from './working-hours.ts';
export {
  addDays,
  addLocalDays,
  canonicalZone,
  instantToLocal,
  instantToZoned,
  isValidZone,
  type LocalDateTime,
  localToInstant,
  weekdayOf,
  type ZonedReading,
  zonedToInstant,
} from './zoned.ts';
