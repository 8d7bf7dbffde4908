// The model: variables with finite domains 0..size-1 and typed constraints, compiled once into flat
// arrays (arcs, indexes, bitsets) that the search reads without allocating.
import { SlotwrightError } from '../errors.ts';
import { fullBitset, wordsFor } from './bitset.ts';

/** Name of a constraint and the group it is blamed under in conflicts (group defaults to name). */
export interface ConstraintMeta {
  readonly name: string;
  readonly group?: string;
}

/** Kind of a constraint, as reported by `Model.constraints`. */
export type ConstraintKind = 'unary' | 'binary' | 'not-equal' | 'table' | 'nary' | 'all-different';

/** A read-only description of one constraint of a built model. */
export interface ConstraintInfo {
  readonly name: string;
  readonly group: string;
  readonly kind: ConstraintKind;
  readonly vars: readonly number[];
}

/** A built, immutable model; pass it to `solve`, `minimalConflict` or `improve`. */
export interface Model {
  readonly variableCount: number;
  /** Distinct constraint groups in order of first use. */
  readonly groups: readonly string[];
  /** Variable names as given to `addVariable`. */
  readonly variableNames: readonly string[];
  /** Domain size of each variable (values are 0..size-1). */
  readonly domainSizes: readonly number[];
  /** Number of constraints (every kind). */
  readonly constraintCount: number;
  /** Whether the model has cost terms (an objective). */
  readonly hasCosts: boolean;
  /** Describes constraint `id` (0..constraintCount-1). */
  constraint(id: number): ConstraintInfo;
}

/** Arc kinds: not-equal with offset, predicate with cached support rows, predicate evaluated. */
export const ARC_NE = 0;
/** Binary predicate whose support rows are cached lazily. */
export const ARC_ROWS = 1;
/** Binary predicate too wide to cache; evaluated value by value. */
export const ARC_EVAL = 2;

/** N-ary constraint kinds. */
export const NARY_TABLE = 0;
/** N-ary predicate. */
export const NARY_PRED = 1;
/** All-different. */
export const NARY_ALLDIFF = 2;

const K_UNARY = 0;
const K_BINARY = 1;
const K_NE = 2;
const K_TABLE = 3;
const K_NARY = 4;
const K_ALLDIFF = 5;
const KIND_NAMES: readonly ConstraintKind[] = [
  'unary',
  'binary',
  'not-equal',
  'table',
  'nary',
  'all-different',
];

// Above this many cached bits per direction a binary predicate is evaluated instead of cached.
const MAX_ROW_BITS = 1 << 26;

/** Lazily computed support bitsets of one direction of a binary predicate. */
export class SupportRows {
  readonly #fn: (a: number, b: number) => boolean;
  readonly #swap: boolean;
  readonly #sizeTo: number;
  readonly wordsTo: number;
  readonly #sizeFrom: number;
  #rows: Uint32Array | null = null;
  #done: Uint8Array | null = null;

  /** Direction `from -> to`; `swap` means the predicate takes (to, from). */
  constructor(fn: (a: number, b: number) => boolean, swap: boolean, sizeFrom: number, sizeTo: number) {
    this.#fn = fn;
    this.#swap = swap;
    this.#sizeFrom = sizeFrom;
    this.#sizeTo = sizeTo;
    this.wordsTo = wordsFor(sizeTo);
  }

  /** Whether (from = a, to = b) is allowed. */
  allows(a: number, b: number): boolean {
    return this.#swap ? this.#fn(b, a) === true : this.#fn(a, b) === true;
  }

  /** Offset in `words` of the row of `a` (values of `to` compatible with from = a), computed on first use. */
  row(a: number): number {
    if (this.#rows === null) {
      this.#rows = new Uint32Array(this.#sizeFrom * this.wordsTo);
      this.#done = new Uint8Array(this.#sizeFrom);
    }
    const off = a * this.wordsTo;
    if (this.#done![a] === 0) {
      const rows = this.#rows;
      for (let b = 0; b < this.#sizeTo; b++) {
        if (this.allows(a, b)) rows[off + (b >>> 5)]! |= 1 << (b & 31);
      }
      this.#done![a] = 1;
    }
    return off;
  }

