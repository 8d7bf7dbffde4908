import { Temporal } from 'temporal-polyfill';
import type {
  BookingView,
  FeedView,
  MeetAnswer,
  MeetQuery,
  ServicePerson,
  SlotwrightService,
  WeekLockView,
  WeekPlanView,
  WeekProgressView,
} from '../app/service.ts';
import type { Issue, Result } from '../errors.ts';
import { CHAT_VERBS, type ChatIntent, parseChatCommand } from './parse-command.ts';
import { ACTION, type Reply, type ReplyAction, type ReplyBlock, type Span, textReply } from './reply.ts';

/** How many options a reply shows at most. */
const SHOWN_OPTIONS = 5;

const HELP: Readonly<Record<string, string>> = {
  meet: 'meet 45m with @ana @bo [optional @cy] [tomorrow | next week | on 2026-12-08 | between 2026-12-08 and 2026-12-10] [room for 6] [with screen]',
  rule: "rule <what you want, in plain words>, e.g. 'rule no meetings before 10:00'; I show what I understood and you confirm",
  rules: 'rules: lists your saved rules with their ids',
  forget: 'forget <rule id>: removes one of your rules',
  feed: 'feed <https address of an .ics calendar>: adds a calendar feed of yours',
  feeds: 'feeds: lists your calendar feeds and how fresh they are',
  series: 'series: lists the recurring meetings the week plan places',
  week: 'week [next | 2026-W50 | YYYY-MM-DD]: plans the recurring meetings of that week (default: next week); an admin can lock it, which books every session',
  why: "why: explains what blocked your last 'meet' request",
  help: 'help [verb]: this list, or one verb in detail',
};

/**
 * The bot's conversation logic, shared by every surface: turns typed commands and button clicks into
 * service calls and the results into neutral replies. Surfaces only render and deliver.
 */
export class Conversation {
  readonly #service: SlotwrightService;

  constructor(service: SlotwrightService) {
    this.#service = service;
  }

  /** The service behind this conversation. */
  get service(): SlotwrightService {
    return this.#service;
  }

  /** Parses typed text; the surface uses the intent to decide whether a slow answer needs a "working" note. */
  parse(actor: ServicePerson, text: string, nowMs: number): Result<ChatIntent> {
    const today = Temporal.Instant.fromEpochMilliseconds(nowMs).toZonedDateTimeISO(actor.zone).toPlainDate();
    return parseChatCommand(text, { today: today.toString() });
  }

  /** Answers one typed command. */
  async command(actor: ServicePerson, text: string, nowMs: number): Promise<Reply> {
    const parsed = this.parse(actor, text, nowMs);
    if (!parsed.ok) return issuesReply('I could not read all of that. Nothing was changed.', parsed.issues);
    return this.run(actor, parsed.value, nowMs);
  }

