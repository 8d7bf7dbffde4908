// A child process that opens (and so migrates) the store named in argv[2] as JSON
// ({ location, searchPath? }), then prints "ok" or the error; for the concurrent-migration tests.
import { openStore, type StoreLocation } from '../../src/store/index.ts';

const job = JSON.parse(process.argv[2]!) as { location: StoreLocation; searchPath?: string[] };
try {
  const h = await openStore(job.location, job.searchPath === undefined ? {} : { searchPath: job.searchPath });
  await h.close();
  process.stdout.write('ok\n');
} catch (error) {
  const e = error as Error;
  process.stdout.write(`failed: ${e.message}: ${String(e.cause)}\n`);
}
