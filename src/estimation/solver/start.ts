/**
 * The start of a run: the start point projected onto the bounds, evaluated (or the caller's warm
 * evaluation taken), the column scaling and the first trust radius. A start that cannot be evaluated
 * ends the run at once with reason 'start-failed'.
 */
import { project } from './bounds.js';
import { norm2, scaledNorm } from './dense.js';
import { createEvaluator, takeInitial } from './evaluation.js';
import { startFailedResult } from './finish.js';
import { columnNorms } from './row-major.js';
import { frameOf, noteNoise, type SolverFrame, type SolverState } from './solver-state.js';
import { stopWith } from './stop-reasons.js';
import type { LeastSquaresProblem, SolverOptions, SolverResult } from './types.js';

export type Begun = { ok: true; frame: SolverFrame; state: SolverState } | { ok: false; result: SolverResult };

export function beginRun(problem: LeastSquaresProblem, start: ArrayLike<number>, options: SolverOptions): Begun {
  const frame = frameOf(problem, start, options, createEvaluator(problem, start.length));
  const { p, lower, upper, evaluator } = frame;
  const startProjection = project(start, lower, upper);
  const theta = startProjection.theta;
  // A warm start reuses the caller's evaluation at the start (only when the start needed no projection).
  const warm = options.initial && !startProjection.clipped ? takeInitial(options.initial, p) : undefined;
  const first = warm ?? evaluator.evaluate(theta, true);
  if (!first.ok || !first.jacobian) {
    return { ok: false, result: startFailedResult(frame, theta, stopWith('start-failed', { why: first.ok ? 'no Jacobian' : first.why })) };
  }
  evaluator.fixResidualCount(first.residuals.length);
  // The cost is always taken from `residuals`, the same path that evaluates the trial points: for
  // ODE models the simulation with sensitivities takes other integration steps, and its cost can
  // differ by a relative 1e-6; comparing trials with it would reject every small step near the
  // optimum. One plain evaluation at the start buys that consistency.
  const firstPlain = warm ?? evaluator.evaluate(theta, false);
  const r = firstPlain.ok ? firstPlain.residuals : first.residuals;
  const J = first.jacobian;
  // Scaling: column norms, a zero column counting as 1 (MINPACK), then a running maximum.
  const D = columnNorms(J);
  for (let k = 0; k < p; k++) if (D[k] === 0) D[k] = 1;
  const xnorm = scaledNorm(D, theta);
  const factor = frame.settings.initialRadiusFactor;
  const state: SolverState = {
    theta,
    r,
    fnorm: norm2(r),
    J,
    D,
    xnorm,
    delta: factor * xnorm === 0 ? factor : factor * xnorm,
    damping: 0,
    iterations: 0,
    acceptedSteps: 0,
    scaledGradient: Number.NaN,
    gradientNorm: Number.NaN,
    rFromJacobianPath: false,
    lastTakenRatio: 0,
    costNoise: options.costNoise ?? 0,
  };
  if (!warm && firstPlain.ok) noteNoise(state, first.residuals, firstPlain.residuals);
  return { ok: true, frame, state };
}
