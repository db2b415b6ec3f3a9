/**
 * Standard errors, 95 % intervals and correlations of the estimates, from the weighted Jacobian at
 * the optimum (linearised least squares).
 *
 * Covariance in the optimiser's coordinates: C = s^2 (J^T J)^-1, computed from the SVD of the
 * column-scaled Jacobian J_s = J diag(1/d): C = s^2 diag(1/d) V S^-2 V^T diag(1/d), never by inverting
 * J^T J. s^2 = SSE / (N - p) when any noise level was estimated (the residual variance absorbs the
 * unknown scale); s^2 = 1 when every sigma was given (then SSE / (N - p), the reduced chi-square, is
 * reported as a check of the given sigmas).
 *
 * Singular information: directions whose scaled singular value is below SINGULAR_THRESHOLD are left
 * out (pseudo-inverse on the determined directions only); a parameter with a component in such a
 * direction gets stdError null and ci95 null, never NaN, and its correlations are null.
 *
 * Log coordinates (theta = ln(value)): standard error by the delta method, se_value = value *
 * se_theta. The 95 % interval is exp of the interval on theta, [value exp(-t se_theta), value
 * exp(t se_theta)]: the interval is built where the linearisation is made (the optimiser's
 * coordinate), so its coverage is exactly that of the interval on theta, and it never contains
 * zero or negative values. It is not symmetric about the estimate; value +- t * se_value would
 * be symmetric but can cross zero and covers less when se_theta is large.
 */
import { formatSignificant } from '../presentation/numbers.js';
import tQuantile from '@stdlib/stats-base-dists-t-quantile';
import { toRowMajor } from './solver/row-major.js';
import { meaningfulChanges, scaledSvd, SINGULAR_THRESHOLD } from './solver/scaled-svd.js';
import type { JacobianInput } from './solver/types.js';

export interface UncertaintyInput {
  /** Weighted Jacobian d r / d theta at the optimum (rows: residuals), in the optimiser's coordinates. */
  jacobian: JacobianInput;
  /** Weighted residuals at the optimum. */
  residuals: ArrayLike<number>;
  /** The optimum in the optimiser's coordinates (ln(value) for log-scaled entries). */
  theta: readonly number[];
  names: readonly string[];
  /** Per entry; default 'linear'. */
  scales?: readonly ('log' | 'linear')[];
  /** True when any noise level was estimated from the residuals (s^2 = SSE/(N-p)); false when all were given (s^2 = 1). */
  sigmaEstimated: boolean;
  /** Per entry, from the solver: on a bound or not. */
  atBound?: readonly (false | 'lower' | 'upper')[];
  /** Per entry, bounds in the parameter's own unit (for the warnings). */
  bounds?: readonly { min: number; max: number }[];
  /** Per entry, the unit (for the warnings). */
  units?: readonly string[];
  /** Relative singular value below which a direction counts as undetermined. Default SINGULAR_THRESHOLD (1e-6). */
  singularThreshold?: number;
}

export interface ParameterUncertainty {
  name: string;
  /** In the parameter's own unit. */
  estimate: number;
  /** Null when the data do not determine the parameter, or no degrees of freedom are left. */
  stdError: number | null;
  ci95: [number, number] | null;
  atBound: false | 'lower' | 'upper';
  /** False at a bound, when undetermined, or without degrees of freedom. */
  intervalReliable: boolean;
  /** False when the parameter has a component in a direction the data do not determine. */
  determined: boolean;
}

export interface UncertaintyResult {
  parameters: ParameterUncertainty[];
  /** Covariance on the parameters' own scale (delta method); null where undetermined. */
  covariance: (number | null)[][];
  correlation: { names: string[]; matrix: (number | null)[][] };
  observations: number;
  freeParameters: number;
  dof: number;
  /** Weighted sum of squared residuals. */
  weightedSSE: number;
  /** The s^2 used: SSE/(N-p) or 1; null without degrees of freedom. */
  residualVariance: number | null;
  /** SSE/(N-p), only when every sigma was given. */
  reducedChiSquare?: number;
  /** t(0.975, N-p); null without degrees of freedom. */
  tQuantile: number | null;
  /** Number of determined directions. */
  rank: number;
  warnings: string[];
}

const formatNumber = (x: number): string => formatSignificant(x, 6);

