// The built package subpath `slotwright/solver`, imported by name from a separate Node process.
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '..', '..');
const BUILT = existsSync(join(ROOT, 'dist', 'solver', 'index.js'));

describe('package subpath slotwright/solver', () => {
  it.skipIf(!BUILT)(
    'imports the built dist by package name and solves 8-queens (skipped when dist/ is missing: run npx tsc -p tsconfig.build.json)',
    () => {
      const script = `
        const m = await import('slotwright/solver');
        const b = new m.ModelBuilder();
        for (let i = 0; i < 8; i++) b.addVariable('r' + i, 8);
        for (let i = 0; i < 8; i++) for (let j = i + 1; j < 8; j++) {
          b.addNotEqual(i, j, { name: 'c' });
          b.addNotEqualOffset(i, j, j - i, { name: 'd' });
          b.addNotEqualOffset(i, j, i - j, { name: 'd' });
        }
        const model = b.build();
        console.log(JSON.stringify({ exports: Object.keys(m).sort(), count: m.countSolutions(model).count }));
      `;
      const out = execFileSync(process.execPath, ['--input-type=module', '-e', script], {
        cwd: ROOT,
        encoding: 'utf8',
      });
      const parsed = JSON.parse(out.trim()) as { exports: string[]; count: number };
      // 92 solutions of 8-queens (OEIS A000170).
      expect(parsed.count).toBe(92);
      expect(parsed.exports).toEqual(
        expect.arrayContaining([
          'ModelBuilder',
          'countSolutions',
          'improve',
          'minimalConflict',
          'solutions',
          'solve',
        ]),
      );
      expect(existsSync(join(ROOT, 'dist', 'solver', 'index.d.ts'))).toBe(true);
    },
  );
});
