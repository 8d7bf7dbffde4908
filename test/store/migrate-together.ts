import { execFile } from 'node:child_process';
import type { StoreLocation } from '../../src/store/index.ts';

/** Starts `n` processes that open the same fresh store at once; resolves to what each printed. */
export function migrateTogether(
  n: number,
  location: StoreLocation,
  searchPath?: readonly string[],
): Promise<string[]> {
  const script = new URL('./migrate-child.ts', import.meta.url).pathname;
  const job = JSON.stringify({ location, ...(searchPath === undefined ? {} : { searchPath }) });
  return Promise.all(
    Array.from(
      { length: n },
      () =>
        new Promise<string>((resolve, reject) =>
          execFile(process.execPath, ['--import', 'tsx', script, job], (error, stdout) =>
            error === null ? resolve(stdout.trim()) : reject(error),
          ),
        ),
    ),
  );
}
