import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { meet } from '../../src/app/meet.ts';
import { workspaceContext } from '../../src/app/workspace.ts';
import { loadWorkspace, type Workspace } from '../../src/config/index.ts';

const NOW = Date.parse('2026-12-01T12:00:00Z');
const root = mkdtempSync(join(tmpdir(), 'slotwright-app-ws-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function workspace(name: string, yaml: string): Workspace {
  const dir = join(root, name);
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, 'workspace.yaml'), yaml);
  const r = loadWorkspace(dir, { now: NOW });
  if (!r.ok) throw new Error(r.issues.map((i) => i.message).join('\n'));
  return r.value;
}

// Lisbon is on UTC in December (WET, IANA rules, from memory), so local times read as UTC below.
const YAML = `zone: Europe/Lisbon
people:
  - {id: ana, name: Ana, rules: ["No meetings before 10am", "No meetings longer than 45 minutes"]}
  - {id: bo, name: Bo, rules: ["Prefer meetings in the afternoon"]}
`;
const monday = { start: Date.parse('2026-12-07T00:00:00Z'), end: Date.parse('2026-12-08T00:00:00Z') };

describe('rules from workspace.yaml in meet', () => {
  it('keeps hard rules and scores preferences', async () => {
    const ws = workspace('rules', YAML);
    const r = await meet(ws, { with: ['ana', 'bo'], lengthMinutes: 30, window: monday }, { now: NOW });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.options.length).toBeGreaterThan(0);
    for (const o of r.value.options) expect(new Date(o.start).getUTCHours()).toBeGreaterThanOrEqual(10);
    // the best option honours bo's afternoon preference; a morning one carries the penalty
    expect(r.value.options[0]!.breakdown.some((b) => b.why.startsWith("against bo's preference"))).toBe(
      false,
    );
    const morning = await meet(
      ws,
      {
        with: ['ana', 'bo'],
        lengthMinutes: 30,
        window: { start: Date.parse('2026-12-07T10:00:00Z'), end: Date.parse('2026-12-07T11:00:00Z') },
      },
      { now: NOW },
    );
    expect(morning.ok && morning.value.options[0]!.breakdown).toContainEqual(
      expect.objectContaining({ why: expect.stringMatching(/^against bo's preference: /), points: -10 }),
    );
  });

  it('names a hard rule as the blocker and offers the standard length it allows', async () => {
    const ws = workspace('rules2', YAML);
    const r = await meet(ws, { with: ['ana', 'bo'], lengthMinutes: 60, window: monday }, { now: NOW });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.options).toEqual([]);
    expect(r.value.blockers).toEqual([expect.objectContaining({ who: 'ana', kind: 'rule' })]);
    expect(r.value.blockers[0]!.detail).toMatch(/^ana's rule: .*45 minutes/);
    expect(r.value.relaxations.map((x) => x.change)).toContain('shorten to 45 minutes');
  });

  it('turns an unreadable rule sentence into an issue naming its owner', async () => {
    const ws = workspace(
      'badrule',
      'zone: UTC\npeople:\n  - {id: ana, name: Ana, rules: ["purple elephants on the moon"]}\n',
    );
    const r = await workspaceContext(ws, { now: NOW, span: monday });
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.issues[0]!.message).toContain('person ana (Ana), rule 1 "purple elephants on the moon"');
  });

  it('passes stale feeds on as warnings', async () => {
    const ws = workspace('stale', 'zone: UTC\npeople:\n  - {id: ana, name: Ana}\n');
    const r = await meet(
      ws,
      { with: ['ana'], lengthMinutes: 30, window: monday },
      {
        now: NOW,
        busyOf: async () => new Map(),
        stale: [{ owner: 'ana', feed: 'https://cal.example.org/a.ics', ageMinutes: 95 }],
      },
    );
    expect(r.ok && r.value.warnings).toEqual([
      "ana's feed https://cal.example.org/a.ics was last read 95 minutes ago; recent changes may be missing",
    ]);
  });
});
