/**
 * Why the solver stopped: one entry per distinct test that ends a run, with its status, its meaning
 * in one line and the template of the `message` users see. Every finish site of the solver names its
 * entry here (stopping-tests.ts, start.ts), so a program can branch on `SolverResult.reason` and a
 * report can explain it from this table alone.
 *
 * Some tests print the same words (e.g. the Gauss-Newton certificate before a trial and the one after
 * a full Gauss-Newton trial): the words are kept as users know them, the codes tell the tests apart.
 *
 * Placeholders in the templates: {costTolerance}, {stepTolerance}, {gradientTolerance} and {noise}
 * are relative numbers printed with one significant digit (1e-14); {maxIterations} is an integer;
 * {why} is the words of the last evaluation that failed.
 */

import { formatTolerance } from '../../presentation/numbers.js';

export type StopStatus = 'converged' | 'stopped' | 'failed';

export interface StopReasonEntry {
  status: StopStatus;
  /** What the test says, in one line. */
  meaning: string;
  /** The message, with {placeholders} (see the top of this file). */
  message: string;
}

export const STOP_REASONS = {
  'start-failed': {
    status: 'failed',
    meaning: 'the residuals or their Jacobian could not be computed at the start point',
    message: 'the residuals cannot be computed at the start point: {why}',
  },
  'zero-residual': {
    status: 'converged',
    meaning: 'every residual is exactly zero',
    message: 'the residuals are zero: the model reproduces the data exactly',
  },
  gradient: {
    status: 'converged',
    meaning: 'the largest cosine between a free Jacobian column and the residual vector is below the gradient tolerance',
    message: 'scaled gradient below {gradientTolerance}',
  },
  'held-at-bounds': {
    status: 'converged',
    meaning: 'no entry is free to move: each sits on a bound and the cost falls only outward',
    message: 'every entry is held at a bound and the cost would only fall outside the bounds',
  },
  'model-gain-below-tolerance': {
    status: 'converged',
    meaning: 'noisy cost, before a trial: no step of the free entries can reduce the linear model by the cost tolerance (squared norm of Q^T r over that of r)',
    message: 'relative cost change predicted by a full Gauss-Newton step below {costTolerance}',
  },
  'model-gain-below-noise': {
    status: 'converged',
    meaning: 'noisy cost, before a trial: the best reduction the linear model allows is below the evaluation noise of the cost',
    message: 'relative cost change predicted by a full Gauss-Newton step below the evaluation noise of the cost ({noise})',
  },
  iterations: {
    status: 'stopped',
    meaning: 'the limit on trial steps was reached before any convergence test passed',
    message: 'iteration limit {maxIterations} reached before convergence',
  },
  'cost-change': {
    status: 'converged',
    meaning: 'the actual and the predicted relative cost reduction of the last trial are both below the cost tolerance',
    message: 'relative cost change below {costTolerance}',
  },
  'newton-gain': {
    status: 'converged',
    meaning: 'a full (undamped, unprojected) Gauss-Newton trial predicted, and achieved no more than, a relative reduction below the cost tolerance',
    message: 'relative cost change predicted by a full Gauss-Newton step below {costTolerance}',
  },
  step: {
    status: 'converged',
    meaning: 'the trust radius fell below the step tolerance times the scaled length of theta',
    message: 'relative step below {stepTolerance}',
  },
  'cost-change-and-step': {
    status: 'converged',
    meaning: 'the cost-change test and the step test passed on the same trial',
    message: 'relative cost change below {costTolerance} and relative step below {stepTolerance}',
  },
  'newton-gain-and-step': {
    status: 'converged',
    meaning: 'the full Gauss-Newton test and the step test passed on the same trial',
    message: 'relative cost change predicted by a full Gauss-Newton step below {costTolerance} and relative step below {stepTolerance}',
  },
  'machine-precision': {
    status: 'converged',
    meaning: 'the cost change or the trust radius is at the rounding level of double precision',
    message: 'no step can reduce the cost further at machine precision',
  },
  'step-after-failed-trial': {
    status: 'converged',
    meaning: 'the trust radius fell below the step tolerance while shrinking after a trial that could not be evaluated',
    message: 'relative step below {stepTolerance} (trial points beyond could not be evaluated: {why})',
  },
  'trial-gain-below-noise': {
    status: 'converged',
    meaning: 'noisy cost: a rejected unprojected trial predicted a positive gain below the evaluation noise of the cost',
    message: 'relative cost change predicted by the trial step below the evaluation noise of the cost ({noise})',
  },
} as const satisfies Record<string, StopReasonEntry>;

/** Why the solver stopped, for programs; `message` says the same in words. */
export type StopReason = keyof typeof STOP_REASONS;

/** The values a message template may name. */
export interface StopDetails {
  costTolerance?: number;
  stepTolerance?: number;
  gradientTolerance?: number;
  noise?: number;
  maxIterations?: number;
  why?: string;
}


function placeholderValue(name: string, details: StopDetails): string {
  switch (name) {
    case 'costTolerance':
    case 'stepTolerance':
    case 'gradientTolerance':
    case 'noise': {
      const v = details[name];
      if (v === undefined) throw new Error(`stop message: no value for {${name}}`);
      return formatTolerance(v);
    }
    case 'maxIterations':
      if (details.maxIterations === undefined) throw new Error('stop message: no value for {maxIterations}');
      return String(details.maxIterations);
    case 'why':
      if (details.why === undefined) throw new Error('stop message: no value for {why}');
      return details.why;
    default:
      throw new Error(`stop message: unknown placeholder {${name}}`);
  }
}

/** The entry's message with its placeholders filled in. */
export function stopMessage(reason: StopReason, details: StopDetails): string {
  return STOP_REASONS[reason].message.replace(/\{(\w+)\}/g, (_, name: string) => placeholderValue(name, details));
}

/** A finished run's verdict: the code, its status from the table, and the message. */
export interface Stop {
  reason: StopReason;
  status: StopStatus;
  message: string;
}

export function stopWith(reason: StopReason, details: StopDetails = {}): Stop {
  return { reason, status: STOP_REASONS[reason].status, message: stopMessage(reason, details) };
}
