import ICAL from 'ical.js';
import { SlotwrightError } from '../errors.ts';
import { normalizeBusy } from '../time/busy-set.ts';
import type { BusyInterval, BusyKind, Interval } from '../time/interval.ts';
import { windowsZoneToIana } from '../time/windows-zones.ts';
import {
  addLocalDays,
  canonicalZone,
  instantToLocal,
  type LocalDateTime,
  localToInstant,
} from '../time/zoned.ts';
import { scanIcs } from './ics-scan.ts';
import { type JcalEvent, type JcalTime, scanVevent } from './jcal-event.ts';

type IcalTime = InstanceType<typeof ICAL.Time>;
type IcalComponent = InstanceType<typeof ICAL.Component>;
type IcalTimezone = InstanceType<typeof ICAL.Timezone>;
type IcalDuration = InstanceType<typeof ICAL.Duration>;
type IcalPeriod = InstanceType<typeof ICAL.Period>;
type IcalRecur = InstanceType<typeof ICAL.Recur>;
type Jcal = [string, unknown[], Jcal[]];

/** What to read a feed for: the stretch of time wanted and whose calendar it is. */
export interface BusyOptions {
  /** Busy time is clipped to this window (UTC epoch ms, half-open). */
  readonly window: Interval;
  /** IANA zone of the feed's owner; all-day dates and floating times are read in it. */
  readonly zone: string;
  /** Owner's email; an event whose ATTENDEE line for it says PARTSTAT=DECLINED is free. @default undefined */
  readonly ownerEmail?: string;
  /** Stop expanding one series after this many instances (with a warning). @default 50000 */
  readonly maxInstancesPerSeries?: number;
  /** Wall-clock time all series of one feed may take to expand (with a warning). @default 2000 */
  readonly expansionTimeBudgetMs?: number;
}

/** Busy time read from one feed, with what could not be read. */
export interface BusyReport {
  /** Sorted, merged, clipped UTC stretches; busy wins where busy and tentative overlap. */
  readonly busy: readonly BusyInterval[];
  /** Plain-language notes on what was guessed or left out (never event titles or people). */
  readonly warnings: readonly string[];
  /** Number of components that could not be read and were left out. */
  readonly skipped: number;
}

const DEFAULT_MAX_INSTANCES = 50_000;
// ical.js can loop without end inside one next() call on rules whose limiting parts never match
// (seen with FREQ=DAILY;BYDAY=FR;BYMONTHDAY=-2,-1). Every candidate it tries passes through
// RecurIterator#check_contracting_rules, so counting those calls bounds the work. The counter is
// only armed while this module expands a series; other users of ical.js see no change.
// A wall-clock deadline per feed backs the counts up, as one check can be slow on such rules.
const CHECKS_PER_SERIES = 100_000;
const CHECKS_PER_FEED = 1_000_000;
const DEFAULT_EXPANSION_MS = 2_000;

class ExpansionBudgetExceeded extends Error {}

let checksLeft = Number.POSITIVE_INFINITY;
let deadline = Number.POSITIVE_INFINITY;
{
  const proto = ICAL.RecurIterator.prototype as unknown as { check_contracting_rules(): boolean };
  const original = proto.check_contracting_rules;
  proto.check_contracting_rules = function guarded(this: unknown): boolean {
    if (checksLeft === Number.POSITIVE_INFINITY) return original.call(this);
    if (--checksLeft < 0 || ((checksLeft & 511) === 0 && performance.now() > deadline))
      throw new ExpansionBudgetExceeded('expansion budget exceeded');
    return original.call(this);
  };
}
const DAY_MS = 86_400_000;

interface TimeFields {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
  isDate: boolean;
}

// ical.js 2.2.1's RecurIterator#next copies its cursor at every step (Time#clone, which sets each
// field through the generic Time#fromData path); that copy was about a third of the time spent
// expanding a weekly series. The cursor of an iterator made here gets a copy method that builds
// the same Time directly: the same seven fields, the same zone and no cached instant, as Time#clone
// leaves them; normalization is left pending only when the original's is (Time#clone always leaves
// it pending, and normalizing normal fields is a no-op). DATE cursors keep ical.js's own copy. The
// copies are still full ical.js Time objects, so whatever ical.js does with them is unchanged;
// nothing outside this module's iterators is touched.
function quickCopies(cursor: IcalTime | null): void {
  const fields = (cursor as unknown as { _time?: TimeFields } | null)?._time;
  if (cursor === null || typeof fields !== 'object' || fields === null || fields.isDate !== false) return;
  Object.defineProperty(cursor, 'clone', { configurable: true, writable: true, value: copyTime });
}

function copyTime(this: IcalTime): IcalTime {
  const from = (this as unknown as { _time: TimeFields })._time;
  if (from.isDate) return ICAL.Time.prototype.clone.call(this);
  const copy = new (ICAL.Time as unknown as new () => IcalTime)();
  const to = (copy as unknown as { _time: TimeFields })._time;
  to.year = from.year;
  to.month = from.month;
  to.day = from.day;
  to.hour = from.hour;
  to.minute = from.minute;
  to.second = from.second;
  to.isDate = false;
  if (this.zone) copy.zone = this.zone;
  const state = copy as unknown as { _pendingNormalization: boolean; _cachedUnixTime: number | null };
  // A copy of fields that are already normal needs no normalizing (it would change nothing); a copy
  // of fields still waiting for it waits too, as Time#clone's copy does.
  state._pendingNormalization = (this as unknown as { _pendingNormalization: boolean })._pendingNormalization;
  state._cachedUnixTime = null;
  return copy;
}

