import * as chrono from 'chrono-node';
import { describe, expect, it } from 'vitest';
import { seriesSchema } from '../../src/config/series-schema.ts';
import {
  describeSeries,
  parseSeriesSentence,
  type SeriesDraft,
  type SeriesSentenceOptions,
} from '../../src/rules/series-sentence.ts';
import { readClock, readLength } from '../../src/rules/series-sentence-words.ts';

// People, groups and rooms: the invented demo workspace (fixtures/demo/workspace.yaml), plus ana, bo
// and cy for the canonical example sentence and a second Teo to make a first name ambiguous.
const options: SeriesSentenceOptions = {
  now: Date.parse('2026-12-01T18:00:00Z'),
  zone: 'Europe/Lisbon',
  people: [
    { id: 'ana', name: 'Ana Reis' },
    { id: 'bo', name: 'Bo Lind' },
    { id: 'cy', name: 'Cy Moss' },
    { id: 'maren', name: 'Maren Holloway', chat: 'U0DEMO001' },
    { id: 'teo', name: 'Teo Brannigan', chat: 'U0DEMO002' },
    { id: 'ines', name: 'Ines Carvalhal', chat: 'U0DEMO006' },
    { id: 'rui', name: 'Rui Teixo', chat: 'U0DEMO007' },
    { id: 'aroha', name: 'Aroha Kerei', chat: 'U0DEMO011' },
    { id: 'teo-m', name: 'Teo Marsh' },
  ],
  groups: [
    { id: 'leads', members: ['maren', 'ines', 'aroha'] },
    { id: 'survey-team', members: ['maren', 'teo', 'ines', 'rui', 'aroha'] },
  ],
  rooms: [
    { id: 'chart-room', name: 'Chart Room', features: ['screen', 'whiteboard'] },
    { id: 'tejo', name: 'Tejo', features: ['screen', 'phone'] },
  ],
  existingIds: ['retro'],
};

