/** report.html: renderer, results-folder reader and writer. */
export { renderFitReport } from './render-fit-report.js';
export { readResultsFolder, readFitJson, readResidualsCsv, MAX_RESIDUALS_BYTES } from './read-results-folder.js';
export type { ResultsFolder } from './read-results-folder.js';
export { writeReportForFolder } from './write-report.js';
export type { WrittenReport } from './write-report.js';
export { decimateMinMax } from './decimate.js';
export { escapeHtml } from './escape-html.js';
