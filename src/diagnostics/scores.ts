/**
 * Fit quality of one output: RMSE, NRMSE and R^2 over the samples where both the measurement and
 * the simulation are present (a missing measurement is skipped and counted, never filled).
 */

export interface SeriesScore {
  /** Samples with both a measured and a simulated value. */
  samples: number;
  /** Samples skipped because one of the two is missing (NaN). */
  missing: number;
  /** Root-mean-square of measured - simulated, in the output's unit. */
  rmse: number;
  /**
   * RMSE over the standard deviation of the measurement (both with divisor n), so that
   * nrmse = sqrt(1 - r2). NaN when the measurement is constant.
   */
  nrmse: number;
  /** Coefficient of determination 1 - SSE/SST (can be negative for a model worse than the mean). NaN when the measurement is constant. */
  r2: number;
  /**
   * The measurement's one value when every scored sample has it: R^2 and NRMSE are then not defined
   * (no variance to explain), and are NaN; RMSE still is.
   */
  constantValue?: number;
}

export function scoreSeries(measured: ArrayLike<number>, simulated: ArrayLike<number>): SeriesScore {
  const n = Math.min(measured.length, simulated.length);
  let count = 0;
  let sumY = 0;
  let lowest = Infinity;
  let highest = -Infinity;
  for (let i = 0; i < n; i++) {
    const y = measured[i];
    const s = simulated[i];
    if (Number.isFinite(y) && Number.isFinite(s)) {
      count++;
      sumY += y;
      lowest = Math.min(lowest, y);
      highest = Math.max(highest, y);
    }
  }
  const missing = Math.max(measured.length, simulated.length) - count;
  if (count === 0) return { samples: 0, missing, rmse: NaN, nrmse: NaN, r2: NaN };
  const mean = sumY / count;
  let sse = 0;
  let sst = 0;
  for (let i = 0; i < n; i++) {
    const y = measured[i];
    const s = simulated[i];
    if (Number.isFinite(y) && Number.isFinite(s)) {
      sse += (y - s) * (y - s);
      sst += (y - mean) * (y - mean);
    }
  }
  const rmse = Math.sqrt(sse / count);
  // A constant log is tested on its values, not on SST: the rounding of the mean leaves SST a tiny
  // positive number (1e-30 for a log of 0.1), and 1 - SSE/SST then comes out near -1e26.
  if (lowest === highest) return { samples: count, missing, rmse, nrmse: NaN, r2: NaN, constantValue: lowest };
  const std = Math.sqrt(sst / count);
  return {
    samples: count,
    missing,
    rmse,
    nrmse: std > 0 ? rmse / std : NaN,
    r2: sst > 0 ? 1 - sse / sst : NaN,
  };
}

/** measured - simulated, NaN where either is missing. */
export function residualOf(measured: ArrayLike<number>, simulated: ArrayLike<number>): Float64Array {
  const n = Math.min(measured.length, simulated.length);
  const e = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const y = measured[i];
    const s = simulated[i];
    e[i] = Number.isFinite(y) && Number.isFinite(s) ? y - s : NaN;
  }
  return e;
}
