/** A small, hand-written CompletedFit for testing the writers (invented numbers, not a real fit). */
import type { CompletedFit } from '../../../src/estimation/fit/fit-result.js';
import type { FitResult } from '../../../src/estimation/fit/fit-result.js';

export function sampleOutcome(): CompletedFit {
  const result: FitResult = {
    tool: 'rigcal',
    version: '0.1.0',
    format: 1,
    model: { name: 'demo-rig', file: 'demo.yaml', sha256: 'ab'.repeat(32) },
    timeUnit: 's',
    experiments: [
      { name: 'steps', role: 'fit', file: 'steps.csv', sha256: 'cd'.repeat(32), rows: 3 },
      { name: 'check', role: 'validation', file: 'check.csv', sha256: 'ef'.repeat(32), rows: 2 },
    ],
    status: 'converged',
    message: 'relative cost change below 1e-10',
    stopReason: 'cost-change',
    solver: { model: 'ode', degreesOfFreedom: 11995, relaxedStops: true, noisyCost: true, speculativeJacobian: true, stepCaps: 3, stepCapFactor: 2, costTolerance: 1e-10, costNoiseLimit: 1e-6, stepTolerance: 1e-10, gradientTolerance: 1e-10 },
    iterations: 7,
    simulations: 9,
    sensitivitySimulations: 8,
    wallSeconds: 0.05,
    parameters: [
      { name: 'K', parameter: 'K', unit: 'N*m/A', status: 'free', estimate: 0.1 + 0.2, stdError: 1.234567890123e-4, ci95: [0.29, 0.31], min: 0.001, max: 1, start: 0.05, scale: 'log', atBound: false },
      { name: 'w0@steps', parameter: 'w0', unit: 'rad/s', status: 'free', experiment: 'steps', estimate: -1 / 3, stdError: null, ci95: null, min: -5, max: 5, start: 0, scale: 'linear', atBound: false },
      { name: 'Tc', parameter: 'Tc', unit: 'N*m', status: 'free', estimate: 0, stdError: 0.01, ci95: [-0.02, 0.02], min: 0, max: 0.2, start: 0.1, scale: 'linear', atBound: 'lower' },
      { name: 'R', parameter: 'R', unit: 'ohm', status: 'fixed', estimate: 1.92 },
    ],
    correlation: { names: ['K', 'w0@steps', 'Tc'], matrix: [[1, null, 0.2], [null, null, null], [0.2, null, 1]] },
    statistics: { observations: 5, freeParameters: 3, dof: 2, weightedSSE: 2.5, logLikelihood: -3, aicc: Infinity, bic: 10 },
    outputs: [
      { experiment: 'steps', output: 'speed', unit: 'rad/s', role: 'fit', samples: 3, missing: 1, sigma: 0.49, sigmaEstimated: true, rmse: 0.4, nrmse: 0.1, r2: 0.99 },
      { experiment: 'check', output: 'speed', unit: 'rad/s', role: 'validation', samples: 2, missing: 0, sigma: 0.49, sigmaEstimated: true, rmse: 0.5, nrmse: 0.2, r2: 0.9 },
    ],
    identifiability: { conditionNumber: 12, problems: [] },
    warnings: ['Tc is at its lower bound 0 N*m; its interval is not reliable'],
    provenance: {
      modelFile: 'demo.yaml',
      modelSha256: 'ab'.repeat(32),
      dataFiles: [{ experiment: 'steps', file: 'steps.csv', sha256: 'cd'.repeat(32) }],
      toolVersion: '0.1.0',
      date: '2026-01-01T00:00:00.000Z',
      overrides: {},
    },
  };
  return {
    result,
    values: { K: 0.1 + 0.2, 'w0@steps': -1 / 3, Tc: 0, R: 1.92 },
    residuals: [
      { experiment: 'steps', role: 'fit', output: 'speed', unit: 'rad/s', time: Float64Array.from([0, 0.1, 0.2, 0.3]), measured: Float64Array.from([1, NaN, 3, 4]), simulated: Float64Array.from([1.5, 2, 2.5, 4.25]) },
      { experiment: 'check', role: 'validation', output: 'speed', unit: 'rad/s', time: Float64Array.from([0, 1]), measured: Float64Array.from([0, 1]), simulated: Float64Array.from([0.5, 1]) },
    ],
  };
}