// A daily or weekly rule with no COUNT repeats the same pattern every INTERVAL days or weeks,
// counted from DTSTART; starting it a whole number of those periods later gives the same instances
// from that later start on (RFC 5545 section 3.3.10: the BYxxx parts and WKST pick the same days
// within each period, UNTIL is a fixed instant). So a series that began long before the window is
// expanded by ical.js from less than one period before `lo` (the window start less slack) instead
// of from its first instance; the start it is given is itself before `lo` and so dropped,
// whether or not it matches the rule. Rules with COUNT, and monthly or yearly ones (whose periods
// differ in length), start at DTSTART as written.
function laterStart(recur: IcalRecur, start: IcalTime, lo: number): IcalTime {
  const days = recur.freq === 'WEEKLY' ? 7 : recur.freq === 'DAILY' ? 1 : 0;
  const interval = Number(recur.interval ?? 1);
  if (days === 0 || (recur.count !== null && recur.count !== undefined)) return start;
  if (!Number.isInteger(interval) || interval < 1) return start;
  const period = days * interval;
  // the most whole periods that still leave the new start before lo
  const periods = Math.ceil((lo - pseudoUtc(localOf(start))) / (period * DAY_MS)) - 1;
  if (periods < 1) return start;
  const later = copyTime.call(start);
  later.adjust(periods * period, 0, 0, 0);
  return later;
}

// Local times differ from UTC by at most about 14 hours; two days of slack keeps every candidate.
const SLACK_MS = 2 * DAY_MS;

const UTC_ZONE = { kind: 'utc' } as const;

type ZoneRef =
  | { readonly kind: 'utc' }
  | { readonly kind: 'iana'; readonly zone: string }
  | { readonly kind: 'ical'; readonly tz: IcalTimezone };

/** A RANGE=THISANDFUTURE change: from an original instant on, instances move by `shift` ms. */
interface RangeChange {
  readonly from: number;
  readonly shift: number;
  readonly length: Length;
  /** undefined: those instances leave the time free (cancelled, transparent or declined). */
  readonly kind: BusyKind | undefined;
}

// The latest change whose original instant is before `at` (the one at `at` is itself overridden).
function rangeAt(ranges: readonly RangeChange[], at: number): RangeChange | undefined {
  let hit: RangeChange | undefined;
  for (const r of ranges) if (r.from < at) hit = r;
  return hit;
}

function isThisAndFuture(range: unknown): boolean {
  return typeof range === 'string' && range.toUpperCase() === 'THISANDFUTURE';
}

/** How long each instance lasts: whole local days plus an exact number of milliseconds. */
interface Length {
  readonly days: number;
  readonly ms: number;
}

// ical.js keeps a TZID it could not resolve as a plain `timezone` field its types do not declare.
function tzidOf(t: IcalTime): string | undefined {
  const v = (t as { timezone?: unknown }).timezone;
  return typeof v === 'string' ? v : undefined;
}

function localOf(t: IcalTime): LocalDateTime {
  return { year: t.year, month: t.month, day: t.day, hour: t.hour, minute: t.minute, second: t.second };
}

function pseudoUtc(l: LocalDateTime): number {
  return Date.UTC(l.year, l.month - 1, l.day, l.hour, l.minute, l.second);
}

// Offset (ms) that an embedded VTIMEZONE gives a local wall-clock time, through ical.js's own rules.
function icalOffsetOfLocal(tz: IcalTimezone, pseudo: number): number {
  const d = new Date(pseudo);
  const t = ICAL.Time.fromData({
    year: d.getUTCFullYear(),
    month: d.getUTCMonth() + 1,
    day: d.getUTCDate(),
    hour: d.getUTCHours(),
    minute: d.getUTCMinutes(),
    second: d.getUTCSeconds(),
  });
  return tz.utcOffset(t) * 1000;
}

// ical.js reads a local time in a gap or overlap differently from RFC 5545 section 3.3.5 (and its
// UTC-to-local conversion is off near a change), so only its offsets of local times are used here.
// Near a change the switch point S of those offsets is found by bisection; ical.js switches at the
// earlier wall-clock reading of the change instant T, so T = S - min(before, after). Then a
// repeated time takes its first occurrence and a nonexistent one the offset before the gap.
function icalLocalToInstant(tz: IcalTimezone, local: LocalDateTime): number {
  const pseudo = pseudoUtc(local);
  const before = icalOffsetOfLocal(tz, pseudo - DAY_MS);
  const after = icalOffsetOfLocal(tz, pseudo + DAY_MS);
  if (before === after) return pseudo - icalOffsetOfLocal(tz, pseudo);
  let lo = pseudo - DAY_MS;
  let hi = pseudo + DAY_MS;
  while (hi - lo > 1000) {
    const mid = lo + Math.floor((hi - lo) / 2000) * 1000;
    if (icalOffsetOfLocal(tz, mid) === before) lo = mid;
    else hi = mid;
  }
  const change = hi - Math.min(before, after);
  const early = pseudo - before;
  const late = pseudo - after;
  const valid = [early < change ? early : undefined, late >= change ? late : undefined].filter(
    (c): c is number => c !== undefined,
  );
  return valid.length > 0 ? Math.min(...valid) : early;
}

// Used only to restate a UTC UNTIL in local time; within an hour of a change it may be an hour off.
function icalInstantToLocal(tz: IcalTimezone, instant: number): LocalDateTime {
  const offset = icalOffsetOfLocal(tz, instant + icalOffsetOfLocal(tz, instant));
  return instantToLocal(instant + offset, 'UTC');
}

