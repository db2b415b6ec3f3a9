/** Data: reading experiment logs into the model's units. */
export { loadExperimentData } from './load-experiment.js';
export { readCsv, detectDelimiter } from './csv-table.js';
export { MAX_DATA_FILE_BYTES, MAX_DATA_ROWS } from './limits.js';
