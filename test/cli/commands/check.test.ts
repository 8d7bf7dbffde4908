import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { CliIo } from '../../../src/cli/io.ts';
import { runCli } from '../../../src/cli/main.ts';

function recordingIo(): CliIo & { outText: string[]; errText: string[] } {
  const outText: string[] = [];
  const errText: string[] = [];
  return {
    outText,
    errText,
    out: (t) => outText.push(t),
    err: (t) => errText.push(t),
    env: {},
    isTty: false,
    now: () => 0,
  };
}

const root = mkdtempSync(join(tmpdir(), 'slotwright-check-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function folder(name: string, yaml: string, feeds: Record<string, string> = {}): string {
  const dir = join(root, name);
  mkdirSync(join(dir, 'feeds'), { recursive: true });
  writeFileSync(join(dir, 'workspace.yaml'), yaml);
  for (const [f, text] of Object.entries(feeds)) writeFileSync(join(dir, 'feeds', f), text);
  return dir;
}

const ICS = 'BEGIN:VCALENDAR\r\nVERSION:2.0\r\nPRODID:-//t//EN\r\nEND:VCALENDAR\r\n';

describe('slotwright check', () => {
  it('prints a one-line summary and exits 0 for a good folder', async () => {
    const dir = folder(
      'good',
      'zone: UTC\npeople:\n  - {id: ana, name: Ana, feeds: [feeds/ana.ics]}\nrooms:\n  - {id: r1, name: R1, capacity: 2}\n',
      { 'ana.ics': ICS },
    );
    const io = recordingIo();
    expect(await runCli(['check', '--workspace', dir, '--now', '2026-12-01T12:00:00Z'], io)).toBe(0);
    expect(io.outText).toEqual([
      'workspace.yaml: ok: 1 people, 1 rooms, 0 groups, 1 feeds, 0 rules, 0 series (zone UTC, grid 5 minutes, horizon 14 days)',
    ]);
  });

  it('exits 1 and prints each error with file, line and key path', async () => {
    const dir = folder('bad', 'zone: Mars/Olympus\npeople:\n  - {id: ana}\n');
    const io = recordingIo();
    expect(await runCli(['check', '--workspace', dir], io)).toBe(1);
    expect(io.errText).toEqual([
      'workspace.yaml:1: zone: expected an IANA time zone such as "Europe/Lisbon" or "America/Halifax", got \'Mars/Olympus\'',
      'workspace.yaml:3: people[0].name: is required (expected string, received undefined)',
    ]);
  });

  it('exits 1 when a named feed file is missing', async () => {
    const dir = folder('nofeed', 'zone: UTC\npeople:\n  - {id: ana, name: Ana, feeds: [feeds/gone.ics]}\n');
    const io = recordingIo();
    expect(await runCli(['check', '--workspace', dir], io)).toBe(1);
    expect(io.errText).toEqual([
      `cannot read ana's feed feeds/gone.ics (no such file); fix the path in ${join(dir, 'workspace.yaml')}`,
    ]);
  });
});
