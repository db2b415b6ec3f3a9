/** Simulation: parameter vectors, experiment and span simulation. */
export { parameterVector } from './parameters.js';
export { simulateExperiment, simulateSpan, trySimulateExperiment } from './simulate.js';
export type { SimulationFailure, SimulationOutcome } from './types.js';