class FeedReader {
  readonly raw: BusyInterval[] = [];
  readonly warnings: string[] = [];
  skipped = 0;
  /** Rule checks left for the whole feed (see CHECKS_PER_FEED). */
  checksLeft = CHECKS_PER_FEED;
  /** performance.now() after which no series is expanded further. */
  readonly deadline: number;
  readonly #owner: ZoneRef;
  readonly #ownerEmail: string | undefined;
  readonly #window: Interval;
  readonly #maxInstances: number;
  readonly #zones = new Map<string, ZoneRef>();
  readonly #vtimezones = new Map<string, Jcal>();
  readonly #warned = new Set<string>();
  readonly #paramZones = new Map<string, ZoneRef>();
  readonly #ranges = new Map<string, RangeChange[]>();
  /** When set, objects built while reading are kept here (see SHAPES). */
  keep: unknown[] | undefined;
  readonly #durations = new Map<string, Length | null>();

  constructor(options: BusyOptions, vtimezones: Map<string, Jcal>) {
    this.#owner = { kind: 'iana', zone: options.zone };
    this.#ownerEmail = options.ownerEmail?.trim().toLowerCase();
    this.#window = options.window;
    this.#maxInstances = options.maxInstancesPerSeries ?? DEFAULT_MAX_INSTANCES;
    this.deadline = performance.now() + (options.expansionTimeBudgetMs ?? DEFAULT_EXPANSION_MS);
    this.#vtimezones = vtimezones;
  }

  warnOnce(key: string, message: string): void {
    if (this.#warned.has(key)) return;
    this.#warned.add(key);
    this.warnings.push(message);
  }

  // TZID order: an IANA name (trusted over any embedded copy of its rules), a Windows name through
  // CLDR, a vendor-prefixed IANA name ("/example.org/2005_1/Europe/Lisbon"), the embedded
  // VTIMEZONE, and last the owner's zone with a warning.
  zoneFor(tzid: string): ZoneRef {
    const hit = this.#zones.get(tzid);
    if (hit !== undefined) return hit;
    let ref: ZoneRef | undefined;
    const iana = canonicalZone(tzid.trim()) ?? windowsZoneToIana(tzid);
    if (iana !== undefined) ref = { kind: 'iana', zone: iana };
    if (ref === undefined && tzid.includes('/')) {
      const parts = tzid.split('/').filter((p) => p !== '');
      for (let k = Math.max(0, parts.length - 3); k < parts.length - 1 && ref === undefined; k++) {
        const z = canonicalZone(parts.slice(k).join('/'));
        if (z !== undefined) ref = { kind: 'iana', zone: z };
      }
    }
    if (ref === undefined) {
      const vtz = this.#vtimezones.get(tzid);
      if (vtz !== undefined) {
        try {
          ref = { kind: 'ical', tz: new ICAL.Timezone(new ICAL.Component(vtz)) };
        } catch {
          ref = undefined;
        }
      }
    }
    if (ref === undefined) {
      this.warnOnce(
        `tz:${tzid}`,
        `unknown time zone '${tzid.slice(0, 64)}': its times are read in ${this.#ownerZoneName()}`,
      );
      ref = this.#owner;
    }
    this.#zones.set(tzid, ref);
    return ref;
  }

  #ownerZoneName(): string {
    return this.#owner.kind === 'iana' ? this.#owner.zone : 'UTC';
  }

  /** The zone a time value is written in: UTC, its TZID, or the owner's (dates and floating times). */
  zoneOf(t: IcalTime, fallbackTzid?: string): ZoneRef {
    if (t.isDate) return this.#owner;
    if (t.zone === ICAL.Timezone.utcTimezone || t.zone?.tzid === 'UTC') return { kind: 'utc' };
    const tzid = tzidOf(t) ?? fallbackTzid;
    if (tzid === undefined || tzid === '') return this.#owner;
    return this.zoneFor(tzid);
  }

  toInstant(local: LocalDateTime, zone: ZoneRef): number {
    switch (zone.kind) {
      case 'utc':
        return pseudoUtc(local);
      case 'iana':
        return localToInstant(local, zone.zone);
      case 'ical':
        return icalLocalToInstant(zone.tz, local);
    }
  }

  toLocal(instant: number, zone: ZoneRef): LocalDateTime {
    switch (zone.kind) {
      case 'utc':
        return instantToLocal(instant, 'UTC');
      case 'iana':
        return instantToLocal(instant, zone.zone);
      case 'ical':
        return icalInstantToLocal(zone.tz, instant);
    }
  }

  instantOf(t: IcalTime, fallbackTzid?: string): number {
    return this.toInstant(localOf(t), this.zoneOf(t, fallbackTzid));
  }

  /** Whether the owner declined this event (ATTENDEE with PARTSTAT=DECLINED). */
  declined(comp: IcalComponent): boolean {
    const owner = this.#ownerEmail;
    if (owner === undefined) return false;
    return comp
      .getAllProperties('attendee')
      .some((p) => declines(owner, p.getFirstValue(), p.getParameter('partstat')));
  }

  /** Busy kind of an event, or undefined when it leaves the time free. */
  kindOf(comp: IcalComponent): BusyKind | undefined {
    return busyKind(
      String(comp.getFirstPropertyValue('status') ?? ''),
      String(comp.getFirstPropertyValue('transp') ?? ''),
      () => this.declined(comp),
    );
  }

  // RFC 5545 section 3.8.5.3: a DTEND gives every instance the same exact duration, a DURATION the
  // same nominal one; with neither, a DATE start lasts one day and a DATE-TIME start no time.
  lengthOf(comp: IcalComponent, start: IcalTime, where: Where): Length | undefined {
    const endProp = comp.getFirstProperty('dtend');
    if (endProp !== null) {
      const end = endProp.getFirstValue() as IcalTime;
      if (start.isDate && end.isDate) {
        const days = Math.round((pseudoUtc(localOf(end)) - pseudoUtc(localOf(start))) / DAY_MS);
        return days >= 0 ? { days, ms: 0 } : this.#negative(where);
      }
      const ms = this.instantOf(end) - this.instantOf(start);
      return ms >= 0 ? { days: 0, ms } : this.#negative(where);
    }
    const durProp = comp.getFirstProperty('duration');
    if (durProp !== null) {
      const d = durProp.getFirstValue() as IcalDuration;
      const sign = d.isNegative ? -1 : 1;
      const days = sign * (d.weeks * 7 + d.days);
      const ms = sign * (d.hours * 3600 + d.minutes * 60 + d.seconds) * 1000;
      return days >= 0 && ms >= 0 ? { days, ms } : this.#negative(where);
    }
    return start.isDate ? { days: 1, ms: 0 } : { days: 0, ms: 0 };
  }

