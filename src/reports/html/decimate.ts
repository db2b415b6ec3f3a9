/**
 * Reduces a long log for display: the samples are cut into `columns` equal spans of time (about one
 * per pixel column of the plot) and each span keeps its smallest and largest value, in time order.
 * The drawn line then covers exactly the same envelope as the full log, at a fraction of the size.
 * Missing samples (NaN) are left out. Logs short enough are returned whole.
 */
export interface XY {
  x: number[];
  y: number[];
}

export function decimateMinMax(time: ArrayLike<number>, values: ArrayLike<number>, columns = 800): XY {
  const n = Math.min(time.length, values.length);
  const out: XY = { x: [], y: [] };
  if (n <= 2 * columns) {
    for (let i = 0; i < n; i++) {
      if (Number.isFinite(values[i]) && Number.isFinite(time[i])) {
        out.x.push(time[i]);
        out.y.push(values[i]);
      }
    }
    return out;
  }
  let t0 = Infinity;
  let t1 = -Infinity;
  for (let i = 0; i < n; i++) {
    const t = time[i];
    if (t < t0) t0 = t;
    if (t > t1) t1 = t;
  }
  const span = t1 - t0 || 1;
  let column = -1;
  let iMin = -1;
  let iMax = -1;
  const flush = () => {
    if (iMin < 0) return;
    const first = Math.min(iMin, iMax);
    const last = Math.max(iMin, iMax);
    out.x.push(time[first]);
    out.y.push(values[first]);
    if (last !== first) {
      out.x.push(time[last]);
      out.y.push(values[last]);
    }
  };
  for (let i = 0; i < n; i++) {
    const v = values[i];
    const t = time[i];
    if (!Number.isFinite(v) || !Number.isFinite(t)) continue;
    const c = Math.min(columns - 1, Math.floor(((t - t0) / span) * columns));
    if (c !== column) {
      flush();
      column = c;
      iMin = i;
      iMax = i;
    } else {
      if (v < values[iMin]) iMin = i;
      if (v > values[iMax]) iMax = i;
    }
  }
  flush();
  return out;
}
