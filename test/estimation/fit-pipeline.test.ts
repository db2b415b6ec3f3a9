/**
 * The pipeline's order of work on the closed-form decay rig (helpers/decay-rig.ts) with the real
 * solver; uncertainty and identifiability are replaced by recording fakes, since they are tested by
 * their own engineer: here we check what the pipeline hands them and what it does with the answers.
 */
import { describe, expect, it } from 'vitest';
import { RunFailure } from '../../src/errors.js';
import { fitLoaded } from '../../src/estimation/fit/fit-model.js';
import type { UncertaintyInput, UncertaintyResult } from '../../src/estimation/uncertainty.js';
import { type FitCollaborators } from '../../src/estimation/fit/collaborators.js';
import { solveLeastSquares } from '../../src/estimation/solver/index.js';
import { runMultistart } from '../../src/estimation/multistart.js';
import { residualDiagnostics } from '../../src/diagnostics/residual-diagnostics.js';
import type { ParameterSpec } from '../../src/model/types.js';
import { decayCompiled, decayData, decayModel, decaySimulator } from './helpers/decay-rig.js';
import { normalDeviates as normalGenerator } from '../../src/util/random.js';

const params = (over: Partial<Record<string, Partial<ParameterSpec>>> = {}): ParameterSpec[] => [
  { name: 'k', kind: 'free', min: 0.01, max: 100, start: 0.5, scale: 'log', perExperiment: false, unit: '1/s', where: {}, ...over.k } as ParameterSpec,
  { name: 'A', kind: 'free', min: -10, max: 10, start: 1, scale: 'linear', perExperiment: true, unit: 'V', where: {}, ...over.A } as ParameterSpec,
  { name: 'c', kind: 'fixed', value: 0.25, unit: 'V', where: {} },
];

function deps(record: UncertaintyInput[] = []): FitCollaborators {
  return {
    sim: decaySimulator,
    solve: (p, s, o) => solveLeastSquares(p, s, o),
    uncertainty(input): UncertaintyResult {
      record.push(input);
      const n = input.theta.length;
      const atBound = input.atBound!;
      const warnings = atBound.flatMap((b, i) => (b ? [`${input.names[i]} at ${b} bound ${b === 'lower' ? input.bounds![i].min : input.bounds![i].max} ${input.units![i]}`] : []));
      const parameters = input.theta.map((th, i) => ({
        name: input.names[i], estimate: th, stdError: 0.01, ci95: [th - 0.02, th + 0.02] as [number, number], atBound: atBound[i], intervalReliable: true, determined: true,
      }));
      const matrix = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)));
      return { parameters, covariance: matrix, correlation: { names: [...input.names], matrix }, observations: input.residuals.length, freeParameters: n, dof: input.residuals.length - n, weightedSSE: 0, residualVariance: 1, tQuantile: 2, rank: n, warnings };
    },
    identifiability: () => ({ conditionNumber: 1, singularValues: [1], problems: [], warnings: [] }),
    multistart: runMultistart,
  };
}

/** Two fit experiments and one validation experiment, truth k = 0.8, A@e1 = 2, A@e2 = 3, noise 0.02. */
function rig(sigma?: number, p = params()) {
  const model = decayModel(p, ['e1', 'e2', 'check'], sigma);
  model.experiments[2].role = 'validation';
  const compiled = decayCompiled(model);
  const noise = normalGenerator(3);
  const t = Array.from({ length: 60 }, (_, i) => i * 0.1);
  const y = (A: number) => t.map((ti) => A * Math.exp(-0.8 * ti) + 0.25 + 0.02 * noise());
  const ys = [y(2), y(3), y(1)];
  ys[0][5] = NaN; // one missing sample
  const data = ys.map((v, i) => decayData(model, i, t, v));
  return { model, compiled, data };
}