  #negative(where: Where): undefined {
    this.warnings.push(`${where}: ends before it starts; left out`);
    this.skipped++;
    return undefined;
  }

  /** Adds one instance starting at a local time in a zone. */
  addInstance(
    local: LocalDateTime,
    zone: ZoneRef,
    length: Length,
    kind: BusyKind,
    knownStart?: number,
  ): void {
    const start = knownStart ?? this.toInstant(local, zone);
    const end =
      length.days === 0
        ? start + length.ms
        : this.toInstant(addLocalDays(local, length.days), zone) + length.ms;
    if (end > start && end > this.#window.start && start < this.#window.end)
      this.raw.push({ start, end, kind });
  }

  // RFC 5545 section 3.8.4.4: a RECURRENCE-ID with RANGE=THISANDFUTURE changes that instance and
  // all later ones; the change of start time and the duration (and here also the busy kind) carry
  // over to each of them.
  #noteRange(uid: string, from: number, startAt: number, length: Length, kind: BusyKind | undefined): void {
    const list = this.#ranges.get(uid) ?? [];
    list.push({ from, shift: startAt - from, length, kind });
    list.sort((x, y) => x.from - y.from);
    this.#ranges.set(uid, list);
  }

  readEvent(comp: IcalComponent, where: Where, overridden: ReadonlySet<number> | undefined): void {
    const startProp = comp.getFirstProperty('dtstart');
    const ridProp = comp.getFirstProperty('recurrence-id');
    if (startProp === null && ridProp === null) {
      this.warnings.push(`${where}: no DTSTART; left out`);
      this.skipped++;
      return;
    }
    const start = (startProp ?? ridProp)!.getFirstValue() as IcalTime;
    const kind = this.kindOf(comp);
    const length = this.lengthOf(comp, start, where);
    if (ridProp !== null && length !== undefined && isThisAndFuture(ridProp.getParameter('range'))) {
      const uid = String(comp.getFirstPropertyValue('uid') ?? '');
      const from = this.instantOf(ridProp.getFirstValue() as IcalTime);
      this.#noteRange(uid, from, this.toInstant(localOf(start), this.zoneOf(start)), length, kind);
    }
    if (length === undefined || kind === undefined) return;
    const zone = this.zoneOf(start);
    const recurring = ridProp === null && (comp.hasProperty('rrule') || comp.hasProperty('rdate'));
    if (!recurring) {
      this.addInstance(localOf(start), zone, length, kind);
      return;
    }
    this.#expand(comp, start, zone, length, kind, where, overridden);
  }

  #expand(
    comp: IcalComponent,
    start: IcalTime,
    zone: ZoneRef,
    length: Length,
    kind: BusyKind,
    where: Where,
    overridden: ReadonlySet<number> | undefined,
  ): void {
    const rrules = comp.getAllProperties('rrule');
    // ical.js compares a UTC UNTIL with local instance times as if both were UTC; restating UNTIL
    // in the series' own zone keeps the last instances RFC 5545 asks for.
    if (!start.isDate && zone.kind !== 'utc') {
      for (const p of rrules) {
        const recur = p.getFirstValue() as IcalRecur;
        const until = recur.until;
        if (
          until !== null &&
          until !== undefined &&
          !until.isDate &&
          until.zone === ICAL.Timezone.utcTimezone
        ) {
          const local = this.toLocal(pseudoUtc(localOf(until)), zone);
          recur.until = ICAL.Time.fromData(local);
        }
      }
    }
    for (const p of rrules) {
      const recur = p.getFirstValue() as IcalRecur;
      const parts = recur.parts as Record<string, unknown[] | undefined>;
      let ordinalDay = false;
      for (const d of parts.BYDAY ?? []) if (/^[+-]?\d/.test(String(d))) ordinalDay = true;
      if (
        recur.freq === 'YEARLY' &&
        (parts.BYWEEKNO !== undefined || (ordinalDay && parts.BYMONTH === undefined))
      )
        this.warnOnce(
          `yearly:${where}`,
          `${where}: a yearly rule by week number or by the n-th weekday of the year is expanded as every matching weekday (a limit of the calendar library); check this series`,
        );
    }
    const excluded = new Set<number>(overridden);
    // An EXDATE written as a DATE on a DATE-TIME series removes the instances that start on that
    // local date (common practice of calendar producers; RFC 5545 section 3.8.5.1 only says the
    // value type should match DTSTART's).
    const excludedDays = new Set<number>();
    for (const p of comp.getAllProperties('exdate')) {
      for (const v of p.getValues() as IcalTime[]) {
        if (v.isDate && !start.isDate) excludedDays.add(pseudoUtc(localOf(v)) / DAY_MS);
        else excluded.add(this.instantOf(v, tzidOf(start)));
      }
    }
    const lengthBound = length.days * 25 * 3_600_000 + length.ms;
    const ranges = this.#ranges.get(String(comp.getFirstPropertyValue('uid') ?? ''));
    let earlier = 0;
    let later = 0;
    for (const r of ranges ?? []) {
      earlier = Math.max(earlier, r.shift + r.length.days * 25 * 3_600_000 + r.length.ms);
      later = Math.max(later, -r.shift);
    }
    const lo = this.#window.start - SLACK_MS - Math.max(lengthBound, earlier);
    const hi = this.#window.end + SLACK_MS + later;
    const feedLeft = this.checksLeft;
    const seriesBudget = Math.min(CHECKS_PER_SERIES, feedLeft);
    checksLeft = seriesBudget;
    deadline = this.deadline;
    let n = 0;
    try {
      if (seriesBudget <= 0 || performance.now() > deadline)
        throw new ExpansionBudgetExceeded('expansion budget exceeded');
      // One RRULE and no RDATE, the usual case, needs no merging of instance sources, so the rule's
      // own iterator is used (ical.js's RecurExpansion clones every instance; EXDATE is applied here
      // either way).
      let it: { next(): IcalTime | null | undefined };
      if (rrules.length === 1 && !comp.hasProperty('rdate')) {
        const recur = rrules[0]!.getFirstValue() as IcalRecur;
        const own = recur.iterator(laterStart(recur, start, lo));
        quickCopies((own as unknown as { last: IcalTime | null }).last);
        it = own;
      } else it = new ICAL.Event(comp).iterator();
      this.keep?.push(comp, it);
      for (let occ = it.next(); occ; occ = it.next()) {
        if (++n > this.#maxInstances) {
          this.warnings.push(
            `${where}: stopped expanding the series after ${this.#maxInstances} instances; later ones are left out`,
          );
          break;
        }
        const local = localOf(occ);
        const pseudo = pseudoUtc(local);
        if (pseudo > hi) break;
        if (pseudo < lo) continue;
        const occZone = occ.isDate || tzidOf(occ) === undefined ? zone : this.zoneOf(occ, tzidOf(start));
        const instZone: ZoneRef = occ.zone === ICAL.Timezone.utcTimezone ? UTC_ZONE : occZone;
        const at = this.toInstant(local, instZone);
        if (excluded.has(at)) continue;
        if (excludedDays.size > 0 && excludedDays.has(Math.floor(pseudo / DAY_MS))) continue;
        const range = ranges === undefined ? undefined : rangeAt(ranges, at);
        if (range === undefined) this.addInstance(local, instZone, length, kind, at);
        else if (range.kind !== undefined) {
          const moved = at + range.shift;
          this.addInstance(this.toLocal(moved, instZone), instZone, range.length, range.kind, moved);
        }
      }
    } catch (error) {
      if (error instanceof ExpansionBudgetExceeded)
        this.warnings.push(
          `${where}: the recurrence rule takes too long to expand; instances after the last one found are left out`,
        );
      else this.warnings.push(`${where}: recurrence could not be expanded further (${cleanMessage(error)})`);
    } finally {
      this.checksLeft = feedLeft - (seriesBudget - Math.max(0, checksLeft));
      checksLeft = Number.POSITIVE_INFINITY;
      deadline = Number.POSITIVE_INFINITY;
    }
  }

  /** The zone a jCal time is written in, as zoneOf does for the same value through ical.js. */
  zoneOfJcal(t: JcalTime): ZoneRef {
    if (t.isDate) return this.#owner;
    if (t.utc) return UTC_ZONE;
    const tzid = t.tzid;
    if (tzid === undefined || tzid === '') return this.#owner;
    let ref = this.#paramZones.get(tzid);
    if (ref === undefined) {
      // ical.js gives a TZID it cannot find in the (detached) component the zone its own service
      // has under that name: UTC for "UTC", "Z" and "GMT".
      const known = ICAL.TimezoneService.get(tzid);
      ref = known === ICAL.Timezone.utcTimezone || known?.tzid === 'UTC' ? UTC_ZONE : this.zoneFor(tzid);
      this.#paramZones.set(tzid, ref);
    }
    return ref;
  }

  instantOfJcal(t: JcalTime): number {
    return this.toInstant(t.local, this.zoneOfJcal(t));
  }

  /** Length of a DURATION text, through ical.js, once per distinct text; undefined when negative. */
  durationLength(text: string): Length | null {
    let hit = this.#durations.get(text);
    if (hit === undefined) {
      const d = ICAL.Duration.fromString(text);
      const sign = d.isNegative ? -1 : 1;
      const days = sign * (d.weeks * 7 + d.days);
      const ms = sign * (d.hours * 3600 + d.minutes * 60 + d.seconds) * 1000;
      hit = days >= 0 && ms >= 0 ? { days, ms } : null;
      this.#durations.set(text, hit);
    }
    return hit;
  }

  /** readEvent for a non-recurring event read from jCal: the same checks in the same order. */
  readSimple(e: JcalEvent, where: Where): void {
    const start = (e.start ?? e.rid)!;
    const kind = this.#kindOfJcal(e);
    const length = this.#lengthOfJcal(e, start, where);
    if (e.rid !== undefined && length !== undefined && isThisAndFuture(e.ridRange))
      this.#noteRange(e.uid, this.instantOfJcal(e.rid), this.instantOfJcal(start), length, kind);
    if (length === undefined || kind === undefined) return;
    const zone = this.zoneOfJcal(start);
    this.addInstance(start.local, zone, length, kind);
  }

  /** readEvent for a series whose DTSTART, DTEND, DURATION and status were read from jCal. */
  readSeries(
    comp: IcalComponent,
    e: JcalEvent,
    where: Where,
    overridden: ReadonlySet<number> | undefined,
  ): void {
    const jstart = e.start!;
    // the ical.js value is still needed: its rules are expanded from it
    const start = comp.getFirstProperty('dtstart')!.getFirstValue() as IcalTime;
    const kind = this.#kindOfJcal(e);
    const length = this.#lengthOfJcal(e, jstart, where);
    if (length === undefined || kind === undefined) return;
    this.#expand(comp, start, this.zoneOfJcal(jstart), length, kind, where, overridden);
  }

  #kindOfJcal(e: JcalEvent): BusyKind | undefined {
    const owner = this.#ownerEmail;
    return busyKind(
      e.status,
      e.transp,
      () =>
        owner !== undefined &&
        e.attendees.some((p) => declines(owner, p[3], (p[1] as Record<string, unknown>).partstat)),
    );
  }

  #lengthOfJcal(e: JcalEvent, start: JcalTime, where: Where): Length | undefined {
    const end = e.end;
    if (end !== undefined) {
      if (start.isDate && end.isDate) {
        const days = Math.round((end.pseudo - start.pseudo) / DAY_MS);
        return days >= 0 ? { days, ms: 0 } : this.#negative(where);
      }
      const ms = this.instantOfJcal(end) - this.instantOfJcal(start);
      return ms >= 0 ? { days: 0, ms } : this.#negative(where);
    }
    if (e.duration !== undefined) return this.durationLength(e.duration) ?? this.#negative(where);
    return start.isDate ? { days: 1, ms: 0 } : { days: 0, ms: 0 };
  }

  readFreeBusy(comp: IcalComponent, where: Where): void {
    for (const p of comp.getAllProperties('freebusy')) {
      const fbtype = String(p.getParameter('fbtype') ?? 'BUSY').toUpperCase();
      if (fbtype === 'FREE') continue;
      // RFC 5545 section 3.2.9: unknown FBTYPE values are treated like BUSY.
      const kind: BusyKind = fbtype === 'BUSY-TENTATIVE' ? 'tentative' : 'busy';
      try {
        for (const period of p.getValues() as IcalPeriod[]) {
          const start = this.instantOf(period.start);
          const end = this.instantOf(period.getEnd());
          if (end > start && end > this.#window.start && start < this.#window.end)
            this.raw.push({ start, end, kind });
        }
      } catch (error) {
        this.warnings.push(`${where}: a FREEBUSY line could not be read (${cleanMessage(error)})`);
        this.skipped++;
      }
    }
  }
}

