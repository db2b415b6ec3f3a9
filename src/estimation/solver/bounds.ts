/**
 * Bounds for the solver: projection onto the box, and the entries held at a bound.
 *
 * An entry sitting on a bound while the cost would fall further outward is held there for the
 * step (left out of the trust-region subproblem): otherwise the step would spend its length on a
 * direction the projection removes, and the solver would stall on the bound.
 */

export function project(theta: ArrayLike<number>, lower: ArrayLike<number>, upper: ArrayLike<number>): { theta: number[]; clipped: boolean } {
  const out = new Array<number>(theta.length);
  let clipped = false;
  for (let i = 0; i < theta.length; i++) {
    const v = theta[i] as number;
    const lo = lower[i] as number;
    const hi = upper[i] as number;
    if (v < lo) {
      out[i] = lo;
      clipped = true;
    } else if (v > hi) {
      out[i] = hi;
      clipped = true;
    } else {
      out[i] = v;
    }
  }
  return { theta: out, clipped };
}

/**
 * Entries free to move in this iteration. `gradient` is J^T r (half the gradient of the SSE); the
 * cost falls along -gradient, so an entry on its lower bound with gradient > 0, or on its upper
 * bound with gradient < 0, is held.
 */
export function movableEntries(theta: ArrayLike<number>, gradient: ArrayLike<number>, lower: ArrayLike<number>, upper: ArrayLike<number>): number[] {
  const free: number[] = [];
  for (let i = 0; i < theta.length; i++) {
    const v = theta[i] as number;
    const g = gradient[i] as number;
    if (v <= (lower[i] as number) && g > 0) continue;
    if (v >= (upper[i] as number) && g < 0) continue;
    free.push(i);
  }
  return free;
}

export function boundStatus(theta: ArrayLike<number>, lower: ArrayLike<number>, upper: ArrayLike<number>): (false | 'lower' | 'upper')[] {
  const out: (false | 'lower' | 'upper')[] = [];
  for (let i = 0; i < theta.length; i++) {
    const v = theta[i] as number;
    out.push(v <= (lower[i] as number) ? 'lower' : v >= (upper[i] as number) ? 'upper' : false);
  }
  return out;
}
