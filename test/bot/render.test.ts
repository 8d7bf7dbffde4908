import { describe, expect, it } from 'vitest';
import type { MeetAnswer } from '../../src/app/service.ts';
import { breakdown, formatLength, meetReply } from '../../src/bot/conversation.ts';
import { actionKind, escapeMrkdwn, renderBlockKit } from '../../src/bot/render-block-kit.ts';
import { formatLocal, renderText } from '../../src/bot/render-text.ts';

const start = Date.UTC(2026, 11, 8, 14, 0);
const answer: MeetAnswer = {
  query: { lengthMinutes: 30, required: [], optional: [], features: [] },
  attendees: [
    { id: 'ines', name: 'Ines Carvalhal', zone: 'Europe/Lisbon', admin: true },
    { id: 'teo', name: 'Teo Brannigan', zone: 'America/Halifax', admin: false },
  ],
  options: [
    {
      token: 'tok1',
      start,
      end: start + 1_800_000,
      score: 97.71,
      breakdown: [
        { label: 'late for teo', points: -2.29 },
        { label: 'tiny', points: -0.01 },
      ],
    },
    {
      token: 'tok2',
      start: start + 3_600_000,
      end: start + 5_400_000,
      room: { id: 'tejo', name: 'Tejo <east>' },
      score: 100,
      breakdown: [],
    },
  ],
  blockers: [],
  relaxations: [],
  warnings: ['teo: feed teo:0 is stale'],
};

describe('renderers', () => {
  it('puts times in Block Kit date tokens so each viewer sees their own zone', () => {
    const m = renderBlockKit(meetReply(answer));
    const text = JSON.stringify(m.blocks);
    // The platform date token <!date^unix^{format}|fallback>, as its formatting docs describe it (from memory).
    expect(text).toContain(`<!date^${start / 1000}^{date_short_pretty} {time}|2026-12-08 14:00 UTC>`);
    expect(text).toContain(`<!date^${(start + 1_800_000) / 1000}^{time}|2026-12-08 14:30 UTC>`);
    expect(text).toContain('in Tejo &lt;east&gt;');
    expect(m.text).toBe('2 option(s) for 30 min with Ines, Teo');
  });

  it('gives every button in a block its own action id, mapped back to one kind', () => {
    const blocks = renderBlockKit(meetReply(answer)).blocks as {
      type: string;
      elements?: { action_id: string }[];
    }[];
    const ids = blocks
      .filter((b) => b.type === 'actions')
      .flatMap((b) => b.elements!.map((e) => e.action_id));
    expect(ids).toEqual([
      'slot_book_option:0',
      'slot_hold_option:1',
      'slot_book_option:0',
      'slot_hold_option:1',
    ]);
    expect(new Set(ids.map(actionKind))).toEqual(new Set(['slot_book_option', 'slot_hold_option']));
  });

  it('renders the same reply as text in the viewer zone with numbered choices', () => {
    const lis = renderText(meetReply(answer), 'Europe/Lisbon', 5);
    expect(lis.text.split('\n').slice(0, 5)).toEqual([
      'Options for 30 min with Ines, Teo',
      '1. Tue 2026-12-08 14:00–14:30',
      '  (fit 98: late for teo −2.3)',
      '  [5] Book option 1',
      '  [6] Hold option 1',
    ]);
    expect(lis.choices.map((c) => c.value)).toEqual(['tok1', 'tok1', 'tok2', 'tok2']);
    // Halifax is UTC-4 in December (IANA tz database: America/Halifax, AST).
    expect(renderText(meetReply(answer), 'America/Halifax').text).toContain('1. Tue 2026-12-08 10:00–10:30');
    // Auckland is UTC+13 in December (NZDT): the next calendar day.
    expect(formatLocal(start, 'Pacific/Auckland')).toBe('Wed 2026-12-09 03:00');
  });

  it('keeps the score breakdown compact and lengths readable', () => {
    expect(breakdown(answer.options[1]!)).toBe('fit 100');
    expect([formatLength(30), formatLength(60), formatLength(90), formatLength(480)]).toEqual([
      '30 min',
      '1 h',
      '1 h 30 min',
      '8 h',
    ]);
    expect(escapeMrkdwn('a & <b>')).toBe('a &amp; &lt;b&gt;');
  });
});
