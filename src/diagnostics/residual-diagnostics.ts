/**
 * Residual diagnostics of one output in one experiment: is what the model leaves over plain noise?
 * - whiteness: Ljung-Box test on the residual autocorrelation (ljung-box.ts, lag rule in lag-rule.ts);
 * - where it is not white: up to which lag (converted to time) the residuals stay correlated;
 * - whether the residuals follow an input (cross-correlation, input now and earlier);
 * - a verdict in words.
 * Missing samples (NaN in measured or simulated) are handled as described in correlation.ts.
 */
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import type { InputCorrelation, ResidualAutocorrelation, ResidualSeries, WhitenessResult } from './types.js';
import { autocorrelation, crossCorrelation } from './correlation.js';
import { displayLags, MIN_SAMPLES_FOR_TESTS, testLags } from './lag-rule.js';
import { ljungBox } from './ljung-box.js';
import { residualOf } from './scores.js';
import { sampleInterval } from './sample-interval.js';
import { formatQuantity } from '../presentation/numbers.js';
import { RESIDUAL_VERDICTS } from '../presentation/verdicts.js';

/** An input signal sampled at the same times as the residual series. */
export interface InputSignal {
  name: string;
  values: ArrayLike<number>;
}

export interface DiagnosticsOptions {
  /** The model's time unit, for lags converted to time in words (default: lags in samples). */
  timeUnit?: string;
  /** Significance level of the tests (default 0.05). */
  alpha?: number;
}

export interface ResidualDiagnostics {
  /** Samples with a residual (both measured and simulated present). */
  samples: number;
  whiteness?: WhitenessResult;
  autocorrelation?: ResidualAutocorrelation;
  /** Per input: largest |cross-correlation|, its lag in the model's time unit, the 95 % band half-width. */
  inputCorrelation?: InputCorrelation[];
  /** Inputs whose cross-correlation with the residuals is significant. */
  inputsFollowed: string[];
  /** Lag (model's time unit, or samples without a time vector) up to which residuals stay correlated. */
  correlatedUpTo?: number;
  verdict: string;
}

export function residualDiagnostics(series: ResidualSeries, inputs: InputSignal[] = [], options: DiagnosticsOptions = {}): ResidualDiagnostics {
  const alpha = options.alpha ?? 0.05;
  const residual = residualOf(series.measured, series.simulated);
  let n = 0;
  for (const v of residual) if (Number.isFinite(v)) n++;
  if (n < MIN_SAMPLES_FOR_TESTS) {
    return { samples: n, inputsFollowed: [], verdict: RESIDUAL_VERDICTS.tooFewSamples(n) };
  }

  const dt = sampleInterval(series.time);
  const timeOfLag = (k: number) => (Number.isFinite(dt) ? k * dt : k);
  const unitOfLag = Number.isFinite(dt) ? options.timeUnit ?? '' : undefined;
  const say = (k: number) => formatQuantity(timeOfLag(k), unitOfLag === '' ? 'time units' : unitOfLag);

  const lTest = testLags(n);
  const lShow = displayLags(n);
  const r = autocorrelation(residual, lShow);
  // 95 % band of a white series' autocorrelation: +-1.96/sqrt(n) (Box & Jenkins, Time Series
  // Analysis, section 2.1.6, large-lag standard error under the white-noise hypothesis).
  const band = normalQuantile(0.975, 0, 1) / Math.sqrt(n);
  const lb = ljungBox(r, n, lTest);
  const white = lb.pValue >= alpha;
  const whiteness: WhitenessResult = { ljungBox: lb.q, lags: lTest, pValue: lb.pValue, white };

  let correlatedUpTo: number | undefined;
  let correlatedWords: string | undefined;
  if (!white) {
    // The time scale of the correlation: the run of lags from lag 1 whose r_k lies outside
    // Bartlett's band for a process correlated only up to lag k - 1, 1.96 sqrt((1 + 2 sum_{j<k}
    // r_j^2) / n) (Box & Jenkins, Time Series Analysis, section 6.2.2, standard error used to find
    // where a moving-average autocorrelation cuts off; quoted from memory). The band widens with
    // the correlation already seen, so the sampling wiggle of a slowly decaying autocorrelation
    // does not stretch the run; an oscillation ends it near its first zero crossing.
    const z = normalQuantile(1 - alpha / 2, 0, 1);
    let run = 0;
    let sumSq = 0;
    for (let k = 1; k < r.length; k++) {
      if (Math.abs(r[k]) <= z * Math.sqrt((1 + 2 * sumSq) / n)) break;
      run = k;
      sumSq += r[k] * r[k];
    }
    if (run > 0) {
      correlatedUpTo = timeOfLag(run);
      // A run reaching the last fifth of the lags examined: the time scale may lie beyond them.
      correlatedWords =
        run > 0.8 * lShow
          ? RESIDUAL_VERDICTS.correlatedBeyond(say(run), say(lShow))
          : RESIDUAL_VERDICTS.correlatedUpTo(say(run));
    } else {
      // No run from lag 1: the test sums many small correlations. Name the strongest lag of the
      // test, without claiming that the residuals stay correlated up to it.
      let at = 1;
      for (let k = 2; k <= lTest; k++) if (Math.abs(r[k]) > Math.abs(r[at])) at = k;
      correlatedWords = RESIDUAL_VERDICTS.weaklyCorrelated(lb.pValue, say(at));
    }
  }

  const inputCorrelation: InputCorrelation[] = [];
  const inputsFollowed: string[] = [];
  const followedWords: string[] = [];
  for (const input of inputs) {
    const ru = autocorrelation(input.values, lShow);
    const rx = crossCorrelation(residual, input.values, lShow);
    // Variance of a cross-correlation between two independent series: Bartlett's formula,
    // (1/n) sum_j r_ee(j) r_uu(j) (Box & Jenkins, Time Series Analysis, section 11.1.3; quoted from
    // memory). It reduces to 1/n when the residuals are white; a slow input with correlated
    // residuals widens the band instead of raising a false alarm. Never narrower than 1/n.
    let s = 1;
    for (let j = 1; j < Math.min(r.length, ru.length); j++) s += 2 * r[j] * ru[j];
    const sd = Math.sqrt(Math.max(1, s) / n);
    const inputBand = normalQuantile(0.975, 0, 1) * sd;
    let maxAbs = 0;
    let at = 0;
    rx.forEach((v, k) => {
      if (Math.abs(v) > maxAbs) {
        maxAbs = Math.abs(v);
        at = k;
      }
    });
    inputCorrelation.push({ input: input.name, maxAbs, lag: timeOfLag(at), band: inputBand });
    // Decision over all lags at once: Bonferroni over the rx.length lags looked at, so that one lag
    // in twenty crossing the per-lag band by chance does not blame the input.
    const threshold = normalQuantile(1 - alpha / (2 * rx.length), 0, 1) * sd;
    if (maxAbs > threshold) {
      inputsFollowed.push(input.name);
      followedWords.push(RESIDUAL_VERDICTS.followsInput(input.name, maxAbs, say(at)));
    }
  }

  const parts = [white ? RESIDUAL_VERDICTS.white : correlatedWords!];
  if (followedWords.length) parts.push(...followedWords);
  return {
    samples: n,
    whiteness,
    autocorrelation: { lagStep: Number.isFinite(dt) ? dt : 1, values: r, band },
    inputCorrelation: inputs.length ? inputCorrelation : undefined,
    inputsFollowed,
    correlatedUpTo,
    verdict: parts.join('; '),
  };
}
