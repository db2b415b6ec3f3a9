/**
 * The likelihood `rank` compares candidate models on, recomputed from each fit's residuals so that
 * every candidate is scored by the same rule whatever its fit reported:
 *
 * - independent Gaussian errors, one noise level sigma_j per output over all fit experiments;
 * - an output with a given `sigma` uses it; an output whose sigma the fit estimated uses the
 *   maximum-likelihood value at the final estimates, sigma_j^2 = SSE_j / n_j (the concentrated
 *   likelihood). Then log L = -1/2 sum_j n_j (ln(2 pi sigma_j^2) + 1) for those outputs, and models
 *   with different residual levels are compared on the same footing;
 * - k = free parameters (per-experiment copies counted one by one) + estimated noise levels.
 *
 * The formulas themselves live in src/estimation/information-criteria.ts (with their sources).
 */
import type { ResidualSeries } from '../diagnostics/types.js';
import { aicc, bic, gaussianLogLikelihood, type LikelihoodTerm } from '../estimation/information-criteria.js';

export interface OutputNoise {
  output: string;
  /** The given sigma, or undefined when the fit estimated it. */
  givenSigma?: number;
}

export interface LikelihoodSummary {
  /** Non-missing fit samples over all outputs. */
  observations: number;
  logLikelihood: number;
  /** -2 log L: the objective in the ranking table. */
  minusTwoLogL: number;
  /** Estimated quantities: free parameters + estimated noise levels. */
  k: number;
  estimatedSigmas: number;
  aicc: number;
  bic: number;
  /** Per output: samples, the sigma used, and whether it was estimated here. */
  terms: { output: string; samples: number; sigma: number; estimated: boolean; sse: number }[];
}

export function fitLikelihood(residuals: readonly ResidualSeries[], noise: readonly OutputNoise[], freeParameters: number): LikelihoodSummary {
  const perOutput = new Map<string, { n: number; sse: number }>();
  for (const s of residuals) {
    if (s.role !== 'fit') continue;
    const acc = perOutput.get(s.output) ?? { n: 0, sse: 0 };
    const len = Math.min(s.measured.length, s.simulated.length);
    for (let i = 0; i < len; i++) {
      const r = s.measured[i] - s.simulated[i];
      if (Number.isFinite(r)) {
        acc.n++;
        acc.sse += r * r;
      }
    }
    perOutput.set(s.output, acc);
  }
  const terms: LikelihoodSummary['terms'] = [];
  const llTerms: LikelihoodTerm[] = [];
  let estimatedSigmas = 0;
  let observations = 0;
  for (const [output, { n, sse }] of perOutput) {
    if (n === 0) continue;
    const given = noise.find((o) => o.output === output)?.givenSigma;
    const estimated = given === undefined;
    // A perfect fit (sse 0) would give log L = +inf; a floor keeps the ranking finite and still
    // puts such a model first.
    const sigma = estimated ? Math.sqrt(Math.max(sse / n, Number.MIN_VALUE)) : given;
    if (estimated) estimatedSigmas++;
    observations += n;
    terms.push({ output, samples: n, sigma, estimated, sse });
    llTerms.push({ samples: n, sigma, weightedSSE: sse / (sigma * sigma) });
  }
  const logLikelihood = gaussianLogLikelihood(llTerms);
  const k = freeParameters + estimatedSigmas;
  return {
    observations,
    logLikelihood,
    minusTwoLogL: -2 * logLikelihood,
    k,
    estimatedSigmas,
    aicc: aicc(logLikelihood, k, observations),
    bic: bic(logLikelihood, k, observations),
    terms,
  };
}
