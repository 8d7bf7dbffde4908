// Entry file of the solve pool's worker threads: worker threads do not inherit the TypeScript loader
// of the main thread, so register tsx here and then load the TypeScript worker module.
import { register } from 'tsx/esm/api';

register();
const worker = await import('./solve-worker.ts');

/** Runs one solve task; piscina calls this export by name. */
export const solve = worker.solve;
