// The systematic search over one component: iterative depth-first search with a trail, forward
// checking or AC-3, MRV, LCV and branch-and-bound. State lives in flat typed arrays indexed by the
// component's local variable numbers; nothing is allocated per node.

import { lowestBit, nextSetBit, popcount32 } from './bitset.ts';
import type { BudgetMeter } from './budget.ts';
import {
  ARC_NE,
  ARC_ROWS,
  type CompiledModel,
  checkedCost,
  NARY_ALLDIFF,
  NARY_PRED,
  NARY_TABLE,
  type SupportRows,
} from './model.ts';
import { Prng } from './prng.ts';
import type { SolveStats, ValueScorer } from './types.ts';

// All-different scopes wider than this skip the matching check (its recursion is one frame per member).
const MATCHING_LIMIT = 2000;

// Open variables with more values than this are left out of the binary part of the cost bound.
const BOUND_SCAN_LIMIT = 32;

/** Plain backtracking: check constraints against assigned variables only. */
export const PROP_NONE = 0;
/** Forward checking. */
export const PROP_FORWARD = 1;
/** Maintained arc consistency (AC-3). */
export const PROP_ARC = 2;

/** Resolved search settings. */
export interface EngineSettings {
  readonly propagation: number;
  readonly mrv: boolean;
  readonly valueOrder: 'natural' | 'lcv' | ValueScorer;
  /** Prune with the cost bound (best mode). */
  readonly useBound: boolean;
  /** Seed of the MRV tie-break priority. */
  readonly seed: number;
}

interface LocalNary {
  readonly kind: number;
  readonly vars: Int32Array;
  readonly tuples: Int32Array | null;
  readonly fn: ((values: readonly number[]) => boolean) | null;
  readonly scratch: number[];
  readonly supOff: Int32Array;
  readonly sup: Uint32Array;
}

/** Search over one set of variables that shares no constraint with the rest. */
export class Engine {
  readonly #model: CompiledModel;
  readonly #gvars: Int32Array;
  readonly #n: number;
  readonly #set: EngineSettings;
  readonly #meter: BudgetMeter;
  readonly #stats: SolveStats;
  // structure
  readonly #off: Int32Array;
  readonly #nw: Int32Array;
  readonly #cap: Int32Array;
  readonly #arcStart: Int32Array;
  readonly #arcSplit: Int32Array;
  readonly #arcTo: Int32Array;
  readonly #arcKind: Uint8Array;
  readonly #arcData: Int32Array;
  readonly #rows: readonly SupportRows[];
  readonly #nary: readonly LocalNary[];
  readonly #naryStart: Int32Array;
  readonly #naryList: Int32Array;
  readonly #degree: Int32Array;
  readonly #tie: Uint32Array;
  readonly #ucost: readonly (Float64Array | null)[];
  readonly #corder: readonly (Int32Array | null)[];
  readonly #costVars: Int32Array;
  readonly #bcStart: Int32Array;
  readonly #bcOther: Int32Array;
  readonly #bcTerm: Int32Array;
  readonly #bcIsX: Uint8Array;
  readonly #bcVars: Int32Array;
  // state
  readonly #dom: Uint32Array;
  readonly #size: Int32Array;
  readonly #val: Int32Array;
  readonly #stamp: Int32Array;
  #frame = 1;
  #trailIdx: Int32Array;
  #trailOld: Int32Array;
  #trailVar: Int32Array;
  #trailLen = 0;
  readonly #queue: Int32Array;
  readonly #inQ: Uint8Array;
  #qHead = 0;
  #qLen = 0;
  readonly #scratch: Uint32Array;
  // search stack
  readonly #varAt: Int32Array;
  readonly #cursor: Int32Array;
  readonly #count: Int32Array;
  readonly #mark: Int32Array;
  readonly #costAt: Float64Array;
  readonly #orderBuf: (Int32Array | null)[];
  readonly #keys: Float64Array;
  // Scratch of the all-different matching, sized to the widest domain on first use.
  #owner = new Int32Array(0);
  #planes = new Uint32Array(0);
  #seenAt = new Int32Array(0);
  #visit = 0;
  readonly #keysCap: number;
  #depth = 0;
  #started = false;
  #done = false;
  /** Solutions must cost strictly less than this (best mode). */
  bound = Number.POSITIVE_INFINITY;
  /** Cost of the last solution found (with useBound), else 0. */
  cost = 0;
  /** True when the budget stopped this search. */
  stoppedByBudget = false;
  /** Stop (without a verdict) once the shared node count reaches this; used for restarts. */
  nodeCap = Number.POSITIVE_INFINITY;
  /** True when `nodeCap` stopped this search. */
  cutOff = false;