describe('fit pipeline (fitLoaded)', () => {
  it('a fit stuck on a bound with non-white residuals also runs 8 starts over the bounds, and says when none is better', () => {
    // k's upper bound (0.5) lies below the truth (0.8): every start ends on it, and the misfit leaves
    // the residuals far from white.
    const { model, compiled, data } = rig(undefined, params({ k: { max: 0.5, start: 0.3 } }));
    const d: FitCollaborators = { ...deps(), diagnostics: (series, inputs, timeUnit) => residualDiagnostics(series, inputs, { timeUnit }) };
    const searched = fitLoaded(model, compiled, data, {}, d).result;
    expect(searched.warnings[0]).toMatch(/^from the model's start values k \(upper\) ended on its bound .* 8 starts spread over the bounds \(seed 1\) found no better one \(--starts 1 skips this search\)$/);
    expect(searched.starts).toBeUndefined(); // the fit from the model's start is the one reported
    const single = fitLoaded(model, compiled, data, { starts: 1 }, d).result;
    expect(single.warnings.join('\n')).toMatch(/may have stopped in a local optimum rather than at the best fit; try several starts spread over the bounds \(--starts 8\)/);
    expect(single.warnings.join('\n')).not.toMatch(/found no better/);
    // The work of both runs counts.
    expect(searched.iterations).toBeGreaterThan(single.iterations);
    expect(searched.simulations).toBeGreaterThan(single.simulations);
    // When none of the spread starts can be simulated, the finished fit stands (no failure).
    const failing: FitCollaborators = {
      ...d,
      multistart: (_entries, _opts, solve) => {
        const bad = { ...solve([0, 0, 0], 0), status: 'failed' as const, cost: Number.NaN };
        return { results: [bad], best: bad, bestIndex: 0, points: [[0, 0, 0]], distinctOptima: 0, bestCosts: [] };
      },
    };
    const kept = fitLoaded(model, compiled, data, {}, failing).result;
    expect(kept.status).not.toBe('failed');
    expect(kept.warnings.join('\n')).toMatch(/try several starts spread over the bounds \(--starts 8\)/);
  });

  it('estimates shared and per-experiment parameters, iterates the noise level, scores validation', () => {
    const { model, compiled, data } = rig();
    const rec: UncertaintyInput[] = [];
    const out = fitLoaded(model, compiled, data, {}, deps(rec));
    const r = out.result;
    expect(r.status).toBe('converged');
    expect(out.values.k).toBeCloseTo(0.8, 1);
    expect(out.values['A@e1']).toBeCloseTo(2, 1);
    expect(out.values['A@e2']).toBeCloseTo(3, 1);
    expect(out.values.c).toBe(0.25);
    expect(r.parameters.map((p) => p.name)).toEqual(['k', 'A@e1', 'A@e2', 'c']);
    // noise: the sigma reported is the RMS residual of the final fit to within the 1 % rule
    const fitRows = r.outputs.filter((o) => o.role === 'fit');
    expect(fitRows).toHaveLength(2);
    const rms = Math.sqrt(out.residuals.filter((s) => s.role === 'fit').reduce((acc, s) => acc + s.measured.reduce((a, m, i) => (Number.isNaN(m) ? a : a + (m - s.simulated[i]) ** 2), 0), 0) / 119);
    expect(Math.abs(fitRows[0].sigma / rms - 1)).toBeLessThan(0.01);
    expect(fitRows[0].sigmaEstimated).toBe(true);
    expect(fitRows[0].missing).toBe(1);
    expect(r.statistics.observations).toBe(119);
    expect(r.statistics.freeParameters).toBe(3);
    expect(rec[0].sigmaEstimated).toBe(true);
    expect(rec[0].scales).toEqual(['log', 'linear', 'linear']);
    // validation experiment: scored, never fitted; its A has no copy so the start value is used
    const v = r.outputs.find((o) => o.role === 'validation')!;
    expect(v.experiment).toBe('check');
    expect(r.warnings.join('\n')).toMatch(/validation experiment check has no estimate of the per-experiment parameter A/);
    expect(r.simulations).toBeGreaterThan(0);
    expect(r.sensitivitySimulations).toBeGreaterThan(0);
    expect(r.experiments!.map((e) => e.role)).toEqual(['fit', 'fit', 'validation']);
  });

  it('with given sigmas reports the reduced chi-square and does not refit', () => {
    const { model, compiled, data } = rig(0.02);
    const out = fitLoaded(model, compiled, data, {}, deps());
    const s = out.result.statistics;
    expect(s.reducedChiSquare).toBeCloseTo(s.weightedSSE / s.dof, 12);
    expect(out.result.outputs[0].sigma).toBe(0.02);
    expect(out.result.message).not.toMatch(/noise levels settled/);
  });

  it('marks a parameter at its bound and passes bounds and units on for the warning', () => {
    const { model, compiled, data } = rig(0.02, params({ k: { min: 1, max: 100, start: 2 } }));
    const out = fitLoaded(model, compiled, data, {}, deps());
    const k = out.result.parameters.find((p) => p.name === 'k')!;
    expect(k.atBound).toBe('lower');
    expect(out.result.warnings).toContain('k at lower bound 1 1/s');
  });

  it('fails with RunFailure when the start cannot be simulated', () => {
    const p = params({ k: { scale: 'linear', min: -2, max: 1, start: -1 } });
    const { model, compiled, data } = rig(0.02, p);
    expect(() => fitLoaded(model, compiled, data, {}, deps())).toThrow(RunFailure);
    expect(() => fitLoaded(model, compiled, data, {}, deps())).toThrow(/cannot simulate at the start values: state grows/);
  });

  it('multistart keeps the best run and reports the starts', () => {
    const { model, compiled, data } = rig(0.02);
    const out = fitLoaded(model, compiled, data, { starts: 4, seed: 9 }, deps());
    expect(out.result.starts?.requested).toBe(4);
    expect(out.result.starts?.seed).toBe(9);
    expect(out.result.starts!.bestCosts[0]).toBeCloseTo(out.result.statistics.weightedSSE, 8);
    expect(out.values.k).toBeCloseTo(0.8, 1);
  });

  it('reports progress through the callback', () => {
    const { model, compiled, data } = rig(0.02);
    const seen: number[] = [];
    fitLoaded(model, compiled, data, { onProgress: (p) => seen.push(p.cost) }, deps());
    expect(seen.length).toBeGreaterThan(2);
    expect(Math.min(...seen)).toBeLessThan(seen[0]);
  });
});
