/**
 * Gross errors in a logged column: a logger's over-range marker (9.9e37), one wild cell. Fitted as
 * data, one of them decides the answer; they must never pass silently. A sample is a gross error
 * when all of these hold (only gross errors, never noise or physics, are meant; the factors are far
 * beyond the usual ones of the methods: common practice, no source):
 * 1. it lies far outside the column's bulk (outsideBulk): the only test for rows of a static model,
 *    which have no order;
 * 2. in a time series, the Hampel identifier flags it (Hampel 1974; on process data: Pearson 2002,
 *    "Outliers in process modeling and identification", IEEE Trans. Control Syst. Technol. 10(1)):
 *    its deviation from the median of its window of 2 HALF_WINDOW + 1 samples is more than
 *    GROSS_FACTOR times the robust spread of all such deviations (1.4826 MAD). Steps, ramps and
 *    smooth transients move the running median with them and are not flagged;
 * 3. it stands apart from the other samples of its window (isolated): a fast physical transient
 *    stays connected to its neighbours, an error does not. Runs of up to HALF_WINDOW are caught.
 */
import quickselect from 'quickselect';

/** Half the width of the running window, in samples: runs of up to this many bad samples are caught. */
const HALF_WINDOW = 3;
/** A sample is a gross error when it deviates by more than this many robust spreads. */
export const GROSS_FACTOR = 100;
/** How far apart from its window's other samples an error stands (see isolated). */
const ISOLATION = 10;
/** Within HALF_WINDOW samples of either end of a time series, the limit is this many times larger. */
const EDGE_FACTOR = 100;
/** And it lies this many times farther from the column's median than the column's bulk (outsideBulk). */
export const BULK_FACTOR = 10;

/** Indices of the gross errors among the finite values of `values` (NaN marks a missing sample). */
export function grossOutliers(values: Float64Array, ordered: boolean): number[] {
  const { x, indexOf } = finiteValues(values);
  if (x.length < 2 * HALF_WINDOW + 2) return [];
  const far = outsideBulk(x);
  if (!ordered || far.length === 0) return far.map(indexOf);
  const dev = deviationsFromRunningMedian(x);
  const limit = GROSS_FACTOR * robustSpread(dev, x);
  const candidates = far.filter((k) => {
    // Near the ends the window cannot be centred: on a ramp the end sample sits at the window's edge
    // and deviates by a few steps of the signal itself, so there only a far larger deviation counts.
    const edge = k < HALF_WINDOW || k >= dev.length - HALF_WINDOW;
    return Math.abs(dev[k]) > (edge ? EDGE_FACTOR * limit : limit);
  });
  const set = new Set(candidates);
  return candidates.filter((k) => isolated(x, dev, k, set)).map(indexOf);
}

/** The finite values in order, and the map back to the column's indices (no copy when none is missing). */
function finiteValues(values: Float64Array): { x: Float64Array; indexOf: (k: number) => number } {
  let finite = 0;
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) finite++;
  if (finite === values.length) return { x: values, indexOf: (k) => k };
  const x = new Float64Array(finite);
  const idx = new Int32Array(finite);
  for (let i = 0, k = 0; i < values.length; i++) {
    if (!Number.isFinite(values[i])) continue;
    x[k] = values[i];
    idx[k++] = i;
  }
  return { x, indexOf: (k) => idx[k] };
}

/**
 * Samples far outside the column's bulk: their distance from the column's median is more than
 * BULK_FACTOR times the 95th percentile of all distances (a level that every real signal reaches
 * often, while up to 5 % of the samples may be bad). In a column that sits on its median 95 % of the
 * time, the scale is the smallest distance of the others (a level the signal really takes).
 * Quantiles by selection, not sorting: this runs on every column of every log.
 */
