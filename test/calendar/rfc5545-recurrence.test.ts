import { describe, expect, it as vitestIt } from 'vitest';
import { busyFromIcs } from '../../src/calendar/busy-from-ics.ts';

// Every example below is from RFC 5545 section 3.8.5.3 ("Recurrence Rule", pages 123-132): the
// DTSTART and RRULE lines as printed, and the instance list the RFC gives after "==>". The RFC
// labels each instance EDT (UTC-4) or EST (UTC-5); the expected UTC instants are computed from
// those labels here, so the check covers both the recurrence and the zone offsets. Each instance
// is given a one-minute duration so that no two instances touch and merge.

type Zone = 'EDT' | 'EST';
/** [year, zone label, month, days, times (HH:MM, default 09:00)] */
type Group = readonly [number, Zone, number, readonly number[], (readonly string[])?];

const range = (a: number, b: number, step = 1): number[] => {
  const out: number[] = [];
  for (let d = a; d <= b; d += step) out.push(d);
  return out;
};

function expected(groups: readonly Group[]): string[] {
  const out: number[] = [];
  for (const [y, zone, m, days, times = ['09:00']] of groups) {
    const offset = zone === 'EDT' ? 4 : 5;
    for (const d of days)
      for (const t of times) {
        const [hh, mm] = t.split(':').map(Number) as [number, number];
        out.push(Date.UTC(y, m - 1, d, hh + offset, mm));
      }
  }
  return out.sort((a, b) => a - b).map((ms) => new Date(ms).toISOString());
}

// The pre-2007 United States Eastern rules (first Sunday of April, last Sunday of October), written
// as an embedded VTIMEZONE under a non-IANA TZID so the ical.js zone path is exercised too; valid for
// the 1987-2006 examples only (IANA tzdata: America/New_York rules "US" 1987-2006).
const EASTERN_1987_2006 = [
  'BEGIN:VTIMEZONE',
  'TZID:US-Eastern',
  'BEGIN:STANDARD',
  'DTSTART:19671029T020000',
  'RRULE:FREQ=YEARLY;BYMONTH=10;BYDAY=-1SU',
  'TZOFFSETFROM:-0400',
  'TZOFFSETTO:-0500',
  'TZNAME:EST',
  'END:STANDARD',
  'BEGIN:DAYLIGHT',
  'DTSTART:19870405T020000',
  'RRULE:FREQ=YEARLY;BYMONTH=4;BYDAY=1SU',
  'TZOFFSETFROM:-0500',
  'TZOFFSETTO:-0400',
  'TZNAME:EDT',
  'END:DAYLIGHT',
  'END:VTIMEZONE',
];

function instances(tzid: string, lines: readonly string[], windowEnd: string): string[] {
  const body = lines.map((l) => l.replaceAll('TZID=America/New_York', `TZID=${tzid}`));
  const ics = [
    'BEGIN:VCALENDAR',
    'VERSION:2.0',
    'PRODID:-//slotwright//rfc5545 examples//EN',
    ...(tzid === 'US-Eastern' ? EASTERN_1987_2006 : []),
    'BEGIN:VEVENT',
    'UID:rfc5545-example',
    'DTSTAMP:19970901T000000Z',
    ...body,
    'DURATION:PT1M',
    'END:VEVENT',
    'END:VCALENDAR',
  ].join('\r\n');
  const start = body.find((l) => l.startsWith('DTSTART'))!;
  const y = Number(start.slice(-15, -11));
  const report = busyFromIcs(ics, {
    window: { start: Date.UTC(y - 1, 0, 1), end: Date.parse(windowEnd) },
    zone: 'America/New_York',
  });
  expect(report.warnings).toEqual([]);
  return report.busy.map((b) => {
    expect(b.end - b.start).toBe(60_000);
    return new Date(b.start).toISOString();
  });
}

interface Example {
  readonly title: string;
  readonly lines: readonly string[];
  /** Exclusive end of the window; for "forever" rules it stops after the last instance the RFC lists. */
  readonly until: string;
  readonly expect: readonly Group[];
  /** ical.js 2.2.1 expands this rule differently from the RFC; the test records the gap (it.fails). */
  readonly libraryGap?: true;
}

