/**
 * The block-by-block triangular factor against the definition of a QR factorisation: for
 * [J r] = Q [R qtr; 0 rho] with Q orthogonal, R^T R = J^T J, R^T qtr = J^T r and
 * |qtr|^2 <= |r|^2, with equality when r lies in J's column space (textbook identities, e.g. Golub and Van Loan, Matrix Computations,
 * ch. 5). Also against ml-matrix's single QR of the whole matrix (|R| agrees row by row up to sign).
 */
import { Matrix, QrDecomposition } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { columnNorms, multiplyColumns, RowMajorMatrix, transposeTimes } from '../../../src/estimation/solver/row-major.js';
import { triangularFactor } from '../../../src/estimation/solver/tall-qr.js';
import { mulberry32 } from '../../../src/util/random.js';

function randomTall(rows: number, cols: number, seed: number): { j: RowMajorMatrix; r: Float64Array } {
  const rand = mulberry32(seed);
  const data = new Float64Array(rows * cols);
  // Columns of very different scale, as a Jacobian in physical units has.
  for (let i = 0; i < rows; i++) for (let k = 0; k < cols; k++) data[i * cols + k] = (rand() - 0.5) * 10 ** (k - 2);
  const r = Float64Array.from({ length: rows }, () => rand() - 0.5);
  return { j: new RowMajorMatrix(rows, cols, data), r };
}

function rtr(R: Matrix, a: number, b: number): number {
  let s = 0;
  for (let i = 0; i <= Math.min(a, b); i++) s += R.get(i, a) * R.get(i, b);
  return s;
}

describe('triangularFactor', () => {
  // 1,537 rows: three full blocks and a partial one; 3 rows: fewer rows than columns + 1.
  for (const rows of [1537, 512, 40, 3]) {
    it(`satisfies R^T R = J^T J, R^T qtr = J^T r and |qtr| <= |r| (${rows} rows)`, () => {
      const cols = 4;
      const { j, r } = randomTall(rows, cols, 7 + rows);
      const { R, qtr } = triangularFactor(j, undefined, r);
      expect(R.rows).toBe(cols);
      for (let a = 0; a < cols; a++) {
        for (let i = a + 1; i < cols; i++) expect(R.get(i, a)).toBe(0);
        for (let b = 0; b < cols; b++) {
          let jtj = 0;
          for (let i = 0; i < rows; i++) jtj += j.get(i, a) * j.get(i, b);
          expect(Math.abs(rtr(R, a, b) - jtj)).toBeLessThanOrEqual(1e-12 * Math.sqrt(rtr(R, a, a) * rtr(R, b, b)) + 1e-300);
        }
      }
      const jtr = transposeTimes(j, r);
      for (let a = 0; a < cols; a++) {
        let s = 0;
        for (let i = 0; i <= a; i++) s += R.get(i, a) * qtr[i]!;
        expect(s).toBeCloseTo(jtr[a]!, 10);
      }
      const rr = r.reduce((s, v) => s + v * v, 0);
      const qq = qtr.reduce((s, v) => s + v * v, 0);
      expect(qq).toBeLessThanOrEqual(rr * (1 + 1e-12));
      if (rows <= cols) expect(qq).toBeCloseTo(rr, 12); // r lies in the span: Q^T r keeps all of it
      else expect(qq).toBeLessThan(0.5 * rr); // random r, 4 of many directions: most of it is outside
    });
  }

  it('agrees with one ml-matrix QR of the whole matrix, and factors a subset of columns', () => {
    const { j } = randomTall(2000, 5, 3);
    const cols = [0, 2, 4];
    const whole = new Matrix(2000, 3);
    for (let i = 0; i < 2000; i++) cols.forEach((c, k) => whole.set(i, k, j.get(i, c)));
    const ref = new QrDecomposition(whole).upperTriangularMatrix;
    const { R } = triangularFactor(j, cols);
    for (let i = 0; i < 3; i++) {
      const sign = Math.sign(R.get(i, i)) * Math.sign(ref.get(i, i));
      for (let k = i; k < 3; k++) expect(sign * R.get(i, k)).toBeCloseTo(ref.get(i, k), 10);
    }
  });
});

describe('row-major products', () => {
  it('match entry-by-entry sums, and column norms survive entries near overflow and underflow', () => {
    const { j, r } = randomTall(100, 3, 11);
    const g = transposeTimes(j, r);
    const v = [0.5, -2, 3];
    const jv = multiplyColumns(j, [0, 1, 2], v);
    for (let k = 0; k < 3; k++) {
      let s = 0;
      for (let i = 0; i < 100; i++) s += j.get(i, k) * r[i]!;
      expect(g[k]).toBeCloseTo(s, 12);
    }
    for (let i = 0; i < 100; i++) expect(jv[i]).toBeCloseTo(j.get(i, 0) * 0.5 - 2 * j.get(i, 1) + 3 * j.get(i, 2), 12);
    const extreme = new RowMajorMatrix(2, 2, Float64Array.from([3e200, 3e-200, 4e200, 4e-200]));
    const n = columnNorms(extreme);
    expect(n[0]! / 5e200).toBeCloseTo(1, 14);
    expect(n[1]! / 5e-200).toBeCloseTo(1, 14);
  });
});