const LISBON = 'Europe/Lisbon';
const cases: readonly [string, SeriesDraft][] = [
  [
    'team sync 45m twice a week with @ana @bo @cy on different days, room for 4, mornings if possible',
    {
      id: 'team-sync',
      name: 'team sync',
      attendees: ['ana', 'bo', 'cy'],
      minutes: 45,
      sessions: 2,
      preferredHours: ['08:00-12:00'],
      zone: LISBON,
      room: { seats: 4, features: [] },
    },
  ],
  [
    'weekly planning 1h with @leads',
    { id: 'weekly-planning', name: 'weekly planning', attendees: ['leads'], minutes: 60, sessions: 1 },
  ],
  [
    'data review for half an hour every monday and thursday with ines, rui and maren',
    {
      id: 'data-review',
      name: 'data review',
      attendees: ['ines', 'rui', 'maren'],
      minutes: 30,
      sessions: 2,
      days: ['mon', 'thu'],
    },
  ],
  [
    '"Survey standup" 15 min daily with @survey-team at 9:30',
    {
      id: 'survey-standup',
      name: 'Survey standup',
      attendees: ['survey-team'],
      minutes: 15,
      sessions: 5,
      days: ['mon', 'tue', 'wed', 'thu', 'fri'],
      hours: ['09:30-09:45'],
      zone: LISBON,
    },
  ],
  [
    'retro 1h30 once a week with @ana, not on fridays, afternoons only',
    {
      id: 'retro-2',
      name: 'retro',
      attendees: ['ana'],
      minutes: 90,
      sessions: 1,
      days: ['mon', 'tue', 'wed', 'thu'],
      hours: ['12:00-17:00'],
      zone: LISBON,
    },
  ],
  [
    'sync 45m 3x a week with @bo between 10 and 12 lisbon time, preferably tuesdays',
    {
      id: 'sync',
      name: 'sync',
      attendees: ['bo'],
      minutes: 45,
      sessions: 3,
      preferredDays: ['tue'],
      hours: ['10:00-12:00'],
      zone: LISBON,
    },
  ],
  [
    'ops 1h weekly with @ana in a room with a screen and a whiteboard',
    {
      id: 'ops',
      name: 'ops',
      attendees: ['ana'],
      minutes: 60,
      sessions: 1,
      room: { features: ['screen', 'whiteboard'] },
    },
  ],
  [
    'ops 1h weekly with @ana, strongly prefer mornings, halifax time',
    {
      id: 'ops',
      name: 'ops',
      attendees: ['ana'],
      minutes: 60,
      sessions: 1,
      preferredHours: ['08:00-12:00'],
      zone: 'America/Halifax',
      weights: { preferredHours: 6 },
    },
  ],
  [
    'catch-up 20 minutes weekly with <@U0DEMO001> and @cy, remote, after 14:00',
    {
      id: 'catch-up',
      name: 'catch-up',
      attendees: ['maren', 'cy'],
      minutes: 20,
      sessions: 1,
      hours: ['14:00-24:00'],
      zone: LISBON,
    },
  ],
  [
    'standup 15m every weekday with @ana and @bo before 10:00',
    {
      id: 'standup',
      name: 'standup',
      attendees: ['ana', 'bo'],
      minutes: 15,
      sessions: 5,
      days: ['mon', 'tue', 'wed', 'thu', 'fri'],
      hours: ['00:00-10:00'],
      zone: LISBON,
    },
  ],
  [
    'design crit 1 hour twice a week with @ana @bo, same day is fine, tuesdays or thursdays',
    {
      id: 'design-crit',
      name: 'design crit',
      attendees: ['ana', 'bo'],
      minutes: 60,
      sessions: 2,
      minDays: 1,
      days: ['tue', 'thu'],
    },
  ],
  [
    'sync 30 minutes three times a week with @leads, in the afternoon if possible, not on mondays',
    {
      id: 'sync',
      name: 'sync',
      attendees: ['leads'],
      minutes: 30,
      sessions: 3,
      days: ['tue', 'wed', 'thu', 'fri'],
      preferredHours: ['12:00-17:00'],
      zone: LISBON,
    },
  ],
  [
    'board prep 2h weekly with @maren from 9am to 11am',
    {
      id: 'board-prep',
      name: 'board prep',
      attendees: ['maren'],
      minutes: 120,
      sessions: 1,
      hours: ['09:00-11:00'],
      zone: LISBON,
    },
  ],
  [
    'call 45m weekly with @aroha @maren, between 9-11am halifax time',
    {
      id: 'call',
      name: 'call',
      attendees: ['aroha', 'maren'],
      minutes: 45,
      sessions: 1,
      hours: ['09:00-11:00'],
      zone: 'America/Halifax',
    },
  ],
  [
    'sync 30m weekly with @ana, mornings only, preferably wednesdays',
    {
      id: 'sync',
      name: 'sync',
      attendees: ['ana'],
      minutes: 30,
      sessions: 1,
      preferredDays: ['wed'],
      hours: ['08:00-12:00'],
      zone: LISBON,
    },
  ],
  [
    'check-in 25m twice a week with @cy',
    { id: 'check-in', name: 'check-in', attendees: ['cy'], minutes: 25, sessions: 2 },
  ],
  [
    'sync 30m twice a week with @ana room for 3 with a phone',
    {
      id: 'sync',
      name: 'sync',
      attendees: ['ana'],
      minutes: 30,
      sessions: 2,
      room: { seats: 3, features: ['phone'] },
    },
  ],
  [
    'late sync 30m weekly with @ana at 9:30pm',
    {
      id: 'late-sync',
      name: 'late sync',
      attendees: ['ana'],
      minutes: 30,
      sessions: 1,
      hours: ['21:30-22:00'],
      zone: LISBON,
    },
  ],
  [
    'sync 30m twice a week with @ana, spread over the week, room for six people',
    {
      id: 'sync',
      name: 'sync',
      attendees: ['ana'],
      minutes: 30,
      sessions: 2,
      room: { seats: 6, features: [] },
    },
  ],
  [
    'sync 30m weekly with @ana and @leads, (America/Halifax) mornings',
    {
      id: 'sync',
      name: 'sync',
      attendees: ['ana', 'leads'],
      minutes: 30,
      sessions: 1,
      hours: ['08:00-12:00'],
      zone: 'America/Halifax',
    },
  ],
  [
    'please set up a series called tide tables 40 minutes once a week with @rui @ines on tuesday or wednesday',
    {
      id: 'tide-tables',
      name: 'tide tables',
      attendees: ['rui', 'ines'],
      minutes: 40,
      sessions: 1,
      days: ['tue', 'wed'],
    },
  ],
  [
    'vessel briefing an hour and a half twice a week with @survey-team on mon, wed & fri, in the morning',
    {
      id: 'vessel-briefing',
      name: 'vessel briefing',
      attendees: ['survey-team'],
      minutes: 90,
      sessions: 2,
      days: ['mon', 'wed', 'fri'],
      hours: ['08:00-12:00'],
      zone: LISBON,
    },
  ],
  [
    'pairing 2 hours 4 times per week with @bo @cy, never on friday, ideally afternoons',
    {
      id: 'pairing',
      name: 'pairing',
      attendees: ['bo', 'cy'],
      minutes: 120,
      sessions: 4,
      days: ['mon', 'tue', 'wed', 'thu'],
      preferredHours: ['12:00-17:00'],
      zone: LISBON,
    },
  ],
  [
    'lab hour 1.5 hours weekly with @ana, utc, from 13:00 to 17:00, preferably thursday',
    {
      id: 'lab-hour',
      name: 'lab hour',
      attendees: ['ana'],
      minutes: 90,
      sessions: 1,
      preferredDays: ['thu'],
      hours: ['13:00-17:00'],
      zone: 'UTC',
    },
  ],
  [
    'charting review 45 mins every tuesday and friday with @maren @teo, room with screen',
    {
      id: 'charting-review',
      name: 'charting review',
      attendees: ['maren', 'teo'],
      minutes: 45,
      sessions: 2,
      days: ['tue', 'fri'],
      room: { features: ['screen'] },
    },
  ],
  [
    'ops review 30m twice a week with <@U0DEMO006> <@U0DEMO011> before noon auckland time, tuesdays if possible',
    {
      id: 'ops-review',
      name: 'ops review',
      attendees: ['ines', 'aroha'],
      minutes: 30,
      sessions: 2,
      preferredDays: ['tue'],
      hours: ['00:00-12:00'],
      zone: 'Pacific/Auckland',
    },
  ],
  [
    'quick sync quarter of an hour daily with @ana',
    {
      id: 'quick-sync',
      name: 'quick sync',
      attendees: ['ana'],
      minutes: 15,
      sessions: 5,
      days: ['mon', 'tue', 'wed', 'thu', 'fri'],
    },
  ],
  [
    'mentoring 50 minutes every wednesday with @rui, strongly prefer evenings',
    {
      id: 'mentoring',
      name: 'mentoring',
      attendees: ['rui'],
      minutes: 50,
      sessions: 1,
      days: ['wed'],
      preferredHours: ['17:00-21:00'],
      zone: LISBON,
      weights: { preferredHours: 6 },
    },
  ],
];

