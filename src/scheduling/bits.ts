// Bitsets over ticks or start indices (Uint32Array, bit i of word i >>> 5). Small and allocation-light:
// a meeting model builds a few per attendee, then the solver works on the result.

/** Words needed for `n` bits. */
export function wordsFor(n: number): number {
  return (n + 31) >>> 5;
}

/** A bitset of `n` bits, all clear. */
export function emptyBits(n: number): Uint32Array {
  return new Uint32Array(wordsFor(n));
}

/** A bitset of `n` bits, all set (bits past `n` stay clear). */
export function fullBits(n: number): Uint32Array {
  const b = new Uint32Array(wordsFor(n));
  setRange(b, 0, n);
  return b;
}

/** Sets bits [from, to). */
export function setRange(bits: Uint32Array, from: number, to: number): void {
  for (let i = from; i < to; ) {
    const w = i >>> 5;
    const off = i & 31;
    const span = Math.min(32 - off, to - i);
    const mask = span === 32 ? 0xffffffff : ((1 << span) - 1) << off;
    bits[w]! |= mask;
    i += span;
  }
}

/** Clears bits [from, to). */
export function clearRange(bits: Uint32Array, from: number, to: number): void {
  for (let i = from; i < to; ) {
    const w = i >>> 5;
    const off = i & 31;
    const span = Math.min(32 - off, to - i);
    const mask = span === 32 ? 0xffffffff : ((1 << span) - 1) << off;
    bits[w]! &= ~mask;
    i += span;
  }
}

/** True when bit `i` is set. */
export function hasBit(bits: Uint32Array, i: number): boolean {
  return ((bits[i >>> 5]! >>> (i & 31)) & 1) === 1;
}

/** dst &= src (same length). */
export function andInto(dst: Uint32Array, src: Uint32Array): void {
  for (let i = 0; i < dst.length; i++) dst[i]! &= src[i]!;
}

/** dst |= src (same length). */
export function orInto(dst: Uint32Array, src: Uint32Array): void {
  for (let i = 0; i < dst.length; i++) dst[i]! |= src[i]!;
}

/** dst &= ~src (same length). */
export function andNotInto(dst: Uint32Array, src: Uint32Array): void {
  for (let i = 0; i < dst.length; i++) dst[i]! &= ~src[i]!;
}

/** Number of set bits. */
export function popcount(bits: Uint32Array): number {
  let n = 0;
  for (let i = 0; i < bits.length; i++) {
    let v = bits[i]!;
    v -= (v >>> 1) & 0x55555555;
    v = (v & 0x33333333) + ((v >>> 2) & 0x33333333);
    n += (((v + (v >>> 4)) & 0x0f0f0f0f) * 0x01010101) >>> 24;
  }
  return n;
}

/** Indices of the set bits, ascending. */
export function bitIndices(bits: Uint32Array): number[] {
  const out: number[] = [];
  for (let w = 0; w < bits.length; w++) {
    let v = bits[w]!;
    while (v !== 0) {
      const low = v & -v;
      out.push((w << 5) + (31 - Math.clz32(low)));
      v ^= low;
    }
  }
  return out;
}

/** out[i] = src[i + k]: every bit moves k places toward index 0; bits shifted in from the top are clear. */
export function shiftDown(src: Uint32Array, k: number): Uint32Array {
  const out = new Uint32Array(src.length);
  const w = k >>> 5;
  const b = k & 31;
  for (let i = 0; i + w < src.length; i++) {
    const lo = src[i + w]!;
    const hi = i + w + 1 < src.length ? src[i + w + 1]! : 0;
    out[i] = b === 0 ? lo : (lo >>> b) | (hi << (32 - b));
  }
  return out;
}

/**
 * Slides a meeting of `len` ticks over `free` (a bitset of `ticks` ticks): bit s of the result is set
 * when ticks s .. s + len - 1 are all free. The result has ticks - len + 1 bits (none when negative).
 * Shifted ANDs with doubling, so the work is O(words * log len).
 */
export function slide(free: Uint32Array, ticks: number, len: number): Uint32Array {
  const starts = ticks - len + 1;
  if (starts <= 0) return new Uint32Array(0);
  let result: Uint32Array | null = null;
  let covered = 0;
  let run = free; // bit s set when a run of `step` free ticks starts at s
  let step = 1;
  let rest = len;
  while (rest > 0) {
    if ((rest & 1) === 1) {
      if (result === null) result = run.slice();
      else andInto(result, shiftDown(run, covered));
      covered += step;
    }
    rest >>>= 1;
    if (rest > 0) {
      const next = run.slice();
      andInto(next, shiftDown(run, step));
      run = next;
      step *= 2;
    }
  }
  const out = new Uint32Array(wordsFor(starts));
  out.set(result!.subarray(0, out.length));
  const tail = starts & 31;
  if (tail !== 0) out[out.length - 1]! &= (1 << tail) - 1;
  return out;
}

/** First index of the run of set bits that holds `t`, or -1 when bit `t` is clear. */
export function runStartAt(bits: Uint32Array, t: number): number {
  if (!hasBit(bits, t)) return -1;
  let w = t >>> 5;
  const off = t & 31;
  let clear = ~bits[w]! & (off === 31 ? 0xffffffff : (1 << (off + 1)) - 1);
  while (clear === 0) {
    w--;
    if (w < 0) return 0;
    clear = ~bits[w]!;
  }
  return (w << 5) + (31 - Math.clz32(clear)) + 1;
}

/** One past the last index of the run of set bits that holds `t` (bits past the end count as clear). */
export function runEndAt(bits: Uint32Array, t: number): number {
  let w = t >>> 5;
  let clear = ~bits[w]! & ~((1 << (t & 31)) - 1);
  while (clear === 0) {
    w++;
    if (w >= bits.length) return bits.length << 5;
    clear = ~bits[w]!;
  }
  return (w << 5) + (31 - Math.clz32(clear & -clear));
}