  /** Answers an already parsed command. */
  async run(actor: ServicePerson, intent: ChatIntent, nowMs: number): Promise<Reply> {
    const s = this.#service;
    switch (intent.verb) {
      case 'help':
        return helpReply(intent.topic);
      case 'meet': {
        const { verb: _verb, ...query } = intent;
        return this.meet(actor, query, nowMs);
      }
      case 'why':
        return whyReply(s.lastMeet(actor.id));
      case 'rule': {
        const r = await s.previewRule(actor, intent.text, nowMs);
        if (!r.ok) return issuesReply('I could not read that rule. Nothing was saved.', r.issues);
        const v = r.value;
        const kind = v.strength === 'hard' ? 'hard rule (must)' : 'preference (would like)';
        const blocks: ReplyBlock[] = [
          {
            kind: 'text',
            spans: ['I read this as a ', { kind: 'strong', text: kind }, `: ${v.description}`],
          },
        ];
        if (v.fields.length > 0)
          blocks.push({ kind: 'list', items: v.fields.map((f) => [`${f.label}: ${f.value}`]) });
        if (v.related.length > 0) blocks.push({ kind: 'note', spans: [v.related.join(' · ')] });
        blocks.push({ kind: 'text', spans: [v.question] });
        blocks.push({
          kind: 'actions',
          actions: [{ id: ACTION.confirmRule, label: 'Save this rule', value: v.token, style: 'primary' }],
        });
        blocks.push({ kind: 'note', spans: ['Nothing is saved until you confirm.'] });
        return { summary: `I read this as: ${v.description}`, private: true, blocks };
      }
      case 'rules': {
        const r = await s.rules(actor);
        if (!r.ok) return issuesReply('I could not list your rules.', r.issues);
        if (r.value.length === 0) return textReply("You have no rules yet. Add one with 'rule …'.");
        return {
          summary: `You have ${r.value.length} rule(s).`,
          private: true,
          blocks: [
            { kind: 'heading', text: 'Your rules' },
            {
              kind: 'list',
              items: r.value.map((x) => [
                { kind: 'code', text: x.id },
                ` ${x.text} (${x.strength === 'hard' ? 'must' : 'would like'})`,
              ]),
            },
            { kind: 'note', spans: ["Remove one with 'forget <id>'."] },
          ],
        };
      }
      case 'forget': {
        const r = await s.forgetRule(actor, intent.ruleId, nowMs);
        if (!r.ok) return issuesReply('Nothing was removed.', r.issues);
        return textReply(`Forgotten: ${r.value.text}`);
      }
      case 'feed': {
        const r = await s.addFeed(actor, intent.url, nowMs);
        if (!r.ok) return issuesReply('The feed was not added.', r.issues);
        return {
          summary: `Feed added: ${r.value.label}`,
          blocks: [{ kind: 'list', items: [feedLine(r.value)] }],
        };
      }
      case 'feeds': {
        const r = await s.feeds(actor, nowMs);
        if (!r.ok) return issuesReply('I could not list your feeds.', r.issues);
        if (r.value.length === 0)
          return textReply("You have no calendar feeds. Add one with 'feed <address>'.");
        return {
          summary: `You have ${r.value.length} feed(s).`,
          private: true,
          blocks: [
            { kind: 'heading', text: 'Your feeds' },
            { kind: 'list', items: r.value.map(feedLine) },
          ],
        };
      }
      case 'series': {
        const r = await s.series(actor, intent.text, nowMs);
        if (!r.ok) return issuesReply('I could not list the series.', r.issues);
        if (r.value.length === 0) return textReply('There are no recurring meetings set up.');
        return {
          summary: `${r.value.length} series`,
          blocks: [
            { kind: 'heading', text: 'Recurring meetings' },
            { kind: 'list', items: r.value.map((x) => [{ kind: 'code', text: x.id }, ` ${x.description}`]) },
          ],
        };
      }
      case 'week':
        return this.week(actor, intent.weekOf, nowMs);
    }
  }

  /** Plans a week; `onProgress` hears how the search goes (for updating a "working" note). */
  async week(
    actor: ServicePerson,
    weekOf: string | undefined,
    nowMs: number,
    onProgress?: (p: WeekProgressView) => void,
  ): Promise<Reply> {
    const r = await this.#service.week(actor, weekOf, nowMs, onProgress);
    if (!r.ok) return issuesReply('I could not plan the week.', r.issues);
    return weekReply(r.value, actor.admin);
  }

  /** Answers a meeting request. */
  async meet(actor: ServicePerson, query: MeetQuery, nowMs: number): Promise<Reply> {
    const r = await this.#service.meet(actor, query, nowMs);
    if (!r.ok) return issuesReply('I could not work on that request. Nothing was booked.', r.issues);
    return meetReply(r.value);
  }

