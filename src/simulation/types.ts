/** What a simulation returns: plain arrays at the sample times. */

export interface SimulationStats {
  rhsEvaluations: number;
  steps: number;
  rejectedSteps: number;
  /** Integration restarts (window start, each jump of a `hold` input). */
  segments: number;
}

export interface SimulationResult {
  experiment: string;
  /** Sample times in the model's time unit. */
  time: Float64Array;
  /** Per state, values at the sample times. */
  states: Float64Array[];
  /** Per output, values at the sample times. */
  outputs: Float64Array[];
  /**
   * When sensitivities were requested: for the parameter slots `slots` (q of them),
   * `outputs[j][i*q+k]` = d output_j(t_i) / d p_slots[k].
   */
  sensitivities?: { slots: readonly number[]; outputs: Float64Array[] };
  stats: SimulationStats;
  /** Things the user should know about a simulation that succeeded (e.g. it looks stiff). */
  warnings?: string[];
}

export interface SimulationOptions {
  /** Relative tolerance (default 1e-8) and absolute tolerance per state (default scaled per state). */
  rtol?: number;
  atol?: number | Float64Array;
  /** Parameter slots to compute sensitivities for. */
  sensitivitySlots?: readonly number[];
  /** Step limit per segment before the model is declared stiff / failing. */
  maxSteps?: number;
  /**
   * Whether the sensitivities take part in the step-size control (default true: full error
   * control, so the Jacobian is resolved to the same tolerance as the outputs). False: partial
   * error control, the steps follow the states only. For measurements and tests.
   */
  sensitivityErrorControl?: boolean;
}

/**
 * Why a simulation that ran could not finish (non-finite state, step limit, stiffness...): the
 * words users see (with experiment, time and parameter values) and machine-readable details.
 */
export interface SimulationFailure {
  message: string;
  details: Record<string, unknown>;
}

/** A simulation's answer: its result, or why it failed. An expected failure is a value, not an exception. */
export type SimulationOutcome = { ok: true; result: SimulationResult } | { ok: false; failure: SimulationFailure };

/**
 * What one simulation is run on: which experiment, its sample times, the integration start and the
 * logged inputs (an experiment's data, or a span of constant inputs for `simulate --duration`).
 */
export interface SimulationInputs {
  /** Experiment name for results and messages. */
  name: string;
  /** Experiment index for initial values (-1: none, declared initial values). */
  experimentIndex: number;
  /** Sample times in model time units, strictly increasing, all >= start. */
  time: Float64Array;
  start: number;
  /** Per model input, one value per sample, in the input's unit. */
  inputs: Float64Array[];
}
