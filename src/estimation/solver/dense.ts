/** Small dense-vector helpers for the solver (the matrix work itself is ml-matrix's). */
import { Matrix } from 'ml-matrix';

export function allFinite(v: ArrayLike<number>): boolean {
  for (let i = 0; i < v.length; i++) if (!Number.isFinite(v[i] as number)) return false;
  return true;
}

/** Euclidean norm, scaled to avoid overflow and underflow (residuals can be 1e-13 or 1e200). */
export function norm2(v: ArrayLike<number>): number {
  let scale = 0;
  let ssq = 1;
  for (let i = 0; i < v.length; i++) {
    const a = Math.abs(v[i] as number);
    if (a === 0) continue;
    if (scale < a) {
      ssq = 1 + ssq * (scale / a) * (scale / a);
      scale = a;
    } else {
      ssq += (a / scale) * (a / scale);
    }
  }
  return scale * Math.sqrt(ssq);
}

/** ||d .* v||. */
export function scaledNorm(d: ArrayLike<number>, v: ArrayLike<number>): number {
  const w = new Float64Array(v.length);
  for (let i = 0; i < v.length; i++) w[i] = (d[i] as number) * (v[i] as number);
  return norm2(w);
}

/** Solve R x = b for upper-triangular R (back substitution). */
export function solveUpper(r: Matrix, b: ArrayLike<number>): Float64Array {
  const n = r.columns;
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i] as number;
    for (let k = i + 1; k < n; k++) s -= r.get(i, k) * (x[k] as number);
    x[i] = s / r.get(i, i);
  }
  return x;
}

/** Solve R^T x = b for upper-triangular R (forward substitution). */
export function solveUpperTransposed(r: Matrix, b: ArrayLike<number>): Float64Array {
  const n = r.columns;
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = b[i] as number;
    for (let k = 0; k < i; k++) s -= r.get(k, i) * (x[k] as number);
    x[i] = s / r.get(i, i);
  }
  return x;
}