  /** The row storage; valid after a call to `row`. */
  get words(): Uint32Array {
    return this.#rows!;
  }
}

/** A compiled n-ary constraint (table, predicate or all-different). */
export interface NaryConstraint {
  readonly kind: number;
  readonly id: number;
  readonly vars: Int32Array;
  /** Flat tuples (arity values each) for tables. */
  readonly tuples: Int32Array | null;
  readonly fn: ((values: readonly number[]) => boolean) | null;
}

/** A binary cost term (both directions are indexed). */
export interface BinaryCost {
  readonly x: number;
  readonly y: number;
  readonly fn: (a: number, b: number) => number;
}

class GrowInt32 {
  data = new Int32Array(64);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = new Int32Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  trimmed(): Int32Array {
    return this.data.slice(0, this.length);
  }
}

function invalid(message: string, details?: Readonly<Record<string, unknown>>): SlotwrightError {
  return new SlotwrightError('model_invalid', message, details === undefined ? {} : { details });
}

/** The compiled model. Fields are read by the solver's own files only. */
export class CompiledModel implements Model {
  readonly variableCount: number;
  readonly groups: readonly string[];
  readonly variableNames: readonly string[];
  readonly domainSizes: readonly number[];
  readonly constraintCount: number;
  readonly hasCosts: boolean;
  /** Domain size per variable. */
  readonly sizes: Int32Array;
  /** Starting domain per variable. */
  readonly initial: readonly Uint32Array[];
  /** Per constraint: kind code, group index, index within its kind's storage. */
  readonly consKind: Uint8Array;
  readonly consGroup: Int32Array;
  readonly consRef: Int32Array;
  readonly consName: readonly string[];
  /** Unary constraints: variable, allowed bitset, constraint id. */
  readonly unaryVar: Int32Array;
  readonly unaryBits: readonly Uint32Array[];
  readonly unaryCons: Int32Array;
  /** Binary constraints (not-equal and predicate): endpoints, constraint id, first arc index. */
  readonly binX: Int32Array;
  readonly binY: Int32Array;
  readonly binShift: Int32Array;
  readonly binCons: Int32Array;
  readonly binArc: Int32Array;
  /** Arcs in CSR form by source variable. */
  readonly arcStart: Int32Array;
  readonly arcTo: Int32Array;
  readonly arcKind: Uint8Array;
  readonly arcData: Int32Array;
  readonly arcCons: Int32Array;
  readonly rows: readonly SupportRows[];
  /** N-ary constraints and their CSR index by variable. */
  readonly nary: readonly NaryConstraint[];
  readonly naryStart: Int32Array;
  readonly naryList: Int32Array;
  /** Distinct neighbours per variable (for the MRV tie-break). */
  readonly degree: Int32Array;
  /** Unary cost per variable and value (null when none), and values sorted by that cost. */
  readonly unaryCost: readonly (Float64Array | null)[];
  readonly costOrder: readonly (Int32Array | null)[];
  readonly binaryCosts: readonly BinaryCost[];
  /** Binary cost terms by variable: CSR of term indices. */
  readonly bcostStart: Int32Array;
  readonly bcostList: Int32Array;

