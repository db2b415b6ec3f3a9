/**
 * Noise weighting. An output with `sigma` in the model file keeps it. For the others the noise level
 * is estimated by maximum likelihood with one unknown variance per output (numerics.md): fit, set
 * sigma_j to the root-mean-square residual of output j over the fit experiments, refit, until no
 * sigma changes by more than 1 %. The first weighting of an estimated output is the standard
 * deviation of its measurements (so that outputs in different units start on a comparable footing).
 */
import type { ExperimentData } from '../data/types.js';
import type { Model } from '../model/types.js';

/** Stop the sigma iteration when every sigma changes by less than this (relative). */
export const SIGMA_TOLERANCE = 0.01;
/** Safety stop for the refit loop; reported as a warning when reached. */
export const MAX_SIGMA_ROUNDS = 20;

export interface NoisePlan {
  sigmas: number[];
  /** Per output: true when the fit estimates its sigma. */
  estimated: boolean[];
}

function stdOfMeasurements(data: readonly ExperimentData[], output: number): number {
  let n = 0;
  let sum = 0;
  let sum2 = 0;
  for (const d of data) {
    const m = d.outputs[output];
    if (!m) continue;
    for (let i = 0; i < m.length; i++) {
      const v = m[i];
      if (Number.isNaN(v)) continue;
      n++;
      sum += v;
      sum2 += v * v;
    }
  }
  if (n < 2) return 1;
  const mean = sum / n;
  const variance = Math.max(0, sum2 / n - mean * mean);
  const sd = Math.sqrt(variance);
  return sd > 0 && Number.isFinite(sd) ? sd : Math.max(Math.abs(mean), 1);
}

export function initialNoise(model: Model, fitData: readonly ExperimentData[]): NoisePlan {
  const estimated = model.outputs.map((o) => o.sigma === undefined);
  const sigmas = model.outputs.map((o, j) => o.sigma ?? stdOfMeasurements(fitData, j));
  return { sigmas, estimated };
}

/**
 * The maximum-likelihood sigma of each estimated output from the weighted residual sums at the
 * current weighting: RMS of the raw residuals = sigma_used * sqrt(weightedSSE_j / n_j).
 * Outputs with given sigma (or without samples) keep their sigma.
 */
export function updatedSigmas(plan: NoisePlan, current: readonly number[], weightedSSE: readonly number[], samples: readonly number[]): number[] {
  return current.map((s, j) => {
    if (!plan.estimated[j] || samples[j] === 0) return s;
    const rms = s * Math.sqrt(weightedSSE[j] / samples[j]);
    // A perfect fit (noise-free synthetic data) would give 0: keep a tiny positive level instead.
    return rms > 0 && Number.isFinite(rms) ? rms : s * 1e-12;
  });
}

export function largestRelativeChange(before: readonly number[], after: readonly number[]): number {
  let worst = 0;
  for (let j = 0; j < before.length; j++) worst = Math.max(worst, Math.abs(after[j] - before[j]) / before[j]);
  return worst;
}
