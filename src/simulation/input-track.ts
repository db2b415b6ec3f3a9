/**
 * One logged input as a function of model time: linear interpolation (with its slope, for the
 * sensitivities of a delay) or zero-order hold, shifted by a transport delay. Before the first
 * sample the first value holds, after the last sample the last value holds (slope 0 outside).
 *
 * Lookups walk a cursor from the previous position (the integrator moves forward in small steps)
 * and fall back to binary search on long jumps, so evaluation costs O(1) on average.
 */
export class InputTrack {
  private cursor = 0;
  constructor(
    readonly time: Float64Array,
    readonly values: Float64Array,
    readonly hold: boolean,
    /** Transport delay in model time units; updated per simulation when it is a parameter. */
    public delay: number,
  ) {}

  /** Index k with time[k] <= s < time[k+1]; -1 before the first sample; n-1 at or after the last. */
  private locate(s: number): number {
    const time = this.time;
    const n = time.length;
    if (s < time[0]) return -1;
    if (s >= time[n - 1]) return n - 1;
    let c = this.cursor;
    if (time[c] <= s) {
      if (s < time[c + 1]) return c;
      if (c + 2 < n && s < time[c + 2]) return (this.cursor = c + 1);
    } else if (c > 0 && time[c - 1] <= s) {
      return (this.cursor = c - 1);
    }
    // Binary search: time[lo] <= s < time[hi].
    let lo = 0;
    let hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (time[mid] <= s) lo = mid;
      else hi = mid;
    }
    return (this.cursor = lo);
  }

  /** Value at model time t (right-continuous for hold inputs). */
  value(t: number): number {
    const s = t - this.delay;
    const k = this.locate(s);
    if (k < 0) return this.values[0];
    const n = this.time.length;
    if (this.hold || k === n - 1) return this.values[k];
    const t0 = this.time[k];
    const v0 = this.values[k];
    return v0 + ((this.values[k + 1] - v0) * (s - t0)) / (this.time[k + 1] - t0);
  }

  /** d value / dt at model time t (0 for hold inputs and outside the log). */
  slope(t: number): number {
    if (this.hold) return 0;
    const s = t - this.delay;
    const k = this.locate(s);
    if (k < 0 || k === this.time.length - 1) return 0;
    return (this.values[k + 1] - this.values[k]) / (this.time[k + 1] - this.time[k]);
  }

  /**
   * Value into u[j] and slope into udot[j] at model time t, with one lookup. The slope jumps at
   * each sample: `side` -1 takes the slope of the interval that ends at a sample when t is (within
   * rounding of) that sample shifted by the delay, otherwise that of the interval that starts
   * there. Within rounding matters because the integrator's step ends on sample + delay, computed
   * in floating point, and t - delay need not give the sample time back exactly.
   */
  fill(t: number, u: Float64Array, udot: Float64Array, j: number, side = 0): void {
    const s = t - this.delay;
    let k = this.locate(s);
    const n = this.time.length;
    const time = this.time;
    const near = 16 * Number.EPSILON * (Math.abs(t) + Math.abs(this.delay));
    if (this.hold) {
      // Hold inputs keep their exact right-continuous lookup (segments end at their jumps).
    } else if (side < 0) {
      if (k >= 0 && s - time[k] <= near) k--;
    } else if (k + 1 < n && time[k + 1] - s <= near) {
      k++;
    }
    if (k < 0) {
      u[j] = this.values[0];
      udot[j] = 0;
    } else if (this.hold || k === n - 1) {
      u[j] = this.values[k];
      udot[j] = 0;
    } else {
      const t0 = this.time[k];
      const v0 = this.values[k];
      const slope = (this.values[k + 1] - v0) / (this.time[k + 1] - t0);
      u[j] = v0 + slope * (s - t0);
      udot[j] = slope;
    }
  }

  /**
   * Model times where a hold input changes value (sample time + delay), strictly inside (from, to).
   * Linear inputs have none: they are continuous.
   */
  jumpTimes(from: number, to: number): number[] {
    if (!this.hold) return [];
    const out: number[] = [];
    const { time, values } = this;
    for (let k = 1; k < time.length; k++) {
      if (values[k] === values[k - 1]) continue;
      const tau = time[k] + this.delay;
      if (tau > from && tau < to) out.push(tau);
    }
    return out;
  }
}
