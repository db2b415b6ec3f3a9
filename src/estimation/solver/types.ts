/**
 * The generic least-squares problem the solver works on, and what it hands back.
 *
 * The solver knows nothing about models, units or ODEs: it moves a vector theta within bounds to
 * reduce cost = sum of squared residuals (the plain SSE, not half of it; every number the solver
 * reports uses this one convention). Two callbacks give the residuals, because for ODE models the
 * Jacobian comes from sensitivity equations integrated in the same simulation and costs several
 * times a plain simulation: `residuals` is called for trial points, `residualsAndJacobian` only
 * where a Jacobian is needed (at the start and after each accepted step).
 */
import type { JacobianInput, RowMajorMatrix } from './row-major.js';
import type { StopReason, StopStatus } from './stop-reasons.js';

/**
 * A Jacobian (rows = residuals, columns = theta entries) as a RowMajorMatrix, an ml-matrix Matrix,
 * a row-major Float64Array of length nResiduals * nTheta, or an array of rows.
 */
export type { JacobianInput };

export interface ResidualsWithJacobian {
  residuals: ArrayLike<number>;
  jacobian: JacobianInput;
}

/**
 * A callback's answer for a point that cannot be evaluated, with the reason in words (an expected
 * failure, e.g. a diverging trial simulation). Returned, never thrown: the solver treats anything
 * a callback throws as a bug and lets it propagate.
 */
export interface EvaluationFailed {
  failed: string;
}

/** What a callback answers: the value, a failure with its words, or null (a failure without words). */
export type EvaluationAnswer<T> = T | EvaluationFailed | null;

export interface LeastSquaresProblem {
  /**
   * Residuals at theta, or a failure (`{ failed: why }`, or null) when they cannot be computed, e.g.
   * a trial simulation diverged: the solver rejects that trial and shrinks its trust region.
   */
  residuals(theta: readonly number[]): EvaluationAnswer<ArrayLike<number>>;
  /** Residuals and their Jacobian d r / d theta at theta; a failure as above. */
  residualsAndJacobian(theta: readonly number[]): EvaluationAnswer<ResidualsWithJacobian>;
  /** Bounds on theta (same length as the start; -Infinity / Infinity allowed). Default: none. */
  lower?: ArrayLike<number>;
  upper?: ArrayLike<number>;
  /**
   * Largest change of each entry in one trial step (Infinity or absent: no limit). A longer step
   * is cut entry by entry, like a bound, and judged by the linear model of the step actually taken.
   * For entries whose linear model is trusted only over a limited range whatever their column
   * norm says, e.g. logarithms of parameters (see fit-core.ts). Default: no limit.
   */
  maxStep?: ArrayLike<number>;
}

/** One trial step, reported to `onIteration`. */
export interface SolverProgress {
  /** 1-based count of trial steps so far. */
  iteration: number;
  /** Cost (SSE) at the current (best) point after this trial. */
  cost: number;
  /** Cost at the trial point (Infinity when the evaluation failed). */
  trialCost: number;
  /** Relative length of the trial step: ||D step|| / ||D theta|| (D = column scaling). */
  step: number;
  accepted: boolean;
  /** Trust-region radius and Levenberg-Marquardt damping after this trial. */
  radius: number;
  damping: number;
  /** Damping the trial step was computed with (0: a full Gauss-Newton step). */
  stepDamping: number;
  /** Relative cost reduction predicted by the linear model and achieved (NaN when the trial failed). */
  predictedReduction: number;
  actualReduction: number;
}

export interface SolverOptions {
  /** Limit on trial steps (each costs one residual evaluation). Default 500. */
  maxIterations?: number;
  /** Converged when both the actual and the predicted relative cost reduction fall below this. Default 1e-14. */
  costTolerance?: number;
  /** Converged when the trust radius falls below this times ||D theta||. Default 1e-10. */
  stepTolerance?: number;
  /** Converged when the largest cosine between a free Jacobian column and the residual vector falls below this. Default 1e-10. */
  gradientTolerance?: number;
  /** First trust radius = this times ||D theta_start|| (or this when that is zero). Default 100. */
  initialRadiusFactor?: number;
  /**
   * Residuals and Jacobian already known at `start` (e.g. the previous optimum of a refit whose
   * weights changed): used instead of evaluating there, so a warm start costs no evaluation. The
   * residuals must come from the same path as `residuals` (the solver compares trial costs with them).
   */
  initial?: ResidualsWithJacobian;
  /**
   * The cost has evaluation noise (ODE fits: integration error that moves with the parameters), so
   * near the optimum trials only measure that noise. Then: (1) before a trial is spent, stop when
   * the linear model predicts a relative reduction (||Q^T r||^2 / ||r||^2: no step of the free
   * entries does better) below max(costTolerance, noise); (2) a rejected trial whose predicted
   * reduction is below the noise also stops. The noise is measured where both evaluation paths
   * meet (start and accepted points: relative difference of their costs), at least `costNoise`.
   * Default false: MINPACK's tests only, which the NIST digits need (on large-residual problems
   * such as ENSO Gauss-Newton's prediction understates what is left).
   */
  noisyCost?: boolean;
  /** Relative noise of the cost already measured (e.g. by the run a refit starts from). */
  costNoise?: number;
  /** Upper limit on the noise the stops of `noisyCost` use (the caller's statistical bound). Default: none. */
  costNoiseLimit?: number;
  /**
   * Evaluate a trial point with its Jacobian straight away when it will very likely be taken: it is
   * a Gauss-Newton step (inside the trust region), the last trial was taken with a ratio of at least
   * 0.75 (the linear model is trusted) and this one predicts a relative gain of at least 1e-3, far
   * above the evaluation noise. A taken step then
   * costs one evaluation with the Jacobian instead of a plain one and one with the Jacobian; a
   * rejected one costs a Jacobian evaluation. The residuals of such a point come from the Jacobian
   * path, so before the next plain trial (and before returning) the point is evaluated plainly once,
   * which keeps every comparison of costs on one path (see `initial`). For ODE fits, where a
   * simulation with sensitivities costs two to three plain ones. Default false.
   */
  speculativeJacobian?: boolean;
  onIteration?: (p: SolverProgress) => void;
}

export type { StopReason, StopStatus };

export interface SolverResult {
  status: StopStatus;
  /** The test that ended the run: a key of STOP_REASONS (stop-reasons.ts), which documents each. */
  reason: StopReason;
  /** In words, e.g. "relative cost change below 1e-10". */
  message: string;
  theta: number[];
  /** Sum of squared residuals at theta (NaN only when the start failed). */
  cost: number;
  residuals: Float64Array;
  /** Jacobian at theta (nResiduals x nTheta); 0 x nTheta when the start failed. */
  jacobian: RowMajorMatrix;
  /** Largest |d cost / d theta_i| over entries not held at a bound (cost = SSE, so this is 2 |J^T r|). */
  gradientNorm: number;
  /** The scale-free gradient measure of the gradient test (largest cosine, see gradientTolerance). */
  scaledGradient: number;
  /** Trial steps taken (accepted or rejected). */
  iterations: number;
  acceptedSteps: number;
  /** Calls of `residuals` and of `residualsAndJacobian`, and the calls of either that failed. */
  residualEvaluations: number;
  jacobianEvaluations: number;
  failedEvaluations: number;
  /** Per theta entry: whether it ended on a bound. */
  atBound: (false | 'lower' | 'upper')[];
  /** Largest relative difference seen between the costs of the two evaluation paths at one point (0 when they agree). */
  costNoise?: number;
}
