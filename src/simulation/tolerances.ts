/**
 * Integration tolerances. Relative 1e-8 by default: integration error stays far below any
 * realistic measurement noise (numerics.md, Integration).
 *
 * Absolute tolerance per state (the rule): atol_i = rtol * max(|x0_i|, 1e-3), so a state is resolved
 * to rtol relative to its initial magnitude, and to rtol * 1e-3 in its own unit when it starts at
 * zero (states of small magnitude in their declared unit, e.g. a current of a few mA, keep about
 * five correct digits even near zero crossings). A sensitivity dx_i/dp_k is of the size x_i / p_k,
 * so its absolute tolerance is atol_i / |p_k| (atol_i when p_k = 0).
 */
const DEFAULT_RTOL = 1e-8;
const ATOL_FLOOR = 1e-3;

export interface Tolerances {
  rtol: number;
  /** Plain array (odex tests Array.isArray), one entry per component of z = [x, S]. */
  atol: number[];
}

export function tolerances(
  rtolOption: number | undefined,
  atolOption: number | Float64Array | undefined,
  x0: Float64Array,
  nStates: number,
  p: Float64Array,
  slots: readonly number[],
): Tolerances {
  const rtol = rtolOption ?? DEFAULT_RTOL;
  const q = slots.length;
  const atol = new Array<number>(nStates * (1 + q));
  for (let i = 0; i < nStates; i++) {
    let a: number;
    if (atolOption === undefined) a = rtol * Math.max(Math.abs(x0[i]), ATOL_FLOOR);
    else if (typeof atolOption === 'number') a = atolOption;
    else a = atolOption[i];
    atol[i] = a;
    for (let k = 0; k < q; k++) {
      const pk = Math.abs(p[slots[k]]);
      atol[nStates + i * q + k] = pk > 0 ? a / pk : a;
    }
  }
  return { rtol, atol };
}
