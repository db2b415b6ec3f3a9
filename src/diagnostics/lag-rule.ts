/**
 * How many lags the residual tests look at. Two numbers, because they answer two questions:
 * - the Ljung-Box test uses few lags (too many dilute its power): min(10*log10(n), n/4), the default
 *   maximum lag of R's `acf` (R documentation, stats::acf, "lag.max"), capped at n/4 so that every
 *   lag still has three quarters of the samples behind it (common practice, no source);
 * - the autocorrelation shown in reports and used to say "correlated up to ... s" reaches further
 *   (up to 250 lags, never beyond n/4), so that a slow misfit can be located in time
 *   (common practice, no source; 250 keeps a 200,000-sample log under ~0.1 s per output).
 */

/** Below this many present samples the tests say nothing (common practice, no source). */
export const MIN_SAMPLES_FOR_TESTS = 10;

/** The longest autocorrelation lag computed for display and for `correlatedUpTo`. */
const MAX_DISPLAY_LAGS = 250;

/** Lags of the Ljung-Box test for `n` present samples (at least 1). */
export function testLags(n: number): number {
  if (n < 2) return 0;
  return Math.max(1, Math.min(Math.floor(10 * Math.log10(n)), Math.floor(n / 4)));
}

/** Lags of the displayed autocorrelation and of the input cross-correlation. */
export function displayLags(n: number): number {
  if (n < 2) return 0;
  return Math.max(testLags(n), Math.min(MAX_DISPLAY_LAGS, Math.floor(n / 4)));
}
