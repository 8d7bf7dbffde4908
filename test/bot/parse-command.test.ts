import { describe, expect, it } from 'vitest';
import { parseChatCommand, parseLength } from '../../src/bot/parse-command.ts';

// 2026-12-02 is a Wednesday (ISO 8601 weekday 3).
const ctx = { today: '2026-12-02' };

describe('chat command parser', () => {
  it('reads a full meeting request', () => {
    const r = parseChatCommand(
      'meet 45m with @ana @bo optional @cy on 2026-12-08 room for 6 with screen',
      ctx,
    );
    expect(r).toEqual({
      ok: true,
      value: {
        verb: 'meet',
        lengthMinutes: 45,
        required: [
          { kind: 'name', id: 'ana' },
          { kind: 'name', id: 'bo' },
        ],
        optional: [{ kind: 'name', id: 'cy' }],
        features: ['screen'],
        window: { from: '2026-12-08', to: '2026-12-08' },
        roomFor: 6,
      },
    });
  });

  it('reads platform mentions, tomorrow and next week', () => {
    const a = parseChatCommand('meet 30m with <@U0DEMO001|maren> <@U0DEMO002> tomorrow', ctx);
    expect(a).toMatchObject({
      ok: true,
      value: {
        required: [
          { kind: 'chat', id: 'U0DEMO001' },
          { kind: 'chat', id: 'U0DEMO002' },
        ],
        window: { from: '2026-12-03', to: '2026-12-03' },
      },
    });
    // Next ISO week: Monday 2026-12-07 to Sunday 2026-12-13.
    const b = parseChatCommand('meet 1h with @teo next week', ctx);
    expect(b).toMatchObject({
      ok: true,
      value: { lengthMinutes: 60, window: { from: '2026-12-07', to: '2026-12-13' } },
    });
  });

  it('reads between two dates and several features', () => {
    const r = parseChatCommand(
      'meet 1h30m with @ana between 2026-12-08 and 2026-12-10 with screen and phone',
      ctx,
    );
    expect(r).toMatchObject({
      ok: true,
      value: {
        lengthMinutes: 90,
        window: { from: '2026-12-08', to: '2026-12-10' },
        features: ['screen', 'phone'],
      },
    });
  });

  it('names every unreadable part instead of guessing', () => {
    const r = parseChatCommand('meet 45 with @ana soonish on 2026-13-01', ctx);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues.map((i) => i.code)).toEqual([
      'length_unreadable',
      'part_unreadable',
      'part_unreadable',
      'date_unreadable',
    ]);
    expect(r.issues[0]!.message).toContain("'45' is not a meeting length");
    expect(r.issues[2]!.message).toContain("'soonish'");
    expect(r.issues[3]!.message).toContain("'2026-13-01' is not a date");
  });

  it('asks for people when none are named and for the earlier date first', () => {
    expect(parseChatCommand('meet 30m tomorrow', ctx)).toMatchObject({
      ok: false,
      issues: [{ code: 'people_missing' }],
    });
    expect(parseChatCommand('meet 30m with @a between 2026-12-09 and 2026-12-08', ctx)).toMatchObject({
      ok: false,
      issues: [{ code: 'window_reversed' }],
    });
  });

  it('reads the other verbs', () => {
    expect(parseChatCommand('rule no meetings before 10:00', ctx)).toEqual({
      ok: true,
      value: { verb: 'rule', text: 'no meetings before 10:00' },
    });
    expect(parseChatCommand('forget r3', ctx)).toEqual({ ok: true, value: { verb: 'forget', ruleId: 'r3' } });
    expect(parseChatCommand('feed <https://cal.example/me.ics>', ctx)).toEqual({
      ok: true,
      value: { verb: 'feed', url: 'https://cal.example/me.ics' },
    });
    expect(parseChatCommand('week 2026-12-07', ctx)).toEqual({
      ok: true,
      value: { verb: 'week', weekOf: '2026-12-07' },
    });
    expect(parseChatCommand('week next', ctx)).toEqual({ ok: true, value: { verb: 'week' } });
    // ISO 8601 week notation YYYY-Www.
    expect(parseChatCommand('week 2026-w50', ctx)).toEqual({
      ok: true,
      value: { verb: 'week', weekOf: '2026-W50' },
    });
    expect(parseChatCommand('week 2026-W54', ctx)).toEqual({
      ok: false,
      issues: [
        {
          code: 'date_unreadable',
          path: ['weekOf'],
          message:
            "'2026-W54' is not a week; write 'next', an ISO week such as 2026-W50, or a date such as 2026-12-07",
        },
      ],
    });
    expect(parseChatCommand('WHY', ctx)).toEqual({ ok: true, value: { verb: 'why' } });
    expect(parseChatCommand('', ctx)).toEqual({ ok: true, value: { verb: 'help' } });
    expect(parseChatCommand('book 1', ctx)).toMatchObject({ ok: false, issues: [{ code: 'verb_unknown' }] });
    expect(parseChatCommand('rules please', ctx)).toMatchObject({
      ok: false,
      issues: [{ code: 'part_unreadable' }],
    });
  });

  it('reads lengths from 5 minutes to 8 hours only', () => {
    expect([parseLength('5m'), parseLength('2h'), parseLength('1h05m'), parseLength('90min')]).toEqual([
      5, 120, 65, 90,
    ]);
    expect([parseLength('4m'), parseLength('9h'), parseLength('h'), parseLength('30')]).toEqual([
      undefined,
      undefined,
      undefined,
      undefined,
    ]);
  });
});
