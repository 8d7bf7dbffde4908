import { describe, expect, it } from 'vitest';
import { parseWorkspaceRules } from '../../src/rules/workspace-rules.ts';

const NOW = Date.parse('2026-12-01T12:00:00Z');
const people = [
  { id: 'maren', name: 'Maren Holloway' },
  { id: 'teo', name: 'Teo Brannigan' },
];

describe('parseWorkspaceRules', () => {
  it('reads each owner’s sentences in the owner’s zone, bound to the owner', () => {
    const r = parseWorkspaceRules(
      [
        {
          kind: 'person',
          id: 'maren',
          name: 'Maren Holloway',
          zone: 'America/Halifax',
          rules: ['no meetings before 10am', "I'm off tomorrow"],
        },
        {
          kind: 'room',
          id: 'quay',
          name: 'Quay',
          zone: 'America/Halifax',
          rules: ['no meetings on weekends'],
        },
      ],
      { now: Date.parse('2026-12-02T02:00:00Z'), people }, // still 2026-12-01 in Halifax (UTC-4)
    );
    expect(r).toEqual({
      ok: true,
      rules: [
        {
          ownerKind: 'person',
          ownerId: 'maren',
          index: 0,
          rule: {
            subject: { kind: 'speaker' },
            strength: 'hard',
            body: { kind: 'window', mode: 'avoid', times: { from: 0, to: 600 } },
          },
          text: 'No meetings before 10am',
        },
        {
          ownerKind: 'person',
          ownerId: 'maren',
          index: 1,
          rule: {
            subject: { kind: 'speaker' },
            strength: 'hard',
            body: { kind: 'dates', mode: 'avoid', from: '2026-12-02', to: '2026-12-02' },
          },
          text: 'No meetings on 2026-12-02',
        },
        {
          ownerKind: 'room',
          ownerId: 'quay',
          index: 0,
          rule: {
            subject: { kind: 'speaker' },
            strength: 'hard',
            body: { kind: 'window', mode: 'avoid', weekdays: [6, 7] },
          },
          text: 'No meetings on weekends',
        },
      ],
    });
  });

  it('stops with errors naming the owner and the sentence', () => {
    const r = parseWorkspaceRules(
      [
        {
          kind: 'person',
          id: 'maren',
          name: 'Maren Holloway',
          zone: 'America/Halifax',
          rules: ['no meetings before 9', 'Teo cannot meet on Mondays'],
        },
        { kind: 'room', id: 'quay', zone: 'America/Halifax', rules: ['no meetings when it rains'] },
      ],
      { now: NOW, people },
    );
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues.map((i) => [i.code, i.path, i.message])).toEqual([
      [
        'rule_ambiguous',
        ['people', 'maren', 'rules', 0],
        'person maren (Maren Holloway), rule 1 "no meetings before 9": \'before 9\' could mean before 9am or before 9pm; say which (with am/pm or as 24-hour time)',
      ],
      [
        'rule_ambiguous',
        ['people', 'maren', 'rules', 1],
        'person maren (Maren Holloway), rule 2 "Teo cannot meet on Mondays": it is about person teo; move it under that person',
      ],
      [
        'rule_unreadable',
        ['rooms', 'quay', 'rules', 0],
        "room quay, rule 1 \"no meetings when it rains\": I could not read 'when it rains' in 'no meetings when it rains'",
      ],
    ]);
  });
});

describe('parseWorkspaceRules on a room that names itself', () => {
  it('binds the sentence to the room and drops the name from the sentence', () => {
    const r = parseWorkspaceRules(
      [
        {
          kind: 'room',
          id: 'tejo',
          name: 'Tejo',
          zone: 'Europe/Lisbon',
          rules: ['Tejo is unavailable on Fridays'],
        },
      ],
      { now: NOW, rooms: [{ id: 'tejo', name: 'Tejo' }] },
    );
    expect(r).toMatchObject({
      ok: true,
      rules: [{ ownerId: 'tejo', text: 'No meetings on Fridays', rule: { subject: { kind: 'speaker' } } }],
    });
  });
});
