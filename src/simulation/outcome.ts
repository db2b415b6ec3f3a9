/**
 * Simulation outcomes as values (SimulationOutcome, types.ts), and the two crossings between the
 * value form and the throwing form that callers such as the CLI prefer.
 */
import { RunFailure } from '../errors.js';
import type { SimulationFailure, SimulationOutcome, SimulationResult } from './types.js';

export function simulationFailed(message: string, details: Record<string, unknown> = {}): SimulationOutcome {
  return { ok: false, failure: { message, details } };
}

/** The result, or the failure thrown as a RunFailure (exit code 1 in the CLI). */
export function resultOrThrow(outcome: SimulationOutcome): SimulationResult {
  if (outcome.ok) return outcome.result;
  throw new RunFailure(outcome.failure.message, outcome.failure.details);
}
