/**
 * Likelihood and information criteria of a weighted least-squares fit, for model ranking.
 *
 * Conventions (one place, used by fit.json, the summary and `rank`):
 * - Noise model: independent Gaussian errors, standard deviation sigma_j for output j.
 *   log L = -1/2 * sum_j n_j * ln(2 pi sigma_j^2) - 1/2 * weightedSSE,
 *   with weightedSSE = sum over all samples of ((measured - simulated) / sigma_j)^2.
 *   When sigma_j is estimated by maximum likelihood (sigma_j^2 = SSE_j / n_j) the last term is
 *   n_j / 2 per output, so models fitted to the same data with estimated noise are compared on the
 *   concentrated likelihood, which is what makes their AICc comparable.
 * - k (number of estimated quantities) = free parameters + noise levels that were estimated
 *   (a noise variance estimated from the data is a parameter of the likelihood; Burnham & Anderson
 *   2002, section 2.2, count sigma^2 in K).
 */
import chisquareCdf from '@stdlib/stats-base-dists-chisquare-cdf';

export interface LikelihoodTerm {
  /** Non-missing samples of this output over the fit experiments. */
  samples: number;
  sigma: number;
  /** Sum of ((measured - simulated)/sigma)^2 over those samples. */
  weightedSSE: number;
}

/** Gaussian log-likelihood with the given noise levels (formula above). */
export function gaussianLogLikelihood(terms: readonly LikelihoodTerm[]): number {
  let ll = 0;
  for (const t of terms) {
    ll -= 0.5 * t.samples * Math.log(2 * Math.PI * t.sigma * t.sigma);
    ll -= 0.5 * t.weightedSSE;
  }
  return ll;
}

/** AIC = 2k - 2 log L (Akaike 1974, IEEE Trans. Automatic Control 19(6):716-723). */
export function aic(logLikelihood: number, k: number): number {
  return 2 * k - 2 * logLikelihood;
}

/**
 * AICc = AIC + 2k(k+1)/(n-k-1), the small-sample correction of Hurvich & Tsai (1989, Biometrika
 * 76(2):297-307). Undefined (Infinity) when n <= k + 1: too few observations to rank with it.
 */
export function aicc(logLikelihood: number, k: number, n: number): number {
  const denom = n - k - 1;
  if (denom <= 0) return Number.POSITIVE_INFINITY;
  return aic(logLikelihood, k) + (2 * k * (k + 1)) / denom;
}

/** BIC = k ln n - 2 log L (Schwarz 1978, Annals of Statistics 6(2):461-464). */
export function bic(logLikelihood: number, k: number, n: number): number {
  return k * Math.log(n) - 2 * logLikelihood;
}

/**
 * Akaike weights w_i = exp(-Delta_i/2) / sum_r exp(-Delta_r/2), Delta_i = AIC_i - min AIC
 * (Burnham & Anderson 2002, Model Selection and Multimodel Inference, section 2.9). Models with an
 * infinite criterion get weight 0.
 */
export function akaikeWeights(criteria: readonly number[]): number[] {
  const finite = criteria.filter((c) => Number.isFinite(c));
  if (finite.length === 0) return criteria.map(() => 0);
  const best = Math.min(...finite);
  const raw = criteria.map((c) => (Number.isFinite(c) ? Math.exp(-(c - best) / 2) : 0));
  const sum = raw.reduce((a, b) => a + b, 0);
  return raw.map((r) => r / sum);
}

export interface LikelihoodRatioTest {
  statistic: number;
  dof: number;
  pValue: number;
}

/**
 * Likelihood-ratio test of a nested smaller model against a larger one (Wilks 1938): the statistic
 * 2 (log L_large - log L_small) is asymptotically chi-square with k_large - k_small degrees of
 * freedom under the smaller model; p = 1 - F_chi2(statistic; dof).
 */
export function likelihoodRatioTest(
  small: { logLikelihood: number; k: number },
  large: { logLikelihood: number; k: number },
): LikelihoodRatioTest {
  const dof = large.k - small.k;
  if (!(dof > 0)) throw new RangeError('likelihood-ratio test needs the larger model to have more parameters');
  // A larger nested model cannot fit worse at its optimum; a slightly negative value is round-off.
  const statistic = Math.max(0, 2 * (large.logLikelihood - small.logLikelihood));
  return { statistic, dof, pValue: 1 - chisquareCdf(statistic, dof) };
}