  /** Built by `ModelBuilder.build`. */
  constructor(parts: {
    names: string[];
    sizes: number[];
    initial: Uint32Array[];
    consKind: GrowInt32;
    consGroup: GrowInt32;
    consRef: GrowInt32;
    consName: string[];
    groups: string[];
    unaryVar: GrowInt32;
    unaryBits: Uint32Array[];
    unaryCons: GrowInt32;
    binX: GrowInt32;
    binY: GrowInt32;
    binShift: GrowInt32;
    binCons: GrowInt32;
    binFn: ((a: number, b: number) => boolean)[];
    binFnIndex: GrowInt32;
    nary: NaryConstraint[];
    unaryCost: (Float64Array | null)[];
    binaryCosts: BinaryCost[];
  }) {
    const n = parts.names.length;
    this.variableCount = n;
    this.variableNames = Object.freeze([...parts.names]);
    this.domainSizes = Object.freeze([...parts.sizes]);
    this.sizes = Int32Array.from(parts.sizes);
    this.initial = Object.freeze(parts.initial.map((b) => b.slice()));
    this.groups = Object.freeze([...parts.groups]);
    this.consKind = Uint8Array.from(parts.consKind.trimmed());
    this.consGroup = parts.consGroup.trimmed();
    this.consRef = parts.consRef.trimmed();
    this.consName = parts.consName;
    this.constraintCount = this.consKind.length;
    this.unaryVar = parts.unaryVar.trimmed();
    this.unaryBits = parts.unaryBits;
    this.unaryCons = parts.unaryCons.trimmed();
    this.binX = parts.binX.trimmed();
    this.binY = parts.binY.trimmed();
    this.binShift = parts.binShift.trimmed();
    this.binCons = parts.binCons.trimmed();
    const binFnIndex = parts.binFnIndex.trimmed();
    const m = this.binX.length;

    // Arcs: two per binary constraint, grouped by source variable.
    const arcStart = new Int32Array(n + 1);
    for (let i = 0; i < m; i++) {
      arcStart[this.binX[i]! + 1]!++;
      arcStart[this.binY[i]! + 1]!++;
    }
    for (let v = 0; v < n; v++) arcStart[v + 1]! += arcStart[v]!;
    const fill = arcStart.slice(0, n);
    const arcTo = new Int32Array(2 * m);
    const arcKind = new Uint8Array(2 * m);
    const arcData = new Int32Array(2 * m);
    const arcCons = new Int32Array(2 * m);
    const binArc = new Int32Array(m);
    const rows: SupportRows[] = [];
    for (let i = 0; i < m; i++) {
      const x = this.binX[i]!;
      const y = this.binY[i]!;
      const c = this.binCons[i]!;
      const fi = binFnIndex[i]!;
      const ax = fill[x]!++;
      const ay = fill[y]!++;
      binArc[i] = ax;
      arcTo[ax] = y;
      arcTo[ay] = x;
      arcCons[ax] = c;
      arcCons[ay] = c;
      if (fi < 0) {
        // y != x + shift, seen from y: x != y - shift.
        arcKind[ax] = ARC_NE;
        arcKind[ay] = ARC_NE;
        arcData[ax] = this.binShift[i]!;
        arcData[ay] = -this.binShift[i]!;
      } else {
        const fn = parts.binFn[fi]!;
        const sx = this.sizes[x]!;
        const sy = this.sizes[y]!;
        const kx = sx * wordsFor(sy) * 32 <= MAX_ROW_BITS ? ARC_ROWS : ARC_EVAL;
        const ky = sy * wordsFor(sx) * 32 <= MAX_ROW_BITS ? ARC_ROWS : ARC_EVAL;
        arcKind[ax] = kx;
        arcKind[ay] = ky;
        arcData[ax] = rows.length;
        rows.push(new SupportRows(fn, false, sx, sy));
        arcData[ay] = rows.length;
        rows.push(new SupportRows(fn, true, sy, sx));
      }
    }
    this.arcStart = arcStart;
    this.arcTo = arcTo;
    this.arcKind = arcKind;
    this.arcData = arcData;
    this.arcCons = arcCons;
    this.binArc = binArc;
    this.rows = rows;

    this.nary = parts.nary;
    const naryStart = new Int32Array(n + 1);
    for (const c of this.nary) for (const v of c.vars) naryStart[v + 1]!++;
    for (let v = 0; v < n; v++) naryStart[v + 1]! += naryStart[v]!;
    const naryList = new Int32Array(naryStart[n]!);
    const nfill = naryStart.slice(0, n);
    this.nary.forEach((c, i) => {
      for (const v of c.vars) naryList[nfill[v]!++] = i;
    });
    this.naryStart = naryStart;
    this.naryList = naryList;

    this.unaryCost = parts.unaryCost;
    this.costOrder = parts.unaryCost.map((costs) => {
      if (costs === null) return null;
      const order = new Int32Array(costs.length);
      for (let i = 0; i < order.length; i++) order[i] = i;
      order.sort((a, b) => costs[a]! - costs[b]! || a - b);
      return order;
    });
    this.binaryCosts = parts.binaryCosts;
    const bcostStart = new Int32Array(n + 1);
    for (const t of this.binaryCosts) {
      bcostStart[t.x + 1]!++;
      bcostStart[t.y + 1]!++;
    }
    for (let v = 0; v < n; v++) bcostStart[v + 1]! += bcostStart[v]!;
    const bcostList = new Int32Array(bcostStart[n]!);
    const bfill = bcostStart.slice(0, n);
    this.binaryCosts.forEach((t, i) => {
      bcostList[bfill[t.x]!++] = i;
      bcostList[bfill[t.y]!++] = i;
    });
    this.bcostStart = bcostStart;
    this.bcostList = bcostList;
    this.hasCosts = this.binaryCosts.length > 0 || this.unaryCost.some((c) => c !== null);

    // Distinct neighbours, with a marker array instead of sets.
    const degree = new Int32Array(n);
    const mark = new Int32Array(n).fill(-1);
    for (let v = 0; v < n; v++) {
      mark[v] = v;
      let d = 0;
      for (let a = arcStart[v]!; a < arcStart[v + 1]!; a++) {
        const w = arcTo[a]!;
        if (mark[w] !== v) {
          mark[w] = v;
          d++;
        }
      }
      for (let k = naryStart[v]!; k < naryStart[v + 1]!; k++) {
        for (const w of this.nary[naryList[k]!]!.vars) {
          if (mark[w] !== v) {
            mark[w] = v;
            d++;
          }
        }
      }
      degree[v] = d;
    }
    this.degree = degree;
    Object.freeze(this);
  }