  /** Handles a button click (or a numbered choice in the console). */
  async action(actor: ServicePerson, kind: string, value: string, nowMs: number): Promise<Reply> {
    const s = this.#service;
    switch (kind) {
      case ACTION.bookOption: {
        const r = await s.book(actor, value, nowMs);
        return r.ok ? bookingReply('Booked', r.value) : issuesReply('Nothing was booked.', r.issues);
      }
      case ACTION.holdOption: {
        const r = await s.hold(actor, value, nowMs);
        return r.ok ? bookingReply('Held', r.value) : issuesReply('Nothing was held.', r.issues);
      }
      case ACTION.cancelBooking: {
        const r = await s.cancel(actor, value, nowMs);
        return r.ok ? bookingReply('Cancelled', r.value) : issuesReply('Nothing was cancelled.', r.issues);
      }
      case ACTION.confirmRule: {
        const r = await s.confirmRule(actor, value, nowMs);
        return r.ok
          ? textReply(`Saved rule ${r.value.id}: ${r.value.text}`, [
              'Saved rule ',
              { kind: 'code', text: r.value.id },
              `: ${r.value.text}`,
            ])
          : issuesReply('The rule was not saved.', r.issues);
      }
      case ACTION.lockWeek: {
        const r = await s.lockWeek(actor, value, nowMs);
        return r.ok ? lockReply(r.value) : issuesReply('The week was not locked.', r.issues);
      }
      case ACTION.tryRelaxation: {
        let query: MeetQuery;
        try {
          query = JSON.parse(value) as MeetQuery;
        } catch {
          return textReply('That button is out of date; ask again.');
        }
        return this.meet(actor, query, nowMs);
      }
      default:
        return textReply('That button is out of date; ask again.');
    }
  }

  /** The home tab: my rules, my feeds and their freshness, my upcoming bookings. */
  async home(actor: ServicePerson, nowMs: number): Promise<Reply> {
    const s = this.#service;
    const [rules, feeds, bookings] = await Promise.all([
      s.rules(actor),
      s.feeds(actor, nowMs),
      s.upcoming(actor, nowMs),
    ]);
    const blocks: ReplyBlock[] = [
      { kind: 'heading', text: `slotwright · ${s.workspaceName}` },
      {
        kind: 'actions',
        actions: [{ id: ACTION.openRequest, label: 'New request', value: 'new', style: 'primary' }],
      },
      { kind: 'heading', text: 'My upcoming bookings' },
    ];
    const section = <T>(
      r: Result<readonly T[]>,
      empty: string,
      lines: (xs: readonly T[]) => ReplyBlock[],
    ): void => {
      if (!r.ok) blocks.push({ kind: 'note', spans: [r.issues.map((i) => i.message).join('; ')] });
      else if (r.value.length === 0) blocks.push({ kind: 'note', spans: [empty] });
      else blocks.push(...lines(r.value));
    };
    section(bookings, 'Nothing booked.', (xs) =>
      xs.flatMap((b): ReplyBlock[] => [
        { kind: 'text', spans: bookingSpans(b) },
        {
          kind: 'actions',
          actions: [{ id: ACTION.cancelBooking, label: 'Cancel', value: b.id, style: 'danger' }],
        },
      ]),
    );
    blocks.push({ kind: 'heading', text: 'My rules' });
    section(rules, 'No rules.', (xs) => [
      { kind: 'list', items: xs.map((x) => [{ kind: 'code', text: x.id }, ` ${x.text}`]) },
    ]);
    blocks.push({ kind: 'heading', text: 'My feeds' });
    section(feeds, 'No feeds.', (xs) => [{ kind: 'list', items: xs.map(feedLine) }]);
    return { summary: `slotwright · ${s.workspaceName}`, blocks };
  }
}

/** The short note posted while a slow answer is computed. */
export function workingReply(intent: ChatIntent): Reply {
  return textReply(intent.verb === 'week' ? 'Planning the week…' : 'Looking for times…');
}

/** True for commands whose answer may take long enough to need a "working" note first. */
export function isSlow(intent: ChatIntent): boolean {
  return intent.verb === 'meet' || intent.verb === 'week';
}

/** A reply naming each issue; the first line says what happened. */
export function issuesReply(headline: string, issues: readonly Issue[]): Reply {
  return {
    summary: `${headline} ${issues[0]?.message ?? ''}`.trim(),
    private: true,
    blocks: [
      { kind: 'text', spans: [headline] },
      { kind: 'list', items: issues.map((i) => [i.message]) },
    ],
  };
}

