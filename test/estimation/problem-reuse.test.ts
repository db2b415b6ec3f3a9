/** The estimation problem keeps the solver's current point's simulations and rescales for new weights. */
import { resultOrThrow } from '../../src/simulation/outcome.js';
import { Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { buildProblem } from '../../src/estimation/problem.js';
import type { ParameterSpec } from '../../src/model/types.js';
import { decayCompiled, decayData, decayModel, decaySimulator } from './helpers/decay-rig.js';

const params: ParameterSpec[] = [
  { name: 'k', kind: 'free', min: 0.01, max: 100, start: 0.7, scale: 'log', perExperiment: false, unit: '1/s', where: {} },
  { name: 'A', kind: 'free', min: -10, max: 10, start: 2, scale: 'linear', perExperiment: false, unit: 'V', where: {} },
  { name: 'c', kind: 'fixed', value: 0.1, unit: 'V', where: {} },
];

function setup() {
  const model = decayModel(params, ['e1']);
  const d = decayData(model, 0, [0, 0.5, 1, 1.5, 2, 3], [2.1, 1.5, NaN, 0.6, 0.5, 0.2]);
  return buildProblem(decayCompiled(model), [d], [0.3], decaySimulator);
}

describe('estimation problem: reuse of work', () => {
  it('simulateAll at the point last evaluated with and without Jacobian costs no simulation, elsewhere it simulates', () => {
    const problem = setup();
    const th = problem.startTheta();
    problem.residualsAndJacobian(th);
    problem.residuals(th);
    const n = problem.counters.simulations;
    const kept = problem.simulateAll(th);
    expect(problem.counters.simulations).toBe(n);
    // Same outputs as a fresh simulation there (closed form: x = A exp(-k t) + c).
    const fresh = resultOrThrow(decaySimulator.trySimulateExperiment(problem.compiled, problem.fitData[0], problem.paramsFor(th, 0)));
    expect(Array.from(kept[0].outputs[0])).toEqual(Array.from(fresh.outputs[0]));
    // A trial point evaluated plainly but never taken is not kept.
    const other = [th[0] + 0.1, th[1]];
    problem.residuals(other);
    problem.simulateAll(other);
    expect(problem.counters.simulations).toBe(n + 2);
  });

  it('reweighted residuals and Jacobian equal a fresh evaluation at the new sigma', () => {
    const problem = setup();
    const th = problem.startTheta();
    const at03 = problem.residualsAndJacobian(th)!;
    const J = new Matrix(at03.residuals.length, 2);
    for (let i = 0; i < J.rows; i++) for (let k = 0; k < 2; k++) J.set(i, k, at03.jacobian[i * 2 + k]);
    problem.setSigmas([0.12]);
    const re = problem.reweighted(at03.residuals, J, [0.3]);
    const fresh = problem.residualsAndJacobian(th)!;
    for (let i = 0; i < J.rows; i++) {
      expect(re.residuals[i]).toBeCloseTo(fresh.residuals[i], 12);
      for (let k = 0; k < 2; k++) expect(re.jacobian.get(i, k)).toBeCloseTo(fresh.jacobian[i * 2 + k], 12);
    }
  });
});