  /** Describes constraint `id`. */
  constraint(id: number): ConstraintInfo {
    if (!Number.isInteger(id) || id < 0 || id >= this.constraintCount) {
      throw invalid(`constraint id ${id} is out of range 0..${this.constraintCount - 1}`);
    }
    const kind = this.consKind[id]!;
    const ref = this.consRef[id]!;
    let vars: number[];
    if (kind === K_UNARY) vars = [this.unaryVar[ref]!];
    else if (kind === K_BINARY || kind === K_NE) vars = [this.binX[ref]!, this.binY[ref]!];
    else vars = [...this.nary[ref]!.vars];
    return {
      name: this.consName[id]!,
      group: this.groups[this.consGroup[id]!]!,
      kind: KIND_NAMES[kind]!,
      vars,
    };
  }

  /** Whether constraint `id` holds for a complete assignment. */
  holds(id: number, values: ArrayLike<number>, scratch: number[]): boolean {
    const kind = this.consKind[id]!;
    const ref = this.consRef[id]!;
    if (kind === K_UNARY) {
      const a = values[this.unaryVar[ref]!]!;
      return ((this.unaryBits[ref]![a >>> 5]! >>> (a & 31)) & 1) === 1;
    }
    if (kind === K_NE) return values[this.binY[ref]!] !== values[this.binX[ref]!]! + this.binShift[ref]!;
    if (kind === K_BINARY) {
      const arc = this.binArc[ref]!;
      return this.rows[this.arcData[arc]!]!.allows(values[this.binX[ref]!]!, values[this.binY[ref]!]!);
    }
    const c = this.nary[ref]!;
    const k = c.vars.length;
    if (c.kind === NARY_ALLDIFF) {
      for (let i = 0; i < k; i++) {
        for (let j = i + 1; j < k; j++) if (values[c.vars[i]!] === values[c.vars[j]!]) return false;
      }
      return true;
    }
    if (c.kind === NARY_TABLE) {
      const t = c.tuples!;
      for (let s = 0; s < t.length; s += k) {
        let ok = true;
        for (let i = 0; i < k; i++) {
          if (t[s + i] !== values[c.vars[i]!]) {
            ok = false;
            break;
          }
        }
        if (ok) return true;
      }
      return false;
    }
    scratch.length = k;
    for (let i = 0; i < k; i++) scratch[i] = values[c.vars[i]!]!;
    return c.fn!(scratch) === true;
  }