// ical.js quotes the offending text in its messages; it may be an event title, so it is cut out.
function cleanMessage(error: unknown): string {
  const text = error instanceof Error ? error.message : String(error);
  return text
    .replace(/"[^"]*"/g, '"…"')
    .replace(/\s+/g, ' ')
    .slice(0, 160);
}

/** Names a component in warnings; the line is found only when a warning is written. */
interface Where {
  toString(): string;
}

type Entry =
  | {
      readonly simple: JcalEvent;
      readonly comp: undefined;
      readonly where: Where;
      readonly series: undefined;
    }
  | {
      readonly simple: undefined;
      readonly comp: IcalComponent;
      readonly where: Where;
      /** For a series in the plain shapes, its values as read from jCal. */
      readonly series: JcalEvent | undefined;
    };

/** The top-level components of a feed; `where` names one of them in warnings. */
interface Children {
  readonly jcals: readonly Jcal[];
  where(index: number): Where;
}

function describe(name: string, line: number | undefined, index: number): string {
  return line === undefined ? `${name.toUpperCase()} #${index + 1}` : `${name.toUpperCase()} at line ${line}`;
}

// The line of each top-level component, found by a line scan only when a warning first needs one.
class ComponentLines {
  #lines: (number | undefined)[] | undefined;
  constructor(
    readonly text: string,
    readonly names: readonly string[],
  ) {}

