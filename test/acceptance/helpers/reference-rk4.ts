/**
 * An integrator of the acceptance rigs' own, independent of rigcal's simulator: classical fixed-step
 * RK4 (any numerical-analysis text, e.g. Hairer, Norsett & Wanner, Solving ODEs I, sec. II.1), with
 * every input discontinuity taken as a step boundary. A `hold` input keeps each sample's value until the
 * next sample (zero-order hold); a delay shifts it later, so its jumps fall at t_i + delay, and those
 * times are breakpoints too. Inside a step a hold input is read at the step's midpoint, so the value
 * on the right of a jump is used over the whole step after it, exactly. Linear inputs are joined by
 * straight lines (kinks at the samples are breakpoints as well). Before the log starts, the first
 * sample's value holds.
 */

export interface InputSignal {
  times: Float64Array | number[];
  values: Float64Array | number[];
  kind: 'hold' | 'linear';
  /** Transport delay, same unit as times: u(t - delay). */
  delay?: number;
}

/** Index of the last sample time <= t (0 when t is before the first). */
function lastAtOrBefore(times: ArrayLike<number>, t: number): number {
  let lo = 0;
  let hi = times.length - 1;
  if (t < times[0]) return 0;
  if (t >= times[hi]) return hi;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (times[mid] <= t) lo = mid;
    else hi = mid;
  }
  return lo;
}

/** Value of an input at time t; `mid` picks the hold segment (the midpoint of the current step). */
export function inputAt(u: InputSignal, t: number, mid: number): number {
  const d = u.delay ?? 0;
  if (u.kind === 'hold') return u.values[lastAtOrBefore(u.times, mid - d)];
  const s = t - d;
  const n = u.times.length;
  if (s <= u.times[0]) return u.values[0];
  if (s >= u.times[n - 1]) return u.values[n - 1];
  const i = lastAtOrBefore(u.times, s);
  const f = (s - u.times[i]) / (u.times[i + 1] - u.times[i]);
  return u.values[i] + f * (u.values[i + 1] - u.values[i]);
}

export type Rhs = (t: number, x: Float64Array, u: Float64Array, dx: Float64Array) => void;

/**
 * Integrates x' = rhs(t, x, u(t)) from t0 with x0 and returns the state at every time of `at`
 * (increasing, >= t0). Steps never exceed hMax and never straddle a breakpoint.
 */
export function integrateRk4(rhs: Rhs, x0: number[], t0: number, at: ArrayLike<number>, inputs: InputSignal[], hMax: number): Float64Array[] {
  const n = x0.length;
  const nodes = new Set<number>([t0]);
  for (let i = 0; i < at.length; i++) nodes.add(at[i]);
  const tEnd = at[at.length - 1];
  for (const u of inputs) for (let i = 0; i < u.times.length; i++) {
    const b = u.times[i] + (u.delay ?? 0);
    if (b > t0 && b < tEnd) nodes.add(b);
  }
  const grid = [...nodes].sort((a, b) => a - b);
  const x = Float64Array.from(x0);
  const out: Float64Array[] = [];
  const uv = new Float64Array(inputs.length);
  const k1 = new Float64Array(n), k2 = new Float64Array(n), k3 = new Float64Array(n), k4 = new Float64Array(n), y = new Float64Array(n);
  const evalAt = (t: number, mid: number, xs: Float64Array, dx: Float64Array) => {
    for (let j = 0; j < inputs.length; j++) uv[j] = inputAt(inputs[j], t, mid);
    rhs(t, xs, uv, dx);
  };
  let k = 0;
  const record = (t: number) => {
    while (k < at.length && at[k] === t) {
      out.push(Float64Array.from(x));
      k++;
    }
  };
  record(grid[0]);
  for (let g = 0; g + 1 < grid.length; g++) {
    const a = grid[g];
    const b = grid[g + 1];
    const steps = Math.max(1, Math.ceil((b - a) / hMax - 1e-9));
    const h = (b - a) / steps;
    for (let s = 0; s < steps; s++) {
      const t = a + s * h;
      const mid = t + h / 2;
      evalAt(t, mid, x, k1);
      for (let i = 0; i < n; i++) y[i] = x[i] + 0.5 * h * k1[i];
      evalAt(mid, mid, y, k2);
      for (let i = 0; i < n; i++) y[i] = x[i] + 0.5 * h * k2[i];
      evalAt(mid, mid, y, k3);
      for (let i = 0; i < n; i++) y[i] = x[i] + h * k3[i];
      evalAt(t + h, mid, y, k4);
      for (let i = 0; i < n; i++) x[i] += (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]);
    }
    record(b);
  }
  return out;
}