const NY = 'DTSTART;TZID=America/New_York:';
const EXAMPLES: readonly Example[] = [
  {
    title: 'Daily for 10 occurrences',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=DAILY;COUNT=10'],
    until: '1998-01-01T00:00:00Z',
    expect: [[1997, 'EDT', 9, range(2, 11)]],
  },
  {
    title: 'Daily until December 24, 1997',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=DAILY;UNTIL=19971224T000000Z'],
    until: '1998-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, range(2, 30)],
      [1997, 'EDT', 10, range(1, 25)],
      [1997, 'EST', 10, range(26, 31)],
      [1997, 'EST', 11, range(1, 30)],
      [1997, 'EST', 12, range(1, 23)],
    ],
  },
  {
    title: 'Every other day - forever',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=DAILY;INTERVAL=2'],
    until: '1997-12-04T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, range(2, 30, 2)],
      [1997, 'EDT', 10, range(2, 24, 2)],
      [1997, 'EST', 10, [26, 28, 30]],
      [1997, 'EST', 11, range(1, 29, 2)],
      [1997, 'EST', 12, [1, 3]],
    ],
  },
  {
    title: 'Every 10 days, 5 occurrences',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=DAILY;INTERVAL=10;COUNT=5'],
    until: '1998-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [2, 12, 22]],
      [1997, 'EDT', 10, [2, 12]],
    ],
  },
  {
    title: 'Every day in January, for 3 years (yearly form)',
    lines: [
      `${NY}19980101T090000`,
      'RRULE:FREQ=YEARLY;UNTIL=20000131T140000Z;BYMONTH=1;BYDAY=SU,MO,TU,WE,TH,FR,SA',
    ],
    until: '2001-01-01T00:00:00Z',
    expect: [
      [1998, 'EST', 1, range(1, 31)],
      [1999, 'EST', 1, range(1, 31)],
      [2000, 'EST', 1, range(1, 31)],
    ],
  },
  {
    title: 'Every day in January, for 3 years (daily form)',
    lines: [`${NY}19980101T090000`, 'RRULE:FREQ=DAILY;UNTIL=20000131T140000Z;BYMONTH=1'],
    until: '2001-01-01T00:00:00Z',
    expect: [
      [1998, 'EST', 1, range(1, 31)],
      [1999, 'EST', 1, range(1, 31)],
      [2000, 'EST', 1, range(1, 31)],
    ],
  },
  {
    title: 'Weekly for 10 occurrences',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=WEEKLY;COUNT=10'],
    until: '1998-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [2, 9, 16, 23, 30]],
      [1997, 'EDT', 10, [7, 14, 21]],
      [1997, 'EST', 10, [28]],
      [1997, 'EST', 11, [4]],
    ],
  },
  {
    title: 'Weekly until December 24, 1997',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=WEEKLY;UNTIL=19971224T000000Z'],
    until: '1998-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [2, 9, 16, 23, 30]],
      [1997, 'EDT', 10, [7, 14, 21]],
      [1997, 'EST', 10, [28]],
      [1997, 'EST', 11, [4, 11, 18, 25]],
      [1997, 'EST', 12, [2, 9, 16, 23]],
    ],
  },
  {
    title: 'Every other week - forever',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=WEEKLY;INTERVAL=2;WKST=SU'],
    until: '1998-02-18T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [2, 16, 30]],
      [1997, 'EDT', 10, [14]],
      [1997, 'EST', 10, [28]],
      [1997, 'EST', 11, [11, 25]],
      [1997, 'EST', 12, [9, 23]],
      [1998, 'EST', 1, [6, 20]],
      [1998, 'EST', 2, [3, 17]],
    ],
  },
  {
    title: 'Weekly on Tuesday and Thursday for five weeks (UNTIL form)',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=WEEKLY;UNTIL=19971007T000000Z;WKST=SU;BYDAY=TU,TH'],
    until: '1998-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [2, 4, 9, 11, 16, 18, 23, 25, 30]],
      [1997, 'EDT', 10, [2]],
    ],
  },
  {
    title: 'Weekly on Tuesday and Thursday for five weeks (COUNT form)',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=WEEKLY;COUNT=10;WKST=SU;BYDAY=TU,TH'],
    until: '1998-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [2, 4, 9, 11, 16, 18, 23, 25, 30]],
      [1997, 'EDT', 10, [2]],
    ],
  },
  {
    title: 'Every other week on Monday, Wednesday, and Friday until December 24, 1997',
    lines: [
      `${NY}19970901T090000`,
      'RRULE:FREQ=WEEKLY;INTERVAL=2;UNTIL=19971224T000000Z;WKST=SU;BYDAY=MO,WE,FR',
    ],
    until: '1998-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [1, 3, 5, 15, 17, 19, 29]],
      [1997, 'EDT', 10, [1, 3, 13, 15, 17]],
      [1997, 'EST', 10, [27, 29, 31]],
      [1997, 'EST', 11, [10, 12, 14, 24, 26, 28]],
      [1997, 'EST', 12, [8, 10, 12, 22]],
    ],
  },
  {
    title: 'Every other week on Tuesday and Thursday, for 8 occurrences',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=WEEKLY;INTERVAL=2;COUNT=8;WKST=SU;BYDAY=TU,TH'],
    until: '1998-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [2, 4, 16, 18, 30]],
      [1997, 'EDT', 10, [2, 14, 16]],
    ],
  },
  {
    title: 'Monthly on the first Friday for 10 occurrences',
    lines: [`${NY}19970905T090000`, 'RRULE:FREQ=MONTHLY;COUNT=10;BYDAY=1FR'],
    until: '1999-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [5]],
      [1997, 'EDT', 10, [3]],
      [1997, 'EST', 11, [7]],
      [1997, 'EST', 12, [5]],
      [1998, 'EST', 1, [2]],
      [1998, 'EST', 2, [6]],
      [1998, 'EST', 3, [6]],
      [1998, 'EST', 4, [3]],
      [1998, 'EDT', 5, [1]],
      [1998, 'EDT', 6, [5]],
    ],
  },
  {
    title: 'Monthly on the first Friday until December 24, 1997',
    lines: [`${NY}19970905T090000`, 'RRULE:FREQ=MONTHLY;UNTIL=19971224T000000Z;BYDAY=1FR'],
    until: '1999-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [5]],
      [1997, 'EDT', 10, [3]],
      [1997, 'EST', 11, [7]],
      [1997, 'EST', 12, [5]],
    ],
  },
  {
    title: 'Every other month on the first and last Sunday of the month for 10 occurrences',
    lines: [`${NY}19970907T090000`, 'RRULE:FREQ=MONTHLY;INTERVAL=2;COUNT=10;BYDAY=1SU,-1SU'],
    until: '1999-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [7, 28]],
      [1997, 'EST', 11, [2, 30]],
      [1998, 'EST', 1, [4, 25]],
      [1998, 'EST', 3, [1, 29]],
      [1998, 'EDT', 5, [3, 31]],
    ],
  },
  {
    title: 'Monthly on the second-to-last Monday of the month for 6 months',
    lines: [`${NY}19970922T090000`, 'RRULE:FREQ=MONTHLY;COUNT=6;BYDAY=-2MO'],
    until: '1999-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [22]],
      [1997, 'EDT', 10, [20]],
      [1997, 'EST', 11, [17]],
      [1997, 'EST', 12, [22]],
      [1998, 'EST', 1, [19]],
      [1998, 'EST', 2, [16]],
    ],
  },
  {
    title: 'Monthly on the third-to-the-last day of the month, forever',
    lines: [`${NY}19970928T090000`, 'RRULE:FREQ=MONTHLY;BYMONTHDAY=-3'],
    until: '1998-02-27T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [28]],
      [1997, 'EST', 10, [29]],
      [1997, 'EST', 11, [28]],
      [1997, 'EST', 12, [29]],
      [1998, 'EST', 1, [29]],
      [1998, 'EST', 2, [26]],
    ],
  },
  {
    title: 'Monthly on the 2nd and 15th of the month for 10 occurrences',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=MONTHLY;COUNT=10;BYMONTHDAY=2,15'],
    until: '1999-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [2, 15]],
      [1997, 'EDT', 10, [2, 15]],
      [1997, 'EST', 11, [2, 15]],
      [1997, 'EST', 12, [2, 15]],
      [1998, 'EST', 1, [2, 15]],
    ],
  },
  {
    title: 'Monthly on the first and last day of the month for 10 occurrences',
    lines: [`${NY}19970930T090000`, 'RRULE:FREQ=MONTHLY;COUNT=10;BYMONTHDAY=1,-1'],
    until: '1999-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [30]],
      [1997, 'EDT', 10, [1]],
      [1997, 'EST', 10, [31]],
      [1997, 'EST', 11, [1, 30]],
      [1997, 'EST', 12, [1, 31]],
      [1998, 'EST', 1, [1, 31]],
      [1998, 'EST', 2, [1]],
    ],
  },
  {
    title: 'Every 18 months on the 10th thru 15th of the month for 10 occurrences',
    lines: [`${NY}19970910T090000`, 'RRULE:FREQ=MONTHLY;INTERVAL=18;COUNT=10;BYMONTHDAY=10,11,12,13,14,15'],
    until: '2000-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, range(10, 15)],
      [1999, 'EST', 3, range(10, 13)],
    ],
  },
  {
    title: 'Every Tuesday, every other month',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=MONTHLY;INTERVAL=2;BYDAY=TU'],
    until: '1998-04-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [2, 9, 16, 23, 30]],
      [1997, 'EST', 11, [4, 11, 18, 25]],
      [1998, 'EST', 1, [6, 13, 20, 27]],
      [1998, 'EST', 3, [3, 10, 17, 24, 31]],
    ],
  },
  {
    title: 'Yearly in June and July for 10 occurrences',
    lines: [`${NY}19970610T090000`, 'RRULE:FREQ=YEARLY;COUNT=10;BYMONTH=6,7'],
    until: '2003-01-01T00:00:00Z',
    expect: [1997, 1998, 1999, 2000, 2001].flatMap((y): Group[] => [
      [y, 'EDT', 6, [10]],
      [y, 'EDT', 7, [10]],
    ]),
  },
  {
    title: 'Every other year on January, February, and March for 10 occurrences',
    lines: [`${NY}19970310T090000`, 'RRULE:FREQ=YEARLY;INTERVAL=2;COUNT=10;BYMONTH=1,2,3'],
    until: '2005-01-01T00:00:00Z',
    expect: [
      [1997, 'EST', 3, [10]],
      ...[1999, 2001, 2003].flatMap((y): Group[] => [
        [y, 'EST', 1, [10]],
        [y, 'EST', 2, [10]],
        [y, 'EST', 3, [10]],
      ]),
    ],
  },
  {
    title: 'Every third year on the 1st, 100th, and 200th day for 10 occurrences',
    lines: [`${NY}19970101T090000`, 'RRULE:FREQ=YEARLY;INTERVAL=3;COUNT=10;BYYEARDAY=1,100,200'],
    until: '2007-01-01T00:00:00Z',
    expect: [
      [1997, 'EST', 1, [1]],
      [1997, 'EDT', 4, [10]],
      [1997, 'EDT', 7, [19]],
      [2000, 'EST', 1, [1]],
      [2000, 'EDT', 4, [9]],
      [2000, 'EDT', 7, [18]],
      [2003, 'EST', 1, [1]],
      [2003, 'EDT', 4, [10]],
      [2003, 'EDT', 7, [19]],
      [2006, 'EST', 1, [1]],
    ],
  },
  {
    title: 'Every 20th Monday of the year, forever',
    lines: [`${NY}19970519T090000`, 'RRULE:FREQ=YEARLY;BYDAY=20MO'],
    libraryGap: true,
    until: '2000-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 5, [19]],
      [1998, 'EDT', 5, [18]],
      [1999, 'EDT', 5, [17]],
    ],
  },
  {
    title: 'Monday of week number 20, forever',
    lines: [`${NY}19970512T090000`, 'RRULE:FREQ=YEARLY;BYWEEKNO=20;BYDAY=MO'],
    libraryGap: true,
    until: '2000-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 5, [12]],
      [1998, 'EDT', 5, [11]],
      [1999, 'EDT', 5, [17]],
    ],
  },
  {
    title: 'Every Thursday in March, forever',
    lines: [`${NY}19970313T090000`, 'RRULE:FREQ=YEARLY;BYMONTH=3;BYDAY=TH'],
    until: '2000-01-01T00:00:00Z',
    expect: [
      [1997, 'EST', 3, [13, 20, 27]],
      [1998, 'EST', 3, [5, 12, 19, 26]],
      [1999, 'EST', 3, [4, 11, 18, 25]],
    ],
  },
  {
    title: 'Every Thursday, but only during June, July, and August, forever',
    lines: [`${NY}19970605T090000`, 'RRULE:FREQ=YEARLY;BYDAY=TH;BYMONTH=6,7,8'],
    until: '2000-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 6, [5, 12, 19, 26]],
      [1997, 'EDT', 7, [3, 10, 17, 24, 31]],
      [1997, 'EDT', 8, [7, 14, 21, 28]],
      [1998, 'EDT', 6, [4, 11, 18, 25]],
      [1998, 'EDT', 7, [2, 9, 16, 23, 30]],
      [1998, 'EDT', 8, [6, 13, 20, 27]],
      [1999, 'EDT', 6, [3, 10, 17, 24]],
      [1999, 'EDT', 7, [1, 8, 15, 22, 29]],
      [1999, 'EDT', 8, [5, 12, 19, 26]],
    ],
  },
  {
    title: 'Every Friday the 13th, forever (DTSTART excluded by EXDATE)',
    lines: [
      `${NY}19970902T090000`,
      'EXDATE;TZID=America/New_York:19970902T090000',
      'RRULE:FREQ=MONTHLY;BYDAY=FR;BYMONTHDAY=13',
    ],
    until: '2000-10-14T00:00:00Z',
    expect: [
      [1998, 'EST', 2, [13]],
      [1998, 'EST', 3, [13]],
      [1998, 'EST', 11, [13]],
      [1999, 'EDT', 8, [13]],
      [2000, 'EDT', 10, [13]],
    ],
  },
  {
    title: 'The first Saturday that follows the first Sunday of the month, forever',
    lines: [`${NY}19970913T090000`, 'RRULE:FREQ=MONTHLY;BYDAY=SA;BYMONTHDAY=7,8,9,10,11,12,13'],
    until: '1998-06-14T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [13]],
      [1997, 'EDT', 10, [11]],
      [1997, 'EST', 11, [8]],
      [1997, 'EST', 12, [13]],
      [1998, 'EST', 1, [10]],
      [1998, 'EST', 2, [7]],
      [1998, 'EST', 3, [7]],
      [1998, 'EDT', 4, [11]],
      [1998, 'EDT', 5, [9]],
      [1998, 'EDT', 6, [13]],
    ],
  },
  {
    title: 'Every 4 years, the first Tuesday after a Monday in November, forever',
    lines: [
      `${NY}19961105T090000`,
      'RRULE:FREQ=YEARLY;INTERVAL=4;BYMONTH=11;BYDAY=TU;BYMONTHDAY=2,3,4,5,6,7,8',
    ],
    until: '2005-01-01T00:00:00Z',
    expect: [
      [1996, 'EST', 11, [5]],
      [2000, 'EST', 11, [7]],
      [2004, 'EST', 11, [2]],
    ],
  },
  {
    title: 'The third instance into the month of one of Tuesday, Wednesday, or Thursday, for 3 months',
    lines: [`${NY}19970904T090000`, 'RRULE:FREQ=MONTHLY;COUNT=3;BYDAY=TU,WE,TH;BYSETPOS=3'],
    until: '1999-01-01T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [4]],
      [1997, 'EDT', 10, [7]],
      [1997, 'EST', 11, [6]],
    ],
  },
  {
    title: 'The second-to-last weekday of the month',
    lines: [`${NY}19970929T090000`, 'RRULE:FREQ=MONTHLY;BYDAY=MO,TU,WE,TH,FR;BYSETPOS=-2'],
    until: '1998-03-31T00:00:00Z',
    expect: [
      [1997, 'EDT', 9, [29]],
      [1997, 'EST', 10, [30]],
      [1997, 'EST', 11, [27]],
      [1997, 'EST', 12, [30]],
      [1998, 'EST', 1, [29]],
      [1998, 'EST', 2, [26]],
      [1998, 'EST', 3, [30]],
    ],
  },
  // "Every 3 hours from 9:00 AM to 5:00 PM" is left out: its UNTIL (17:00Z, 13:00 EDT) contradicts
  // the listed 15:00 EDT instance, a known inconsistency in the RFC text.
  {
    title: 'Every 15 minutes for 6 occurrences',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=MINUTELY;INTERVAL=15;COUNT=6'],
    until: '1997-09-03T00:00:00Z',
    expect: [[1997, 'EDT', 9, [2], ['09:00', '09:15', '09:30', '09:45', '10:00', '10:15']]],
  },
  {
    title: 'Every hour and a half for 4 occurrences',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=MINUTELY;INTERVAL=90;COUNT=4'],
    until: '1997-09-03T00:00:00Z',
    expect: [[1997, 'EDT', 9, [2], ['09:00', '10:30', '12:00', '13:30']]],
  },
  {
    title: 'Every 20 minutes from 9:00 AM to 4:40 PM every day (daily form)',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=DAILY;BYHOUR=9,10,11,12,13,14,15,16;BYMINUTE=0,20,40'],
    until: '1997-09-04T04:00:00Z',
    expect: [[1997, 'EDT', 9, [2, 3], range(9, 16).flatMap((h) => [0, 20, 40].map((m) => `${h}:${m}`))]],
  },
  {
    title: 'Every 20 minutes from 9:00 AM to 4:40 PM every day (minutely form)',
    lines: [`${NY}19970902T090000`, 'RRULE:FREQ=MINUTELY;INTERVAL=20;BYHOUR=9,10,11,12,13,14,15,16'],
    until: '1997-09-04T04:00:00Z',
    expect: [[1997, 'EDT', 9, [2, 3], range(9, 16).flatMap((h) => [0, 20, 40].map((m) => `${h}:${m}`))]],
  },
  {
    title: 'WKST=MO changes the days generated',
    lines: [`${NY}19970805T090000`, 'RRULE:FREQ=WEEKLY;INTERVAL=2;COUNT=4;BYDAY=TU,SU;WKST=MO'],
    until: '1998-01-01T00:00:00Z',
    expect: [[1997, 'EDT', 8, [5, 10, 19, 24]]],
  },
  {
    title: 'WKST=SU changes the days generated',
    lines: [`${NY}19970805T090000`, 'RRULE:FREQ=WEEKLY;INTERVAL=2;COUNT=4;BYDAY=TU,SU;WKST=SU'],
    until: '1998-01-01T00:00:00Z',
    expect: [[1997, 'EDT', 8, [5, 17, 19, 31]]],
  },
  {
    title: 'An invalid date (February 30) is ignored',
    lines: [`${NY}20070115T090000`, 'RRULE:FREQ=MONTHLY;BYMONTHDAY=15,30;COUNT=5'],
    until: '2008-01-01T00:00:00Z',
    expect: [
      [2007, 'EST', 1, [15, 30]],
      [2007, 'EST', 2, [15]],
      [2007, 'EDT', 3, [15, 30]],
    ],
  },
];

