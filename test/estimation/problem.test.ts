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

  it('keeps the words and details of the last failed simulation, and evaluates again after it', () => {
    const model = decayModel([{ ...params[0], kind: 'free', scale: 'linear', min: -1, max: 1 } as ParameterSpec, params[1], params[2]], ['e1']);
    const problem = buildProblem(decayCompiled(model), [decayData(model, 0, [0, 1], [1, 0.5])], [1], decaySimulator);
    expect(problem.residuals([-0.5, 1, 0])).toBeNull();
    expect(problem.lastFailure).toEqual({ message: 'state grows without bound', details: { k: -0.5 } });
    // Closed form x = A exp(-k t) + c at k = 0.5, A = 1, c = 0: residual 1 - 1 at t = 0.
    expect(problem.residuals([0.5, 1, 0])![0]).toBe(0);
    // Where every simulation must succeed (the optimum's series), a failure is a RunFailure.
    expect(() => problem.simulateAll([-0.5, 1, 0])).toThrow(/grows without bound/);
  });
});

describe('estimation problem on a compiled ODE model with the real simulator', () => {
  it('sensitivity Jacobian matches finite differences (log-scaled C and R, per-experiment T0)', async () => {
    const { loadModel } = await import('../../src/model/load/index.js');
    const { compileModel } = await import('../../src/model/compile/index.js');
    const { loadAllData } = await import('../../src/estimation/fit/fit-model.js');
    const { parameterVector, trySimulateExperiment } = await import('../../src/simulation/index.js');
    const { tempDir, writeThermalRig } = await import('./helpers/rigs.js');
    const model = loadModel(writeThermalRig(tempDir()));
    const problem = buildProblem(compileModel(model), loadAllData(model), [0.05], { trySimulateExperiment, parameterVector });
    expect(problem.entries.map((e) => `${e.name}:${e.scale}`)).toEqual(['C:log', 'R:log', 'T0@warm:linear', 'T0@cold:linear']);
    const theta = [Math.log(1500), Math.log(0.3), 305, 300];
    const rj = problem.residualsAndJacobian(theta)!;
    const m = theta.length;
    let worst = 0;
    for (let k = 0; k < m; k++) {
      const h = 1e-5 * Math.max(1, Math.abs(theta[k]));
      const tp = theta.slice();
      const tm = theta.slice();
      tp[k] += h;
      tm[k] -= h;
      const rp = problem.residuals(tp)!;
      const rm = problem.residuals(tm)!;
      let scale = 0;
      for (let i = 0; i < problem.nResiduals; i++) scale = Math.max(scale, Math.abs(rj.jacobian[i * m + k]));
      for (let i = 0; i < problem.nResiduals; i++) {
        const fd = (rp[i] - rm[i]) / (2 * h);
        worst = Math.max(worst, Math.abs(rj.jacobian[i * m + k] - fd) / scale);
      }
    }
    // integration tolerance 1e-8 relative: central differences agree to about 1e-5 of the column's size
    console.log(`thermal rig Jacobian vs central differences: largest difference ${worst.toExponential(2)} of the column size`);
    expect(worst).toBeLessThan(1e-4);
    // T0@cold has no influence on the warm experiment's rows (the first 241)
    for (let i = 0; i < 241; i++) expect(rj.jacobian[i * m + 3]).toBe(0);
  });
});