function helpReply(topic: string | undefined): Reply {
  if (topic !== undefined) {
    const line = HELP[topic];
    if (line === undefined)
      return textReply(`'${topic}' is not a verb; try one of: ${CHAT_VERBS.join(', ')}`);
    return textReply(line, [{ kind: 'code', text: line }]);
  }
  return {
    summary: 'What I can do',
    private: true,
    blocks: [
      { kind: 'text', spans: ['What I can do:'] },
      { kind: 'list', items: CHAT_VERBS.map((v) => [{ kind: 'code', text: HELP[v]! }]) },
    ],
  };
}

function names(a: MeetAnswer): string {
  return a.attendees.map((p) => p.name.split(' ')[0]).join(', ');
}

/** The score breakdown in compact form: whole fit score, parts rounded, parts that round to 0 left out. */
export function breakdown(o: MeetAnswer['options'][number]): string {
  const parts = o.breakdown
    .map((p) => ({ label: p.label, points: Math.round(p.points * 10) / 10 }))
    .filter((p) => p.points !== 0)
    .map((p) => `${p.label} ${p.points > 0 ? '+' : '−'}${Math.abs(p.points)}`);
  const fit = `fit ${Math.round(o.score)}`;
  return parts.length === 0 ? fit : `${fit}: ${parts.join('; ')}`;
}

/** "30 min", "1 h", "1 h 30 min". */
export function formatLength(minutes: number): string {
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  if (h === 0) return `${m} min`;
  return m === 0 ? `${h} h` : `${h} h ${m} min`;
}

/** Renders the answer to a meeting request. */
export function meetReply(a: MeetAnswer): Reply {
  const blocks: ReplyBlock[] = [];
  const what = `${formatLength(a.query.lengthMinutes)} with ${names(a)}`;
  if (a.options.length > 0) {
    blocks.push({ kind: 'text', spans: [{ kind: 'strong', text: `Options for ${what}` }] });
    a.options.slice(0, SHOWN_OPTIONS).forEach((o, i) => {
      const spans: Span[] = [
        { kind: 'strong', text: `${i + 1}.` },
        ' ',
        { kind: 'time', start: o.start, end: o.end },
      ];
      if (o.room !== undefined) spans.push(` in ${o.room.name}`);
      blocks.push({ kind: 'text', spans });
      blocks.push({ kind: 'note', spans: [breakdown(o)] });
      blocks.push({
        kind: 'actions',
        actions: [
          { id: ACTION.bookOption, label: `Book option ${i + 1}`, value: o.token, style: 'primary' },
          { id: ACTION.holdOption, label: `Hold option ${i + 1}`, value: o.token },
        ],
      });
    });
  } else {
    blocks.push({ kind: 'text', spans: [{ kind: 'strong', text: `Nothing fits for ${what}.` }] });
  }
  if (a.blockers.length > 0 && a.options.length === 0) {
    blocks.push({ kind: 'text', spans: ['In the way:'] });
    blocks.push({
      kind: 'list',
      items: a.blockers.map((b) => [{ kind: 'strong', text: b.subject }, `: ${b.reason}`]),
    });
  }
  if (a.relaxations.length > 0) {
    const actions: ReplyAction[] = a.relaxations.slice(0, 5).map((r) => ({
      id: ACTION.tryRelaxation,
      label: r.label.slice(0, 75),
      value: JSON.stringify(r.query),
    }));
    blocks.push({
      kind: 'text',
      spans: [a.options.length === 0 ? 'These changes would open times:' : 'Other ways:'],
    });
    blocks.push({ kind: 'actions', actions });
  }
  if (a.warnings.length > 0) blocks.push({ kind: 'note', spans: [a.warnings.join(' · ')] });
  const summary =
    a.options.length > 0 ? `${a.options.length} option(s) for ${what}` : `Nothing fits for ${what}`;
  return { summary, blocks };
}