describe('parseSeriesSentence: phrasings with expected structures', () => {
  it('has at least 25 phrasings', () => {
    expect(cases.length).toBeGreaterThanOrEqual(25);
  });

  for (const [sentence, expected] of cases) {
    it(sentence, () => {
      const result = parseSeriesSentence(sentence, options);
      if (!result.ok) throw new Error(JSON.stringify(result.issues));
      expect(result.value.series).toEqual(expected);
      // The workspace schema accepts every structure the sentence reader produces.
      const checked = seriesSchema.safeParse(result.value.series);
      expect(checked.success ? [] : checked.error.issues).toEqual([]);
    });
  }
});

describe('parseSeriesSentence: unreadable parts are named, unclear ones ask', () => {
  const issuesOf = (s: string) => {
    const r = parseSeriesSentence(s, options);
    expect(r.ok).toBe(false);
    return r.ok ? [] : r.issues.map((i) => ({ code: i.code, path: i.path, message: i.message }));
  };

  it('names a word it cannot read', () => {
    expect(issuesOf('planning an hour with @ana, projector please')).toEqual([
      {
        code: 'series_unreadable',
        path: ['text', 28],
        message: "could not read 'projector'; leave it out or say it another way",
      },
    ]);
  });

  it('asks about a bare hour that could be morning or afternoon', () => {
    expect(issuesOf('1:1 30m weekly with @ana at 3')).toEqual([
      {
        code: 'series_ambiguous',
        path: ['text', 25],
        message: "does '3' mean 03:00 or 15:00? write it as 03:00 or 15:00",
      },
    ]);
  });

  it('asks which of two people a first name means', () => {
    expect(issuesOf('sync 30m twice a week with teo')).toEqual([
      {
        code: 'series_ambiguous',
        path: ['text', 27],
        message: "'teo' could be @teo or @teo-m; mention the one you mean",
      },
    ]);
  });

  it('names an unknown mention and an unknown chat id', () => {
    expect(issuesOf('sync 30m weekly with @zed and <@U0NOBODY>').map((i) => i.message)).toEqual([
      'no person in the workspace has chat id U0NOBODY',
      '@zed is neither a person nor a group of this workspace',
    ]);
  });

  it('refuses rhythms other than weekly instead of treating them as weekly', () => {
    expect(issuesOf('sync 45m every other week with @bo')[0]?.message).toBe(
      "'every other week': a series repeats every week; other rhythms are not supported",
    );
  });

  it('asks for seats or equipment instead of a named room', () => {
    expect(issuesOf('sync 30m twice a week with @ana in Tejo')[0]?.message).toMatch(
      /^a series takes any room that fits; instead of naming Tejo/,
    );
  });

  it('asks when the days cannot hold the sessions on different days', () => {
    expect(issuesOf('sync 30m twice a week on monday with @ana')[0]?.message).toBe(
      '2 sessions on different days do not fit in Monday; allow more days or say "same day is fine"',
    );
  });

  it('asks when two counts disagree', () => {
    expect(issuesOf('sync 30m twice a week every monday with @ana')[0]?.message).toBe(
      "'every Monday' gives 1 session but the sentence also says 2 a week; which is it?",
    );
  });

  it('asks when one part is both a must and a wish', () => {
    expect(issuesOf('sync 30m weekly with @ana, mornings only if possible')[0]?.code).toBe(
      'series_ambiguous',
    );
  });

  it('asks for the missing name, length and attendees', () => {
    expect(issuesOf('twice a week').map((i) => i.message)).toEqual([
      'what is the series called? put the name first, e.g. "team sync 30m weekly with @ana"',
      'how long is each session? add a length such as 30m or 1h',
      'who attends? mention people or groups, e.g. "with @ana @bo"',
    ]);
  });

  it('refuses a length the grid cannot hold', () => {
    expect(issuesOf('sync 7m weekly with @ana')[0]?.message).toBe(
      'a session of 7 minutes cannot be placed; use 5 to 1440 minutes in steps of 5',
    );
  });

  it('refuses an hour range that ends before it starts', () => {
    expect(issuesOf('sync 30m weekly with @ana between 16:00 and 10:00')[0]?.message).toMatch(
      /ends before it starts/,
    );
  });
});

