/** Simulation: parameter vectors, experiment and span simulation. */
export { parameterVector, splitParameterKey } from './parameters.js';
export { simulateExperiment, simulateSpan, trySimulateExperiment } from './simulate.js';
export { resultOrThrow } from './outcome.js';
export type { SimulationFailure, SimulationOutcome } from './types.js';
export { DEFAULT_RTOL, ATOL_FLOOR } from './tolerances.js';
export { timeConstants } from './stiffness.js';
