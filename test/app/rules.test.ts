import { describe, expect, it } from 'vitest';
import { InMemoryRuleStore } from '../../src/app/in-memory-rule-store.ts';
import {
  forgetRule,
  listRules,
  previewRule,
  type RuleDeps,
  ruleOwnerId,
  saveRule,
} from '../../src/app/rules.ts';

const NOW = Date.parse('2026-12-01T12:00:00Z');
const INES = { id: 'ines', zone: 'Europe/Lisbon', admin: true };
const RUI = { id: 'rui', zone: 'Europe/Lisbon', admin: false };

function deps(): RuleDeps {
  let n = 0;
  return {
    store: new InMemoryRuleStore(),
    people: [
      { id: 'ines', name: 'Ines Carvalhal' },
      { id: 'rui', name: 'Rui Teixo' },
      { id: 'maren', name: 'Maren Holloway' },
    ],
    rooms: [{ id: 'tejo', name: 'Tejo' }],
    newId: () => `r${++n}`,
  };
}

describe('rule use cases', () => {
  it('previews, saves, lists and forgets a rule', async () => {
    const d = deps();
    const preview = await previewRule(d, RUI, 'no meetings before 10am', NOW);
    expect(preview.ok).toBe(true);
    if (!preview.ok) return;
    expect(preview.value.text).toBe('No meetings before 10am');
    expect(preview.value.ownerId).toBe('rui');
    expect(preview.value.question).toBe('Save this rule?');
    expect(await d.store.list('rui')).toEqual([]); // nothing saved before the yes

    const saved = await saveRule(d, RUI, preview.value.token, NOW + 1000);
    expect(saved).toEqual({
      ok: true,
      value: {
        id: 'r1',
        ownerId: 'rui',
        rule: preview.value.rule,
        text: 'No meetings before 10am',
        createdAt: NOW + 1000,
      },
    });

    const second = await previewRule(d, RUI, 'prefer 9am meetings', NOW);
    if (!second.ok) throw new Error('unreadable');
    expect(second.value.related.map((r) => r.relation)).toEqual(['contradicts']);

    const listed = await listRules(d, RUI);
    expect(listed.ok && listed.value.map((r) => r.id)).toEqual(['r1']);
    expect(await forgetRule(d, RUI, 'r1')).toMatchObject({ ok: true, value: { id: 'r1' } });
    expect(await forgetRule(d, RUI, 'r1')).toEqual({
      ok: false,
      issues: [
        {
          code: 'not_found',
          path: ['ruleId'],
          message: "There is no rule 'r1' among the rules of rui; list them to see the ids",
        },
      ],
    });
  });

  it('passes parse issues through with their suggestions', async () => {
    const r = await previewRule(deps(), RUI, 'no meetings before 9', NOW);
    expect(r).toMatchObject({
      ok: false,
      issues: [{ code: 'rule_ambiguous', suggestions: ['no meetings before 9am', 'no meetings before 9pm'] }],
    });
  });

  it('lets only admins bind other people and rooms', async () => {
    const d = deps();
    expect(await previewRule(d, RUI, 'Maren cannot meet on Fridays', NOW)).toMatchObject({
      ok: false,
      issues: [{ code: 'unauthorized' }],
    });
    const p = await previewRule(d, INES, 'the Tejo room is unavailable on weekends', NOW);
    if (!p.ok) throw new Error('refused');
    expect(p.value.ownerId).toBe('room:tejo');
    // a token handed to an admin cannot be replayed by someone else
    expect(await saveRule(d, RUI, p.value.token, NOW)).toMatchObject({
      ok: false,
      issues: [{ code: 'unauthorized' }],
    });
    expect(await saveRule(d, INES, p.value.token, NOW)).toMatchObject({
      ok: true,
      value: { ownerId: 'room:tejo' },
    });
    expect(await listRules(d, RUI, 'room:tejo')).toMatchObject({ ok: false });
  });

  it('refuses a forged or damaged token and saves nothing', async () => {
    const d = deps();
    const forged = Buffer.from(
      JSON.stringify({ v: 1, ownerId: 'rui', text: 'x', rule: { subject: 'me' } }),
    ).toString('base64url');
    expect(await saveRule(d, RUI, forged, NOW)).toMatchObject({
      ok: false,
      issues: [{ code: 'bad_argument' }],
    });
    expect(await saveRule(d, RUI, 'not a token', NOW)).toMatchObject({
      ok: false,
      issues: [{ code: 'bad_argument' }],
    });
    expect(await d.store.list('rui')).toEqual([]);
  });

  it('names owners of rooms and groups apart from people', () => {
    expect(ruleOwnerId({ kind: 'speaker' }, 'bea')).toBe('bea');
    expect(ruleOwnerId({ kind: 'group', id: 'leads' }, 'bea')).toBe('group:leads');
  });
});

describe('InMemoryRuleStore', () => {
  it('keeps owners apart and never overwrites a rule', async () => {
    const s = new InMemoryRuleStore();
    const rule = {
      subject: { kind: 'speaker' },
      strength: 'hard',
      body: { kind: 'gap', minutes: 10 },
    } as const;
    await s.add({
      id: 'a',
      ownerId: 'rui',
      rule,
      text: 'At least 10 minutes between meetings',
      createdAt: 1,
    });
    await expect(s.add({ id: 'a', ownerId: 'rui', rule, text: 'other', createdAt: 2 })).rejects.toThrow(
      "rule id 'a' is already used",
    );
    expect((await s.list('rui')).map((r) => r.text)).toEqual(['At least 10 minutes between meetings']);
    expect(await s.list('bea')).toEqual([]);
    expect(await s.remove('bea', 'a')).toBe(false);
    expect(await s.remove('rui', 'a')).toBe(true);
  });
});