describe('RFC 5545 section 3.8.5.3 recurrence examples, ICS in and busy time out', () => {
  vitestIt('warns about the yearly rules the calendar library expands wrongly', () => {
    const ics = [
      'BEGIN:VCALENDAR',
      'BEGIN:VEVENT',
      'UID:y',
      `${NY}19970519T090000`,
      'RRULE:FREQ=YEARLY;BYDAY=20MO',
      'END:VEVENT',
      'END:VCALENDAR',
    ].join('\r\n');
    const r = busyFromIcs(ics, {
      window: { start: Date.UTC(1997, 0, 1), end: Date.UTC(1998, 0, 1) },
      zone: 'America/New_York',
    });
    expect(r.warnings).toEqual([
      'VEVENT at line 2: a yearly rule by week number or by the n-th weekday of the year is expanded as every matching weekday (a limit of the calendar library); check this series',
    ]);
  });
  vitestIt('has at least 15 examples', () => {
    expect(EXAMPLES.length).toBeGreaterThanOrEqual(15);
  });
  for (const ex of EXAMPLES) {
    // ical.js 2.2.1 yields every Monday for these two yearly rules; the pipeline warns about such
    // rules instead of hiding the gap, and these tests flip to failing once the library is fixed.
    const it = ex.libraryGap === true ? vitestIt.fails : vitestIt;
    it(`${ex.title} (TZID=America/New_York, IANA rules through Temporal)`, () => {
      expect(instances('America/New_York', ex.lines, ex.until)).toEqual(expected(ex.expect));
    });
    const lastYear = Math.max(...ex.expect.map((g) => g[0]));
    if (lastYear < 2007) {
      it(`${ex.title} (embedded VTIMEZONE, ical.js zone rules)`, () => {
        expect(instances('US-Eastern', ex.lines, ex.until)).toEqual(expected(ex.expect));
      });
    }
  }
});
