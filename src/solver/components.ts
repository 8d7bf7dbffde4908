// Independent parts of the constraint graph, and ways to combine their answers.
import type { CompiledModel } from './model.ts';

/** Splits the variables into connected components of active constraints and cost terms. */
export function components(model: CompiledModel, active: Uint8Array | null): Int32Array[] {
  const n = model.variableCount;
  const parent = new Int32Array(n);
  for (let i = 0; i < n; i++) parent[i] = i;
  const find = (v: number): number => {
    let r = v;
    while (parent[r] !== r) r = parent[r]!;
    while (parent[v] !== r) {
      const next = parent[v]!;
      parent[v] = r;
      v = next;
    }
    return r;
  };
  const union = (a: number, b: number): void => {
    const ra = find(a);
    const rb = find(b);
    if (ra !== rb) parent[Math.max(ra, rb)] = Math.min(ra, rb);
  };
  for (let i = 0; i < model.binX.length; i++) {
    if (active === null || active[model.binCons[i]!] === 1) union(model.binX[i]!, model.binY[i]!);
  }
  for (const c of model.nary) {
    if (active !== null && active[c.id] !== 1) continue;
    for (let j = 1; j < c.vars.length; j++) union(c.vars[0]!, c.vars[j]!);
  }
  for (const t of model.binaryCosts) union(t.x, t.y);
  const index = new Int32Array(n).fill(-1);
  const lists: number[][] = [];
  for (let v = 0; v < n; v++) {
    const r = find(v);
    let k = index[r]!;
    if (k < 0) {
      k = lists.length;
      index[r] = k;
      lists.push([]);
    }
    lists[k]!.push(v);
  }
  return lists.map((l) => Int32Array.from(l));
}

/** A list filled on demand from a generator and kept for re-reading. */
export class LazyList<T> {
  readonly #items: T[] = [];
  readonly #source: Iterator<T>;
  #ended = false;

  /** Wraps a source iterator. */
  constructor(source: Iterator<T>) {
    this.#source = source;
  }

  /** Whether item i exists, pulling from the source as needed. */
  has(i: number): boolean {
    while (this.#items.length <= i && !this.#ended) {
      const r = this.#source.next();
      if (r.done === true) this.#ended = true;
      else this.#items.push(r.value);
    }
    return i < this.#items.length;
  }

  /** Item i; call `has(i)` first. */
  get(i: number): T {
    return this.#items[i]!;
  }
}

/** Every combination of one item per list (odometer order), lazily. */
export function* product<T>(lists: readonly LazyList<T>[]): Generator<readonly T[]> {
  const m = lists.length;
  for (const l of lists) if (!l.has(0)) return;
  const idx = new Array<number>(m).fill(0);
  for (;;) {
    yield idx.map((i, k) => lists[k]!.get(i));
    let k = m - 1;
    while (k >= 0) {
      idx[k]!++;
      if (lists[k]!.has(idx[k]!)) break;
      idx[k] = 0;
      k--;
    }
    if (k < 0) return;
  }
}

/** A solution of part of the model with its cost. */
export interface Scored<T> {
  readonly cost: number;
  readonly parts: readonly T[];
}

/** The k cheapest combinations of one entry per list, each list sorted by cost (k-best of a sum). */
export function kBestOfSum<T>(
  lists: readonly (readonly { cost: number; item: T }[])[],
  k: number,
): Scored<T>[] {
  let acc: Scored<T>[] = [{ cost: 0, parts: [] }];
  for (const list of lists) {
    const next: Scored<T>[] = [];
    for (const a of acc) {
      for (const b of list) {
        const cost = a.cost + b.cost;
        if (next.length >= k && cost >= next[next.length - 1]!.cost) break;
        insertSorted(next, { cost, parts: [...a.parts, b.item] }, k);
      }
    }
    acc = next;
    if (acc.length === 0) return acc;
  }
  return acc;
}

function insertSorted<T>(list: Scored<T>[], entry: Scored<T>, k: number): void {
  let i = list.length;
  while (i > 0 && list[i - 1]!.cost > entry.cost) i--;
  list.splice(i, 0, entry);
  if (list.length > k) list.pop();
}
