/**
 * How the trust radius Delta and the damping follow a trial (Moré 1978, as in MINPACK's lmder):
 * shrink when the ratio of actual to predicted reduction is poor, grow when the linear model was
 * trusted, shrink by 4 when the trial could not be evaluated (the step went too far).
 */
import type { SolverState } from './solver-state.js';

/** A step is taken when it achieves at least this share of the predicted reduction (MINPACK's 1e-4). */
export const ACCEPT_RATIO = 1e-4;

/** What a trial that could be evaluated achieved. */
export interface TrialOutcome {
  /** Norm of the trial point's residuals. */
  fnorm1: number;
  /** Relative actual reduction of the cost (-1 when the cost grew more than 100-fold). */
  actred: number;
  /** actred / prered (0 when nothing was predicted). */
  ratio: number;
}

export function trialOutcome(state: SolverState, fnorm1: number, prered: number): TrialOutcome {
  const actred = 0.1 * fnorm1 < state.fnorm ? 1 - (fnorm1 / state.fnorm) ** 2 : -1;
  return { fnorm1, actred, ratio: prered > 0 ? actred / prered : 0 };
}

/** Update Delta and the damping from the trial's ratio (before the step is taken or not). */
export function updateRadius(state: SolverState, outcome: TrialOutcome, pnorm: number, dirder: number): void {
  const { fnorm1, actred, ratio } = outcome;
  if (ratio <= 0.25) {
    let temp = actred >= 0 ? 0.5 : (0.5 * dirder) / (dirder + 0.5 * actred);
    if (0.1 * fnorm1 >= state.fnorm || !(temp >= 0.1)) temp = 0.1;
    state.delta = temp * Math.min(state.delta, pnorm / 0.1);
    state.damping /= temp;
  } else if (state.damping === 0 || ratio >= 0.75) {
    state.delta = pnorm / 0.5;
    state.damping *= 0.5;
  }
}

/** A trial (or the Jacobian of a taken step) that could not be evaluated: reject and shrink. */
export function shrinkAfterFailure(state: SolverState, pnorm: number): void {
  state.delta = 0.25 * Math.min(state.delta, pnorm > 0 ? pnorm : state.delta);
  state.damping *= 4;
}