  /** Prepares search over one component from its shared structure and root domains. */
  constructor(
    model: CompiledModel,
    st: Structure,
    rootDom: readonly Uint32Array[],
    settings: EngineSettings,
    meter: BudgetMeter,
    stats: SolveStats,
  ) {
    this.#model = model;
    const gvars = st.gvars;
    this.#gvars = gvars;
    const n = gvars.length;
    this.#n = n;
    this.#set = settings;
    this.#meter = meter;
    this.#stats = stats;
    const off = st.off;
    this.#off = off;
    this.#nw = st.nw;
    this.#cap = st.cap;
    const dom = new Uint32Array(off[n]!);
    const size = new Int32Array(n);
    for (let i = 0; i < n; i++) {
      const src = rootDom[gvars[i]!]!;
      dom.set(src, off[i]!);
      let c = 0;
      for (let w = 0; w < src.length; w++) c += popcount32(src[w]!);
      size[i] = c;
    }
    this.#dom = dom;
    this.#size = size;
    this.#val = new Int32Array(n).fill(-1);
    this.#stamp = new Int32Array(dom.length);
    const tcap = Math.max(64, dom.length);
    this.#trailIdx = new Int32Array(tcap);
    this.#trailOld = new Int32Array(tcap);
    this.#trailVar = new Int32Array(tcap);
    this.#queue = new Int32Array(n);
    this.#inQ = new Uint8Array(n);
    this.#scratch = new Uint32Array(st.maxWords);
    this.#arcStart = st.arcStart;
    this.#arcSplit = st.arcSplit;
    this.#arcTo = st.arcTo;
    this.#arcKind = st.arcKind;
    this.#arcData = st.arcData;
    this.#rows = model.rows;
    this.#nary = st.nary;
    this.#naryStart = st.naryStart;
    this.#naryList = st.naryList;
    this.#degree = st.degree;
    // MRV ties: by index for seed 0 (the order the model was written in), otherwise by a fixed
    // seeded priority, which is what restarts use to explore other orders deterministically.
    const rng = new Prng(settings.seed);
    this.#tie = Uint32Array.from(gvars, (_, i) => (settings.seed === 0 ? i : rng.nextU32()));
    this.#ucost = st.ucost;
    this.#corder = st.corder;
    this.#costVars = st.costVars;
    this.#bcStart = st.bcStart;
    this.#bcOther = st.bcOther;
    this.#bcTerm = st.bcTerm;
    this.#bcIsX = st.bcIsX;
    const bcVars: number[] = [];
    for (let i = 0; i < n; i++) if (st.bcStart[i + 1]! > st.bcStart[i]!) bcVars.push(i);
    this.#bcVars = settings.useBound ? Int32Array.from(bcVars) : new Int32Array(0);
    const maxCap = st.maxCap;
    this.#keysCap = maxCap;
    this.#varAt = new Int32Array(n);
    this.#cursor = new Int32Array(n);
    this.#count = new Int32Array(n);
    this.#mark = new Int32Array(n);
    this.#costAt = new Float64Array(n + 1);
    this.#orderBuf = new Array<Int32Array | null>(n).fill(null);
    this.#keys = new Float64Array(settings.valueOrder === 'natural' ? 0 : maxCap);
  }

  /** Number of variables of this component. */
  get variableCount(): number {
    return this.#n;
  }

