// Random small constraint problems as plain data, a builder for them and an independent brute force.
import fc from 'fast-check';
import { type Model, ModelBuilder } from '../../src/solver/index.ts';

/** One constraint of a random problem, as data. */
export type Spec =
  | { kind: 'unary'; v: number; allowed: readonly number[]; group: string }
  | { kind: 'binary'; x: number; y: number; pairs: readonly string[]; group: string }
  | { kind: 'ne'; x: number; y: number; offset: number; group: string }
  | { kind: 'table'; vars: readonly number[]; tuples: readonly (readonly number[])[]; group: string }
  | { kind: 'nary'; vars: readonly number[]; modulus: number; forbidden: number; group: string }
  | { kind: 'alldiff'; vars: readonly number[]; group: string };

/** A random problem: domain sizes, starting domains, constraints and cost tables. */
export interface Problem {
  readonly sizes: readonly number[];
  readonly initial: readonly (readonly number[] | null)[];
  readonly constraints: readonly Spec[];
  readonly unaryCosts: readonly { v: number; costs: readonly number[] }[];
  readonly binaryCosts: readonly { x: number; y: number; costs: readonly number[] }[];
}

const GROUPS = ['g0', 'g1', 'g2', 'g3'] as const;

function distinctVars(n: number, min: number, max: number): fc.Arbitrary<number[]> {
  return fc.uniqueArray(fc.integer({ min: 0, max: n - 1 }), { minLength: min, maxLength: Math.min(max, n) });
}

/** fast-check arbitrary of problems with up to `maxVars` variables of up to `maxSize` values. */
export function problemArb(maxVars = 5, maxSize = 4, withCosts = false): fc.Arbitrary<Problem> {
  return fc
    .record({
      sizes: fc.array(fc.integer({ min: 1, max: maxSize }), { minLength: 1, maxLength: maxVars }),
      seed: fc.nat(),
    })
    .chain(({ sizes }) => {
      const n = sizes.length;
      const value = (v: number): fc.Arbitrary<number> => fc.integer({ min: 0, max: sizes[v]! - 1 });
      const group = fc.constantFrom(...GROUPS);
      const varArb = fc.integer({ min: 0, max: n - 1 });
      const spec: fc.Arbitrary<Spec>[] = [
        varArb.chain((v) =>
          fc.record({
            kind: fc.constant('unary' as const),
            v: fc.constant(v),
            allowed: fc.uniqueArray(value(v), { maxLength: sizes[v]! }),
            group,
          }),
        ),
      ];
      if (n >= 2) {
        const pair = distinctVars(n, 2, 2);
        spec.push(
          pair.chain(([x, y]) =>
            fc.record({
              kind: fc.constant('binary' as const),
              x: fc.constant(x!),
              y: fc.constant(y!),
              pairs: fc.uniqueArray(
                fc.tuple(value(x!), value(y!)).map(([a, b]) => `${a},${b}`),
                { maxLength: sizes[x!]! * sizes[y!]! },
              ),
              group,
            }),
          ),
          pair.chain(([x, y]) =>
            fc.record({
              kind: fc.constant('ne' as const),
              x: fc.constant(x!),
              y: fc.constant(y!),
              offset: fc.integer({ min: -2, max: 2 }),
              group,
            }),
          ),
          distinctVars(n, 2, 4).chain((vars) =>
            fc.record({ kind: fc.constant('alldiff' as const), vars: fc.constant(vars), group }),
          ),
          distinctVars(n, 1, 3).chain((vars) =>
            fc.record({
              kind: fc.constant('table' as const),
              vars: fc.constant(vars),
              tuples: fc.array(fc.tuple(...vars.map(value)), { maxLength: 8 }),
              group,
            }),
          ),
          distinctVars(n, 1, 4).chain((vars) =>
            fc.record({
              kind: fc.constant('nary' as const),
              vars: fc.constant(vars),
              modulus: fc.integer({ min: 2, max: 4 }),
              forbidden: fc.integer({ min: 0, max: 3 }),
              group,
            }),
          ),
        );
      }
      const costs = withCosts
        ? {
            unaryCosts: fc.array(
              varArb.chain((v) =>
                fc.record({
                  v: fc.constant(v),
                  costs: fc.array(fc.integer({ min: 0, max: 9 }), {
                    minLength: sizes[v]!,
                    maxLength: sizes[v]!,
                  }),
                }),
              ),
              { maxLength: n },
            ),
            binaryCosts:
              n >= 2
                ? fc.array(
                    distinctVars(n, 2, 2).chain(([x, y]) =>
                      fc.record({
                        x: fc.constant(x!),
                        y: fc.constant(y!),
                        costs: fc.array(fc.integer({ min: 0, max: 5 }), {
                          minLength: sizes[x!]! * sizes[y!]!,
                          maxLength: sizes[x!]! * sizes[y!]!,
                        }),
                      }),
                    ),
                    { maxLength: 3 },
                  )
                : fc.constant<{ x: number; y: number; costs: number[] }[]>([]),
          }
        : {
            unaryCosts: fc.constant<{ v: number; costs: number[] }[]>([]),
            binaryCosts: fc.constant<{ x: number; y: number; costs: number[] }[]>([]),
          };
      return fc.record({
        sizes: fc.constant(sizes),
        initial: fc.tuple(
          ...sizes.map((s) =>
            fc.option(fc.uniqueArray(fc.integer({ min: 0, max: s - 1 }), { minLength: 1, maxLength: s }), {
              freq: 4,
            }),
          ),
        ),
        constraints: fc.array(fc.oneof(...spec), { maxLength: 7 }),
        ...costs,
      });
    });
}

