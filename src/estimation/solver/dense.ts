/** Small dense-vector helpers for the solver (the matrix work itself is ml-matrix's). */
import { Matrix } from 'ml-matrix';
import type { JacobianInput } from './types.js';

/** The caller's Jacobian as an ml-matrix Matrix of nRows x nCols, checked for shape. */
export function toJacobianMatrix(j: JacobianInput, nRows: number, nCols: number): Matrix {
  let m: Matrix;
  if (j instanceof Matrix) {
    m = j;
  } else if (j instanceof Float64Array) {
    if (j.length !== nRows * nCols) {
      throw new Error(`Jacobian has ${j.length} entries, expected ${nRows} x ${nCols}`);
    }
    m = new Matrix(nRows, nCols);
    for (let i = 0; i < nRows; i++) {
      for (let k = 0; k < nCols; k++) m.set(i, k, j[i * nCols + k] as number);
    }
  } else {
    m = new Matrix(nRows, nCols);
    if (j.length !== nRows) throw new Error(`Jacobian has ${j.length} rows, expected ${nRows}`);
    for (let i = 0; i < nRows; i++) {
      const src = j[i] as ArrayLike<number>;
      if (src.length !== nCols) throw new Error(`Jacobian row ${i} has ${src.length} entries, expected ${nCols}`);
      for (let k = 0; k < nCols; k++) m.set(i, k, src[k] as number);
    }
  }
  if (m.rows !== nRows || m.columns !== nCols) {
    throw new Error(`Jacobian is ${m.rows} x ${m.columns}, expected ${nRows} x ${nCols}`);
  }
  return m;
}

export function allFinite(v: ArrayLike<number>): boolean {
  for (let i = 0; i < v.length; i++) if (!Number.isFinite(v[i] as number)) return false;
  return true;
}

export function matrixAllFinite(m: Matrix): boolean {
  for (let i = 0; i < m.rows; i++) if (!allFinite(m.getRow(i))) return false;
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

/** J v for a subset of J's columns (`cols`), v indexed like `cols`. */
export function multiplyColumns(j: Matrix, cols: readonly number[], v: ArrayLike<number>): Float64Array {
  const out = new Float64Array(j.rows);
  for (let i = 0; i < j.rows; i++) {
    let s = 0;
    for (let k = 0; k < cols.length; k++) s += j.get(i, cols[k] as number) * (v[k] as number);
    out[i] = s;
  }
  return out;
}

/** J^T r (one entry per column of J). */
export function transposeTimes(j: Matrix, r: ArrayLike<number>): Float64Array {
  const out = new Float64Array(j.columns);
  for (let i = 0; i < j.rows; i++) {
    const ri = r[i] as number;
    if (ri === 0) continue;
    for (let k = 0; k < j.columns; k++) out[k] += j.get(i, k) * ri;
  }
  return out;
}

/** Euclidean norm of each column of J. */
export function columnNorms(j: Matrix): Float64Array {
  const out = new Float64Array(j.columns);
  for (let k = 0; k < j.columns; k++) out[k] = norm2(j.getColumn(k));
  return out;
}