  lineOf(i: number): number | undefined {
    if (this.#lines === undefined) {
      const scan = scanIcs(this.text);
      const names = this.names;
      const aligned =
        names.length === scan.components.length && names.every((n, k) => n === scan.components[k]!.name);
      this.#lines = names.map((_, k) => (aligned ? scan.components[k]!.line : undefined));
    }
    return this.#lines[i];
  }
}

// A component named in warnings (one small object per component, no closure).
class ChildWhere implements Where {
  constructor(
    readonly table: ComponentLines,
    readonly index: number,
  ) {}

  toString(): string {
    return describe(this.table.names[this.index]!, this.table.lineOf(this.index), this.index);
  }
}

function rootsOf(parsed: unknown): Jcal[] {
  if (!Array.isArray(parsed)) return [];
  return (typeof parsed[0] === 'string' ? [parsed] : parsed) as Jcal[];
}

// The properties that bear on busy time: component bounds, the event's times and recurrence, its
// status, the owner's ATTENDEE line (only when the owner is known), free/busy periods and what a
// VTIMEZONE is made of. Every other content line (titles, descriptions, places, organizers, alarms'
// texts, vendor X- properties) is cut from the text before ical.js parses it: such lines are never
// read here (privacy), and not parsing them is most of what a big feed costs beyond its times. Only
// whole unfolded content lines whose name is not on this list go, with their folded continuation
// lines (RFC 5545 section 3.1); anything that is not a well-formed "NAME;...:" or "NAME:" start of
// a line is left for ical.js to judge, so broken input is still reported as before.
const BUSY_NAMES = [
  'BEGIN',
  'END',
  'VERSION',
  'UID',
  'DTSTART',
  'DTEND',
  'DURATION',
  'RRULE',
  'RDATE',
  'EXDATE',
  'EXRULE',
  'RECURRENCE-ID',
  'STATUS',
  'TRANSP',
  'FREEBUSY',
  'TZID',
  'TZOFFSETFROM',
  'TZOFFSETTO',
  'TZNAME',
];
// STATUS:CONFIRMED and TRANSP:OPAQUE say what an event without them means (busy), so they go too.
const lineCut = (keep: readonly string[]): RegExp =>
  // The line break before a line goes with it, so a line is only ever cut after a real break.
  new RegExp(
    `\\r?\\n(?:(?!(?:${keep.join('|')})[;:])[A-Z0-9-]+[;:][^\\r\\n]*(?:\\r?\\n[ \\t][^\\r\\n]*)*|(?:STATUS:CONFIRMED|TRANSP:OPAQUE)(?=\\r?\\n(?![ \\t])))`,
    'gi',
  );
