/**
 * The data generator's own integrator: classical fixed-step Runge-Kutta (4th order) between
 * breakpoints. Deliberately independent of rigcal's simulator (different method, no dense output,
 * no step control) so that the demo data check the simulator rather than repeat it.
 *
 * Breakpoints are the instants where an input jumps (hold inputs, shifted by their delay) or has a
 * kink (linear inputs): each segment between two breakpoints is integrated on its own with steps no
 * longer than `hmax`, so that no jump is smeared across a step.
 */

/** dx/dt into dx. `tSeg` is the midpoint of the current segment: hold inputs are looked up there. */
export type Rhs = (t: number, x: Float64Array, dx: Float64Array, tSeg: number) => void;

export interface IntegrationRequest {
  rhs: Rhs;
  x0: number[];
  /** Integration starts here (<= sampleTimes[0]). */
  start: number;
  sampleTimes: Float64Array;
  /** Jump or kink instants (any order, duplicates allowed; those outside the span are ignored). */
  breakpoints: number[];
  /** Longest step. */
  hmax: number;
}

/** States at the sample times: result[stateIndex][sampleIndex]. */
export function integrateRk4(req: IntegrationRequest): Float64Array[] {
  const n = req.x0.length;
  const times = req.sampleTimes;
  const end = times[times.length - 1];
  const stops = [...new Set([req.start, ...times, ...req.breakpoints.filter((b) => b > req.start && b < end)])].sort((a, b) => a - b);
  const out = Array.from({ length: n }, () => new Float64Array(times.length));
  const x = Float64Array.from(req.x0);
  const k1 = new Float64Array(n), k2 = new Float64Array(n), k3 = new Float64Array(n), k4 = new Float64Array(n);
  const tmp = new Float64Array(n);
  let sample = 0;
  const record = (t: number) => {
    while (sample < times.length && times[sample] === t) {
      for (let i = 0; i < n; i++) out[i][sample] = x[i];
      sample++;
    }
  };
  record(stops[0]);
  for (let s = 0; s + 1 < stops.length; s++) {
    const a = stops[s];
    const b = stops[s + 1];
    const tSeg = 0.5 * (a + b);
    const steps = Math.max(1, Math.ceil((b - a) / req.hmax - 1e-9));
    const h = (b - a) / steps;
    for (let j = 0; j < steps; j++) {
      const t = a + j * h;
      req.rhs(t, x, k1, tSeg);
      for (let i = 0; i < n; i++) tmp[i] = x[i] + 0.5 * h * k1[i];
      req.rhs(t + 0.5 * h, tmp, k2, tSeg);
      for (let i = 0; i < n; i++) tmp[i] = x[i] + 0.5 * h * k2[i];
      req.rhs(t + 0.5 * h, tmp, k3, tSeg);
      for (let i = 0; i < n; i++) tmp[i] = x[i] + h * k3[i];
      req.rhs(j === steps - 1 ? b : t + h, tmp, k4, tSeg);
      for (let i = 0; i < n; i++) x[i] += (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]);
    }
    record(b);
  }
  if (sample !== times.length) throw new Error(`integrateRk4: recorded ${sample} of ${times.length} samples`);
  return out;
}

/** Zero-order hold of logged samples: the value of the last sample at or before t (the first before the log). */
export function holdAt(times: Float64Array, values: Float64Array, t: number): number {
  if (t < times[0]) return values[0];
  let lo = 0, hi = times.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (times[mid] <= t) lo = mid; else hi = mid - 1;
  }
  return values[lo];
}

/** Straight lines between logged samples, constant beyond either end. */
export function linearAt(times: Float64Array, values: Float64Array, t: number): number {
  const last = times.length - 1;
  if (t <= times[0]) return values[0];
  if (t >= times[last]) return values[last];
  let lo = 0, hi = last;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (times[mid] <= t) lo = mid; else hi = mid;
  }
  const f = (t - times[lo]) / (times[hi] - times[lo]);
  return values[lo] + f * (values[hi] - values[lo]);
}

/** The instants where a hold signal changes value (each shifted by `delay`). */
export function holdJumps(times: Float64Array, values: Float64Array, delay = 0): number[] {
  const jumps: number[] = [];
  for (let k = 1; k < times.length; k++) if (values[k] !== values[k - 1]) jumps.push(times[k] + delay);
  return jumps;
}
