/**
 * Bounded trust-region Levenberg-Marquardt in the style of Moré (1978), the method of MINPACK's
 * lmder, with bounds kept by projection.
 *
 * Each iteration: the Jacobian's columns set the scaling D (running maximum of the column norms, so
 * the trust region never widens in a direction only because its column shrank); the damped step
 * comes from `dampedStep` (QR, trust radius Delta); the trial point is projected onto the bounds;
 * the ratio of actual to predicted cost reduction decides whether the step is taken (only when the
 * cost falls) and how Delta and the damping change. A trial whose residuals cannot be computed (a
 * diverging simulation) is a rejected step that shrinks Delta. Optional per-entry step limits
 * (`maxStep`) cut a trial step entry by entry, the same way as the bounds.
 *
 * The steps live beside this file: start.ts (the start point), trial-step.ts (step and prediction),
 * judge-trial.ts and trust-radius.ts (ratio test, radius, taking the step), stopping-tests.ts (every
 * test, each naming its entry of stop-reasons.ts) and finish.ts (the result). This file is the loop.
 *
 * cost = sum of squared residuals (SSE) throughout.
 */
import { movableEntries } from './bounds.js';
import { finishRun } from './finish.js';
import { judgeTrial, type Judgement } from './judge-trial.js';
import { columnNorms, transposeTimes } from './row-major.js';
import { noiseLevel, onPlainPath, type SolverFrame, type SolverState } from './solver-state.js';
import { beginRun } from './start.js';
import { stopAfterTrial, stopAtIterationLimit, stopAtPoint, stopByModelGain } from './stopping-tests.js';
import type { Stop } from './stop-reasons.js';
import { triangularFactor } from './tall-qr.js';
import { trialStep, type IterationModel, type TrialStep } from './trial-step.js';
import type { LeastSquaresProblem, SolverOptions, SolverResult } from './types.js';

/**
 * Speculative Jacobian trials (SolverOptions.speculativeJacobian): least ratio of the last taken step,
 * least predicted gain. Only Gauss-Newton steps qualify: a step held to the trust radius just after
 * the radius grew is the solver probing, and is rejected often (measured on a saturating-curve fit
 * y = a (1 - exp(-b x)) from a far start: 5 of the 9 such trials that followed a step with ratio
 * >= 0.75 were rejected). On the ODE demo fits the trials in question are Gauss-Newton steps.
 */
const SPECULATE_AFTER_RATIO = 0.75;
const SPECULATE_MIN_GAIN = 1e-3;

/**
 * Minimise the sum of squared residuals of `problem` from `start` within its bounds.
 * Never throws for a failed evaluation (the callbacks answer failures as values: a rejected step,
 * or status 'failed' at the start); errors thrown by the callbacks are bugs and propagate.
 */
export function solveLeastSquares(problem: LeastSquaresProblem, start: ArrayLike<number>, options: SolverOptions = {}): SolverResult {
  const begun = beginRun(problem, start, options);
  if (!begun.ok) return begun.result;
  const { frame, state } = begun;
  for (;;) {
    const stop = iterate(frame, state);
    if (stop) return finishRun(frame, state, stop);
  }
}

/** One iteration: the tests at the current point, then trials until one is taken (undefined) or a test passes. */
function iterate(frame: SolverFrame, state: SolverState): Stop | undefined {
  const free = measureGradient(frame, state);
  const atPoint = stopAtPoint(frame, state, free.length);
  if (atPoint) return atPoint;
  const { R, qtr } = triangularFactor(state.J, free, state.r);
  const model: IterationModel = { free, R, qtr, Df: Float64Array.from(free, (k) => state.D[k]!) };
  const certified = stopByModelGain(frame, state, qtr);
  if (certified) return certified;
  for (;;) {
    const limit = stopAtIterationLimit(frame, state);
    if (limit) return limit;
    const t = runTrial(frame, state, model);
    if (t !== 'rejected') return t === 'next-iteration' ? undefined : t;
  }
}

/** Gradient (of cost/2) and the entries free to move; updates the scaling and the gradient measures. */
function measureGradient(frame: SolverFrame, state: SolverState): number[] {
  const { J, r, fnorm, D } = state;
  const g = transposeTimes(J, r);
  const free = movableEntries(state.theta, g, frame.lower, frame.upper);
  const cn = columnNorms(J);
  for (let k = 0; k < frame.p; k++) D[k] = Math.max(D[k]!, cn[k]!);
  state.scaledGradient = 0;
  state.gradientNorm = 0;
  for (const k of free) {
    state.gradientNorm = Math.max(state.gradientNorm, 2 * Math.abs(g[k]!));
    if (cn[k]! > 0 && fnorm > 0) state.scaledGradient = Math.max(state.scaledGradient, Math.abs(g[k]!) / (cn[k]! * fnorm));
  }
  return free;
}

/** One trial: a Stop, 'next-iteration' (taken, or the point must be factored again) or 'rejected'. */
function runTrial(frame: SolverFrame, state: SolverState, model: IterationModel): Stop | 'next-iteration' | 'rejected' {
  const step = trialStep(frame, state, model);
  // After a rejected trial the shrunk region may still hold the same Gauss-Newton step: the
  // evaluation is deterministic, so the same point is not evaluated twice.
  const last = state.lastTrial;
  const repeated = last !== undefined && last.theta.length === step.theta.length && last.theta.every((v, k) => v === step.theta[k]);
  const speculate = !repeated && speculates(frame, state, step);
  if (!speculate && state.rFromJacobianPath) {
    // A plain trial is compared with a plain cost: evaluate the point plainly, and since the step
    // came from the other path's residuals (Q^T r), factor again before stepping.
    onPlainPath(state, frame);
    return 'next-iteration';
  }
  state.iterations++;
  const ev = repeated ? last!.ev : frame.evaluator.evaluate(step.theta, speculate);
  state.lastTrial = { theta: step.theta, ev };
  const judged = judgeTrial(frame, state, step, ev);
  state.lastTakenRatio = judged.accepted ? judged.ratio : 0;
  reportProgress(frame, state, judged);
  const stop = stopAfterTrial(frame, state, judged);
  if (stop) return stop;
  return judged.accepted ? 'next-iteration' : 'rejected';
}

/** Whether to evaluate this trial with its Jacobian at once (SolverOptions.speculativeJacobian). */
function speculates(frame: SolverFrame, state: SolverState, step: TrialStep): boolean {
  return (
    frame.options.speculativeJacobian === true &&
    step.ds.damping === 0 && // a Gauss-Newton step: the linear model's own minimiser lies inside the region
    state.lastTakenRatio >= SPECULATE_AFTER_RATIO &&
    step.prered >= Math.max(SPECULATE_MIN_GAIN, 100 * noiseLevel(state, frame.options))
  );
}

function reportProgress(frame: SolverFrame, state: SolverState, judged: Judgement): void {
  const { step } = judged;
  frame.options.onIteration?.({
    iteration: state.iterations,
    cost: state.fnorm * state.fnorm,
    trialCost: judged.trialCost,
    step: state.xnorm > 0 ? step.pnorm / state.xnorm : step.pnorm,
    accepted: judged.accepted,
    radius: state.delta,
    damping: state.damping,
    stepDamping: step.ds.damping,
    predictedReduction: judged.evaluated ? judged.prered : Number.NaN,
    actualReduction: judged.evaluated ? judged.actred : Number.NaN,
  });
}
