/** Simulation: parameter vectors, experiment and span simulation. */
export { parameterVector, splitParameterKey } from './parameters.js';
export { simulateExperiment, simulateSpan } from './simulate.js';
export { DEFAULT_RTOL, ATOL_FLOOR } from './tolerances.js';
export { timeConstants } from './stiffness.js';
