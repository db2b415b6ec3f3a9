/**
 * A demo results set for the report's tests, the browser test and the speed benchmark: a made-up
 * DC motor speed rig of our own (first-order speed response to voltage steps, plus a current with a
 * small unmodelled ripple), with seeded noise. Invented data, for demonstration only: it is not a
 * fit, only the shape of one.
 */
import type { ResidualSeries } from '../../src/diagnostics/types.js';
import type { FitResult, OutputResult } from '../../src/estimation/fit/fit-result.js';
import { residualDiagnostics } from '../../src/diagnostics/residual-diagnostics.js';
import { scoreSeries } from '../../src/diagnostics/scores.js';

export interface DemoOptions {
  /** Samples per experiment (default 2000). */
  samples?: number;
  /** Include a validation experiment (default true). */
  validation?: boolean;
  /** Replaces the model name (tests put hostile text here). */
  modelName?: string;
}

function noise(seed: number): () => number {
  let a = seed >>> 0;
  const u = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(Math.max(u(), 1e-300))) * Math.cos(2 * Math.PI * u());
}

function experiment(name: string, role: 'fit' | 'validation', n: number, seed: number): { series: ResidualSeries[]; voltage: Float64Array } {
  const dt = 0.001;
  const g = noise(seed);
  const time = new Float64Array(n);
  const voltage = new Float64Array(n);
  const speedSim = new Float64Array(n);
  const speedMeas = new Float64Array(n);
  const currentSim = new Float64Array(n);
  const currentMeas = new Float64Array(n);
  const K = 8.2; // rad/s per V
  const tau = 0.12; // s
  // Voltage steps every 0.8 s (a square wave of 0.625 Hz: odd harmonics 0.625, 1.875, 3.125, 4.375 Hz).
  const period = 800;
  let w = 0;
  for (let i = 0; i < n; i++) {
    const t = i * dt;
    time[i] = t;
    voltage[i] = Math.floor(i / period) % 2 ? 6 : 12;
    if (i > 0) w += (dt / tau) * (K * voltage[i - 1] - w);
    speedSim[i] = w;
    speedMeas[i] = w + 0.4 * g();
    currentSim[i] = 0.05 * w + 0.1 * (K * voltage[i] - w);
    // An unmodelled 3.7 Hz ripple, away from the input's harmonics: the current's residuals will
    // not be white, yet they do not follow the input.
    currentMeas[i] = currentSim[i] + 0.05 * Math.sin(2 * Math.PI * 3.7 * t) + 0.02 * g();
  }
  for (let i = 7; i < n; i += 97) speedMeas[i] = NaN; // a few dropped samples
  return {
    voltage,
    series: [
      { experiment: name, role, output: 'speed', unit: 'rad/s', time, measured: speedMeas, simulated: speedSim },
      { experiment: name, role, output: 'current', unit: 'A', time, measured: currentMeas, simulated: currentSim },
    ],
  };
}

export function demoResults(options: DemoOptions = {}): { fit: FitResult; series: ResidualSeries[] } {
  const n = options.samples ?? 2000;
  const runs = [experiment('steps-12V', 'fit', n, 1)];
  if (options.validation ?? true) runs.push(experiment('steps-validation', 'validation', n, 2));
  const series = runs.flatMap((r) => r.series);
  const outputs: OutputResult[] = [];
  runs.forEach((r) =>
    r.series.forEach((s) => {
      const score = scoreSeries(s.measured, s.simulated);
      const d = residualDiagnostics(s, [{ name: 'V', values: r.voltage }], { timeUnit: 's' });
      outputs.push({
        experiment: s.experiment, output: s.output, unit: s.unit, role: s.role,
        samples: score.samples, missing: score.missing, sigma: score.rmse, sigmaEstimated: true,
        rmse: score.rmse, nrmse: score.nrmse, r2: score.r2,
        whiteness: d.whiteness, verdict: d.verdict, correlatedUpTo: d.correlatedUpTo,
        autocorrelation: d.autocorrelation, inputCorrelation: d.inputCorrelation,
      });
    }),
  );
  const hash = 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855';
  const date = '2026-01-15T10:00:00.000Z';
  const fit: FitResult = {
    tool: 'rigcal', version: '0.1.0', format: 1,
    model: { name: options.modelName ?? 'demo-motor-rig', file: 'demo-motor.yaml', sha256: hash, description: 'Demo scenario of our own: a DC motor speed rig (invented data).' },
    timeUnit: 's',
    experiments: runs.map((r) => ({ name: r.series[0].experiment, role: r.series[0].role, file: `${r.series[0].experiment}.csv`, sha256: hash, rows: n })),
    status: 'converged', message: 'relative cost change below 1e-10', stopReason: 'cost-change',
    solver: { model: 'ode', degreesOfFreedom: 11995, relaxedStops: true, noisyCost: true, speculativeJacobian: true, stepCaps: 3, stepCapFactor: 2, costTolerance: 1e-10, costNoiseLimit: 1e-6, stepTolerance: 1e-10, gradientTolerance: 1e-10 },
    iterations: 9, simulations: 11, wallSeconds: 0.21,
    parameters: [
      { name: 'K', parameter: 'K', unit: 'rad/(s*V)', status: 'free', estimate: 8.2, stdError: 0.004, ci95: [8.192, 8.208], min: 1, max: 20, start: 5, atBound: false },
      { name: 'tau', parameter: 'tau', unit: 's', status: 'free', estimate: 0.12, stdError: 0.0002, ci95: [0.1196, 0.1204], min: 0.001, max: 2, start: 0.5, scale: 'log', atBound: false },
      { name: 'b', parameter: 'b', unit: 'N*m*s/rad', status: 'free', estimate: 0, stdError: null, ci95: null, min: 0, max: 1, start: 0.01, atBound: 'lower' },
      { name: 'R', parameter: 'R', unit: 'ohm', status: 'fixed', estimate: 1.92 },
    ],
    correlation: { names: ['K', 'tau', 'b'], matrix: [[1, 0.31, null], [0.31, 1, null], [null, null, 1]] },
    statistics: { observations: outputs.reduce((a, o) => a + (o.role === 'fit' ? o.samples : 0), 0), freeParameters: 3, dof: 0, weightedSSE: 0, logLikelihood: 0, aicc: 0, bic: 0 },
    outputs,
    identifiability: { conditionNumber: 153.2, problems: [{ parameters: ['b'], message: 'b is not determined by these data: the speed response does not depend on it at this operating point' }] },
    warnings: ['b is at its lower bound 0 N*m*s/rad; its interval is not reliable'],
    provenance: { modelFile: 'demo-motor.yaml', modelSha256: hash, dataFiles: runs.map((r) => ({ experiment: r.series[0].experiment, file: `${r.series[0].experiment}.csv`, sha256: hash })), toolVersion: '0.1.0', date, overrides: {} },
  };
  // Plausible statistics for a fit whose sigmas were estimated: weighted SSE near the observations.
  const N = fit.statistics.observations;
  Object.assign(fit.statistics, { dof: N - 3, weightedSSE: N, logLikelihood: -0.5 * N * (1 + Math.log(2 * Math.PI)), aicc: N * (1 + Math.log(2 * Math.PI)) + 6 + 24 / (N - 4), bic: N * (1 + Math.log(2 * Math.PI)) + 3 * Math.log(N) });
  return { fit, series };
}