const CUT_WITHOUT_OWNER = lineCut(BUSY_NAMES);
const CUT_WITH_OWNER = lineCut([...BUSY_NAMES, 'ATTENDEE']);

/** The text with every content line that cannot bear on busy time taken out (see BUSY_NAMES). */
export function busyLinesOnly(text: string, withAttendees: boolean): string {
  return text.replace(withAttendees ? CUT_WITH_OWNER : CUT_WITHOUT_OWNER, '');
}

// Parses the text (cut to the lines that bear on busy time) with ical.js; when that fails, parses
// each top-level component of the original text on its own so one broken event does not hide the
// rest, and reports each broken one by name and line. The line scan runs only when needed (a failed
// parse or a warning), as it costs time on big feeds; it always reads the original text, so lines
// are named as the user sees them.
function childrenOf(
  text: string,
  withAttendees: boolean,
  reader: { warnings: string[]; skipped: number },
): Children {
  let roots: Jcal[] | undefined;
  let wholeError: unknown;
  try {
    roots = rootsOf(ICAL.parse(busyLinesOnly(text, withAttendees)));
  } catch (error) {
    wholeError = error;
  }
  if (roots !== undefined) {
    const jcals = roots.flatMap((r) => (r[0] === 'vcalendar' ? r[2] : []));
    if (roots.length === 0 || roots.every((r) => r[0] !== 'vcalendar'))
      throw new SlotwrightError(
        'ics_invalid',
        'not an iCalendar feed: no BEGIN:VCALENDAR found at line 1 or later',
      );
    // Warnings name components by line; only the names are kept for that, so the parsed tree can be
    // collected as soon as the caller is done with it.
    const table = new ComponentLines(
      text,
      jcals.map((j) => j[0]),
    );
    return { jcals, where: (i) => new ChildWhere(table, i) };
  }
  const scan = scanIcs(text);
  if (scan.calendars === 0)
    throw new SlotwrightError(
      'ics_invalid',
      `not an iCalendar feed: ${cleanMessage(wholeError)}; expected BEGIN:VCALENDAR ... END:VCALENDAR`,
      { cause: wholeError },
    );
  const jcals: Jcal[] = [];
  const wheres: string[] = [];
  scan.components.forEach((c, i) => {
    const where = describe(c.name, c.line, i);
    try {
      if (c.unterminated) throw new Error(`no END:${c.name.toUpperCase()}`);
      const parsed = rootsOf(ICAL.parse(`BEGIN:VCALENDAR\r\n${c.text}\r\nEND:VCALENDAR\r\n`));
      for (const r of parsed)
        for (const jcal of r[2]) {
          jcals.push(jcal);
          wheres.push(where);
        }
    } catch (error) {
      const at = c.badLine === undefined ? '' : ` (line ${c.badLine})`;
      reader.warnings.push(`${where} could not be read${at}: ${cleanMessage(error)}; left out`);
      reader.skipped++;
    }
  });
  return { jcals, where: (i) => wheres[i]! };
}

/**
 * Reads an iCalendar feed (RFC 5545) into busy time over a window. Titles, descriptions, places and
 * attendees are never copied out; only the busy stretches, warnings and a count of skipped parts are.
 * Throws SlotwrightError `ics_invalid` only when the text is no iCalendar data at all.
 */
export function busyFromIcs(icsText: string, options: BusyOptions): BusyReport {
  return readFeed(icsText, options, undefined);
}

