/**
 * One trial step: the damped step for the current trust radius (damped-step.ts), the trial point
 * projected onto the bounds (or onto the box of per-entry step limits, intersected with the
 * bounds), and the linear model's predicted relative reduction of the cost for the step taken.
 */
import { project } from './bounds.js';
import { dampedStep, type DampedStep } from './damped-step.js';
import { norm2, scaledNorm } from './dense.js';
import { multiplyColumns } from './row-major.js';
import type { TriangularFactor } from './tall-qr.js';
import type { SolverFrame, SolverState } from './solver-state.js';

/** The factored problem of one iteration (fixed while its trials shrink the region). */
export interface IterationModel {
  /** Entries free to move in this iteration. */
  free: number[];
  /** Triangle of the QR of J's free columns and Q^T r (tall-qr.ts). */
  R: TriangularFactor['R'];
  qtr: TriangularFactor['qtr'];
  /** The column scaling of the free entries. */
  Df: Float64Array;
}

export interface TrialStep {
  ds: DampedStep;
  /** The trial point, and whether the projection cut the step. */
  theta: number[];
  clipped: boolean;
  /** Scaled length of the step actually taken. */
  pnorm: number;
  /** Predicted relative reduction of the linear model, and the directional derivative. */
  prered: number;
  dirder: number;
}

/** Compute the next trial step; updates the state's damping (and the first radius, see below). */
export function trialStep(frame: SolverFrame, state: SolverState, model: IterationModel): TrialStep {
  const { free, Df } = model;
  const ds = dampedStep(model.R, model.qtr, Df, state.delta, state.damping);
  state.damping = ds.damping;
  const full = state.theta.slice();
  for (let k = 0; k < free.length; k++) full[free[k]!]! += ds.step[k]!;
  // Per-entry step limits act as a box around theta, intersected with the bounds.
  const projected = frame.maxStep ? project(full, stepLower(frame, state.theta), stepUpper(frame, state.theta)) : project(full, frame.lower, frame.upper);
  const trial = projected.theta;
  const actual = Float64Array.from(free, (k) => trial[k]! - state.theta[k]!);
  const pnorm = scaledNorm(Df, actual);
  // MINPACK: on the first iteration the radius is cut to the first step's length.
  if (state.acceptedSteps === 0) state.delta = Math.min(state.delta, pnorm);
  const { prered, dirder } = predictedReduction(state, model, ds, projected.clipped, actual);
  return { ds, theta: trial, clipped: projected.clipped, pnorm, prered, dirder };
}

function stepLower(frame: SolverFrame, theta: readonly number[]): Float64Array {
  return Float64Array.from(theta, (v, i) => Math.max(frame.lower[i]!, v - frame.maxStep![i]!));
}
function stepUpper(frame: SolverFrame, theta: readonly number[]): Float64Array {
  return Float64Array.from(theta, (v, i) => Math.min(frame.upper[i]!, v + frame.maxStep![i]!));
}

/** Predicted relative reduction of the linear model for the step actually taken, and the directional derivative. */
function predictedReduction(state: SolverState, model: IterationModel, ds: DampedStep, clipped: boolean, actual: Float64Array): { prered: number; dirder: number } {
  const { J, r, fnorm } = state;
  if (!clipped) {
    const t1 = norm2(multiplyColumns(J, model.free, ds.step)) / fnorm;
    const t2 = (Math.sqrt(state.damping) * ds.scaledLength) / fnorm;
    return { prered: t1 * t1 + 2 * t2 * t2, dirder: -(t1 * t1 + t2 * t2) };
  }
  const ja = multiplyColumns(J, model.free, actual);
  const lin = new Float64Array(r.length);
  let rja = 0;
  for (let i = 0; i < r.length; i++) {
    lin[i] = r[i]! + ja[i]!;
    rja += r[i]! * ja[i]!;
  }
  return { prered: 1 - (norm2(lin) / fnorm) ** 2, dirder: rja / (fnorm * fnorm) };
}
