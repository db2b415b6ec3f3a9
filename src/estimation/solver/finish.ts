/**
 * The end of a run: the result record from the state and the stop (stop-reasons.ts). Every finish
 * of the solver comes through here, so the record is built in one place.
 */
import { boundStatus } from './bounds.js';
import { RowMajorMatrix } from './row-major.js';
import { onPlainPath, type SolverFrame, type SolverState } from './solver-state.js';
import type { Stop } from './stop-reasons.js';
import type { SolverResult } from './types.js';

/** Finish at the current point: its residuals are put on the plain path first (see onPlainPath). */
export function finishRun(frame: SolverFrame, state: SolverState, stop: Stop): SolverResult {
  onPlainPath(state, frame);
  const { counts } = frame.evaluator;
  return {
    status: stop.status,
    reason: stop.reason,
    message: stop.message,
    theta: state.theta,
    cost: state.fnorm * state.fnorm,
    residuals: state.r,
    jacobian: state.J,
    gradientNorm: state.gradientNorm,
    scaledGradient: state.scaledGradient,
    iterations: state.iterations,
    acceptedSteps: state.acceptedSteps,
    residualEvaluations: counts.residualEvaluations,
    jacobianEvaluations: counts.jacobianEvaluations,
    failedEvaluations: counts.failedEvaluations,
    atBound: boundStatus(state.theta, frame.lower, frame.upper),
    costNoise: state.costNoise,
  };
}

/** The start could not be evaluated: no cost, no residuals, an empty Jacobian. */
export function startFailedResult(frame: SolverFrame, theta: number[], stop: Stop): SolverResult {
  const { counts } = frame.evaluator;
  return {
    status: stop.status,
    reason: stop.reason,
    message: stop.message,
    theta,
    cost: Number.NaN,
    residuals: new Float64Array(0),
    jacobian: RowMajorMatrix.zeros(0, frame.p),
    gradientNorm: Number.NaN,
    scaledGradient: Number.NaN,
    iterations: 0,
    acceptedSteps: 0,
    residualEvaluations: counts.residualEvaluations,
    jacobianEvaluations: counts.jacobianEvaluations,
    failedEvaluations: counts.failedEvaluations,
    atBound: boundStatus(theta, frame.lower, frame.upper),
  };
}
