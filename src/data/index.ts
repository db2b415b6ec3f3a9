/** Data: reading experiment logs into the model's units. */
export { loadExperimentData } from './load-experiment.js';
