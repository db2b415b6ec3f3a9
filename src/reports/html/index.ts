/** report.html: renderer and results-folder reader (the `report` verb: src/verbs/report.ts). */
export { renderFitReport } from './render-fit-report.js';
export { readResultsFolder, readFitJson, readResidualsCsv, MAX_RESIDUALS_BYTES } from './read-results-folder.js';
export type { ResultsFolder } from './read-results-folder.js';
export { decimateMinMax } from './decimate.js';
export { escapeHtml } from './escape-html.js';
