/**
 * The trust-region subproblem of Levenberg-Marquardt (Moré 1978, "The Levenberg-Marquardt
 * algorithm: implementation and theory"): find the damping lambda >= 0 whose step
 *   s(lambda) = argmin ||R s + qtr||^2 + lambda ||D s||^2
 * has a scaled length ||D s|| within 10 % of the trust radius Delta (or lambda = 0 when the
 * Gauss-Newton step already lies inside). R is the triangular factor of the Jacobian (J = Q R),
 * qtr = Q^T r, D the column scaling.
 *
 * Each trial lambda is solved by a QR factorisation of the stacked matrix [R; sqrt(lambda) D]
 * (ml-matrix), never by forming or inverting J^T J: that would square the condition number, which
 * on ill-conditioned problems (the NIST Lanczos and MGH sets) costs the digits we need. The
 * damping is found by Moré's safeguarded Newton iteration on phi(lambda) = ||D s|| - Delta.
 */
import { Matrix, QrDecomposition } from 'ml-matrix';
import { allFinite, norm2, scaledNorm, solveUpper, solveUpperTransposed } from './dense.js';

export interface DampedStep {
  step: Float64Array;
  /** The damping lambda of the step (0: the Gauss-Newton step). */
  damping: number;
  /** ||D step||. */
  scaledLength: number;
}

const TINY = 2.2250738585072014e-308; // smallest normal double (MINPACK's dwarf)
const MAX_NEWTON = 10; // Moré: rarely more than 2-3 are needed
/** Relative scaled singular value below which a direction counts as numerically null for the step. */
const RANK_FLOOR = 1e-8;

/** Solve the stacked problem [R; sqrt(lambda) D] s = [-qtr; 0]; returns s and the new triangular factor. */
function solveDamped(r: Matrix, qtr: ArrayLike<number>, d: ArrayLike<number>, lambda: number): { s: Float64Array; rLambda: Matrix } {
  const p = r.columns;
  const a = new Matrix(2 * p, p);
  const b = new Matrix(2 * p, 1);
  const sq = Math.sqrt(lambda);
  for (let i = 0; i < p; i++) {
    for (let k = i; k < p; k++) a.set(i, k, r.get(i, k));
    a.set(p + i, i, sq * (d[i] as number));
    b.set(i, 0, -(qtr[i] as number));
  }
  const qr = new QrDecomposition(a);
  const s = Float64Array.from(qr.solve(b).getColumn(0));
  return { s, rLambda: qr.upperTriangularMatrix };
}

/** Moré's Newton correction of lambda for phi(lambda) = ||D s|| - Delta, from the factor of J^T J + lambda D^2. */
function newtonCorrection(rLambda: Matrix, d: ArrayLike<number>, s: ArrayLike<number>, scaledLength: number, phi: number, delta: number): number {
  const p = s.length;
  const w = new Float64Array(p);
  for (let i = 0; i < p; i++) w[i] = ((d[i] as number) * (d[i] as number) * (s[i] as number)) / scaledLength;
  const y = solveUpperTransposed(rLambda, w);
  const ny = norm2(y);
  return phi / delta / (ny * ny);
}

/**
 * The step for trust radius `delta`, starting the damping search from `previousDamping`.
 * R must be p x p upper triangular (possibly singular), D positive.
 */
export function dampedStep(r: Matrix, qtr: ArrayLike<number>, d: ArrayLike<number>, delta: number, previousDamping: number): DampedStep {
  const p = r.columns;

  // Scale of the problem in the scaled coordinates: ||R D^-1||_F ~ the largest scaled singular value.
  let scaleSq = 0;
  for (let k = 0; k < p; k++) for (let i = 0; i <= k; i++) scaleSq += (r.get(i, k) / (d[k] as number)) ** 2;
  // Directions whose scaled singular value is below RANK_FLOOR times the largest are numerically
  // null (e.g. two parameters entering only as k/m): their Gauss-Newton component is rounding noise
  // divided by rounding noise, and would throw the parameters far along the null direction. So the
  // Gauss-Newton step is used only when no R_ii is that small, and the damping never goes below
  // RANK_FLOOR^2 times the scale, which damps such directions to nothing and changes well-posed
  // steps by a relative 1e-16 / (smallest scaled singular value)^2: 1e-6 on the worst NIST problem.
  const minDamping = RANK_FLOOR * RANK_FLOOR * scaleSq;
  let gn: Float64Array | null = null;
  let nonsingular = scaleSq > 0;
  for (let i = 0; i < p; i++) if (!(Math.abs(r.get(i, i)) / (d[i] as number) > RANK_FLOOR * Math.sqrt(scaleSq))) nonsingular = false;
  if (nonsingular) {
    const minusQtr = new Float64Array(p);
    for (let i = 0; i < p; i++) minusQtr[i] = -(qtr[i] as number);
    gn = solveUpper(r, minusQtr);
    if (!allFinite(gn)) {
      gn = null;
      nonsingular = false;
    }
  }
  let lower = 0;
  if (gn) {
    const len = scaledNorm(d, gn);
    const phi = len - delta;
    if (phi <= 0.1 * delta) return { step: gn, damping: 0, scaledLength: len };
    // Lower bound on lambda from the Newton step at lambda = 0 (phi is convex in lambda).
    lower = newtonCorrection(r, d, gn, len, phi, delta);
    if (!Number.isFinite(lower) || lower < 0) lower = 0;
  }

  // Upper bound: ||D^-1 J^T r|| / Delta.
  const g = new Float64Array(p);
  for (let k = 0; k < p; k++) {
    let sum = 0;
    for (let i = 0; i <= k; i++) sum += r.get(i, k) * (qtr[i] as number);
    g[k] = sum / (d[k] as number);
  }
  const gnorm = norm2(g);
  let upper = gnorm / delta;
  if (upper === 0) upper = TINY / Math.min(delta, 0.1);

  let lambda = Math.min(Math.max(previousDamping, lower), upper);
  if (lambda === 0) lambda = gn ? gnorm / scaledNorm(d, gn) : gnorm / delta;

  let best: DampedStep | null = null;
  let phiPrev = gn ? scaledNorm(d, gn) - delta : Number.NaN;
  for (let it = 1; it <= MAX_NEWTON; it++) {
    if (lambda === 0 || !Number.isFinite(lambda)) lambda = Math.max(TINY, 0.001 * upper);
    if (!gn) lambda = Math.max(lambda, minDamping);
    const { s, rLambda } = solveDamped(r, qtr, d, lambda);
    const len = scaledNorm(d, s);
    const phi = len - delta;
    best = { step: s, damping: lambda, scaledLength: len };
    const phiBefore = phiPrev;
    phiPrev = phi;
    // Done when within 10 % of the radius, or (lower bound zero) when phi stopped decreasing below zero.
    if (Math.abs(phi) <= 0.1 * delta || (lower === 0 && phi <= phiBefore && phiBefore < 0) || it === MAX_NEWTON) break;
    const correction = newtonCorrection(rLambda, d, s, len, phi, delta);
    if (phi > 0) lower = Math.max(lower, lambda);
    if (phi < 0) upper = Math.min(upper, lambda);
    lambda = Math.max(lower, lambda + correction);
  }
  return best as DampedStep;
}