export function computeUncertainty(input: UncertaintyInput): UncertaintyResult {
  const p = input.theta.length;
  const n = input.residuals.length;
  const J = toRowMajor(input.jacobian, n, p);
  const scales = input.scales ?? new Array<'log' | 'linear'>(p).fill('linear');
  const warnings: string[] = [];

  let sse = 0;
  for (let i = 0; i < n; i++) sse += (input.residuals[i] as number) ** 2;
  const dof = n - p;
  const reduced = dof > 0 ? sse / dof : Number.NaN;
  let s2: number;
  if (input.sigmaEstimated) {
    s2 = reduced;
  } else {
    s2 = 1;
  }
  const t = dof > 0 ? (tQuantile(0.975, dof) as number) : null;
  if (dof <= 0) {
    warnings.push(`${n} residuals for ${p} free parameters leave no degrees of freedom: no standard errors or intervals`);
  }

  // Covariance in theta coordinates on the determined directions.
  const svd = scaledSvd(J, input.singularThreshold ?? SINGULAR_THRESHOLD, meaningfulChanges(input.theta, scales));
  const d = svd.columnScale;
  const covTheta: number[][] = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  svd.singularValues.forEach((s, k) => {
    if (!svd.determined[k]) return;
    const w = 1 / (s * s);
    for (let a = 0; a < p; a++) {
      const va = svd.v.get(a, k) / d[a]!;
      if (va === 0) continue;
      for (let b = 0; b < p; b++) covTheta[a]![b]! += w * va * (svd.v.get(b, k) / d[b]!);
    }
  });
  const usable = Number.isFinite(s2) && dof > 0;

  // Own-scale values and the delta-method factors d value / d theta.
  const value = input.theta.map((th, i) => (scales[i] === 'log' ? Math.exp(th) : th));
  const g = value.map((v, i) => (scales[i] === 'log' ? v : 1));

  const parameters: ParameterUncertainty[] = [];
  for (let i = 0; i < p; i++) {
    const name = input.names[i] ?? `theta${i}`;
    const atBound = input.atBound?.[i] ?? false;
    const determined = !svd.undetermined[i];
    let stdError: number | null = null;
    let ci95: [number, number] | null = null;
    if (determined && usable && t !== null) {
      const seTheta = Math.sqrt(s2 * covTheta[i]![i]!);
      stdError = g[i]! * seTheta;
      const th = input.theta[i]!;
      ci95 = scales[i] === 'log' ? [Math.exp(th - t * seTheta), Math.exp(th + t * seTheta)] : [th - t * seTheta, th + t * seTheta];
    }
    if (atBound) {
      const b = input.bounds?.[i];
      const where = b ? ` ${formatNumber(atBound === 'lower' ? b.min : b.max)}${input.units?.[i] ? ' ' + input.units[i] : ''}` : '';
      warnings.push(`${name} is at its ${atBound} bound${where}; its interval is not reliable`);
    }
    parameters.push({
      name,
      estimate: value[i]!,
      stdError,
      ci95,
      atBound,
      intervalReliable: stdError !== null && !atBound,
      determined,
    });
  }

  const covariance: (number | null)[][] = [];
  const correlation: (number | null)[][] = [];
  for (let a = 0; a < p; a++) {
    const covRow: (number | null)[] = [];
    const corRow: (number | null)[] = [];
    for (let b = 0; b < p; b++) {
      const ok = !svd.undetermined[a] && !svd.undetermined[b];
      covRow.push(ok && usable ? s2 * covTheta[a]![b]! * g[a]! * g[b]! : null);
      if (!ok) {
        corRow.push(null);
      } else if (a === b) {
        corRow.push(1);
      } else {
        const denom = Math.sqrt(covTheta[a]![a]! * covTheta[b]![b]!);
        // g > 0 (exp) or 1, so the correlation is the same on either scale.
        corRow.push(denom > 0 ? Math.max(-1, Math.min(1, covTheta[a]![b]! / denom)) : null);
      }
    }
    covariance.push(covRow);
    correlation.push(corRow);
  }

  return {
    parameters,
    covariance,
    correlation: { names: parameters.map((q) => q.name), matrix: correlation },
    observations: n,
    freeParameters: p,
    dof,
    weightedSSE: sse,
    residualVariance: usable ? s2 : null,
    ...(input.sigmaEstimated || dof <= 0 ? {} : { reducedChiSquare: reduced }),
    tQuantile: t,
    rank: svd.rank,
    warnings,
  };
}
