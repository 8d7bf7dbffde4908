// A line-level look at an iCalendar text: where each top-level component starts and ends. It parses
// nothing itself (ical.js does); it only lets errors name a component and line, and lets a damaged
// file be parsed one component at a time so the parts that are fine are still used.

/** One component directly under a VCALENDAR, with the physical line numbers it spans (1-based). */
export interface ScannedComponent {
  /** Component name in lower case, e.g. `vevent`. */
  readonly name: string;
  /** Line of its BEGIN. */
  readonly line: number;
  /** Its lines, BEGIN to END (or to where it was cut off). */
  readonly text: string;
  /** First line inside it that cannot be a content line (no colon, not a folded continuation). */
  readonly badLine: number | undefined;
  /** True when no matching END was found. */
  readonly unterminated: boolean;
}

/** Result of scanning: the top-level components and whether any VCALENDAR was seen. */
export interface IcsScan {
  readonly calendars: number;
  readonly components: readonly ScannedComponent[];
}

const BEGIN = /^BEGIN:([A-Za-z0-9-]+)\s*$/i;
const END = /^END:([A-Za-z0-9-]+)\s*$/i;

/** Scans the lines of an iCalendar text for its top-level components. */
export function scanIcs(text: string): IcsScan {
  const lines = text.split(/\r\n|\n|\r/);
  const components: ScannedComponent[] = [];
  let calendars = 0;
  const stack: string[] = [];
  let current: { name: string; line: number; from: number; badLine: number | undefined } | undefined;
  const close = (to: number, unterminated: boolean): void => {
    if (current === undefined) return;
    components.push({
      name: current.name,
      line: current.line,
      text: lines.slice(current.from, to + 1).join('\r\n'),
      badLine: current.badLine,
      unterminated,
    });
    current = undefined;
  };
  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i]!;
    const begin = BEGIN.exec(raw);
    if (begin !== null) {
      const name = begin[1]!.toLowerCase();
      if (name === 'vcalendar') {
        if (current !== undefined) close(i - 1, true);
        stack.length = 0;
        calendars++;
      } else if (stack.length === 1 && stack[0] === 'vcalendar') {
        current = { name, line: i + 1, from: i, badLine: undefined };
      }
      stack.push(name);
      continue;
    }
    const end = END.exec(raw);
    if (end !== null) {
      const name = end[1]!.toLowerCase();
      const at = stack.lastIndexOf(name);
      if (at >= 0) stack.length = at;
      if (current !== undefined && stack.length <= 1) close(i, name !== current.name);
      continue;
    }
    if (current !== undefined && current.badLine === undefined && raw !== '') {
      const folded = raw.startsWith(' ') || raw.startsWith('\t');
      if (!folded && !raw.includes(':')) current.badLine = i + 1;
    }
  }
  if (current !== undefined) close(lines.length - 1, true);
  return { calendars, components };
}
