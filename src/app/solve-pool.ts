import { availableParallelism } from 'node:os';
import { Piscina } from 'piscina';
import { normalizeError, SlotwrightError } from '../errors.ts';
import type { SolveAnswer, SolveTask } from './solve-worker.ts';

/** Options of the solve pool. */
export interface SolvePoolOptions {
  /** Most worker threads. @default available cores minus one, at least 1 */
  readonly maxThreads?: number;
  /** Threads kept warm. @default 1 */
  readonly minThreads?: number;
  /** Ms an idle extra thread lives. @default 30000 */
  readonly idleTimeoutMs?: number;
  /** Tasks allowed to wait for a thread before new ones are refused. @default 64 */
  readonly maxQueue?: number;
}

/** Runs scheduling solves on worker threads so the chat event loop keeps answering. */
export class SolvePool {
  #pool: Piscina | undefined;
  readonly #options: SolvePoolOptions;

  /** Threads start on the first task, so a process that never solves never pays for them. */
  constructor(options: SolvePoolOptions = {}) {
    this.#options = options;
  }

  #piscina(): Piscina {
    if (this.#pool !== undefined) return this.#pool;
    const options = this.#options;
    const o = {
      maxThreads: Math.max(1, availableParallelism() - 1),
      minThreads: 1,
      idleTimeoutMs: 30_000,
      maxQueue: 64,
      ...options,
    } satisfies Required<SolvePoolOptions>;
    this.#pool = new Piscina({
      filename: new URL('./solve-worker.mjs', import.meta.url).href,
      name: 'solve',
      maxThreads: o.maxThreads,
      minThreads: Math.min(o.minThreads, o.maxThreads),
      idleTimeout: o.idleTimeoutMs,
      maxQueue: o.maxQueue,
    });
    return this.#pool;
  }

  /** Runs one task on a worker; an aborted signal stops waiting and ends the task. */
  async run<K extends SolveTask['kind']>(
    task: Extract<SolveTask, { kind: K }>,
    signal?: AbortSignal,
  ): Promise<Extract<SolveAnswer, { kind: K }>> {
    try {
      return (await this.#piscina().run(task, signal === undefined ? {} : { signal })) as Extract<
        SolveAnswer,
        { kind: K }
      >;
    } catch (error) {
      const e = normalizeError(error);
      throw new SlotwrightError(e.code === 'internal' ? 'internal' : e.code, `solving failed: ${e.message}`, {
        cause: error,
      });
    }
  }

  /** Tasks waiting for a thread. */
  get queued(): number {
    return this.#pool?.queueSize ?? 0;
  }

  /** Stops the threads. */
  async close(): Promise<void> {
    await this.#pool?.destroy();
    this.#pool = undefined;
  }
}
