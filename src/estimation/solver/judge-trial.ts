/**
 * A trial point's evaluation judged: the ratio of actual to predicted reduction updates the trust
 * radius (trust-radius.ts), and a step with a good enough ratio is taken, which is when (and only
 * when) the costly Jacobian is evaluated, unless the trial was evaluated with it (speculativeJacobian).
 */
import { norm2, scaledNorm } from './dense.js';
import type { Evaluation } from './evaluation.js';
import { noteNoise, type SolverFrame, type SolverState } from './solver-state.js';
import type { JudgedTrial } from './stopping-tests.js';
import type { TrialStep } from './trial-step.js';
import { ACCEPT_RATIO, shrinkAfterFailure, trialOutcome, updateRadius } from './trust-radius.js';

/** The judged trial, and the cost at the trial point (Infinity when it could not be evaluated). */
export type Judgement = JudgedTrial & { trialCost: number };

export function judgeTrial(frame: SolverFrame, state: SolverState, step: TrialStep, ev: Evaluation): Judgement {
  if (!ev.ok) {
    // A trial that cannot be evaluated: reject and shrink the region (the step went too far).
    shrinkAfterFailure(state, step.pnorm);
    return { step, evaluated: false, why: ev.why, accepted: false, prered: 0, actred: -1, ratio: 0, trialCost: Infinity };
  }
  const outcome = trialOutcome(state, norm2(ev.residuals), step.prered);
  updateRadius(state, outcome, step.pnorm, step.dirder);
  const accepted = outcome.ratio >= ACCEPT_RATIO && takeStep(frame, state, step, ev);
  const { fnorm1, actred, ratio } = outcome;
  return { step, evaluated: true, accepted, prered: step.prered, actred, ratio, trialCost: fnorm1 * fnorm1 };
}

/** Move to the trial point with its Jacobian; false (and the region shrunk) when that cannot be evaluated. */
function takeStep(frame: SolverFrame, state: SolverState, step: TrialStep, ev: Evaluation & { ok: true }): boolean {
  const withJ = ev.jacobian ? ev : frame.evaluator.evaluate(step.theta, true);
  if (!withJ.ok || !withJ.jacobian) {
    shrinkAfterFailure(state, step.pnorm);
    return false;
  }
  if (withJ !== ev) noteNoise(state, withJ.residuals, ev.residuals);
  state.theta = step.theta;
  state.r = ev.residuals; // the plain evaluation's residuals (see start.ts), unless speculative
  state.rFromJacobianPath = withJ === ev;
  state.J = withJ.jacobian;
  state.fnorm = norm2(state.r);
  state.xnorm = scaledNorm(state.D, state.theta);
  state.acceptedSteps++;
  return true;
}