function whyReply(a: MeetAnswer | undefined): Reply {
  if (a === undefined)
    return textReply("You have not asked for a meeting yet. Try 'meet 30m with @someone'.");
  const what = `${formatLength(a.query.lengthMinutes)} with ${names(a)}`;
  if (a.blockers.length === 0) {
    return textReply(
      a.options.length > 0
        ? `Your last request (${what}) had ${a.options.length} option(s); nothing blocked it.`
        : `Your last request (${what}) had no options and no single person or rule to name.`,
    );
  }
  return {
    summary: `Why: ${a.blockers.map((b) => b.subject).join(', ')}`,
    private: true,
    blocks: [
      { kind: 'text', spans: [`What limited your last request (${what}):`] },
      { kind: 'list', items: a.blockers.map((b) => [{ kind: 'strong', text: b.subject }, `: ${b.reason}`]) },
    ],
  };
}

function bookingSpans(b: BookingView): Span[] {
  const spans: Span[] = [{ kind: 'time', start: b.start, end: b.end }];
  if (b.room !== undefined) spans.push(` in ${b.room}`);
  if (b.attendees.length > 0) spans.push(` with ${b.attendees.join(', ')}`);
  spans.push(` · ${b.state}`);
  if (b.state === 'held' && b.expiresAt !== undefined)
    spans.push(' until ', { kind: 'time', start: b.expiresAt });
  return spans;
}

function bookingReply(verb: string, b: BookingView): Reply {
  const blocks: ReplyBlock[] = [
    { kind: 'text', spans: [{ kind: 'strong', text: `${verb}: ` }, ...bookingSpans(b)] },
  ];
  if (b.state !== 'cancelled')
    blocks.push({
      kind: 'actions',
      actions: [
        {
          id: ACTION.cancelBooking,
          label: b.state === 'held' ? 'Release hold' : 'Cancel booking',
          value: b.id,
          style: 'danger',
        },
      ],
    });
  if (b.state === 'held' && verb === 'Held')
    blocks.push({
      kind: 'actions',
      actions: [{ id: ACTION.bookOption, label: 'Book it', value: `hold:${b.id}`, style: 'primary' }],
    });
  return { summary: `${verb} (${b.id})`, blocks };
}

function feedLine(f: FeedView): Span[] {
  const spans: Span[] = [{ kind: 'strong', text: f.label }, ` · ${f.freshness}`];
  if (f.fetchedAt !== undefined) spans.push(' (read ', { kind: 'time', start: f.fetchedAt }, ')');
  if (f.note !== undefined) spans.push(` · ${f.note}`);
  return spans;
}

/** The "working" note of a week plan, updated while the search runs. */
export function weekProgressReply(p: WeekProgressView): Reply {
  const seconds = (p.elapsedMs / 1000).toFixed(1);
  const best = Number.isFinite(p.best)
    ? `best cost so far ${Math.round(p.best * 10) / 10}`
    : 'placing sessions';
  const left = p.unplaced > 0 ? `, ${p.unplaced} series not placed yet` : '';
  return textReply(`Planning the week… ${seconds} s, ${best}${left}`);
}

function when(ms: number | undefined): Span {
  return ms === undefined ? 'no time' : { kind: 'time', start: ms };
}

