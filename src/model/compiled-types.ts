/**
 * A compiled model: the model's expressions turned into plain JavaScript functions that read
 * typed arrays by index. Everything is in the units the model file declares.
 *
 * Slots: states 0..nStates-1 in model order, inputs 0..nInputs-1 in model order, parameters
 * 0..nParams-1 in the order of `model.parameters` (one slot per declared parameter; per-experiment
 * copies are the estimator's business: it fills the slot with the copy of the experiment simulated).
 * Defines are evaluated inside the generated functions and have no slot.
 */
import type { Model } from './types.js';

export type Vec = Float64Array;

export interface CompiledModel {
  model: Model;
  nStates: number;
  nInputs: number;
  nParams: number;
  nOutputs: number;
  /** Parameter name -> slot. */
  paramSlot: ReadonlyMap<string, number>;
  /** Parameter values as declared (fixed value, or free start), in slot order. */
  defaultParams(): Vec;

  /** dx/dt into `dx` (length nStates). */
  rhs(t: number, x: Vec, u: Vec, p: Vec, dx: Vec): void;
  /** Output values into `y` (length nOutputs). For static models `x` is empty. */
  outputs(t: number, x: Vec, u: Vec, p: Vec, y: Vec): void;
  /** Initial states into `x0`, for experiment index `experiment` (its `initial` overrides apply). */
  initial(experiment: number, p: Vec, x0: Vec): void;

  /**
   * The forward sensitivity system for the parameter slots `slots` (q = slots.length), built from
   * symbolic derivatives. Compiled on demand and cached per distinct `slots` list.
   */
  sensitivity(slots: readonly number[]): SensitivitySystem;
}

/**
 * Augmented state z = [x (nStates), S (nStates*q, row-major: S[i*q+k] = dx_i/dp_slots[k])].
 *
 * Input derivatives: when an input has a delay that is one of `slots`, d u(t - d)/dd = -udot(t - d);
 * the simulator passes the time derivative of each (delayed) input in `udot` so that the generated
 * code can add (df/du) * (-udot) to the column of that delay parameter.
 */
export interface SensitivitySystem {
  slots: readonly number[];
  q: number;
  /** dz/dt into dz (length nStates*(1+q)). */
  rhs(t: number, z: Vec, u: Vec, udot: Vec, p: Vec, dz: Vec): void;
  /** Outputs into y (nOutputs) and their sensitivities into dy (nOutputs*q, row-major). */
  outputs(t: number, z: Vec, u: Vec, udot: Vec, p: Vec, y: Vec, dy: Vec): void;
  /** z0 = [x0, dx0/dp] for experiment index `experiment`. */
  initial(experiment: number, p: Vec, z0: Vec): void;
  /**
   * For each slot k that is the delay of input j: `delayOfInput[k] = j`, else -1. The simulator
   * needs it for the jump conditions of `hold` inputs with a free delay.
   */
  delayOfInput: readonly number[];
}
