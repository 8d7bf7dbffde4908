import { readFileSync } from 'node:fs';
import { Temporal } from 'temporal-polyfill';
import { busyFromIcs, fetchFeed, redactUrl } from '../../calendar/index.ts';
import { normalizeError } from '../../errors.ts';
import type { BusyInterval } from '../../time/index.ts';
import { canonicalZone, zonedToInstant } from '../../time/index.ts';
import { parseVerbArgs, stringOption } from '../args.ts';
import { type CliIo, UsageError } from '../io.ts';
import type { CliCommand } from '../main.ts';

const USAGE = `Usage: slotwright busy <file-or-url> --from <from> --to <to> [--zone <IANA>] [--owner <email>] [--json]

Reads one calendar feed (an .ics file, an https URL, or pasted iCalendar text) and prints its busy
time between --from and --to, merged and sorted. Titles and attendees are never shown.

  <from>, <to>     a date YYYY-MM-DD (00:00 of that day in --zone; --to is exclusive)
                   or an ISO-8601 instant with offset, e.g. 2026-12-07T09:00:00-04:00
  --zone <IANA>    zone for dates, all-day events and floating times (default: the system zone)
  --owner <email>  whose calendar it is; invitations this person declined are free time
  --json           print one JSON object: {"busy":[{"start","end","kind"}],"warnings":[...]}

Feed URLs must be https and public. An admin can allow internal hosts (and http for them) with
SLOTWRIGHT_FEED_ALLOW=host1,host2.
Exit codes: 0 read (warnings allowed), 1 the feed could not be read, 2 bad arguments.`;

function parseBound(text: string, zone: string, name: string): number {
  if (/^\d{4}-\d{2}-\d{2}$/.test(text)) {
    try {
      return zonedToInstant(Temporal.PlainDate.from(text).toString(), 0, zone);
    } catch {
      throw new UsageError(`--${name} '${text}' is not a calendar date`);
    }
  }
  try {
    return Temporal.Instant.from(text).epochMilliseconds;
  } catch {
    throw new UsageError(
      `--${name} takes a date YYYY-MM-DD or an instant with offset such as 2026-12-07T09:00:00Z, got '${text}'`,
    );
  }
}

const utc = (ms: number) => new Date(ms).toISOString().replace(/\.\d{3}Z$/, 'Z');

function table(busy: readonly BusyInterval[], zone: string): string[] {
  if (busy.length === 0) return [`no busy time (times in ${zone})`];
  const lines = [`busy time in ${zone}:`];
  for (const b of busy) {
    const s = Temporal.Instant.fromEpochMilliseconds(b.start).toZonedDateTimeISO(zone);
    const e = Temporal.Instant.fromEpochMilliseconds(b.end).toZonedDateTimeISO(zone);
    const hm = (z: Temporal.ZonedDateTime) => z.toPlainTime().toString({ smallestUnit: 'minute' });
    const day = (z: Temporal.ZonedDateTime) =>
      `${z.toPlainDate().toString()} ${['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'][z.dayOfWeek - 1]}`;
    const end = e.toPlainDate().equals(s.toPlainDate()) ? hm(e) : `${day(e)} ${hm(e)}`;
    lines.push(`  ${day(s)} ${hm(s)} - ${end}  ${b.kind}`);
  }
  return lines;
}

async function readInput(source: string, io: CliIo): Promise<string> {
  if (/^BEGIN:VCALENDAR/im.test(source.trimStart())) return source;
  if (/^[a-z][a-z0-9+.-]*:\/\//i.test(source)) {
    const allowHosts = (io.env.SLOTWRIGHT_FEED_ALLOW ?? '')
      .split(',')
      .map((h) => h.trim())
      .filter((h) => h !== '');
    const r = await fetchFeed(source, { allowHosts });
    return r.status === 'ok' ? r.body : '';
  }
  try {
    return readFileSync(source, 'utf8');
  } catch (error) {
    const code = (error as { code?: string }).code;
    throw new Error(
      code === 'ENOENT'
        ? `no such file: ${source}`
        : `cannot read ${source}${code === undefined ? '' : ` (${code})`}`,
    );
  }
}

/** `slotwright busy`: one feed's busy time over a window. */
export const command: CliCommand = {
  name: 'busy',
  summary: 'show the busy time of one calendar feed (file, URL or pasted text)',
  usage: USAGE,
  async run(args, io) {
    const { values, positionals } = parseVerbArgs(
      args,
      {
        from: { type: 'string' },
        to: { type: 'string' },
        zone: { type: 'string' },
        owner: { type: 'string' },
        json: { type: 'boolean' },
      },
      { min: 1, max: 1, names: '<file-or-url>' },
    );
    const source = positionals[0]!;
    const zoneText = stringOption(values, 'zone') ?? Intl.DateTimeFormat().resolvedOptions().timeZone;
    const zone = canonicalZone(zoneText);
    if (zone === undefined)
      throw new UsageError(`--zone '${zoneText}' is not an IANA zone name such as Europe/Lisbon`);
    const from = parseBound(stringOption(values, 'from', true), zone, 'from');
    const to = parseBound(stringOption(values, 'to', true), zone, 'to');
    if (to <= from) throw new UsageError('--to must be later than --from');
    const owner = stringOption(values, 'owner');
    if (owner !== undefined && !/^[^\s@]+@[^\s@]+$/.test(owner))
      throw new UsageError(`--owner takes an email address, got '${owner}'`);
    const json = values.json === true;
    try {
      const text = await readInput(source, io);
      const report = busyFromIcs(text, {
        window: { start: from, end: to },
        zone,
        ...(owner === undefined ? {} : { ownerEmail: owner }),
      });
      if (json) {
        io.out(
          JSON.stringify({
            busy: report.busy.map((b) => ({ start: utc(b.start), end: utc(b.end), kind: b.kind })),
            warnings: report.warnings,
          }),
        );
      } else {
        for (const line of table(report.busy, zone)) io.out(line);
        for (const w of report.warnings) io.err(`warning: ${w}`);
      }
      return 0;
    } catch (error) {
      const e = normalizeError(error);
      // the message may quote the source; a URL is shown redacted
      const message = /^[a-z][a-z0-9+.-]*:\/\//i.test(source)
        ? e.message.replaceAll(source, redactUrl(source))
        : e.message;
      if (json) io.out(JSON.stringify({ error: message }));
      else io.err(`slotwright busy: ${message}`);
      return 1;
    }
  },
};
