/**
 * Singular value decomposition of the column-scaled Jacobian, shared by the covariance
 * (uncertainty.ts) and the identifiability analysis (identifiability.ts).
 *
 * Columns are scaled to unit length first, so that the singular values measure how well
 * combinations of parameters are determined regardless of their units: J_s = J diag(1/d),
 * d = column norms (a zero column, or one without influence, shows up as a zero singular value).
 */
import { Matrix, SingularValueDecomposition } from 'ml-matrix';
import { columnNorms, type RowMajorMatrix } from './row-major.js';
import { triangularFactor } from './tall-qr.js';

/**
 * A singular value below this fraction of the largest marks a direction the data do not determine.
 * Why 1e-6: Jacobians from sensitivity equations integrated with relative tolerance 1e-8 carry
 * relative errors of about 1e-8, so singular values below about 1e-7 cannot be told from zero; 1e-6
 * keeps a factor of 100 above that floor. A direction at 1e-6 has a standard error a million times
 * that of the best determined direction (in scaled units): for a physical parameter, undetermined.
 * The worst NIST StRD problems stay well above it, as they must, since NIST certifies their
 * standard deviations: at the certified optimum the scaled condition numbers are 1e4 (Lanczos1-3),
 * 3e3 (MGH10) and 6e4 (Bennett5), i.e. smallest singular values of 1e-4 to 2e-5 of the largest.
 */
export const SINGULAR_THRESHOLD = 1e-6;

/**
 * A parameter takes part in a weak direction when its component in the (unit) right singular vector
 * is at least this large. Its share of the direction is then at least 1e-4, and the direction
 * inflates its variance by at least 1e-4 / (1e-6)^2 = 1e8 times the best-determined variance.
 */
export const NULL_COMPONENT = 0.01;

/**
 * A parameter whose meaningful change (a factor e in log coordinates, 100 % of its value in linear
 * ones) moves the weighted residuals by less than this norm has no influence on the fit here: its
 * column is taken as zero. Column scaling would otherwise blow a column of 1e-46 up to unit length
 * and hide it (a fit stranded on a plateau, e.g. NIST BoxBOD from its far start). 1e-6 means the
 * weighted SSE changes by about 1e-12 of one unit of chi-square: nothing the data can tell.
 * Common practice, no source.
 */
export const NO_INFLUENCE = 1e-6;

/** The size of a meaningful change of each coordinate: 1 in log coordinates, |theta| in linear ones. */
export function meaningfulChanges(theta: readonly number[], scales?: readonly ('log' | 'linear')[]): number[] {
  // A linear parameter at exactly 0 has no scale of its own to judge by: never flagged this way.
  return theta.map((t, i) => (scales?.[i] === 'log' ? 1 : t !== 0 ? Math.abs(t) : Number.POSITIVE_INFINITY));
}

export interface ScaledSvd {
  /** Column norms d of J (1 where a column is zero). */
  columnScale: Float64Array;
  /** Singular values of J_s, largest first (length p). */
  singularValues: number[];
  /** Right singular vectors of J_s as columns (p x p), in the order of `singularValues`. */
  v: Matrix;
  /** Per singular value: above the threshold (a determined direction). */
  determined: boolean[];
  rank: number;
  /** Per parameter: whether it has a component of at least NULL_COMPONENT in an undetermined direction. */
  undetermined: boolean[];
}

export function scaledSvd(j: RowMajorMatrix, threshold = SINGULAR_THRESHOLD, meaningfulChange?: readonly number[]): ScaledSvd {
  const p = j.columns;
  // J = Q R with Q orthogonal, so J D^-1 and R D^-1 have the same singular values and right
  // singular vectors, and the column norms of J are those of R: the SVD works on p x p, not on the
  // whole tall J (24,000 rows on the flywheel demo).
  const { R } = triangularFactor(j);
  const norms = columnNorms(j);
  const js = new Matrix(p, p);
  const d = new Float64Array(p);
  for (let k = 0; k < p; k++) {
    const s = norms[k]!;
    const noInfluence = meaningfulChange !== undefined && s * meaningfulChange[k]! < NO_INFLUENCE;
    d[k] = s > 0 && !noInfluence ? s : 1;
    if (noInfluence) continue; // left zero: a zero singular value whose direction is this parameter
    for (let i = 0; i <= k; i++) js.set(i, k, R.get(i, k) / d[k]!);
  }
  const svd = new SingularValueDecomposition(js, { computeLeftSingularVectors: false, computeRightSingularVectors: true, autoTranspose: false });
  // ml-matrix returns them largest first; sort anyway, carrying the vectors, so callers can rely on it.
  const order = svd.diagonal.map((s, i) => ({ s, i })).sort((a, b) => b.s - a.s);
  const vRaw = svd.rightSingularVectors;
  const v = new Matrix(p, p);
  order.forEach(({ i }, col) => {
    for (let r = 0; r < p; r++) v.set(r, col, vRaw.get(r, i));
  });
  const singularValues = order.map((o) => o.s);
  const smax = singularValues[0] ?? 0;
  const determined = singularValues.map((s) => smax > 0 && s > threshold * smax);
  const undetermined = new Array<boolean>(p).fill(false);
  determined.forEach((ok, col) => {
    if (ok) return;
    for (let r = 0; r < p; r++) if (Math.abs(v.get(r, col)) >= NULL_COMPONENT) undetermined[r] = true;
  });
  return { columnScale: d, singularValues, v, determined, rank: determined.filter(Boolean).length, undetermined };
}
