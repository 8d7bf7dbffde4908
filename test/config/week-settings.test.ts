import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadWorkspace, parseWorkspace } from '../../src/config/load-workspace.ts';
import { parseWeekPostTime, weekPostSettingsSchema } from '../../src/config/week-post-schema.ts';
import * as jobs from '../../src/jobs/index.ts';

const NOW = Date.parse('2026-12-01T12:00:00Z');
const where = { file: '/ws/workspace.yaml', dir: '/ws' };
const DEMO = join(import.meta.dirname, '..', '..', 'fixtures', 'demo');

const BASE = `zone: Europe/Lisbon
people:
  - {id: ana, name: Ana, rest: {hours: 12, strength: preference}}
  - {id: bo, name: Bo, zone: America/Halifax}
`;

function issues(text: string): string[] {
  const r = parseWorkspace(text, where, { now: NOW });
  if (r.ok) throw new Error('expected the workspace to be refused');
  return r.issues.map((i) => i.message);
}

describe('weekPlan post settings and rest in workspace.yaml', () => {
  it('reads the weekly post and rest at workspace and person level; the engine settings stay apart', () => {
    const r = parseWorkspace(
      `${BASE}weekPlan: {step: 15, post: "fri 14:00", channel: C0123ABCD, zone: Europe/Lisbon}\nrest: {hours: 11}\n`,
      where,
      { now: NOW },
    );
    if (!r.ok) throw new Error(JSON.stringify(r.issues));
    expect(r.value.weekPost).toEqual({ post: 'fri 14:00', channel: 'C0123ABCD', zone: 'Europe/Lisbon' });
    // The engine's settings carry no post keys.
    expect(Object.keys(r.value.weekPlan).sort()).toEqual([
      'compact',
      'seatsHard',
      'step',
      'usualEdgeMinutes',
      'weights',
    ]);
    expect(r.value.weekPlan.step).toBe(15);
    // strength defaults to hard (the rest schema's default).
    expect(r.value.rest).toEqual({ hours: 11, strength: 'hard' });
    expect(r.value.people[0]!.rest).toEqual({ hours: 12, strength: 'preference' });
    expect(r.value.people[1]!.rest).toBeUndefined();
  });

  it('leaves post and rest out when not written', () => {
    const r = parseWorkspace(BASE.replace(', rest: {hours: 12, strength: preference}', ''), where, {
      now: NOW,
    });
    if (!r.ok) throw new Error(JSON.stringify(r.issues));
    expect(r.value.weekPost).toBeUndefined();
    expect(r.value.rest).toBeUndefined();
    expect('rest' in r.value.people[0]!).toBe(false);
  });

  it('refuses a half-written post, a bad time, a channel name and a bad zone, each with the fix', () => {
    expect(issues(`${BASE}weekPlan: {post: "fri 14:00"}\n`)).toEqual([
      'workspace.yaml:5: weekPlan.channel: the weekly post needs post, channel and zone together (got post); add channel or remove the others',
      'workspace.yaml:5: weekPlan.zone: the weekly post needs post, channel and zone together (got post); add zone or remove the others',
    ]);
    expect(
      issues(`${BASE}weekPlan: {post: "friday at 2pm", channel: C0123ABCD, zone: Europe/Lisbon}\n`),
    ).toEqual([
      'workspace.yaml:5: weekPlan.post: write the post time as a weekday and a 24-hour time, for example "fri 14:00"',
    ]);
    expect(
      issues(`${BASE}weekPlan: {post: "fri 14:00", channel: "#general", zone: Europe/Lisbon}\n`),
    ).toEqual(['workspace.yaml:5: weekPlan.channel: a channel id such as C0123ABCD (the id, not the #name)']);
    expect(issues(`${BASE}weekPlan: {post: "fri 14:00", channel: C0123ABCD, zone: Lisbon}\n`)).toEqual([
      'workspace.yaml:5: weekPlan.zone: an IANA zone such as Europe/Lisbon',
    ]);
    // A misspelt key is still refused: the section stays strict.
    expect(issues(`${BASE}weekPlan: {postAt: "fri 14:00"}\n`)[0]).toContain("unknown key 'postAt'");
    expect(issues(`${BASE}rest: {hours: 30}\n`)[0]).toContain('rest between days takes 1 to 24 hours');
  });

  it('the demo workspace posts on Friday 14:00 Lisbon time to its channel', () => {
    const r = loadWorkspace(DEMO, { now: NOW });
    if (!r.ok) throw new Error(JSON.stringify(r.issues));
    expect(r.value.weekPost).toEqual({ post: 'fri 14:00', channel: 'C0123ABCD', zone: 'Europe/Lisbon' });
    expect(r.value.rest).toBeUndefined();
  });

  it("jobs export the config's parser and schema (one parser): Friday 14:00 is cron 0 14 * * 5", () => {
    expect(jobs.parseWeekPostTime).toBe(parseWeekPostTime);
    expect(jobs.weekPostSettingsSchema).toBe(weekPostSettingsSchema);
    // ISO weekday 5 = Friday (ISO 8601); cron counts Sunday as 0 (common practice).
    expect(parseWeekPostTime('fri 14:00')).toEqual({ weekday: 5, minutes: 840 });
    expect(jobs.weekPostCron(parseWeekPostTime('fri 14:00'))).toBe('0 14 * * 5');
    expect(weekPostSettingsSchema.safeParse({ post: 'fri 14:00', channel: 'C0123ABCD' }).success).toBe(false);
  });
});
