import { describe, expect, it } from 'vitest';
import { buildProblem } from '../../src/estimation/problem.js';
import type { ParameterSpec } from '../../src/model/types.js';
import { decayCompiled, decayData, decayModel, decaySimulator } from './helpers/decay-rig.js';

const params: ParameterSpec[] = [
  { name: 'k', kind: 'free', min: 0.01, max: 100, start: 0.7, scale: 'log', perExperiment: false, unit: '1/s', where: {} },
  { name: 'A', kind: 'free', min: -10, max: 10, start: 2, scale: 'linear', perExperiment: true, unit: 'V', where: {} },
  { name: 'c', kind: 'free', min: -1, max: 1, start: 0.1, scale: 'linear', perExperiment: false, unit: 'V', where: {} },
];

function setup() {
  const model = decayModel(params, ['e1', 'e2']);
  const compiled = decayCompiled(model);
  const t = [0, 0.5, 1, 1.5, 2, 3];
  const d1 = decayData(model, 0, t, [2.1, 1.5, NaN, 0.6, 0.5, 0.2]);
  const d2 = decayData(model, 1, t.slice(0, 4), [3.2, 2.3, 1.4, 1.0]);
  return { model, problem: buildProblem(compiled, [d1, d2], [0.3], decaySimulator) };
}

describe('estimation problem assembly', () => {
  it('lays out theta: shared, per-experiment copies and log coordinates', () => {
    const { problem } = setup();
    expect(problem.entries.map((e) => e.name)).toEqual(['k', 'A@e1', 'A@e2', 'c']);
    expect(problem.entries[0].lower).toBeCloseTo(Math.log(0.01), 14);
    const theta = problem.startTheta();
    expect(theta[0]).toBeCloseTo(Math.log(0.7), 14);
    expect(problem.valuesOf(theta)[0]).toBeCloseTo(0.7, 14);
    // 5 non-missing samples in e1 (one NaN skipped) + 4 in e2
    expect(problem.nResiduals).toBe(9);
    // each experiment gets its own copy of A in slot 1
    const th = [Math.log(0.5), 1.5, 2.5, 0.2];
    expect(Array.from(problem.paramsFor(th, 0))).toEqual([0.5, 1.5, 0.2]);
    expect(Array.from(problem.paramsFor(th, 1))).toEqual([0.5, 2.5, 0.2]);
  });

  it('Jacobian equals central finite differences of the residuals (per-experiment and log columns)', () => {
    const { problem } = setup();
    const theta = [Math.log(0.9), 1.8, 3.1, 0.05];
    const rj = problem.residualsAndJacobian(theta)!;
    const r0 = problem.residuals(theta)!;
    expect(Array.from(rj.residuals)).toEqual(Array.from(r0));
    const n = problem.nResiduals;
    const m = theta.length;
    for (let k = 0; k < m; k++) {
      const h = 1e-6 * Math.max(1, Math.abs(theta[k]));
      const tp = theta.slice();
      const tm = theta.slice();
      tp[k] += h;
      tm[k] -= h;
      const rp = problem.residuals(tp)!;
      const rm = problem.residuals(tm)!;
      for (let i = 0; i < n; i++) {
        const fd = (rp[i] - rm[i]) / (2 * h);
        expect(Math.abs(rj.jacobian[i * m + k] - fd)).toBeLessThan(1e-7 * Math.max(1, Math.abs(fd)));
      }
    }
    // The copy of A for e2 has no influence on e1's rows (first 5 residuals).
    for (let i = 0; i < 5; i++) expect(rj.jacobian[i * m + 2]).toBe(0);
    for (let i = 5; i < 9; i++) expect(rj.jacobian[i * m + 1]).toBe(0);
  });

  it('weights residuals by 1/sigma', () => {
    const { problem } = setup();
    const theta = problem.startTheta();
    const r1 = problem.residuals(theta)!;
    problem.setSigmas([0.6]);
    const r2 = problem.residuals(theta)!;
    for (let i = 0; i < r1.length; i++) expect(r2[i]).toBeCloseTo(r1[i] / 2, 12);
  });

  it('reports a failed trial simulation as null, not as an exception', () => {
    const model = decayModel([{ ...params[0], kind: 'free', scale: 'linear', min: -1, max: 1 } as ParameterSpec, params[1], params[2]], ['e1']);
    const problem = buildProblem(decayCompiled(model), [decayData(model, 0, [0, 1], [1, 0.5])], [1], decaySimulator);
    expect(problem.residuals([-0.5, 1, 0])).toBeNull();
    expect(problem.residualsAndJacobian([-0.5, 1, 0])).toBeNull();
    expect(problem.lastFailure?.message).toMatch(/grows/);
  });
});
