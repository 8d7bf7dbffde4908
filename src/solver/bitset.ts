// Bit helpers for domains stored as Uint32Array words (value v lives in word v >>> 5, bit v & 31).

/** Number of 32-bit words needed to hold `size` values. */
export function wordsFor(size: number): number {
  return (size + 31) >>> 5;
}

/** Number of set bits in a 32-bit word (SWAR popcount; no table lookups). */
export function popcount32(x: number): number {
  let v = x - ((x >>> 1) & 0x55555555);
  v = (v & 0x33333333) + ((v >>> 2) & 0x33333333);
  return Math.imul((v + (v >>> 4)) & 0x0f0f0f0f, 0x01010101) >>> 24;
}

/** Index of the lowest set bit of a non-zero word. */
export function lowestBit(x: number): number {
  return 31 - Math.clz32(x & -x);
}

/** Smallest set value strictly greater than `after` in words [off, off + count), or -1. */
export function nextSetBit(words: Uint32Array, off: number, count: number, after: number): number {
  let from = after + 1;
  if (from < 0) from = 0;
  let w = from >>> 5;
  if (w >= count) return -1;
  let word = words[off + w]! & (0xffffffff << (from & 31));
  for (;;) {
    if (word !== 0) return (w << 5) + lowestBit(word);
    w++;
    if (w >= count) return -1;
    word = words[off + w]!;
  }
}

/** Sets bits 0..size-1 of a fresh bitset and leaves the tail of the last word clear. */
export function fullBitset(size: number): Uint32Array {
  const out = new Uint32Array(wordsFor(size));
  out.fill(0xffffffff);
  const rest = size & 31;
  if (rest !== 0) out[out.length - 1] = (1 << rest) - 1;
  return out;
}
