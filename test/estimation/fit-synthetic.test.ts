/**
 * Fits of synthetic rigs with known truth (seeded data generated in the tests): every free parameter
 * must lie inside its 95 % interval, the noise level must be recovered, and a model that only
 * determines a ratio must say so.
 */
import { describe, expect, it } from 'vitest';
import { fitModel } from '../../src/estimation/fit/fit-model.js';
import { loadModel } from '../../src/model/load/index.js';
import { THERMAL_TRUTH, tempDir, writeSpringRig, writeThermalRig } from './helpers/rigs.js';

function report(label: string, r: { iterations: number; simulations: number; sensitivitySimulations?: number; wallSeconds: number }) {
  // measured numbers for the report (printed, not asserted)
  console.log(`${label}: ${r.iterations} iterations, ${r.simulations} simulations + ${r.sensitivitySimulations} with sensitivities, ${r.wallSeconds.toFixed(3)} s`);
}

describe('fit of a heated block with a per-experiment initial temperature (estimated noise)', () => {
  const dir = tempDir();
  const file = writeThermalRig(dir);
  const outcome = fitModel(loadModel(file));
  const r = outcome.result;
  report('thermal rig', r);

  it('converges and every true value lies in its 95 % interval', () => {
    expect(r.status).toBe('converged');
    const free = r.parameters.filter((p) => p.status === 'free');
    expect(free.map((p) => p.name)).toEqual(['C', 'R', 'T0@warm', 'T0@cold']);
    for (const p of free) {
      const truth = THERMAL_TRUTH[p.name as keyof typeof THERMAL_TRUTH];
      expect(p.ci95, p.name).not.toBeNull();
      expect(p.ci95![0], p.name).toBeLessThan(truth);
      expect(p.ci95![1], p.name).toBeGreaterThan(truth);
      expect(p.atBound).toBe(false);
    }
    expect(r.parameters.find((p) => p.name === 'T0@warm')!.experiment).toBe('warm');
    expect(outcome.values.Ta).toBe(293.15);
  });

  it('estimates the noise level by maximum likelihood and reports it', () => {
    const rows = r.outputs.filter((o) => o.role === 'fit');
    expect(rows).toHaveLength(2);
    for (const o of rows) {
      expect(o.sigmaEstimated).toBe(true);
      // 482 samples: the ML sigma is within about 3 * sigma/sqrt(2n) = 7 % of the truth (chi distribution)
      expect(Math.abs(o.sigma / THERMAL_TRUTH.sigma - 1)).toBeLessThan(0.1);
      expect(o.r2).toBeGreaterThan(0.99);
    }
    expect(r.statistics.observations).toBe(482);
    expect(r.statistics.dof).toBe(478);
    expect(r.statistics.reducedChiSquare).toBeUndefined();
    // with ML sigmas the weighted SSE equals the number of samples to within the 1 % sigma tolerance
    expect(Math.abs(r.statistics.weightedSSE / 482 - 1)).toBeLessThan(0.03);
    expect(Number.isFinite(r.statistics.aicc)).toBe(true);
    expect(outcome.residuals).toHaveLength(2);
  });

  it('given sigmas are kept and give a reduced chi-square near 1', () => {
    const dir2 = tempDir();
    const o2 = fitModel(loadModel(writeThermalRig(dir2, 11, { sigmaLine: ', sigma: 0.05' })));
    report('thermal rig, sigma given', o2.result);
    expect(o2.result.outputs[0].sigma).toBe(0.05);
    expect(o2.result.outputs[0].sigmaEstimated).toBe(false);
    // E = 1, sd = sqrt(2/478) = 0.065 (chi-square / dof): 4 sd bound
    expect(Math.abs(o2.result.statistics.reducedChiSquare! - 1)).toBeLessThan(0.26);
    // same optimum as with estimated sigma (one output: weighting does not move the estimate)
    const c1 = r.parameters.find((p) => p.name === 'C')!.estimate;
    const c2 = o2.result.parameters.find((p) => p.name === 'C')!.estimate;
    expect(Math.abs(c2 / c1 - 1)).toBeLessThan(1e-5);
  });
});

describe('mass and stiffness both free in a free decay', () => {
  it('is reported as not separately determined: only k/m', () => {
    const dir = tempDir();
    const outcome = fitModel(loadModel(writeSpringRig(dir)));
    const r = outcome.result;
    report('spring decay (k and m both free)', r);
    expect(r.status).not.toBe('failed');
    const problem = r.identifiability.problems.find((p) => p.parameters.includes('k') && p.parameters.includes('m'));
    expect(problem, JSON.stringify(r.identifiability)).toBeDefined();
    expect(problem!.message).toMatch(/k\/m|m\/k/);
    expect(r.warnings.join('\n')).toMatch(/k\/m|m\/k/);
    // the ratio itself is well estimated (truth 1000 1/s^2)
    expect(Math.abs(outcome.values.k / outcome.values.m / 1000 - 1)).toBeLessThan(1e-3);
    for (const p of r.parameters) {
      if (p.status !== 'free') continue;
      expect(Number.isNaN(p.estimate)).toBe(false);
      if (p.stdError !== null) expect(Number.isFinite(p.stdError)).toBe(true);
    }
  });
});
