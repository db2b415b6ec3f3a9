/**
 * The Jacobian as the solver keeps it: one flat Float64Array, row by row.
 *
 * Why not an ml-matrix Matrix: a Matrix stores each row as its own array, and an ODE fit's
 * Jacobian is tall (24,000 x 4 on the flywheel demo). Held that way, converting, copying and
 * factorising it allocated about 100,000 small arrays per iteration, and the garbage collector
 * took a fifth of the fit's time. The tall products (J^T r, J v, column norms) run here on the
 * flat array; every factorisation is still ml-matrix's (see tall-qr.ts).
 */
import { Matrix } from 'ml-matrix';

export class RowMajorMatrix {
  constructor(
    readonly rows: number,
    readonly columns: number,
    /** Entry (i, k) at data[i * columns + k]. */
    readonly data: Float64Array,
  ) {
    if (data.length !== rows * columns) throw new Error(`matrix data has ${data.length} entries, expected ${rows} x ${columns}`);
  }

  static zeros(rows: number, columns: number): RowMajorMatrix {
    return new RowMajorMatrix(rows, columns, new Float64Array(rows * columns));
  }

  get(i: number, k: number): number {
    return this.data[i * this.columns + k]!;
  }

  clone(): RowMajorMatrix {
    return new RowMajorMatrix(this.rows, this.columns, this.data.slice());
  }
}

/** The forms a caller may hand over a Jacobian in. */
export type JacobianInput = RowMajorMatrix | Matrix | Float64Array | ArrayLike<number>[];

/**
 * The caller's Jacobian as a RowMajorMatrix of nRows x nCols, checked for shape. A flat
 * Float64Array or a RowMajorMatrix is used as it is (not copied): the solver never writes into it.
 */
export function toRowMajor(j: JacobianInput, nRows: number, nCols: number): RowMajorMatrix {
  let m: RowMajorMatrix;
  if (j instanceof RowMajorMatrix) {
    m = j;
  } else if (j instanceof Float64Array) {
    if (j.length !== nRows * nCols) throw new Error(`Jacobian has ${j.length} entries, expected ${nRows} x ${nCols}`);
    m = new RowMajorMatrix(nRows, nCols, j);
  } else if (j instanceof Matrix) {
    m = new RowMajorMatrix(j.rows, j.columns, Float64Array.from(j.to1DArray()));
  } else {
    if (j.length !== nRows) throw new Error(`Jacobian has ${j.length} rows, expected ${nRows}`);
    const data = new Float64Array(nRows * nCols);
    for (let i = 0; i < nRows; i++) {
      const src = j[i] as ArrayLike<number>;
      if (src.length !== nCols) throw new Error(`Jacobian row ${i} has ${src.length} entries, expected ${nCols}`);
      for (let k = 0; k < nCols; k++) data[i * nCols + k] = src[k] as number;
    }
    m = new RowMajorMatrix(nRows, nCols, data);
  }
  if (m.rows !== nRows || m.columns !== nCols) throw new Error(`Jacobian is ${m.rows} x ${m.columns}, expected ${nRows} x ${nCols}`);
  return m;
}

/** J^T r (one entry per column of J). */
export function transposeTimes(j: RowMajorMatrix, r: ArrayLike<number>): Float64Array {
  const { rows, columns: p, data } = j;
  const out = new Float64Array(p);
  for (let i = 0; i < rows; i++) {
    const ri = r[i] as number;
    if (ri === 0) continue;
    const base = i * p;
    for (let k = 0; k < p; k++) out[k]! += data[base + k]! * ri;
  }
  return out;
}

/** J v for a subset of J's columns (`cols`), v indexed like `cols`. */
export function multiplyColumns(j: RowMajorMatrix, cols: readonly number[], v: ArrayLike<number>): Float64Array {
  const { rows, columns: p, data } = j;
  const out = new Float64Array(rows);
  const q = cols.length;
  for (let i = 0; i < rows; i++) {
    const base = i * p;
    let s = 0;
    for (let k = 0; k < q; k++) s += data[base + cols[k]!]! * (v[k] as number);
    out[i] = s;
  }
  return out;
}

/**
 * Euclidean norm of each column of J, scaled against overflow and underflow like norm2 (one
 * running scale per column, in a single pass over the rows).
 */
export function columnNorms(j: RowMajorMatrix): Float64Array {
  const { rows, columns: p, data } = j;
  const scale = new Float64Array(p);
  const ssq = new Float64Array(p).fill(1);
  for (let i = 0; i < rows; i++) {
    const base = i * p;
    for (let k = 0; k < p; k++) {
      const a = Math.abs(data[base + k]!);
      if (a === 0) continue;
      const s = scale[k]!;
      if (s < a) {
        const t = s / a;
        ssq[k] = 1 + ssq[k]! * t * t;
        scale[k] = a;
      } else {
        const t = a / s;
        ssq[k]! += t * t;
      }
    }
  }
  const out = new Float64Array(p);
  for (let k = 0; k < p; k++) out[k] = scale[k]! * Math.sqrt(ssq[k]!);
  return out;
}
