// A small seeded generator so the engine stays deterministic and never touches Math.random.

/** Seeded pseudo-random generator (mulberry32): same seed, same sequence. */
export class Prng {
  #state: number;

  /** Starts the sequence from a 32-bit seed. */
  constructor(seed: number) {
    this.#state = seed >>> 0;
  }

  /** Next 32-bit unsigned integer. */
  nextU32(): number {
    this.#state = (this.#state + 0x6d2b79f5) | 0;
    let t = this.#state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (t ^ (t >>> 14)) >>> 0;
  }

  /** Uniform float in [0, 1). */
  next(): number {
    return this.nextU32() / 4294967296;
  }

  /** Uniform integer in [0, bound). */
  int(bound: number): number {
    return Math.floor(this.next() * bound);
  }
}