function naryAllows(s: { modulus: number; forbidden: number }, values: readonly number[]): boolean {
  // A deterministic, irregular predicate: a weighted sum avoids one residue.
  let h = 0;
  values.forEach((a, i) => {
    h += a * (i + 1) + a * a;
  });
  return h % s.modulus !== s.forbidden % s.modulus;
}

/** Whether one constraint holds for a full assignment (written apart from the engine). */
export function specHolds(c: Spec, a: readonly number[]): boolean {
  switch (c.kind) {
    case 'unary':
      return c.allowed.includes(a[c.v]!);
    case 'binary':
      return c.pairs.includes(`${a[c.x]},${a[c.y]}`);
    case 'ne':
      return a[c.y] !== a[c.x]! + c.offset;
    case 'table':
      return c.tuples.some((t) => t.every((v, i) => v === a[c.vars[i]!]));
    case 'nary':
      return naryAllows(
        c,
        c.vars.map((v) => a[v]!),
      );
    case 'alldiff':
      return new Set(c.vars.map((v) => a[v])).size === c.vars.length;
  }
}

/** Objective of a full assignment. */
export function specCost(p: Problem, a: readonly number[]): number {
  let total = 0;
  for (const u of p.unaryCosts) total += u.costs[a[u.v]!]!;
  for (const b of p.binaryCosts) total += b.costs[a[b.x]! * p.sizes[b.y]! + a[b.y]!]!;
  return total;
}

/** Builds the model of a problem, keeping only constraints whose group passes `keep`. */
export function buildProblem(p: Problem, keep: (group: string) => boolean = () => true): Model {
  const b = new ModelBuilder();
  p.sizes.forEach((s, v) => {
    const init = p.initial[v];
    b.addVariable(`x${v}`, s, init === null || init === undefined ? undefined : init);
  });
  p.constraints.forEach((c, i) => {
    if (!keep(c.group)) return;
    const meta = { name: `${c.kind} ${i}`, group: c.group };
    switch (c.kind) {
      case 'unary':
        b.addUnary(c.v, (x) => c.allowed.includes(x), meta);
        break;
      case 'binary':
        b.addBinary(c.x, c.y, (x, y) => c.pairs.includes(`${x},${y}`), meta);
        break;
      case 'ne':
        b.addNotEqualOffset(c.x, c.y, c.offset, meta);
        break;
      case 'table':
        b.addTable(c.vars, c.tuples, meta);
        break;
      case 'nary':
        b.addNary(c.vars, (values) => naryAllows(c, values), meta);
        break;
      case 'alldiff':
        b.addAllDifferent(c.vars, meta);
        break;
    }
  });
  for (const u of p.unaryCosts) b.addUnaryCost(u.v, (a) => u.costs[a]!);
  for (const bc of p.binaryCosts) b.addBinaryCost(bc.x, bc.y, (x, y) => bc.costs[x * p.sizes[bc.y]! + y]!);
  return b.build();
}

/** Every solution by enumeration, in lexicographic order, for constraints passing `keep`. */
export function bruteForce(p: Problem, keep: (group: string) => boolean = () => true): number[][] {
  const out: number[][] = [];
  const n = p.sizes.length;
  const a = new Array<number>(n).fill(0);
  const active = p.constraints.filter((c) => keep(c.group));
  const rec = (i: number): void => {
    if (i === n) {
      if (active.every((c) => specHolds(c, a))) out.push([...a]);
      return;
    }
    const init = p.initial[i];
    for (let v = 0; v < p.sizes[i]!; v++) {
      if (init !== null && init !== undefined && !init.includes(v)) continue;
      a[i] = v;
      rec(i + 1);
    }
  };
  rec(0);
  return out;
}

/** Number of violated constraints (and values outside the starting domains) of an assignment. */
export function specViolations(p: Problem, a: readonly number[]): number {
  let count = p.constraints.filter((c) => !specHolds(c, a)).length;
  a.forEach((v, i) => {
    const init = p.initial[i];
    if (init !== null && init !== undefined && !init.includes(v)) count++;
  });
  return count;
}
