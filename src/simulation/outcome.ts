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

/**
 * The value form of a simulator that offers only the throwing form (a RunFailure becomes a
 * failure; anything else thrown is a bug and propagates). For simulators passed in from outside
 * (estimation/problem.ts SimulatorFns without `trySimulateExperiment`); the library's own
 * simulation answers values and never needs it.
 */
export function outcomeOfThrowing<A extends unknown[]>(simulate: (...args: A) => SimulationResult): (...args: A) => SimulationOutcome {
  return (...args) => {
    try {
      return { ok: true, result: simulate(...args) };
    } catch (err) {
      if (!(err instanceof RunFailure)) throw err;
      return { ok: false, failure: failureOf(err) };
    }
  };
}

function failureOf(err: RunFailure): SimulationFailure {
  return { message: err.message, details: err.details };
}
