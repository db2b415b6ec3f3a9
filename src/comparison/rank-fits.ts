/**
 * Ranking of candidate models already fitted to the same data: likelihood, AICc, BIC, Akaike
 * weights, validation scores, residual whiteness, the preferred model with the reason in words, and
 * optionally likelihood-ratio tests between nested candidates.
 *
 * Objective: -2 log L of the Gaussian noise model with each model's maximum-likelihood noise levels
 * where the noise is estimated (likelihood.ts). Weighted SSE is not used because, with estimated
 * noise, each model weights by its own sigmas and the sums would not be comparable.
 */
import type { CompletedFit } from '../estimation/fit/fit-result.js';
import { akaikeWeights, likelihoodRatioTest } from '../estimation/information-criteria.js';
import type { Model } from '../model/types.js';
import { residualDiagnostics, scoreSeries } from '../diagnostics/index.js';
import { fitLikelihood } from './likelihood.js';
import { formatCriterion, likelihoodRatioVerdict } from '../presentation/index.js';

export interface CandidateFit {
  /** Display name (the model's name, made unique by the caller). */
  name: string;
  file: string;
  model: Model;
  outcome: CompletedFit;
}

export interface ValidationScore {
  experiment: string;
  output: string;
  unit: string;
  samples: number;
  rmse: number;
  nrmse: number;
  r2: number;
}

export interface WhitenessScore {
  experiment: string;
  output: string;
  white: boolean | null;
  pValue: number | null;
  verdict: string;
}

export interface RankedModel {
  name: string;
  file: string;
  status: string;
  freeParameters: number;
  /** Estimated quantities in the criteria: free parameters + estimated noise levels. */
  k: number;
  observations: number;
  logLikelihood: number;
  /** -2 log L (see the module comment). */
  objective: number;
  aicc: number;
  deltaAicc: number;
  bic: number;
  weight: number;
  validation: ValidationScore[];
  /** Whiteness of the fit residuals per experiment and output. */
  whiteness: WhitenessScore[];
}

export interface NestedTest {
  smaller: string;
  larger: string;
  statistic: number;
  dof: number;
  pValue: number;
  verdict: string;
}

export interface RankResult {
  objective: string;
  /** Sorted by AICc, best first. */
  models: RankedModel[];
  preferred: string;
  reason: string;
  nested?: NestedTest[];
}

/** Rule of thumb of Burnham & Anderson (2002), section 2.6: Delta_i <= 2 means substantial support. */
const SUBSTANTIAL_SUPPORT_DELTA = 2;
/** Significance level of the likelihood-ratio tests. */
const LRT_ALPHA = 0.05;

const OBJECTIVE_TEXT =
  '-2 log L: Gaussian likelihood of the fit residuals, with each model\'s maximum-likelihood noise level per output where the noise is estimated (given sigmas are used as given)';

export function rankFits(candidates: readonly CandidateFit[], options: { nested?: boolean } = {}): RankResult {
  const scored = candidates.map((c) => scoreCandidate(c));
  const weights = akaikeWeights(scored.map((s) => s.aicc));
  const finite = scored.map((s) => s.aicc).filter(Number.isFinite);
  const best = finite.length ? Math.min(...finite) : NaN;
  scored.forEach((s, i) => {
    s.weight = weights[i];
    s.deltaAicc = s.aicc - best;
  });
  const models = [...scored].sort((a, b) => cmp(a.aicc, b.aicc) || a.freeParameters - b.freeParameters);
  const { preferred, reason } = choosePreferred(models);
  const result: RankResult = { objective: OBJECTIVE_TEXT, models, preferred, reason };
  if (options.nested) result.nested = nestedTests(models);
  return result;
}

function cmp(a: number, b: number): number {
  if (a === b) return 0;
  if (!Number.isFinite(a)) return Number.isFinite(b) ? 1 : 0;
  if (!Number.isFinite(b)) return -1;
  return a - b;
}

