/**
 * The stopping tests (MINPACK's, in words, and those of `noisyCost`), each answering a Stop from the
 * table of stop-reasons.ts or undefined to go on. They read the state and never change it.
 */
import { norm2 } from './dense.js';
import { noiseLevel, type SolverFrame, type SolverState } from './solver-state.js';
import { stopWith, type Stop } from './stop-reasons.js';
import type { TrialStep } from './trial-step.js';

const EPS = 2.220446049250313e-16;

/** At the current point, before any trial: zero residuals, then the gradient test. */
export function stopAtPoint(frame: SolverFrame, state: SolverState, freeCount: number): Stop | undefined {
  if (state.fnorm === 0) return stopWith('zero-residual');
  const gtol = frame.settings.gradientTolerance;
  if (state.scaledGradient <= gtol) return freeCount ? stopWith('gradient', { gradientTolerance: gtol }) : stopWith('held-at-bounds');
  return undefined;
}

/**
 * On request (`noisyCost`), the Gauss-Newton certificate before a trial is spent: no step of the
 * free entries can reduce the linear model's cost by more than ||Q^T r||^2, so when that is below
 * ftol of the cost nothing is left to gain. Near the optimum of an ODE fit this saves the trials
 * that integration noise in the cost would reject one by one until the step test.
 */
export function stopByModelGain(frame: SolverFrame, state: SolverState, qtr: Float64Array): Stop | undefined {
  if (!frame.options.noisyCost) return undefined;
  const ftol = frame.settings.costTolerance;
  const noise = noiseLevel(state, frame.options);
  const bestPredicted = (norm2(qtr) / state.fnorm) ** 2;
  if (!(bestPredicted <= Math.max(ftol, noise))) return undefined;
  return bestPredicted <= ftol ? stopWith('model-gain-below-tolerance', { costTolerance: ftol }) : stopWith('model-gain-below-noise', { noise });
}

export function stopAtIterationLimit(frame: SolverFrame, state: SolverState): Stop | undefined {
  const maxIterations = frame.settings.maxIterations;
  return state.iterations >= maxIterations ? stopWith('iterations', { maxIterations }) : undefined;
}

/** What the tests after a trial need to know about it. */
export interface JudgedTrial {
  step: TrialStep;
  /** False when the trial could not be evaluated; then `why` says why. */
  evaluated: boolean;
  why?: string;
  accepted: boolean;
  /** Predicted reduction (0 after a failed evaluation), actual reduction and their ratio. */
  prered: number;
  actred: number;
  ratio: number;
}

/** After a trial (taken or not), in MINPACK's order, then the noise test of `noisyCost`. */
export function stopAfterTrial(frame: SolverFrame, state: SolverState, t: JudgedTrial): Stop | undefined {
  if (state.fnorm === 0) return stopWith('zero-residual');
  const { costTolerance: ftol, stepTolerance: xtol } = frame.settings;
  const stepDone = state.delta <= xtol * state.xnorm || state.delta === 0;
  if (!t.evaluated) return stepDone ? stopWith('step-after-failed-trial', { stepTolerance: xtol, why: t.why! }) : undefined;
  const { prered, actred, ratio } = t;
  const costDone = Math.abs(actred) <= ftol && prered <= ftol && 0.5 * ratio <= 1;
  // A full (undamped, unprojected) Gauss-Newton step that predicts less than ftol is a certificate
  // of convergence whatever the actual change: when rounding or integration noise in the cost
  // exceeds ftol, |actred| would never pass, and the run would end only after the trust region had
  // been shrunk to the step tolerance by rejected (noise-driven) trials.
  const newtonDone = !costDone && t.step.ds.damping === 0 && !t.step.clipped && prered <= ftol && actred <= ftol;
  const tolerances = { costTolerance: ftol, stepTolerance: xtol };
  if (costDone) return stopWith(stepDone ? 'cost-change-and-step' : 'cost-change', tolerances);
  if (newtonDone) return stopWith(stepDone ? 'newton-gain-and-step' : 'newton-gain', tolerances);
  if (stepDone) return stopWith('step', tolerances);
  if ((Math.abs(actred) <= EPS && prered <= EPS && 0.5 * ratio <= 1) || state.delta <= EPS * state.xnorm) return stopWith('machine-precision');
  return stopByTrialNoise(frame, state, t);
}

/**
 * `noisyCost`: a rejected trial whose predicted gain is below the noise of the cost cannot be judged.
 * Only a positive gain predicted for the unprojected step counts: a projected step's linear model
 * can predict a loss (prered < 0), which says nothing about noise.
 */
function stopByTrialNoise(frame: SolverFrame, state: SolverState, t: JudgedTrial): Stop | undefined {
  if (!frame.options.noisyCost || t.accepted || t.step.clipped) return undefined;
  const noise = noiseLevel(state, frame.options);
  return t.prered > 0 && t.prered <= noise ? stopWith('trial-gain-below-noise', { noise }) : undefined;
}