  /** Objective of a complete assignment (0 without cost terms). */
  costOf(values: ArrayLike<number>): number {
    let total = 0;
    for (let v = 0; v < this.variableCount; v++) {
      const c = this.unaryCost[v];
      if (c) total += c[values[v]!]!;
    }
    for (const t of this.binaryCosts) total += checkedCost(t.fn(values[t.x]!, values[t.y]!));
    return total;
  }

  /** Whether value a is in the starting domain of v. */
  inDomain(v: number, a: number): boolean {
    return a >= 0 && a < this.sizes[v]! && ((this.initial[v]![a >>> 5]! >>> (a & 31)) & 1) === 1;
  }

  /** Constraint ids that touch variable v (unary, binary and n-ary), built on demand. */
  constraintsOf(v: number): Int32Array {
    let index = this.#cache.byVar;
    if (index === null) {
      const n = this.variableCount;
      const start = new Int32Array(n + 1);
      const each = (fn: (id: number, v: number) => void): void => {
        for (let i = 0; i < this.unaryVar.length; i++) fn(this.unaryCons[i]!, this.unaryVar[i]!);
        for (let i = 0; i < this.binX.length; i++) {
          fn(this.binCons[i]!, this.binX[i]!);
          fn(this.binCons[i]!, this.binY[i]!);
        }
        for (const c of this.nary) for (const w of c.vars) fn(c.id, w);
      };
      each((_id, w) => {
        start[w + 1]!++;
      });
      for (let w = 0; w < n; w++) start[w + 1]! += start[w]!;
      const list = new Int32Array(start[n]!);
      const fill = start.slice(0, n);
      each((id, w) => {
        list[fill[w]!++] = id;
      });
      index = { start, list };
      this.#cache.byVar = index;
    }
    return index.list.subarray(index.start[v]!, index.start[v + 1]!);
  }

  // A memo of derived data; the model stays observably immutable.
  readonly #cache: { byVar: { start: Int32Array; list: Int32Array } | null } = { byVar: null };
}

/** Checks a cost value returned by a cost function. */
export function checkedCost(c: number): number {
  if (!(c >= 0) || !Number.isFinite(c)) {
    throw invalid(`a cost function returned ${c}; costs must be finite numbers >= 0`);
  }
  return c;
}

/** Returns the compiled form of a model made by `ModelBuilder`, or throws. */
export function compiled(model: Model): CompiledModel {
  if (!(model instanceof CompiledModel)) {
    throw invalid('the model was not made by ModelBuilder.build(); build models with ModelBuilder');
  }
  return model;
}

/** Collects variables and constraints; `build()` compiles them into an immutable `Model`. */
export class ModelBuilder {
  readonly #names: string[] = [];
  readonly #sizes: number[] = [];
  readonly #initial: Uint32Array[] = [];
  readonly #consKind = new GrowInt32();
  readonly #consGroup = new GrowInt32();
  readonly #consRef = new GrowInt32();
  readonly #consName: string[] = [];
  readonly #groups: string[] = [];
  readonly #groupIndex = new Map<string, number>();
  readonly #unaryVar = new GrowInt32();
  readonly #unaryBits: Uint32Array[] = [];
  readonly #unaryCons = new GrowInt32();
  readonly #binX = new GrowInt32();
  readonly #binY = new GrowInt32();
  readonly #binShift = new GrowInt32();
  readonly #binCons = new GrowInt32();
  readonly #binFnIndex = new GrowInt32();
  readonly #binFn: ((a: number, b: number) => boolean)[] = [];
  readonly #nary: NaryConstraint[] = [];
  readonly #unaryCost: (Float64Array | null)[] = [];
  readonly #binaryCosts: BinaryCost[] = [];
  #built = false;
  #lastMeta: ConstraintMeta | null = null;
  #lastName = '';
  #lastGroup: string | undefined = undefined;
  #lastIndex = 0;