describe('parseSeriesSentence: first week', () => {
  it('reads "starting next week" from now in the speaker zone', () => {
    // 2026-12-01 is a Tuesday (checked by Temporal in src/time), so next week starts Monday 2026-12-07.
    const r = parseSeriesSentence('ops 1h weekly with @ana starting next week', options);
    expect(r.ok && r.value.startsOn).toBe('2026-12-07');
  });

  it('reads a date and gives the Monday of its week', () => {
    const r = parseSeriesSentence('sync 30m weekly with @ana starting 2027-01-13', options);
    expect(r.ok && r.value.startsOn).toBe('2027-01-11');
  });

  it('refuses a week in the past', () => {
    const r = parseSeriesSentence('sync 30m weekly with @ana starting 2026-11-02', options);
    expect(r.ok ? [] : r.issues.map((i) => i.message)).toEqual([
      '2026-11-02 is in a past week; give a date from this week on',
    ]);
  });
});

describe('describeSeries', () => {
  it('restates the canonical sentence in our words', () => {
    const r = parseSeriesSentence(cases[0]![0], options);
    expect(r.ok && r.value.echo).toBe(
      'team sync: 45 minutes, twice a week on different days, with @ana, @bo and @cy; preferably between 08:00 and 12:00, Europe/Lisbon time; a room for 4.',
    );
  });

  it('says when the same day is allowed, the days, the hours and the room needs', () => {
    expect(
      describeSeries({
        id: 'x',
        name: 'design crit',
        attendees: ['ana', 'bo'],
        minutes: 60,
        sessions: 2,
        minDays: 1,
        days: ['tue', 'thu'],
        hours: ['00:00-10:00', '14:00-24:00'],
        zone: LISBON,
        room: { features: ['screen'] },
      }),
    ).toBe(
      'design crit: 1 hour, twice a week, the same day allowed, with @ana and @bo; only on Tuesday or Thursday, only before 10:00 or after 14:00, Europe/Lisbon time; a room seating every attendee, with screen.',
    );
  });

  it('reads its own echo back to the same structure', () => {
    // The echo is for people, but it stays close enough to the sentence grammar to read back.
    for (const [sentence] of cases) {
      const first = parseSeriesSentence(sentence, options);
      if (!first.ok) throw new Error(sentence);
      const again = parseSeriesSentence(first.value.echo, { ...options, existingIds: [] });
      expect(again.ok ? { ...again.value.series, id: first.value.series.id } : again.issues).toEqual(
        first.value.series,
      );
    }
  });
});

describe('clock times and lengths agree with chrono-node', () => {
  // chrono-node (a reference npm parser of dates in English) reads the same unambiguous clock times.
  const ref = new Date('2026-12-01T12:00:00Z');
  for (const t of ['9am', '9:30pm', '12pm', '12am', '11:45 am', '7 p.m.', '14:00', '09:15', 'noon']) {
    it(t, () => {
      const mine = readClock(t);
      const theirs = chrono.parse(`at ${t}`, ref)[0]?.start;
      expect(theirs).toBeDefined();
      expect(mine).toEqual({ kind: 'time', minutes: theirs!.get('hour')! * 60 + theirs!.get('minute')! });
    });
  }

  it('reads lengths in minutes', () => {
    const table: [string, number][] = [
      ['45m', 45],
      ['45 min', 45],
      ['1h', 60],
      ['1h30', 90],
      ['1 hour 15 minutes', 75],
      ['1.5 hours', 90],
      ['two hours', 120],
      ['half an hour', 30],
      ['an hour', 60],
      ['forty-five minutes', 45],
    ];
    expect(table.map(([t]) => readLength(t))).toEqual(table.map(([, n]) => n));
  });
});