/** A week plan: one line per session (each viewer's zone), the cost parts, what is left out, the diff and a Lock button. */
export function weekReply(w: WeekPlanView, canLock: boolean): Reply {
  const blocks: ReplyBlock[] = [
    { kind: 'heading', text: `Week plan for ${w.isoWeek} (week of ${w.weekOf})` },
  ];
  if (w.sessions.length > 0)
    blocks.push({
      kind: 'list',
      items: w.sessions.map((x) => [
        { kind: 'time', start: x.start, end: x.end },
        ' ',
        { kind: 'strong', text: x.series },
        x.room === undefined ? '' : ` in ${x.room}`,
      ]),
    });
  else blocks.push({ kind: 'text', spans: ['No session could be placed.'] });
  const cost = Math.round(w.cost.total * 10) / 10;
  blocks.push({
    kind: 'note',
    spans: [
      w.cost.parts.length === 0
        ? `cost ${cost} (lower is better): every preference met`
        : `cost ${cost} (lower is better): ${w.cost.parts.map((p) => `${p.label} ${Math.round(p.points * 10) / 10}`).join('; ')}`,
    ],
  });
  if (w.unplaced.length > 0) {
    blocks.push({ kind: 'text', spans: ['Could not place:'] });
    blocks.push({
      kind: 'list',
      items: w.unplaced.map((u) => [
        { kind: 'strong', text: u.series },
        `: ${u.reason}${u.blockers.length === 0 ? '' : ` (in the way: ${u.blockers.join(', ')})`}`,
      ]),
    });
  }
  if (w.diff === undefined)
    blocks.push({
      kind: 'note',
      spans: ['The week before was not locked, so there is nothing to compare with.'],
    });
  else if (w.diff.length === 0)
    blocks.push({ kind: 'note', spans: ['Same times as the locked week before.'] });
  else {
    blocks.push({ kind: 'text', spans: ['Changes against the locked week before:'] });
    blocks.push({
      kind: 'list',
      items: w.diff.map((d): Span[] =>
        d.change === 'moved'
          ? [{ kind: 'strong', text: d.series }, ': moved from ', when(d.before), ' to ', when(d.after)]
          : d.change === 'added'
            ? [{ kind: 'strong', text: d.series }, ': new session ', when(d.after)]
            : [{ kind: 'strong', text: d.series }, ': no session at ', when(d.before)],
      ),
    });
  }
  if (w.warnings.length > 0) blocks.push({ kind: 'note', spans: [w.warnings.join(' · ')] });
  if (w.lockToken !== undefined && canLock && w.sessions.length > 0) {
    blocks.push({
      kind: 'actions',
      actions: [
        {
          id: ACTION.lockWeek,
          label: w.relock ? 'Lock again (re-books what changed)' : 'Lock this week (books every session)',
          value: w.lockToken,
          style: 'primary',
        },
      ],
    });
  } else if (w.lockToken !== undefined && w.sessions.length > 0) {
    blocks.push({ kind: 'note', spans: ['An admin can lock this plan, which books every session.'] });
  }
  return {
    summary: `Week plan ${w.isoWeek}: ${w.sessions.length} session(s), ${w.unplaced.length} series not placed`,
    blocks,
  };
}

/** What a lock did: describeWeekLock's lines, the booked sessions and where the invites went. */
export function lockReply(v: WeekLockView): Reply {
  const [first, ...rest] = v.lines;
  const blocks: ReplyBlock[] = [
    { kind: 'text', spans: [{ kind: 'strong', text: first ?? `${v.isoWeek} locked` }] },
  ];
  if (v.booked.length > 0)
    blocks.push({
      kind: 'list',
      items: v.booked.map((b) => [
        { kind: 'time', start: b.start, end: b.end },
        ' ',
        { kind: 'strong', text: b.series },
        b.room === undefined ? '' : ` in ${b.room}`,
        ' · booked ',
        { kind: 'code', text: b.bookingId },
      ]),
    });
  if (rest.length > 0) blocks.push({ kind: 'list', items: rest.map((l) => [l]) });
  if (v.invites.length > 0) {
    const written = v.invites.filter((i) => i.where !== undefined);
    blocks.push({
      kind: 'note',
      spans: [
        written.length === v.invites.length
          ? `${v.invites.length} weekly invite(s) (RRULE FREQ=WEEKLY) written for download: ${written.map((i) => `${i.method} ${i.where}`).join(', ')}`
          : `${v.invites.length} weekly invite(s) made but not sent (no invite outbox is configured): ${v.invites.map((i) => `${i.method} ${i.uid}`).join(', ')}`,
      ],
    });
  }
  return { summary: first ?? `${v.isoWeek} locked`, blocks };
}