  /** Adds a variable with values 0..size-1 (restricted to `initial` when given); returns its index. */
  addVariable(name: string, size: number, initial?: Iterable<number>): number {
    this.#open();
    if (!Number.isInteger(size) || size < 1 || size > 1 << 24) {
      throw invalid(`variable "${name}": size must be an integer from 1 to ${1 << 24}, got ${size}`);
    }
    let bits: Uint32Array;
    if (initial === undefined) bits = fullBitset(size);
    else {
      bits = new Uint32Array(wordsFor(size));
      for (const a of initial) {
        if (!Number.isInteger(a) || a < 0 || a >= size) {
          throw invalid(`variable "${name}": initial value ${a} is outside 0..${size - 1}`);
        }
        bits[a >>> 5]! |= 1 << (a & 31);
      }
    }
    this.#names.push(name);
    this.#sizes.push(size);
    this.#initial.push(bits);
    this.#unaryCost.push(null);
    return this.#names.length - 1;
  }

  /** Restricts v to the values `allowed` accepts (evaluated once per value here). */
  addUnary(v: number, allowed: (value: number) => boolean, meta: ConstraintMeta): void {
    this.#var(v, meta);
    const size = this.#sizes[v]!;
    const bits = new Uint32Array(wordsFor(size));
    for (let a = 0; a < size; a++) if (allowed(a) === true) bits[a >>> 5]! |= 1 << (a & 31);
    const id = this.#constraint(K_UNARY, this.#unaryVar.length, meta);
    this.#unaryVar.push(v);
    this.#unaryBits.push(bits);
    this.#unaryCons.push(id);
  }

  /** Pairs (x = a, y = b) must satisfy `allowed(a, b)`. */
  addBinary(x: number, y: number, allowed: (a: number, b: number) => boolean, meta: ConstraintMeta): void {
    this.#pair(x, y, meta);
    this.#binFnIndex.push(this.#binFn.length);
    this.#binFn.push(allowed);
    this.#pushBinary(K_BINARY, x, y, 0, meta);
  }

  /** x and y take different values. */
  addNotEqual(x: number, y: number, meta: ConstraintMeta): void {
    this.addNotEqualOffset(x, y, 0, meta);
  }

  /** value(y) != value(x) + offset (diagonals of n-queens, fixed gaps); a fast path like not-equal. */
  addNotEqualOffset(x: number, y: number, offset: number, meta: ConstraintMeta): void {
    this.#pair(x, y, meta);
    if (!Number.isInteger(offset)) throw invalid(`constraint "${meta.name}": offset must be an integer`);
    this.#binFnIndex.push(-1);
    this.#pushBinary(K_NE, x, y, offset, meta);
  }

  /** The values of `vars` must equal one of `tuples` (explicit allowed tuples). */
  addTable(vars: readonly number[], tuples: readonly (readonly number[])[], meta: ConstraintMeta): void {
    this.#scope(vars, meta);
    const k = vars.length;
    const flat = new Int32Array(tuples.length * k);
    tuples.forEach((t, i) => {
      if (t.length !== k) {
        throw invalid(`table "${meta.name}": tuple ${i} has ${t.length} values, expected ${k}`);
      }
      for (let j = 0; j < k; j++) {
        const a = t[j]!;
        if (!Number.isInteger(a) || a < 0 || a >= this.#sizes[vars[j]!]!) {
          throw invalid(
            `table "${meta.name}": tuple ${i} value ${a} is outside the domain of "${this.#names[vars[j]!]}"`,
          );
        }
        flat[i * k + j] = a;
      }
    });
    this.#pushNary(NARY_TABLE, K_TABLE, vars, flat, null, meta);
  }

  /** `allowed(values)` must hold; checked when all are fixed, forward-checks the last open variable. */
  addNary(
    vars: readonly number[],
    allowed: (values: readonly number[]) => boolean,
    meta: ConstraintMeta,
  ): void {
    this.#scope(vars, meta);
    this.#pushNary(NARY_PRED, K_NARY, vars, null, allowed, meta);
  }

  /** All of `vars` take pairwise different values. */
  addAllDifferent(vars: readonly number[], meta: ConstraintMeta): void {
    this.#scope(vars, meta);
    this.#pushNary(NARY_ALLDIFF, K_ALLDIFF, vars, null, null, meta);
  }

  /** Adds cost(value) of v to the objective (minimised; costs must be >= 0). */
  addUnaryCost(v: number, cost: (value: number) => number): void {
    this.#var(v, { name: 'unary cost' });
    const size = this.#sizes[v]!;
    const table = this.#unaryCost[v] ?? new Float64Array(size);
    for (let a = 0; a < size; a++) table[a]! += checkedCost(cost(a));
    this.#unaryCost[v] = table;
  }

