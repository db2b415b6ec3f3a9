/** Excitation signals for the demo tests: steps, PRBS, chirp, band-limited noise. */
import type { SeededRandom as Rng } from '../../src/util/random.js';

export function sampleTimes(n: number, dt: number, t0 = 0): Float64Array {
  // k*dt rather than accumulating, rounded to 12 digits so that the file shows clean decimals and
  // the times integrated are exactly the times written.
  return Float64Array.from({ length: n }, (_, k) => Number((t0 + k * dt).toPrecision(12)));
}

/** Piecewise-constant steps: `levels[i]` from `at[i]` on (level 0 before the first). */
export function steps(times: Float64Array, at: number[], levels: number[]): Float64Array {
  return times.map((t) => {
    let v = 0;
    for (let i = 0; i < at.length; i++) if (t >= at[i] - 1e-12) v = levels[i];
    return v;
  });
}

/**
 * Pseudo-random binary sequence from a maximal-length linear feedback shift register (x^9 + x^5 + 1,
 * period 511 bits), one bit every `bitTime`; values `low` / `high`.
 */
export function prbs(times: Float64Array, bitTime: number, low: number, high: number, seed = 0x1ff): Float64Array {
  let reg = seed & 0x1ff || 1;
  const bits: number[] = [];
  const nBits = Math.ceil((times[times.length - 1] - times[0]) / bitTime) + 2;
  for (let i = 0; i < nBits; i++) {
    const bit = ((reg >> 8) ^ (reg >> 4)) & 1;
    reg = ((reg << 1) | bit) & 0x1ff;
    bits.push(bit);
  }
  return times.map((t) => (bits[Math.floor((t - times[0]) / bitTime + 1e-9)] ? high : low));
}

/** Linear chirp (swept sine) from f0 to f1 Hz over `duration`, amplitude `amp`, with a short fade in and out. */
export function chirp(times: Float64Array, f0: number, f1: number, duration: number, amp: number): Float64Array {
  const rate = (f1 - f0) / duration;
  const fade = 0.05 * duration;
  return times.map((t) => {
    if (t < 0 || t > duration) return 0;
    const env = Math.min(1, t / fade, (duration - t) / fade);
    return amp * env * Math.sin(2 * Math.PI * (f0 * t + 0.5 * rate * t * t));
  });
}

/** Gaussian noise smoothed by a first-order low-pass (time constant tau), scaled to standard deviation `std`. */
export function lowPassNoise(times: Float64Array, tau: number, std: number, rng: Rng): Float64Array {
  const out = new Float64Array(times.length);
  let y = 0;
  for (let k = 0; k < times.length; k++) {
    const dt = k ? times[k] - times[k - 1] : 0;
    const a = Math.exp(-dt / tau);
    y = a * y + Math.sqrt(1 - a * a) * rng.normal();
    out[k] = std * y;
  }
  return out;
}

/** Round to `digits` significant digits, as a logger would write them. */
export function roundTo(values: Float64Array, digits: number): Float64Array {
  return values.map((v) => (v === 0 || !Number.isFinite(v) ? v : Number(v.toPrecision(digits))));
}
