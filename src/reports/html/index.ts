/** report.html: renderer and results-folder reader (the `report` verb: src/verbs/report.ts). */
export { renderFitReport } from './render-fit-report.js';
export { readResultsFolder } from './read-results-folder.js';
export type { ResultsFolder } from './read-results-folder.js';
