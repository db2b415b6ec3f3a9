/**
 * Ljung-Box portmanteau test of whiteness: Q = n (n + 2) sum_{k=1}^{L} r_k^2 / (n - k), compared with
 * a chi-square distribution with L degrees of freedom (Ljung & Box, "On a measure of lack of fit in
 * time series models", Biometrika 65 (1978) 297-303).
 *
 * Degrees of freedom: L, without subtracting the number of fitted parameters. That subtraction is
 * for residuals of fitted ARMA models; our parameters are physical and do not shape the residual
 * autocorrelation in that way (statsmodels' acorr_ljungbox uses the same default, model_df = 0).
 */
import chisquareCdf from '@stdlib/stats-base-dists-chisquare-cdf';

export interface LjungBox {
  q: number;
  lags: number;
  pValue: number;
}

/**
 * @param r autocorrelation r_0..r_L (at least L + 1 values)
 * @param n number of (present) samples the autocorrelation came from
 * @param lags L
 */
export function ljungBox(r: readonly number[], n: number, lags: number): LjungBox {
  if (lags < 1 || r.length < lags + 1 || n <= lags) throw new RangeError(`Ljung-Box needs 1 <= lags < n and lags + 1 autocorrelations (lags ${lags}, n ${n}, r ${r.length})`);
  let s = 0;
  for (let k = 1; k <= lags; k++) s += (r[k] * r[k]) / (n - k);
  const q = n * (n + 2) * s;
  const pValue = Math.min(1, Math.max(0, 1 - chisquareCdf(q, lags)));
  return { q, lags, pValue };
}
