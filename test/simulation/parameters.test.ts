/** Parameter vectors: declared values, experiment `set`, --set overrides and given values. */
import { describe, expect, it } from 'vitest';
import { UserError } from '../../src/errors.js';
import { parameterVector } from '../../src/simulation/parameters.js';
import { handModel } from './hand-models.js';

function model() {
  const c = handModel({
    states: ['x'],
    params: [
      { name: 'J', value: 3.1e-3 },
      { name: 'K', value: 0.05, free: [1e-3, 1] },
      { name: 'w0', value: 0, free: [-5, 5], perExperiment: true },
    ],
    outputs: ['x'],
    experiments: [{ name: 'steps' }, { name: 'coast', set: { J: 3.4e-3 } }],
    rhs: () => {},
    outputsFn: () => {},
  });
  return c;
}

describe('parameterVector', () => {
  it('declared values, then the experiment set', () => {
    const c = model();
    expect(Array.from(parameterVector(c, 0))).toEqual([3.1e-3, 0.05, 0]);
    expect(Array.from(parameterVector(c, 1))).toEqual([3.4e-3, 0.05, 0]);
  });

  it('values by name and name@experiment; the copy of the simulated experiment wins', () => {
    const c = model();
    const values = { K: 0.052, 'w0@coast': 1.5, 'w0@steps': -0.5, w0: 9 };
    expect(Array.from(parameterVector(c, 0, values))).toEqual([3.1e-3, 0.052, -0.5]);
    expect(Array.from(parameterVector(c, 1, values))).toEqual([3.4e-3, 0.052, 1.5]);
    // plain name applies to the experiment simulated
    expect(parameterVector(c, 1, { w0: 2 })[2]).toBe(2);
  });

  it('overrides (--set) apply after the experiment set, values after overrides', () => {
    const c = model();
    c.model.overrides = { J: 4e-3 };
    expect(parameterVector(c, 1)[0]).toBe(4e-3);
    expect(parameterVector(c, 1, { J: 5e-3 })[0]).toBe(5e-3);
  });

  it('unknown names and experiments are user errors with the nearest names', () => {
    const c = model();
    expect(() => parameterVector(c, 0, { k: 1 })).toThrow(UserError);
    expect(() => parameterVector(c, 0, { k: 1 })).toThrow(/"k" is not a parameter of model hand; nearest: K/);
    expect(() => parameterVector(c, 0, { 'w0@cost': 1 })).toThrow(/"cost" is not an experiment of model hand; nearest: coast/);
    expect(() => parameterVector(c, 0, { K: Number.NaN })).toThrow(/not a finite number/);
  });
});