function outsideBulk(x: Float64Array): number[] {
  const centre = quantile(Float64Array.from(x), 0.5);
  const dist = x.map((v) => Math.abs(v - centre));
  let scale = quantile(Float64Array.from(dist), 0.95);
  if (!(scale > 0)) {
    scale = Infinity;
    for (const d of dist) if (d > 0 && d < scale) scale = d;
  }
  if (!(scale > 0 && scale < Infinity)) return [];
  const out: number[] = [];
  for (let k = 0; k < dist.length; k++) if (dist[k] > BULK_FACTOR * scale) out.push(k);
  return out;
}

/** The q-quantile (lower order statistic) of v; reorders v. */
function quantile(v: Float64Array, q: number): number {
  const k = Math.floor(q * (v.length - 1));
  quickselect(v as unknown as number[], k);
  return v[k];
}

/**
 * A physical feature narrower than the window (a fast transient) deviates from the running median
 * too, but stays connected to its neighbours; an error stands apart from them: its deviation is
 * more than ISOLATION times the range of the window's other samples (other candidates left out).
 */
function isolated(x: Float64Array, dev: Float64Array, k: number, candidates: ReadonlySet<number>): boolean {
  const from = Math.min(Math.max(0, k - HALF_WINDOW), x.length - (2 * HALF_WINDOW + 1));
  let lo = Infinity;
  let hi = -Infinity;
  for (let j = from; j < from + 2 * HALF_WINDOW + 1; j++) {
    if (candidates.has(j)) continue;
    lo = Math.min(lo, x[j]);
    hi = Math.max(hi, x[j]);
  }
  return !(hi >= lo) || Math.abs(dev[k]) > ISOLATION * (hi - lo);
}

function deviationsFromRunningMedian(x: Float64Array): Float64Array {
  const n = x.length;
  const dev = new Float64Array(n);
  const win = new Float64Array(2 * HALF_WINDOW + 1);
  for (let i = 0; i < n; i++) {
    // The window is shifted inward at the ends, so that it always holds 2 HALF_WINDOW + 1 samples.
    const from = Math.min(Math.max(0, i - HALF_WINDOW), n - win.length);
    for (let k = 0; k < win.length; k++) win[k] = x[from + k];
    dev[i] = x[i] - smallMedian(win);
  }
  return dev;
}

/**
 * Median of a short odd-length array by insertion sort, in place: a library sort's call costs more
 * than the seven comparisons, and this runs once per sample of logs of a million rows.
 */
function smallMedian(w: Float64Array): number {
  for (let i = 1; i < w.length; i++) {
    const v = w[i];
    let j = i - 1;
    while (j >= 0 && w[j] > v) {
      w[j + 1] = w[j];
      j--;
    }
    w[j + 1] = v;
  }
  return w[w.length >> 1];
}

/**
 * The noise-like spread the deviations are judged against: 1.4826 MAD of the deviations (the
 * normal-consistent scale). A clean monotone stretch leaves every deviation from the running median
 * exactly zero; then the same scale of the first differences about their median (the noise between
 * neighbours), and for data with no spread at all a tiny fraction of their size, so that one bad
 * value in a constant column still stands out.
 */
function robustSpread(dev: Float64Array, x: Float64Array): number {
  const mad = 1.4826 * madOf(dev);
  if (mad > 0) return mad;
  const diffs = x.subarray(1).map((v, i) => v - x[i]);
  const madDiff = 1.4826 * madOf(diffs);
  if (madDiff > 0) return madDiff;
  return 1e-9 * Math.max(1, Math.abs(median(Float64Array.from(x))));
}

/** Median absolute deviation about the median. */
function madOf(v: Float64Array): number {
  const centre = median(Float64Array.from(v));
  return median(v.map((d) => Math.abs(d - centre)));
}

/** Median of the values (sorts its argument in place). */
function median(v: Float64Array): number {
  v.sort();
  const m = v.length >> 1;
  return v.length % 2 ? v[m] : 0.5 * (v[m - 1] + v[m]);
}