  /** Adds cost(a, b) of (x, y) to the objective (costs must be >= 0). */
  addBinaryCost(x: number, y: number, cost: (a: number, b: number) => number): void {
    this.#pair(x, y, { name: 'binary cost' });
    this.#binaryCosts.push({ x, y, fn: cost });
  }

  /** Compiles the model; the builder cannot be used afterwards. */
  build(): Model {
    this.#open();
    this.#built = true;
    return new CompiledModel({
      names: this.#names,
      sizes: this.#sizes,
      initial: this.#initial,
      consKind: this.#consKind,
      consGroup: this.#consGroup,
      consRef: this.#consRef,
      consName: this.#consName,
      groups: this.#groups,
      unaryVar: this.#unaryVar,
      unaryBits: this.#unaryBits,
      unaryCons: this.#unaryCons,
      binX: this.#binX,
      binY: this.#binY,
      binShift: this.#binShift,
      binCons: this.#binCons,
      binFn: this.#binFn,
      binFnIndex: this.#binFnIndex,
      nary: this.#nary,
      unaryCost: this.#unaryCost,
      binaryCosts: this.#binaryCosts,
    });
  }

  #open(): void {
    if (this.#built) throw invalid('this ModelBuilder was already built; start a new ModelBuilder');
  }

  #var(v: number, meta: ConstraintMeta): void {
    this.#open();
    if (!Number.isInteger(v) || v < 0 || v >= this.#names.length) {
      throw invalid(`constraint "${meta.name}": variable ${v} does not exist (have ${this.#names.length})`);
    }
  }

  #pair(x: number, y: number, meta: ConstraintMeta): void {
    this.#var(x, meta);
    this.#var(y, meta);
    if (x === y) throw invalid(`constraint "${meta.name}": both ends are variable ${x}; use addUnary`);
  }

  #scope(vars: readonly number[], meta: ConstraintMeta): void {
    if (vars.length === 0) throw invalid(`constraint "${meta.name}": needs at least one variable`);
    const seen = new Set<number>();
    for (const v of vars) {
      this.#var(v, meta);
      if (seen.has(v)) throw invalid(`constraint "${meta.name}": variable ${v} appears twice`);
      seen.add(v);
    }
  }

  #constraint(kind: number, ref: number, meta: ConstraintMeta): number {
    let g: number;
    // Large models pass one meta object for many constraints: remember the last one's group.
    if (meta === this.#lastMeta && meta.name === this.#lastName && meta.group === this.#lastGroup) {
      g = this.#lastIndex;
    } else {
      if (typeof meta?.name !== 'string' || meta.name === '') {
        throw invalid('every constraint needs meta.name (a non-empty string)');
      }
      const group = meta.group ?? meta.name;
      let found = this.#groupIndex.get(group);
      if (found === undefined) {
        found = this.#groups.length;
        this.#groups.push(group);
        this.#groupIndex.set(group, found);
      }
      g = found;
      this.#lastMeta = meta;
      this.#lastName = meta.name;
      this.#lastGroup = meta.group;
      this.#lastIndex = g;
    }
    const id = this.#consKind.length;
    this.#consKind.push(kind);
    this.#consGroup.push(g);
    this.#consRef.push(ref);
    this.#consName.push(meta.name);
    return id;
  }

  #pushBinary(kind: number, x: number, y: number, shift: number, meta: ConstraintMeta): void {
    const id = this.#constraint(kind, this.#binX.length, meta);
    this.#binX.push(x);
    this.#binY.push(y);
    this.#binShift.push(shift);
    this.#binCons.push(id);
  }

  #pushNary(
    kind: number,
    consKind: number,
    vars: readonly number[],
    tuples: Int32Array | null,
    fn: ((values: readonly number[]) => boolean) | null,
    meta: ConstraintMeta,
  ): void {
    const id = this.#constraint(consKind, this.#nary.length, meta);
    this.#nary.push({ kind, id, vars: Int32Array.from(vars), tuples, fn });
  }
}