function scoreCandidate(c: CandidateFit): RankedModel {
  const fit = c.outcome.result;
  const freeParameters = fit.statistics.freeParameters;
  const noise = c.model.outputs.map((o) => ({ output: o.name, givenSigma: o.sigma }));
  const failed = fit.status === 'failed';
  const ll = fitLikelihood(c.outcome.residuals, noise, freeParameters);
  return {
    name: c.name,
    file: c.file,
    status: fit.status,
    freeParameters,
    k: ll.k,
    observations: ll.observations,
    logLikelihood: failed ? NaN : ll.logLikelihood,
    objective: failed ? NaN : ll.minusTwoLogL,
    aicc: failed ? Number.POSITIVE_INFINITY : ll.aicc,
    deltaAicc: NaN,
    bic: failed ? Number.POSITIVE_INFINITY : ll.bic,
    weight: 0,
    validation: c.outcome.residuals
      .filter((s) => s.role === 'validation')
      .map((s) => {
        const sc = scoreSeries(s.measured, s.simulated);
        return { experiment: s.experiment, output: s.output, unit: s.unit, samples: sc.samples, rmse: sc.rmse, nrmse: sc.nrmse, r2: sc.r2 };
      })
      .filter((v) => v.samples > 0),
    whiteness: c.outcome.residuals
      .filter((s) => s.role === 'fit')
      .map((s) => {
        // Static models: rows are not time, so lags stay in rows.
        const d = residualDiagnostics(s, [], { timeUnit: c.model.isStatic ? undefined : c.model.timeUnit });
        return { experiment: s.experiment, output: s.output, white: d.whiteness?.white ?? null, pValue: d.whiteness?.pValue ?? null, verdict: d.verdict };
      }),
  };
}

function choosePreferred(models: readonly RankedModel[]): { preferred: string; reason: string } {
  const best = models[0];
  if (!best || !Number.isFinite(best.aicc)) {
    return { preferred: best?.name ?? '', reason: 'no candidate could be scored (every fit failed or had too few observations for AICc)' };
  }
  const next = models[1];
  let reason = `lowest AICc (${formatCriterion(best.aicc)}, Akaike weight ${formatCriterion(best.weight, 3)})`;
  if (next && Number.isFinite(next.aicc)) reason += `; the next, ${next.name}, is ${formatCriterion(next.deltaAicc, 3)} AICc units worse`;
  const simpler = models
    .filter((m) => m !== best && m.freeParameters < best.freeParameters && m.deltaAicc < SUBSTANTIAL_SUPPORT_DELTA)
    .sort((a, b) => a.freeParameters - b.freeParameters)[0];
  if (simpler) {
    reason +=
      `. But ${simpler.name}, with ${simpler.freeParameters} instead of ${best.freeParameters} free parameters, is within ` +
      `${formatCriterion(simpler.deltaAicc, 3)} < ${SUBSTANTIAL_SUPPORT_DELTA} AICc units: the data support it about as well, and the simpler model is as good ` +
      `(rule of thumb of Burnham & Anderson 2002: differences below 2 mean substantial support for both)`;
  }
  return { preferred: best.name, reason };
}

/** Consecutive models by number of free parameters; only pairs where the smaller has fewer. */
function nestedTests(models: readonly RankedModel[]): NestedTest[] {
  const ordered = models.filter((m) => Number.isFinite(m.logLikelihood)).sort((a, b) => a.freeParameters - b.freeParameters);
  const tests: NestedTest[] = [];
  for (let i = 0; i + 1 < ordered.length; i++) {
    const small = ordered[i];
    const large = ordered[i + 1];
    if (!(small.freeParameters < large.freeParameters)) continue;
    const t = likelihoodRatioTest({ logLikelihood: small.logLikelihood, k: small.k }, { logLikelihood: large.logLikelihood, k: large.k });
    const significant = t.pValue < LRT_ALPHA;
    tests.push({
      smaller: small.name,
      larger: large.name,
      statistic: t.statistic,
      dof: t.dof,
      pValue: t.pValue,
      verdict: likelihoodRatioVerdict(large.name, small.name, significant, LRT_ALPHA),
    });
  }
  return tests;
}
