import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

// The layering of the project: inner layers do no I/O and import no outer layer.
const SRC = join(import.meta.dirname, '..', 'src');
const INNER = ['solver', 'time', 'rules', 'scheduling'] as const;
const OUTER = ['calendar', 'store', 'bot', 'jobs', 'cli', 'app', 'config'] as const;
// What each inner layer may import from the project (besides its own folder and src/errors.ts).
// scheduling may import config for its types and pure schemas only (config also reads files).
const ALLOWED: Record<(typeof INNER)[number], readonly string[]> = {
  solver: [],
  time: [],
  rules: ['time'],
  scheduling: ['solver', 'time', 'rules', 'config'],
};

function filesUnder(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) out.push(...filesUnder(p));
    else if (p.endsWith('.ts')) out.push(p);
  }
  return out;
}

function importsOf(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  const re = /(?:^|\n)\s*(?:import|export)\s[^;]*?from\s+['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)/g;
  const found: string[] = [];
  for (const m of text.matchAll(re)) found.push((m[1] ?? m[2])!);
  return found;
}

describe('layering', () => {
  for (const layer of INNER) {
    it(`src/${layer} imports no node:*, network or database module and no outer layer`, () => {
      const dir = join(SRC, layer);
      const offences: string[] = [];
      for (const file of filesUnder(dir)) {
        for (const spec of importsOf(file)) {
          const where = relative(SRC, file);
          if (
            spec.startsWith('node:') ||
            ['fs', 'path', 'http', 'https', 'net', 'dns', 'child_process', 'worker_threads'].includes(spec)
          ) {
            offences.push(`${where}: ${spec}`);
          }
          if (
            [
              'pg',
              'better-sqlite3',
              'kysely',
              '@slack/bolt',
              'node-cron',
              'piscina',
              'ical-generator',
            ].includes(spec)
          ) {
            offences.push(`${where}: ${spec}`);
          }
          if (spec.startsWith('.')) {
            const target = relative(SRC, join(file, '..', spec)).split(/[\\/]/)[0]!;
            const ok = target === layer || target === 'errors.ts' || ALLOWED[layer].includes(target);
            if (!ok) offences.push(`${where}: ${spec}`);
          }
        }
      }
      expect(offences).toEqual([]);
    });
  }

  it('outer layers other than app do not import each other', () => {
    const offences: string[] = [];
    for (const layer of OUTER.filter((l) => l !== 'app' && l !== 'cli' && l !== 'bot' && l !== 'config')) {
      for (const file of filesUnder(join(SRC, layer))) {
        for (const spec of importsOf(file)) {
          if (!spec.startsWith('.')) continue;
          const target = relative(SRC, join(file, '..', spec)).split(/[\\/]/)[0]!;
          // config (schemas and the workspace loader) sits under every outer layer, so any may import it
          if ((OUTER as readonly string[]).includes(target) && target !== layer && target !== 'config')
            offences.push(`${relative(SRC, file)}: ${spec}`);
        }
      }
    }
    expect(offences).toEqual([]);
  });

  it('no source file uses a default export', () => {
    const offences = filesUnder(SRC).filter((f) => /^export default /m.test(readFileSync(f, 'utf8')));
    expect(offences.map((f) => relative(SRC, f))).toEqual([]);
  });
});