  /** Writes the current full assignment into `out` at global indices. */
  write(out: number[] | Int32Array): void {
    for (let i = 0; i < this.#n; i++) out[this.#gvars[i]!] = this.#val[i]!;
  }

  /** The current full assignment as a local-order Int32Array copy. */
  snapshot(): Int32Array {
    return this.#val.slice();
  }

  /** Finds the next solution; false when exhausted or stopped by the budget. */
  next(): boolean {
    if (this.#done) return false;
    const n = this.#n;
    if (!this.#started) {
      this.#started = true;
      if (!this.#rootOk()) {
        this.#done = true;
        return false;
      }
      this.#depth = 0;
      this.#open(0);
    }
    const meter = this.#meter;
    const stats = this.#stats;
    const val = this.#val;
    const varAt = this.#varAt;
    const mark = this.#mark;
    const useBound = this.#set.useBound;
    for (;;) {
      const d = this.#depth;
      if (d < 0) {
        this.#done = true;
        return false;
      }
      const x = varAt[d]!;
      val[x] = -1;
      this.#restore(mark[d]!);
      const a = this.#nextValue(d, x);
      if (a < 0) {
        this.#depth = d - 1;
        continue;
      }
      if (stats.nodes >= this.nodeCap) {
        this.#done = true;
        this.cutOff = true;
        return false;
      }
      if (!meter.step()) {
        this.#done = true;
        this.stoppedByBudget = true;
        return false;
      }
      stats.nodes++;
      this.#frame++;
      if (!this.#assign(x, a)) {
        stats.backtracks++;
        continue;
      }
      if (useBound) {
        const c = this.#costAt[d]! + this.#stepCost(x, a);
        this.#costAt[d + 1] = c;
        if (c + this.#lowerBound() >= this.bound) {
          stats.backtracks++;
          continue;
        }
      }
      if (d === n - 1) {
        this.cost = useBound ? this.#costAt[n]! : 0;
        return true;
      }
      this.#depth = d + 1;
      this.#open(d + 1);
    }
  }

  #rootOk(): boolean {
    const n = this.#n;
    for (let i = 0; i < n; i++) if (this.#size[i] === 0) return false;
    if (this.#set.propagation === PROP_ARC) {
      for (let i = 0; i < n; i++) this.#enqueue(i);
      return this.#propagateQueue();
    }
    if (this.#set.propagation === PROP_FORWARD) {
      // n-ary constraints over already fixed variables (or one open one) are settled before search.
      for (let c = 0; c < this.#nary.length; c++) if (!this.#propagateNary(this.#nary[c]!, -1)) return false;
    }
    return true;
  }

  #open(d: number): void {
    const x = this.#set.mrv ? this.#selectMrv() : d;
    this.#varAt[d] = x;
    this.#mark[d] = this.#trailLen;
    const order = this.#set.valueOrder;
    if (order === 'natural') {
      this.#cursor[d] = -1;
      return;
    }
    let buf = this.#orderBuf[d];
    if (buf === null || buf === undefined || buf.length < this.#cap[x]!) {
      buf = new Int32Array(this.#keys.length);
      this.#orderBuf[d] = buf;
    }
    const keys = this.#keys;
    const dom = this.#dom;
    const off = this.#off[x]!;
    const nw = this.#nw[x]!;
    const lcv = order === 'lcv';
    const planes = lcv ? this.#lcvNotEqual(x) : 0;
    const counts = this.#planes;
    let k = 0;
    for (let w = 0; w < nw; w++) {
      let word = dom[off + w]!;
      while (word !== 0) {
        const bit = lowestBit(word);
        const a = (w << 5) + bit;
        word &= word - 1;
        if (lcv) {
          let ne = 0;
          for (let p = 0; p < planes; p++) ne += ((counts[p * nw + w]! >>> bit) & 1) << p;
          keys[k] = ne + this.#lcvScore(x, a);
        } else keys[k] = order(this.#gvars[x]!, a);
        buf[k] = a;
        k++;
      }
    }
    sortByKey(keys, buf, 0, k - 1);
    this.#cursor[d] = 0;
    this.#count[d] = k;
  }

  #nextValue(d: number, x: number): number {
    if (this.#set.valueOrder === 'natural') {
      const a = nextSetBit(this.#dom, this.#off[x]!, this.#nw[x]!, this.#cursor[d]!);
      this.#cursor[d] = a;
      return a;
    }
    const c = this.#cursor[d]!;
    if (c >= this.#count[d]!) return -1;
    this.#cursor[d] = c + 1;
    return this.#orderBuf[d]![c]!;
  }

  #selectMrv(): number {
    const val = this.#val;
    const size = this.#size;
    const degree = this.#degree;
    let best = -1;
    let bestSize = 0x7fffffff;
    let bestDeg = -1;
    let bestTie = 0;
    const tie = this.#tie;
    for (let i = 0; i < this.#n; i++) {
      if (val[i]! >= 0) continue;
      const s = size[i]!;
      if (s > bestSize) continue;
      const dg = degree[i]!;
      if (s < bestSize || dg > bestDeg || (dg === bestDeg && tie[i]! < bestTie)) {
        best = i;
        bestSize = s;
        bestDeg = dg;
        bestTie = tie[i]!;
      }
    }
    return best;
  }

  /**
   * For every value a of x at once, how many open not-equal neighbours hold a + shift: each arc adds a
   * shifted window of the neighbour's domain into bit-sliced counters (plane p holds bit p of every
   * count), so the cost is words per arc instead of values per arc. Returns the number of planes.
   */
  #lcvNotEqual(x: number): number {
    const first = this.#arcStart[x]!;
    const split = this.#arcSplit[x]!;
    const nw = this.#nw[x]!;
    let planes = 1;
    while (1 << planes <= split - first) planes++;
    if (this.#planes.length < planes * nw) this.#planes = new Uint32Array(planes * nw);
    const P = this.#planes;
    P.fill(0, 0, planes * nw);
    const dom = this.#dom;
    const val = this.#val;
    for (let i = first; i < split; i++) {
      const y = this.#arcTo[i]!;
      if (val[y]! >= 0) continue;
      const shift = this.#arcData[i]!;
      const offY = this.#off[y]!;
      const nwY = this.#nw[y]!;
      for (let w = 0; w < nw; w++) {
        // Bits (32w + shift) .. (32w + shift + 31) of D(y); words outside the domain read as empty.
        const start = (w << 5) + shift;
        const q = start >> 5;
        const r = start & 31;
        const lo = q >= 0 && q < nwY ? dom[offY + q]! : 0;
        let t = lo;
        if (r !== 0) {
          const hi = q + 1 >= 0 && q + 1 < nwY ? dom[offY + q + 1]! : 0;
          t = ((lo >>> r) | (hi << (32 - r))) >>> 0;
        }
        for (let p = 0; t !== 0 && p < planes; p++) {
          const old = P[p * nw + w]!;
          P[p * nw + w] = (old ^ t) >>> 0;
          t = (old & t) >>> 0;
        }
      }
    }
    return planes;
  }

  /** Values lost in the open neighbours of x if x took a, over predicate arcs and all-different. */
  #lcvScore(x: number, a: number): number {
    const dom = this.#dom;
    const val = this.#val;
    let lost = 0;
    for (let i = this.#arcSplit[x]!; i < this.#arcStart[x + 1]!; i++) {
      const y = this.#arcTo[i]!;
      if (val[y]! >= 0) continue;
      const kind = this.#arcKind[i]!;
      const offY = this.#off[y]!;
      if (kind === ARC_NE) {
        const b = a + this.#arcData[i]!;
        if (b >= 0 && b < this.#cap[y]! && ((dom[offY + (b >>> 5)]! >>> (b & 31)) & 1) === 1) lost++;
      } else if (kind === ARC_ROWS) {
        const rows = this.#rows[this.#arcData[i]!]!;
        const ro = rows.row(a);
        const words = rows.words;
        for (let w = 0; w < this.#nw[y]!; w++) lost += popcount32(dom[offY + w]! & ~words[ro + w]!);
      } else {
        const rows = this.#rows[this.#arcData[i]!]!;
        for (let w = 0; w < this.#nw[y]!; w++) {
          let word = dom[offY + w]!;
          while (word !== 0) {
            const b = (w << 5) + lowestBit(word);
            word &= word - 1;
            if (!rows.allows(a, b)) lost++;
          }
        }
      }
    }
    for (let k = this.#naryStart[x]!; k < this.#naryStart[x + 1]!; k++) {
      const c = this.#nary[this.#naryList[k]!]!;
      if (c.kind !== NARY_ALLDIFF) continue;
      for (const y of c.vars) {
        if (y === x || val[y]! >= 0) continue;
        if (a < this.#cap[y]! && ((dom[this.#off[y]! + (a >>> 5)]! >>> (a & 31)) & 1) === 1) lost++;
      }
    }
    return lost;
  }

  #stepCost(x: number, a: number): number {
    const uc = this.#ucost[x];
    let c = uc === null || uc === undefined ? 0 : uc[a]!;
    const val = this.#val;
    for (let k = this.#bcStart[x]!; k < this.#bcStart[x + 1]!; k++) {
      const o = val[this.#bcOther[k]!]!;
      if (o < 0) continue;
      const term = this.#model.binaryCosts[this.#bcTerm[k]!]!;
      c += checkedCost(this.#bcIsX[k] === 1 ? term.fn(a, o) : term.fn(o, a));
    }
    return c;
  }

  #lowerBound(): number {
    let lb = 0;
    const dom = this.#dom;
    for (let k = 0; k < this.#costVars.length; k++) {
      const v = this.#costVars[k]!;
      if (this.#val[v]! >= 0) continue;
      const order = this.#corder[v]!;
      const off = this.#off[v]!;
      for (let j = 0; j < order.length; j++) {
        const a = order[j]!;
        if (((dom[off + (a >>> 5)]! >>> (a & 31)) & 1) === 1) {
          lb += this.#ucost[v]![a]!;
          break;
        }
      }
    }
    // Binary terms between an assigned and an open variable: the open side's cheapest value, when it
    // has few enough values for that to be cheap to find. Terms are >= 0, so the sum stays a bound.
    const val = this.#val;
    for (let k = 0; k < this.#bcVars.length; k++) {
      const v = this.#bcVars[k]!;
      if (val[v]! >= 0 || this.#size[v]! > BOUND_SCAN_LIMIT) continue;
      const off = this.#off[v]!;
      for (let t = this.#bcStart[v]!; t < this.#bcStart[v + 1]!; t++) {
        const o = val[this.#bcOther[t]!]!;
        if (o < 0) continue;
        const term = this.#model.binaryCosts[this.#bcTerm[t]!]!;
        const isX = this.#bcIsX[t] === 1;
        let best = Number.POSITIVE_INFINITY;
        for (let w = 0; w < this.#nw[v]!; w++) {
          let word = dom[off + w]!;
          while (word !== 0) {
            const b = (w << 5) + lowestBit(word);
            word &= word - 1;
            const c = isX ? term.fn(b, o) : term.fn(o, b);
            if (c < best) best = c;
          }
        }
        if (best !== Number.POSITIVE_INFINITY) lb += checkedCost(best);
      }
    }
    return lb;
  }

  // ---- domain changes (trailed) ----

  #save(idx: number, v: number): void {
    if (this.#stamp[idx] === this.#frame) return;
    this.#stamp[idx] = this.#frame;
    if (this.#trailLen === this.#trailIdx.length) this.#growTrail();
    const t = this.#trailLen++;
    this.#trailIdx[t] = idx;
    this.#trailOld[t] = this.#dom[idx]! | 0;
    this.#trailVar[t] = v;
  }

  #growTrail(): void {
    const len = this.#trailIdx.length * 2;
    const a = new Int32Array(len);
    a.set(this.#trailIdx);
    this.#trailIdx = a;
    const b = new Int32Array(len);
    b.set(this.#trailOld);
    this.#trailOld = b;
    const c = new Int32Array(len);
    c.set(this.#trailVar);
    this.#trailVar = c;
  }

  #restore(mark: number): void {
    const dom = this.#dom;
    const size = this.#size;
    const ti = this.#trailIdx;
    const to = this.#trailOld;
    const tv = this.#trailVar;
    for (let t = this.#trailLen - 1; t >= mark; t--) {
      const idx = ti[t]!;
      const old = to[t]! >>> 0;
      size[tv[t]!]! += popcount32(old ^ dom[idx]!);
      dom[idx] = old;
      this.#stamp[idx] = 0;
    }
    this.#trailLen = mark;
  }

  /** Removes value b from v; -1 when v became empty, 1 when removed, 0 when absent. */
  #remove(v: number, b: number): number {
    if (b < 0 || b >= this.#cap[v]!) return 0;
    const idx = this.#off[v]! + (b >>> 5);
    const bit = 1 << (b & 31);
    const w = this.#dom[idx]!;
    if ((w & bit) === 0) return 0;
    this.#save(idx, v);
    this.#dom[idx] = w & ~bit;
    this.#stats.pruned++;
    if (--this.#size[v]! === 0) return -1;
    if (this.#set.propagation === PROP_ARC) this.#enqueue(v);
    return 1;
  }

  /** Intersects v with words[from..]; -1 when empty, 1 when changed, 0 otherwise. */
  #intersect(v: number, words: Uint32Array, from: number): number {
    const dom = this.#dom;
    const off = this.#off[v]!;
    const nw = this.#nw[v]!;
    let removed = 0;
    for (let w = 0; w < nw; w++) {
      const old = dom[off + w]!;
      const next = (old & words[from + w]!) >>> 0;
      if (next !== old) {
        this.#save(off + w, v);
        dom[off + w] = next;
        removed += popcount32(old ^ next);
      }
    }
    if (removed === 0) return 0;
    this.#stats.pruned += removed;
    this.#size[v]! -= removed;
    if (this.#size[v] === 0) return -1;
    if (this.#set.propagation === PROP_ARC) this.#enqueue(v);
    return 1;
  }

  #single(v: number): number {
    const off = this.#off[v]!;
    for (let w = 0; w < this.#nw[v]!; w++) {
      const word = this.#dom[off + w]!;
      if (word !== 0) return (w << 5) + lowestBit(word);
    }
    return -1;
  }

  #enqueue(v: number): void {
    if (this.#inQ[v] === 1) return;
    this.#inQ[v] = 1;
    const n = this.#n;
    let t = this.#qHead + this.#qLen;
    if (t >= n) t -= n;
    this.#queue[t] = v;
    this.#qLen++;
  }

  #clearQueue(): void {
    while (this.#qLen > 0) {
      this.#inQ[this.#queue[this.#qHead]!] = 0;
      this.#qHead = this.#qHead + 1 === this.#n ? 0 : this.#qHead + 1;
      this.#qLen--;
    }
    this.#qHead = 0;
  }

  // ---- assignment and propagation ----

  #assign(x: number, a: number): boolean {
    const off = this.#off[x]!;
    const dom = this.#dom;
    const aw = a >>> 5;
    const bit = 1 << (a & 31);
    for (let w = 0; w < this.#nw[x]!; w++) {
      const old = dom[off + w]!;
      const next = w === aw ? (old & bit) >>> 0 : 0;
      if (next !== old) {
        this.#save(off + w, x);
        dom[off + w] = next;
      }
    }
    this.#size[x] = 1;
    this.#val[x] = a;
    const p = this.#set.propagation;
    if (p === PROP_NONE) return this.#checkBack(x, a);
    if (p === PROP_FORWARD) return this.#forward(x, a);
    this.#enqueue(x);
    return this.#propagateQueue();
  }

  #checkBack(x: number, a: number): boolean {
    const val = this.#val;
    this.#stats.propagations++;
    for (let i = this.#arcStart[x]!; i < this.#arcStart[x + 1]!; i++) {
      const b = val[this.#arcTo[i]!]!;
      if (b < 0) continue;
      if (this.#arcKind[i] === ARC_NE) {
        if (b === a + this.#arcData[i]!) return false;
      } else if (!this.#rows[this.#arcData[i]!]!.allows(a, b)) return false;
    }
    for (let k = this.#naryStart[x]!; k < this.#naryStart[x + 1]!; k++) {
      const c = this.#nary[this.#naryList[k]!]!;
      const vars = c.vars;
      if (c.kind === NARY_ALLDIFF) {
        for (let j = 0; j < vars.length; j++) if (vars[j] !== x && val[vars[j]!] === a) return false;
        continue;
      }
      let open = false;
      for (let j = 0; j < vars.length; j++) {
        if (val[vars[j]!]! < 0) {
          open = true;
          break;
        }
      }
      if (open) continue;
      if (c.kind === NARY_PRED) {
        for (let j = 0; j < vars.length; j++) c.scratch[j] = val[vars[j]!]!;
        if (c.fn!(c.scratch) !== true) return false;
      } else if (!this.#tupleMatches(c)) return false;
    }
    return true;
  }

  #tupleMatches(c: LocalNary): boolean {
    const t = c.tuples!;
    const vars = c.vars;
    const k = vars.length;
    const val = this.#val;
    for (let s = 0; s < t.length; s += k) {
      let j = 0;
      while (j < k && t[s + j] === val[vars[j]!]) j++;
      if (j === k) return true;
    }
    return false;
  }

  #forward(x: number, a: number): boolean {
    const val = this.#val;
    const stats = this.#stats;
    const arcTo = this.#arcTo;
    const arcData = this.#arcData;
    const dom = this.#dom;
    const off = this.#off;
    const cap = this.#cap;
    const size = this.#size;
    const stamp = this.#stamp;
    const frame = this.#frame;
    const first = this.#arcStart[x]!;
    const split = this.#arcSplit[x]!;
    const end = this.#arcStart[x + 1]!;
    // Not-equal arcs, inlined: the hot loop of models like n-queens.
    let visited = 0;
    let pruned = 0;
    let ok = true;
    for (let i = first; i < split; i++) {
      const y = arcTo[i]!;
      if (val[y]! >= 0) continue;
      visited++;
      const b = a + arcData[i]!;
      if (b < 0 || b >= cap[y]!) continue;
      const idx = off[y]! + (b >>> 5);
      const w = dom[idx]!;
      const bit = 1 << (b & 31);
      if ((w & bit) === 0) continue;
      if (stamp[idx] !== frame) this.#save(idx, y);
      dom[idx] = w & ~bit;
      pruned++;
      if (--size[y]! === 0) {
        ok = false;
        break;
      }
    }
    stats.propagations += visited;
    stats.pruned += pruned;
    if (!ok) return false;
    for (let i = split; i < end; i++) {
      const y = arcTo[i]!;
      if (val[y]! >= 0) continue;
      stats.propagations++;
      if (this.#filterBy(i, a, y) < 0) return false;
    }
    for (let k = this.#naryStart[x]!; k < this.#naryStart[x + 1]!; k++) {
      if (!this.#propagateNary(this.#nary[this.#naryList[k]!]!, x)) return false;
    }
    return true;
  }

  /** Keeps in y only values compatible with (source of arc i) = a. */
  #filterBy(i: number, a: number, y: number): number {
    const kind = this.#arcKind[i]!;
    if (kind === ARC_NE) return this.#remove(y, a + this.#arcData[i]!);
    const rows = this.#rows[this.#arcData[i]!]!;
    if (kind === ARC_ROWS) {
      const ro = rows.row(a);
      return this.#intersect(y, rows.words, ro);
    }
    const dom = this.#dom;
    const off = this.#off[y]!;
    let result = 0;
    for (let w = 0; w < this.#nw[y]!; w++) {
      let word = dom[off + w]!;
      while (word !== 0) {
        const b = (w << 5) + lowestBit(word);
        word &= word - 1;
        if (!rows.allows(a, b)) {
          const r = this.#remove(y, b);
          if (r < 0) return -1;
          result = 1;
        }
      }
    }
    return result;
  }

  #propagateQueue(): boolean {
    const val = this.#val;
    const size = this.#size;
    const stats = this.#stats;
    while (this.#qLen > 0) {
      const y = this.#queue[this.#qHead]!;
      this.#qHead = this.#qHead + 1 === this.#n ? 0 : this.#qHead + 1;
      this.#qLen--;
      this.#inQ[y] = 0;
      const single = size[y] === 1 ? this.#single(y) : -1;
      // Not-equal arcs come first and prune only from a single value, so skip them otherwise.
      const from = single >= 0 ? this.#arcStart[y]! : this.#arcSplit[y]!;
      for (let i = from; i < this.#arcStart[y + 1]!; i++) {
        const z = this.#arcTo[i]!;
        if (val[z]! >= 0) continue;
        stats.propagations++;
        const r = single >= 0 ? this.#filterBy(i, single, z) : this.#revise(i, y, z);
        if (r < 0) {
          this.#clearQueue();
          return false;
        }
      }
      for (let k = this.#naryStart[y]!; k < this.#naryStart[y + 1]!; k++) {
        if (!this.#propagateNary(this.#nary[this.#naryList[k]!]!, y)) {
          this.#clearQueue();
          return false;
        }
      }
    }
    return true;
  }

  /** Removes values of z without support in y (arc i goes y -> z); y has several values. */
  #revise(i: number, y: number, z: number): number {
    const kind = this.#arcKind[i]!;
    if (kind === ARC_NE) return 0;
    const rows = this.#rows[this.#arcData[i]!]!;
    const dom = this.#dom;
    const offY = this.#off[y]!;
    const nwY = this.#nw[y]!;
    const offZ = this.#off[z]!;
    const nwZ = this.#nw[z]!;
    if (kind === ARC_ROWS) {
      const sc = this.#scratch;
      sc.fill(0, 0, nwZ);
      for (let w = 0; w < nwY; w++) {
        let word = dom[offY + w]!;
        while (word !== 0) {
          const b = (w << 5) + lowestBit(word);
          word &= word - 1;
          const ro = rows.row(b);
          const words = rows.words;
          let covered = true;
          for (let u = 0; u < nwZ; u++) {
            const s = (sc[u]! | words[ro + u]!) >>> 0;
            sc[u] = s;
            if ((dom[offZ + u]! & ~s) !== 0) covered = false;
          }
          if (covered) return 0;
        }
      }
      return this.#intersect(z, sc, 0);
    }
    let result = 0;
    for (let u = 0; u < nwZ; u++) {
      let zw = dom[offZ + u]!;
      while (zw !== 0) {
        const c = (u << 5) + lowestBit(zw);
        zw &= zw - 1;
        let supported = false;
        for (let w = 0; w < nwY && !supported; w++) {
          let word = dom[offY + w]!;
          while (word !== 0) {
            const b = (w << 5) + lowestBit(word);
            word &= word - 1;
            if (rows.allows(b, c)) {
              supported = true;
              break;
            }
          }
        }
        if (!supported) {
          if (this.#remove(z, c) < 0) return -1;
          result = 1;
        }
      }
    }
    return result;
  }

  /** Runs an n-ary propagator; `trigger` is the variable that changed (-1 at the root). */
  #propagateNary(c: LocalNary, trigger: number): boolean {
    this.#stats.propagations++;
    const vars = c.vars;
    const k = vars.length;
    const size = this.#size;
    if (c.kind === NARY_ALLDIFF) {
      if (trigger >= 0 && size[trigger] === 1) {
        const a = this.#single(trigger);
        for (let j = 0; j < k; j++) {
          const y = vars[j]!;
          if (y !== trigger && this.#remove(y, a) < 0) return false;
        }
      }
      if (this.#set.propagation === PROP_ARC) {
        // The matching recurses once per member; very wide scopes keep to the count check.
        return this.#pigeonhole(c) && (c.vars.length > MATCHING_LIMIT || this.#matchable(c));
      }
      return true;
    }
    if (c.kind === NARY_PRED) {
      let openVar = -1;
      let openAt = -1;
      for (let j = 0; j < k; j++) {
        const y = vars[j]!;
        if (size[y]! > 1) {
          if (openVar >= 0) return true;
          openVar = y;
          openAt = j;
        } else c.scratch[j] = this.#single(y);
      }
      if (openVar < 0) return c.fn!(c.scratch) === true;
      const dom = this.#dom;
      const off = this.#off[openVar]!;
      for (let w = 0; w < this.#nw[openVar]!; w++) {
        let word = dom[off + w]!;
        while (word !== 0) {
          const b = (w << 5) + lowestBit(word);
          word &= word - 1;
          c.scratch[openAt] = b;
          if (c.fn!(c.scratch) !== true && this.#remove(openVar, b) < 0) return false;
        }
      }
      return true;
    }
    // Table: keep the values that appear in some tuple valid for every current domain.
    const t = c.tuples!;
    const sup = c.sup;
    const supOff = c.supOff;
    const dom = this.#dom;
    sup.fill(0);
    for (let s = 0; s < t.length; s += k) {
      let j = 0;
      for (; j < k; j++) {
        const b = t[s + j]!;
        if (((dom[this.#off[vars[j]!]! + (b >>> 5)]! >>> (b & 31)) & 1) === 0) break;
      }
      if (j < k) continue;
      for (j = 0; j < k; j++) {
        const b = t[s + j]!;
        sup[supOff[j]! + (b >>> 5)]! |= 1 << (b & 31);
      }
    }
    for (let j = 0; j < k; j++) if (this.#intersect(vars[j]!, sup, supOff[j]!) < 0) return false;
    return true;
  }

  /**
   * Whether every member of an all-different can take a distinct value at once (a bipartite matching
   * of members to values, by augmenting paths). By Hall's theorem this catches every group of k
   * members confined to fewer than k values, not only the whole scope.
   */
  #matchable(c: LocalNary): boolean {
    const vars = c.vars;
    const k = vars.length;
    if (this.#owner.length === 0) {
      this.#owner = new Int32Array(this.#keysCap).fill(-1);
      this.#seenAt = new Int32Array(this.#keysCap);
    }
    const owner = this.#owner;
    let ok = true;
    let matched = 0;
    for (; matched < k; matched++) {
      this.#visit++;
      if (!this.#augment(c, matched)) {
        ok = false;
        break;
      }
    }
    // Owners live only for this call: clear the values they point at.
    const dom = this.#dom;
    for (let j = 0; j < k; j++) {
      const v = vars[j]!;
      const off = this.#off[v]!;
      for (let w = 0; w < this.#nw[v]!; w++) {
        let word = dom[off + w]!;
        while (word !== 0) {
          owner[(w << 5) + lowestBit(word)] = -1;
          word &= word - 1;
        }
      }
    }
    return ok;
  }

  #augment(c: LocalNary, j: number): boolean {
    const v = c.vars[j]!;
    const dom = this.#dom;
    const off = this.#off[v]!;
    const owner = this.#owner;
    const seen = this.#seenAt;
    const visit = this.#visit;
    for (let w = 0; w < this.#nw[v]!; w++) {
      let word = dom[off + w]!;
      while (word !== 0) {
        const b = (w << 5) + lowestBit(word);
        word &= word - 1;
        if (seen[b] === visit) continue;
        seen[b] = visit;
        const o = owner[b]!;
        if (o < 0 || this.#augment(c, o)) {
          owner[b] = j;
          return true;
        }
      }
    }
    return false;
  }

  /** Fails when the open variables of an all-different have fewer values in total than members. */
  #pigeonhole(c: LocalNary): boolean {
    const sc = this.#scratch;
    let maxW = 0;
    let open = 0;
    for (const y of c.vars) if (this.#nw[y]! > maxW) maxW = this.#nw[y]!;
    sc.fill(0, 0, maxW);
    for (const y of c.vars) {
      open++;
      const off = this.#off[y]!;
      for (let w = 0; w < this.#nw[y]!; w++) sc[w]! |= this.#dom[off + w]!;
    }
    let total = 0;
    for (let w = 0; w < maxW; w++) total += popcount32(sc[w]!);
    return total >= open;
  }
}

/** Sorts vals[lo..hi] by keys ascending, ties by value (quicksort on parallel arrays). */
function sortByKey(keys: Float64Array, vals: Int32Array, lo: number, hi: number): void {
  while (hi - lo > 16) {
    const mid = (lo + hi) >>> 1;
    const pk = keys[mid]!;
    const pv = vals[mid]!;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (keys[i]! < pk || (keys[i] === pk && vals[i]! < pv)) i++;
      while (keys[j]! > pk || (keys[j] === pk && vals[j]! > pv)) j--;
      if (i <= j) {
        const tk = keys[i]!;
        keys[i] = keys[j]!;
        keys[j] = tk;
        const tv = vals[i]!;
        vals[i] = vals[j]!;
        vals[j] = tv;
        i++;
        j--;
      }
    }
    if (j - lo < hi - i) {
      sortByKey(keys, vals, lo, j);
      lo = i;
    } else {
      sortByKey(keys, vals, i, hi);
      hi = j;
    }
  }
  for (let i = lo + 1; i <= hi; i++) {
    const k = keys[i]!;
    const v = vals[i]!;
    let j = i - 1;
    while (j >= lo && (keys[j]! > k || (keys[j] === k && vals[j]! > v))) {
      keys[j + 1] = keys[j]!;
      vals[j + 1] = vals[j]!;
      j--;
    }
    keys[j + 1] = k;
    vals[j + 1] = v;
  }
}

/** The static part of one component's search: arcs, n-ary scopes and costs in local numbering. */
export interface Structure {
  readonly gvars: Int32Array;
  readonly off: Int32Array;
  readonly nw: Int32Array;
  readonly cap: Int32Array;
  readonly maxCap: number;
  readonly maxWords: number;
  readonly arcStart: Int32Array;
  /** Per variable, where its predicate arcs start (not-equal arcs come first). */
  readonly arcSplit: Int32Array;
  readonly arcTo: Int32Array;
  readonly arcKind: Uint8Array;
  readonly arcData: Int32Array;
  readonly nary: readonly LocalNary[];
  readonly naryStart: Int32Array;
  readonly naryList: Int32Array;
  readonly degree: Int32Array;
  readonly ucost: readonly (Float64Array | null)[];
  readonly corder: readonly (Int32Array | null)[];
  readonly costVars: Int32Array;
  readonly bcStart: Int32Array;
  readonly bcOther: Int32Array;
  readonly bcTerm: Int32Array;
  readonly bcIsX: Uint8Array;
}

/** Builds the structure of component `gvars` (ascending) for the active constraints. */
export function buildStructure(
  model: CompiledModel,
  gvars: Int32Array,
  local: Int32Array,
  active: Uint8Array | null,
): Structure {
  const n = gvars.length;
  const sizes = model.sizes;
  const off = new Int32Array(n + 1);
  const nw = new Int32Array(n);
  const cap = new Int32Array(n);
  let maxCap = 1;
  let maxWords = 1;
  for (let i = 0; i < n; i++) {
    const c = sizes[gvars[i]!]!;
    cap[i] = c;
    nw[i] = (c + 31) >>> 5;
    off[i + 1] = off[i]! + nw[i]!;
    if (c > maxCap) maxCap = c;
    if (nw[i]! > maxWords) maxWords = nw[i]!;
  }
  const mStart = model.arcStart;
  const mCons = model.arcCons;
  const mTo = model.arcTo;
  const mKind = model.arcKind;
  const mData = model.arcData;
  const arcStart = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) {
    const g = gvars[i]!;
    let c = 0;
    if (active === null) c = mStart[g + 1]! - mStart[g]!;
    else for (let a = mStart[g]!; a < mStart[g + 1]!; a++) c += active[mCons[a]!]!;
    arcStart[i + 1] = arcStart[i]! + c;
  }
  const m = arcStart[n]!;
  const arcTo = new Int32Array(m);
  const arcKind = new Uint8Array(m);
  const arcData = new Int32Array(m);
  const arcSplit = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const g = gvars[i]!;
    let k = arcStart[i]!;
    // Two passes: not-equal arcs first, then predicate arcs.
    for (let pass = 0; pass < 2; pass++) {
      if (pass === 1) arcSplit[i] = k;
      for (let a = mStart[g]!; a < mStart[g + 1]!; a++) {
        if (active !== null && active[mCons[a]!] !== 1) continue;
        if ((mKind[a] === ARC_NE) !== (pass === 0)) continue;
        arcTo[k] = local[mTo[a]!]!;
        arcKind[k] = mKind[a]!;
        arcData[k] = mData[a]!;
        k++;
      }
    }
  }

  const seen = new Map<number, number>();
  const nary: LocalNary[] = [];
  const lists: number[][] = [];
  for (let i = 0; i < n; i++) {
    const g = gvars[i]!;
    const mine: number[] = [];
    for (let k = model.naryStart[g]!; k < model.naryStart[g + 1]!; k++) {
      const ci = model.naryList[k]!;
      const c = model.nary[ci]!;
      if (active !== null && active[c.id] !== 1) continue;
      let li = seen.get(ci);
      if (li === undefined) {
        li = nary.length;
        seen.set(ci, li);
        const vars = Int32Array.from(c.vars, (v) => local[v]!);
        const supOff = new Int32Array(vars.length + 1);
        for (let j = 0; j < vars.length; j++) supOff[j + 1] = supOff[j]! + nw[vars[j]!]!;
        nary.push({
          kind: c.kind,
          vars,
          tuples: c.tuples,
          fn: c.fn,
          scratch: new Array<number>(vars.length).fill(0),
          supOff,
          sup: new Uint32Array(c.kind === NARY_TABLE ? supOff[vars.length]! : 0),
        });
      }
      mine.push(li);
    }
    lists.push(mine);
  }
  const naryStart = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) naryStart[i + 1] = naryStart[i]! + lists[i]!.length;
  const naryList = new Int32Array(naryStart[n]!);
  for (let i = 0; i < n; i++) naryList.set(lists[i]!, naryStart[i]!);

  const ucost = Array.from(gvars, (g) => model.unaryCost[g] ?? null);
  const corder = Array.from(gvars, (g) => model.costOrder[g] ?? null);
  const costVars: number[] = [];
  for (let i = 0; i < n; i++) if (ucost[i] !== null) costVars.push(i);
  const bcStart = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) {
    const g = gvars[i]!;
    bcStart[i + 1] = bcStart[i]! + (model.bcostStart[g + 1]! - model.bcostStart[g]!);
  }
  const bcOther = new Int32Array(bcStart[n]!);
  const bcTerm = new Int32Array(bcStart[n]!);
  const bcIsX = new Uint8Array(bcStart[n]!);
  for (let i = 0, k = 0; i < n; i++) {
    const g = gvars[i]!;
    for (let j = model.bcostStart[g]!; j < model.bcostStart[g + 1]!; j++) {
      const t = model.bcostList[j]!;
      const term = model.binaryCosts[t]!;
      const isX = term.x === g;
      bcOther[k] = local[isX ? term.y : term.x]!;
      bcTerm[k] = t;
      bcIsX[k] = isX ? 1 : 0;
      k++;
    }
  }
  return {
    gvars,
    off,
    nw,
    cap,
    maxCap,
    maxWords,
    arcStart,
    arcSplit,
    arcTo,
    arcKind,
    arcData,
    nary,
    naryStart,
    naryList,
    degree: Int32Array.from(gvars, (g) => model.degree[g]!),
    ucost,
    corder,
    costVars: Int32Array.from(costVars),
    bcStart,
    bcOther,
    bcTerm,
    bcIsX,
  };
}
