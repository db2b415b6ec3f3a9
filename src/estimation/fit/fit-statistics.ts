/**
 * The fit's statistics with the final weighting: observations, degrees of freedom, weighted SSE, the
 * Gaussian log-likelihood and the information criteria, which count every estimated noise level
 * as a parameter too (numerics.md).
 */
import { aicc, bic, gaussianLogLikelihood } from '../information-criteria.js';
import { perOutputSums } from '../problem.js';
import type { SolverResult } from '../solver/types.js';
import type { FitStatistics } from './fit-result.js';
import { anyNoiseEstimated, type FitSetup } from './fit-setup.js';

export function fitStatistics(setup: FitSetup, run: SolverResult): { statistics: FitStatistics; warnings: string[] } {
  const { problem, noise } = setup;
  const sums = perOutputSums(problem, run.residuals);
  const N = problem.nResiduals;
  const p = problem.entries.length;
  const weightedSSE = run.cost;
  const terms = problem.sigmas.map((s, j) => ({ samples: sums.samples[j], sigma: s, weightedSSE: sums.sse[j] })).filter((t) => t.samples > 0);
  const logLikelihood = gaussianLogLikelihood(terms);
  const estimatedSigmas = noise.estimated.filter((e, j) => e && sums.samples[j] > 0).length;
  const k = p + estimatedSigmas;
  const statistics: FitStatistics = {
    observations: N,
    freeParameters: p,
    dof: N - p,
    weightedSSE,
    logLikelihood,
    aicc: aicc(logLikelihood, k, N),
    bic: bic(logLikelihood, k, N),
  };
  if (!anyNoiseEstimated(setup) && N > p) statistics.reducedChiSquare = weightedSSE / (N - p);
  const warnings = N <= p ? [`only ${N} measured samples for ${p} free parameters: nothing is left to judge the fit`] : [];
  return { statistics, warnings };
}
