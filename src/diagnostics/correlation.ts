/**
 * Sample auto- and cross-correlation of series that may have missing samples (NaN).
 *
 * Missing samples: each series is centred on the mean of its present samples, and a missing sample
 * then counts as zero, so a lag product enters the sum only where both samples are present. The
 * normaliser stays the sum of squares over the present samples. With no missing sample this is the
 * usual biased estimator r_k = sum_{t} d_t d_{t+k} / sum_t d_t^2 (Box & Jenkins, Time Series
 * Analysis, eq. 2.1.12); with missing samples it is what statsmodels calls missing="conservative".
 */

/** Centres `x` on the mean of its finite samples; missing samples become 0. Also counts them. */
function centreWithGaps(x: ArrayLike<number>): { d: Float64Array; present: number; sumSquares: number } {
  let sum = 0;
  let present = 0;
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    if (Number.isFinite(v)) {
      sum += v;
      present++;
    }
  }
  const mean = present > 0 ? sum / present : 0;
  const d = new Float64Array(x.length);
  let sumSquares = 0;
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    if (Number.isFinite(v)) {
      const c = v - mean;
      d[i] = c;
      sumSquares += c * c;
    }
  }
  return { d, present, sumSquares };
}

/** r_0..r_maxLag of `x` (r_0 = 1). All zeros when the series is constant or empty. */
export function autocorrelation(x: ArrayLike<number>, maxLag: number): number[] {
  const { d, sumSquares } = centreWithGaps(x);
  const n = d.length;
  const lags = Math.max(0, Math.min(maxLag, n - 1));
  const r = new Array<number>(lags + 1).fill(0);
  if (!(sumSquares > 0)) return r;
  for (let k = 0; k <= lags; k++) {
    let s = 0;
    for (let t = 0; t + k < n; t++) s += d[t] * d[t + k];
    r[k] = s / sumSquares;
  }
  return r;
}

/**
 * Cross-correlation r_k = corr(e_t, u_{t-k}) for k = 0..maxLag: the residual now against the input
 * now and earlier. Negative lags (input after the residual) are not examined: a model without
 * feedback cannot be blamed for input that has not happened yet.
 */
export function crossCorrelation(e: ArrayLike<number>, u: ArrayLike<number>, maxLag: number): number[] {
  const n = Math.min(e.length, u.length);
  const ce = centreWithGaps(e);
  const cu = centreWithGaps(u);
  const lags = Math.max(0, Math.min(maxLag, n - 1));
  const r = new Array<number>(lags + 1).fill(0);
  const norm = Math.sqrt(ce.sumSquares * cu.sumSquares);
  if (!(norm > 0)) return r;
  for (let k = 0; k <= lags; k++) {
    let s = 0;
    for (let t = k; t < n; t++) s += ce.d[t] * cu.d[t - k];
    r[k] = s / norm;
  }
  return r;
}
