import type { DeliveryLog } from '../app/ports.ts';

/** A DeliveryLog for one process (the console, tests); keys are forgotten after `ttlMs`. */
export class InMemoryDeliveryLog implements DeliveryLog {
  readonly #seen = new Map<string, number>();
  readonly #ttlMs: number;

  /** @param ttlMs how long a key is remembered. @default 86_400_000 (one day, well past the platform's retries) */
  constructor(ttlMs = 86_400_000) {
    this.#ttlMs = ttlMs;
  }

  /** True the first time a key is seen within the time to live. */
  async claim(key: string, atMs: number): Promise<boolean> {
    const at = this.#seen.get(key);
    if (at !== undefined && atMs - at < this.#ttlMs) return false;
    this.#seen.set(key, atMs);
    if (this.#seen.size > 10_000) {
      for (const [k, t] of this.#seen) if (atMs - t >= this.#ttlMs) this.#seen.delete(k);
    }
    return true;
  }
}
