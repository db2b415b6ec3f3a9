/**
 * The triangular factor R of a tall J (and Q^T r with it) without ever holding Q.
 *
 * [J r] is reduced block by block: the triangle found so far is stacked on the next block of rows
 * and the stack is factorised again by ml-matrix's Householder QR. The product of those orthogonal
 * factors is one orthogonal Q with [J r] = Q [R qtr; 0 rho], so R is J's triangular factor and qtr
 * is Q^T r restricted to J's columns. Householder
 * reflections block by block are as stable as one reflection sweep over all rows (the sequential
 * form of tall-skinny QR).
 *
 * Why blocks: the single sweep needed the whole m x p matrix as ml-matrix rows plus Q (m x p) to
 * form Q^T r; on a 24,000-row Jacobian that was 0.4 s of a 2 s fit, most of it allocation.
 */
import { Matrix, QrDecomposition } from 'ml-matrix';
import type { RowMajorMatrix } from './row-major.js';

/**
 * A scratch stack that QrDecomposition may factor in place. QrDecomposition starts by cloning its
 * input, and Matrix.clone copies entry by entry through a generator that allocates an array per
 * entry: measured, that copy cost as much as the factorisation itself. The stack is built for one
 * factorisation and read through the decomposition only, so its "clone" is itself.
 */
class ScratchMatrix extends Matrix {
  override clone(): this {
    return this;
  }
}

/**
 * Rows of J added per factorisation. Measured on a 24,000 x 4 Jacobian with r: anything from 32 to
 * 8,192 rows per block takes 4-7 ms per factorisation, within the run-to-run spread.
 */
const BLOCK_ROWS = 512;

export interface TriangularFactor {
  /** p x p upper triangular, p = number of columns taken. */
  R: Matrix;
  /** Q^T r for those columns (length p); zeros when no r was given. */
  qtr: Float64Array;
}

/**
 * Factor the columns `cols` of J (all columns when omitted), with r as an extra column when given.
 * Fewer rows than columns are padded with zero rows, which change nothing.
 */
export function triangularFactor(j: RowMajorMatrix, cols?: readonly number[], r?: ArrayLike<number>): TriangularFactor {
  const take = cols ?? Array.from({ length: j.columns }, (_, k) => k);
  const p = take.length;
  const w = r ? p + 1 : p;
  const { rows, columns, data } = j;
  let top: Matrix | undefined; // the w x w triangle so far
  for (let start = 0; start < rows || top === undefined; start += BLOCK_ROWS) {
    const end = Math.min(rows, start + BLOCK_ROWS);
    const fromTop = top ? w : 0;
    const stack = new ScratchMatrix(Math.max(fromTop + Math.max(0, end - start), w), w);
    for (let i = 0; i < fromTop; i++) for (let k = i; k < w; k++) stack.set(i, k, top!.get(i, k));
    for (let i = start; i < end; i++) {
      const row = i - start + fromTop;
      const base = i * columns;
      for (let k = 0; k < p; k++) stack.set(row, k, data[base + take[k]!]!);
      if (r) stack.set(row, p, r[i] as number);
    }
    top = new QrDecomposition(stack).upperTriangularMatrix;
    if (rows === 0) break;
  }
  const R = new Matrix(p, p);
  const qtr = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    for (let k = i; k < p; k++) R.set(i, k, top!.get(i, k));
    if (r) qtr[i] = top!.get(i, p);
  }
  return { R, qtr };
}
