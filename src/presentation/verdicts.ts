/**
 * Every verdict rigcal puts into words, one phrase each, for the terminal and the HTML report
 * alike: the residual whiteness of an output (short label and sentence), and the likelihood-ratio
 * test between nested models. Pure functions returning strings.
 */
import { formatCorrelation, formatPValueClause } from './numbers.js';

/** The short label of a whiteness test, for table cells. */
const WHITENESS_LABELS = {
  white: 'white',
  notWhite: 'not white',
  notJudged: 'not judged',
} as const;

/** The label of one output: white, not white, or not judged (too few samples, no test). */
export function whitenessLabel(whiteness: { white: boolean } | null | undefined): string {
  if (!whiteness) return WHITENESS_LABELS.notJudged;
  return whiteness.white ? WHITENESS_LABELS.white : WHITENESS_LABELS.notWhite;
}

/** The label of several outputs at once: white, "2/4 not white", or not judged. */
export function whitenessTally(white: readonly (boolean | null)[]): string {
  const judged = white.filter((w): w is boolean => w !== null);
  if (!judged.length) return WHITENESS_LABELS.notJudged;
  const notWhite = judged.filter((w) => !w).length;
  return notWhite === 0 ? WHITENESS_LABELS.white : `${notWhite}/${judged.length} ${WHITENESS_LABELS.notWhite}`;
}

/** The sentences of a residual verdict; lags and times already formatted with their unit. */
export const RESIDUAL_VERDICTS = {
  tooFewSamples: (samples: number) => `too few samples (${samples}) to judge the residuals`,
  white: 'residuals are white: the model explains this output within noise',
  correlatedBeyond: (run: string, longest: string) =>
    `residuals are correlated beyond ${run} (near the longest lag examined, ${longest}): the model misses slow dynamics or a drift`,
  correlatedUpTo: (run: string) => `residuals are correlated up to ${run}: the model misses dynamics on that time scale`,
  weaklyCorrelated: (pValue: number, at: string) =>
    `residuals are weakly correlated (Ljung-Box ${formatPValueClause(pValue, 2)}), most at lag ${at}: the model may miss a small effect on that time scale`,
  followsInput: (input: string, correlation: number, at: string) =>
    `residuals follow input ${input} (cross-correlation ${formatCorrelation(correlation)} at lag ${at}): part of its effect is not modelled`,
  /** Shown where a result carries no verdict at all. */
  none: 'no verdict',
} as const;

/** The verdict of a likelihood-ratio test of a smaller model against a larger one. */
export function likelihoodRatioVerdict(larger: string, smaller: string, significant: boolean, alpha: number): string {
  return significant
    ? `${larger} fits significantly better than ${smaller} at the ${alpha * 100} % level: its extra parameters are supported`
    : `${larger} does not fit significantly better than ${smaller} at the ${alpha * 100} % level: keep the simpler model`;
}

/**
 * The words of a fit's status, where a person reads it first: a fit that stopped on its iteration
 * limit has estimates that are the last point reached, not an optimum, and the CLI exits 3 for it.
 */
export function fitStatusPhrase(status: string, message: string): string {
  if (status === 'stopped') return `STOPPED BEFORE CONVERGING (${message}): the estimates are the last point reached, not an optimum (exit code 3)`;
  return `${status} (${message})`;
}

/** Why an output has no R^2: its measurement is constant in that experiment (value already with its unit). */
export function constantOutputWarning(output: string, experiment: string, value: string): string {
  return `output ${output} in experiment ${experiment} is constant (value ${value}): R^2 and NRMSE are not defined; RMSE still is`;
}