function readFeed(icsText: string, options: BusyOptions, keep: unknown[] | undefined): BusyReport {
  const { window } = options;
  if (!Number.isFinite(window.start) || !Number.isFinite(window.end) || window.end <= window.start)
    throw new SlotwrightError('bad_argument', 'the window must have a start before its end');
  if (canonicalZone(options.zone) === undefined)
    throw new SlotwrightError(
      'zone_unknown',
      `unknown time zone '${options.zone}'; use an IANA name such as Europe/Lisbon`,
    );
  const collector = { warnings: [] as string[], skipped: 0 };
  let children: Children | undefined = childrenOf(icsText, options.ownerEmail !== undefined, collector);
  const vtimezones = new Map<string, Jcal>();
  // A VEVENT is either read straight from its jCal (simple) or wrapped in an ical.js Component.
  const events: Entry[] = [];
  const freeBusy: { comp: IcalComponent; where: Where }[] = [];
  const durationSeconds = (text: string): number => ICAL.Duration.fromString(text).toSeconds();
  const count = children.jcals.length;
  for (let i = 0; i < count; i++) {
    const jcal = children.jcals[i]!;
    const name = jcal[0];
    try {
      if (name === 'vevent') {
        const scan = scanVevent(jcal[1] as unknown[][], window, durationSeconds);
        if (scan.kind === 'outside') continue;
        if (scan.kind === 'simple') {
          events.push({ simple: scan.event, comp: undefined, where: children.where(i), series: undefined });
          continue;
        }
        if (scan.kind === 'recurring') {
          const comp = new ICAL.Component(jcal);
          events.push({ simple: undefined, comp, where: children.where(i), series: scan.event });
          continue;
        }
      }
      // Detached components: ical.js then looks no TZID up in the whole tree (slow on big feeds)
      // and zones are resolved here, through Temporal.
      const comp = new ICAL.Component(jcal);
      if (name === 'vtimezone') {
        const tzid = comp.getFirstPropertyValue('tzid');
        if (typeof tzid === 'string') vtimezones.set(tzid, jcal);
      } else if (name === 'vevent')
        events.push({ simple: undefined, comp, where: children.where(i), series: undefined });
      else if (name === 'vfreebusy') freeBusy.push({ comp, where: children.where(i) });
    } catch (error) {
      collector.warnings.push(`${children.where(i)} could not be read: ${cleanMessage(error)}; left out`);
      collector.skipped++;
    }
  }
  children = undefined;
  const reader = new FeedReader(options, vtimezones);
  if (keep !== undefined) {
    reader.keep = keep;
    keep.push(reader, events);
  }
  reader.warnings.push(...collector.warnings);
  reader.skipped += collector.skipped;

  // Changed instances (RECURRENCE-ID) replace the master's instance at that original time.
  const overrides = new Map<string, Set<number>>();
  const masters: Entry[] = [];
  for (const e of events) {
    try {
      let uid: string;
      let at: number;
      if (e.simple !== undefined) {
        if (e.simple.rid === undefined) {
          masters.push(e);
          continue;
        }
        uid = e.simple.uid;
        at = reader.instantOfJcal(e.simple.rid);
      } else {
        const rid = e.comp.getFirstPropertyValue('recurrence-id') as IcalTime | null;
        if (rid === null) {
          masters.push(e);
          continue;
        }
        uid = String(e.comp.getFirstPropertyValue('uid') ?? '');
        at = reader.instantOf(rid);
      }
      const set = overrides.get(uid) ?? new Set<number>();
      set.add(at);
      overrides.set(uid, set);
      if (e.simple !== undefined) reader.readSimple(e.simple, e.where);
      else reader.readEvent(e.comp, e.where, undefined);
    } catch (error) {
      reader.warnings.push(`${e.where} could not be read: ${cleanMessage(error)}; left out`);
      reader.skipped++;
    }
  }
  for (const e of masters) {
    try {
      if (e.simple !== undefined) reader.readSimple(e.simple, e.where);
      else {
        const uid = String(e.comp.getFirstPropertyValue('uid') ?? '');
        if (e.series !== undefined) reader.readSeries(e.comp, e.series, e.where, overrides.get(uid));
        else reader.readEvent(e.comp, e.where, overrides.get(uid));
      }
    } catch (error) {
      reader.warnings.push(`${e.where} could not be read: ${cleanMessage(error)}; left out`);
      reader.skipped++;
    }
  }
  for (const f of freeBusy) {
    try {
      reader.readFreeBusy(f.comp, f.where);
    } catch (error) {
      reader.warnings.push(`${f.where} could not be read: ${cleanMessage(error)}; left out`);
      reader.skipped++;
    }
  }
  return { busy: normalizeBusy(reader.raw, window), warnings: reader.warnings, skipped: reader.skipped };
}

// V8 drops the hidden classes of objects none of which is alive after a full garbage collection,
// and with them the optimized code built for those classes: a process that reads a feed now and
// then (or a benchmark that collects between runs) would otherwise expand every feed in
// unoptimized code. Reading one small invented feed when the module loads, and keeping what it
// built (a few kilobytes, no user data), keeps those classes, so later reads start optimized.
const SHAPES: unknown[] = [];
const SHAPE_FEED = [
  'BEGIN:VCALENDAR',
  'VERSION:2.0',
  'PRODID:-//slotwright//shapes//EN',
  'BEGIN:VEVENT',
  'UID:shape-series',
  'DTSTART;TZID=Europe/Lisbon:20260105T090000',
  'DTEND;TZID=Europe/Lisbon:20260105T093000',
  'RRULE:FREQ=WEEKLY;UNTIL=20260301T000000Z',
  'EXDATE;TZID=Europe/Lisbon:20260112T090000',
  'END:VEVENT',
  'BEGIN:VEVENT',
  'UID:shape-series',
  'RECURRENCE-ID;TZID=Europe/Lisbon:20260119T090000',
  'DTSTART;TZID=Europe/Lisbon:20260119T100000',
  'DTEND;TZID=Europe/Lisbon:20260119T103000',
  'END:VEVENT',
  'BEGIN:VEVENT',
  'UID:shape-single',
  'DTSTART;TZID=Europe/Lisbon:20260120T140000',
  'DURATION:PT45M',
  'STATUS:TENTATIVE',
  'END:VEVENT',
  'BEGIN:VEVENT',
  'UID:shape-day',
  'DTSTART;VALUE=DATE:20260121',
  'DTEND:20260122T000000Z',
  'END:VEVENT',
  'END:VCALENDAR',
].join('\r\n');
const SHAPE_OPTIONS = {
  window: { start: Date.UTC(2026, 0, 1), end: Date.UTC(2026, 2, 1) },
  zone: 'Europe/Lisbon',
};
try {
  readFeed(SHAPE_FEED, SHAPE_OPTIONS, SHAPES);
} catch {
  // Only a matter of speed; reading feeds works the same without it.
}

/**
 * Busy kind from STATUS and TRANSP: cancelled, transparent or declined events leave the time free,
 * tentative ones are `tentative`, the rest `busy`. `declined` is asked only when it matters.
 */
function busyKind(status: string, transp: string, declined: () => boolean): BusyKind | undefined {
  const st = status.toUpperCase();
  if (st === 'CANCELLED' || transp.toUpperCase() === 'TRANSPARENT') return undefined;
  if (declined()) return undefined;
  return st === 'TENTATIVE' ? 'tentative' : 'busy';
}

/** True when an ATTENDEE value (a mailto address) is the owner's and its PARTSTAT is DECLINED. */
function declines(owner: string, value: unknown, partstat: unknown): boolean {
  if (typeof value !== 'string') return false;
  const email = value
    .replace(/^mailto:/i, '')
    .trim()
    .toLowerCase();
  return email === owner && typeof partstat === 'string' && partstat.toUpperCase() === 'DECLINED';
}
