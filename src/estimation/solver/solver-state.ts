/**
 * What the solver carries from one trial to the next, and the fixed frame of a run (bounds, step
 * limits, tolerances, the evaluator). One mutable record, changed only by the steps of the method
 * (trial-step.ts, trust-radius.ts, levenberg-marquardt.ts), so that each step can be read alone.
 *
 * cost = sum of squared residuals (SSE) throughout; fnorm = sqrt(cost).
 */
import { norm2 } from './dense.js';
import { SOLVER_DEFAULTS } from './defaults.js';
import type { Evaluation, Evaluator } from './evaluation.js';
import type { RowMajorMatrix } from './row-major.js';
import type { LeastSquaresProblem, SolverOptions } from './types.js';

/** The stopping tolerances and limits of a run, defaults filled in. */
export interface SolverSettings {
  maxIterations: number;
  costTolerance: number;
  stepTolerance: number;
  gradientTolerance: number;
  initialRadiusFactor: number;
}

function settingsOf(options: SolverOptions): SolverSettings {
  return {
    maxIterations: options.maxIterations ?? SOLVER_DEFAULTS.maxIterations,
    costTolerance: options.costTolerance ?? SOLVER_DEFAULTS.costTolerance,
    stepTolerance: options.stepTolerance ?? SOLVER_DEFAULTS.stepTolerance,
    gradientTolerance: options.gradientTolerance ?? SOLVER_DEFAULTS.gradientTolerance,
    initialRadiusFactor: options.initialRadiusFactor ?? SOLVER_DEFAULTS.initialRadiusFactor,
  };
}

/** What does not change during a run. */
export interface SolverFrame {
  p: number;
  lower: Float64Array;
  upper: Float64Array;
  /** Per-entry step limits (LeastSquaresProblem.maxStep), when given. */
  maxStep?: Float64Array;
  settings: SolverSettings;
  options: SolverOptions;
  evaluator: Evaluator;
}

/** Bounds and step limits as arrays, checked; throws for a malformed problem (a bug of the caller). */
export function frameOf(problem: LeastSquaresProblem, start: ArrayLike<number>, options: SolverOptions, evaluator: Evaluator): SolverFrame {
  const p = start.length;
  const lower = Float64Array.from({ length: p }, (_, i) => (problem.lower ? (problem.lower[i] as number) : -Infinity));
  const upper = Float64Array.from({ length: p }, (_, i) => (problem.upper ? (problem.upper[i] as number) : Infinity));
  for (let i = 0; i < p; i++) {
    if (!(lower[i]! <= upper[i]!)) throw new Error(`solver: bounds of entry ${i} are empty or not numbers (${lower[i]}, ${upper[i]})`);
    if (!Number.isFinite(start[i] as number)) throw new Error(`solver: start value of entry ${i} is not finite`);
  }
  const maxStep = problem.maxStep ? Float64Array.from({ length: p }, (_, i) => problem.maxStep![i] as number) : undefined;
  if (maxStep?.some((m) => !(m > 0))) throw new Error('solver: every per-entry step limit must be positive (Infinity for none)');
  return { p, lower, upper, ...(maxStep ? { maxStep } : {}), settings: settingsOf(options), options, evaluator };
}

export interface SolverState {
  theta: number[];
  /** Residuals at theta and their norm; from the plain path unless `rFromJacobianPath`. */
  r: Float64Array;
  fnorm: number;
  J: RowMajorMatrix;
  /** Column scaling (running maximum of the column norms) and ||D theta||. */
  D: Float64Array;
  xnorm: number;
  /** Trust radius and Levenberg-Marquardt damping. */
  delta: number;
  damping: number;
  iterations: number;
  acceptedSteps: number;
  /** The last trial point and its evaluation (a repeated trial is not evaluated again). */
  lastTrial?: { theta: number[]; ev: Evaluation };
  scaledGradient: number;
  gradientNorm: number;
  /**
   * True while r (and fnorm) came with the Jacobian of a speculative trial rather than from a plain
   * evaluation; `onPlainPath` evaluates the point plainly before a plain comparison or the return.
   */
  rFromJacobianPath: boolean;
  /** Ratio of the last trial when it was taken, else 0 (speculativeJacobian). */
  lastTakenRatio: number;
  /** Evaluation noise of the cost: how far the two paths disagree at one point (see noisyCost). */
  costNoise: number;
}

/** Record the relative difference between the costs of the two evaluation paths at one point. */
export function noteNoise(state: SolverState, withJacobian: Float64Array, plain: Float64Array): void {
  const a = norm2(withJacobian);
  const b = norm2(plain);
  if (b > 0 && Number.isFinite(a)) state.costNoise = Math.max(state.costNoise, Math.abs(a * a - b * b) / (b * b));
}

/** The noise level the stops of `noisyCost` use: the measured noise, within the caller's limit. */
export function noiseLevel(state: SolverState, options: SolverOptions): number {
  return Math.min(state.costNoise, options.costNoiseLimit ?? Infinity);
}

/** Before a plain comparison or the return: put the current point's residuals on the plain path. */
export function onPlainPath(state: SolverState, frame: SolverFrame): void {
  if (!state.rFromJacobianPath) return;
  state.rFromJacobianPath = false;
  const plain = frame.evaluator.evaluate(state.theta, false);
  if (!plain.ok) return; // keeps r: its path differs from the plain one only by evaluation noise
  noteNoise(state, state.r, plain.residuals);
  state.r = plain.residuals;
  state.fnorm = norm2(state.r);
}
