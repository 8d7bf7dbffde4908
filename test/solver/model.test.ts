import { describe, expect, it } from 'vitest';
import { type Model, ModelBuilder, solve } from '../../src/solver/index.ts';

describe('ModelBuilder', () => {
  it('describes the built model: sizes, names, groups and constraints', () => {
    const b = new ModelBuilder();
    const x = b.addVariable('x', 4, [1, 3]);
    const y = b.addVariable('y', 2);
    b.addNotEqual(x, y, { name: 'differ', group: 'people' });
    b.addUnary(y, (v) => v === 1, { name: 'y is one' });
    b.addTable([x, y], [[3, 1]], { name: 'pairs', group: 'people' });
    const m: Model = b.build();
    expect(m.variableCount).toBe(2);
    expect(m.variableNames).toEqual(['x', 'y']);
    expect(m.domainSizes).toEqual([4, 2]);
    expect(m.groups).toEqual(['people', 'y is one']);
    expect(m.constraintCount).toBe(3);
    expect(m.constraint(0)).toEqual({ name: 'differ', group: 'people', kind: 'not-equal', vars: [0, 1] });
    expect(m.constraint(2)).toEqual({ name: 'pairs', group: 'people', kind: 'table', vars: [0, 1] });
    expect(m.hasCosts).toBe(false);
    expect(solve(m, { mode: { kind: 'all' } }).solutions).toEqual([[3, 1]]);
  });

  it('never lets callers change a built model through the builder or the inputs', () => {
    const b = new ModelBuilder();
    const allowed = [0, 1];
    b.addVariable('x', 3, allowed);
    const m = b.build();
    allowed.push(2);
    expect(() => b.addVariable('late', 2)).toThrow(/already built/);
    expect(solve(m, { mode: { kind: 'all' } }).solutions).toEqual([[0], [1]]);
    expect(Object.isFrozen(m)).toBe(true);
  });

  it.each([
    ['a size of 0', (b: ModelBuilder) => b.addVariable('x', 0), /size must be an integer from 1/],
    [
      'an initial value out of range',
      (b: ModelBuilder) => b.addVariable('x', 3, [3]),
      /initial value 3 is outside 0..2/,
    ],
    [
      'an unknown variable',
      (b: ModelBuilder) => b.addNotEqual(0, 7, { name: 'n' }),
      /variable 7 does not exist/,
    ],
    [
      'a binary constraint on one variable',
      (b: ModelBuilder) => b.addNotEqual(0, 0, { name: 'n' }),
      /both ends/,
    ],
    [
      'a repeated variable in a scope',
      (b: ModelBuilder) => b.addAllDifferent([0, 0], { name: 'ad' }),
      /appears twice/,
    ],
    [
      'a table tuple of the wrong arity',
      (b: ModelBuilder) => b.addTable([0, 1], [[1]], { name: 't' }),
      /tuple 0 has 1 values, expected 2/,
    ],
    [
      'a table value outside a domain',
      (b: ModelBuilder) => b.addTable([0, 1], [[0, 9]], { name: 't' }),
      /value 9 is outside the domain of "b"/,
    ],
    [
      'a negative cost',
      (b: ModelBuilder) => b.addUnaryCost(0, () => -1),
      /costs must be finite numbers >= 0/,
    ],
    ['a missing constraint name', (b: ModelBuilder) => b.addNotEqual(0, 1, { name: '' }), /needs meta.name/],
  ])('refuses %s with a clear reason', (_label, act, message) => {
    const b = new ModelBuilder();
    b.addVariable('a', 3);
    b.addVariable('b', 3);
    expect(() => act(b)).toThrow(message);
  });

  it('refuses a model object it did not build', () => {
    const fake = { variableCount: 0, groups: [] } as unknown as Model;
    expect(() => solve(fake)).toThrow(/not made by ModelBuilder/);
  });

  it('refuses unknown option values', () => {
    const b = new ModelBuilder();
    b.addVariable('x', 2);
    const m = b.build();
    expect(() => solve(m, { propagation: 'strong' as never })).toThrow(/propagation must be/);
    expect(() => solve(m, { mode: { kind: 'best', k: 0 } })).toThrow(/mode.k must be an integer >= 1/);
  });
});
