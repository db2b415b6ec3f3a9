/**
 * The results folder of `validate`: validation.json, residuals.csv, and report.html when a renderer
 * is given, written as a whole (src/files/results-folder.ts). A folder that is not a validation
 * folder of ours is never replaced.
 */
import type { ResidualSeries } from '../diagnostics/types.js';
import { toJson } from '../files/json.js';
import { VALIDATION_FOLDER, writeResultsFolder, type FolderEntry } from '../files/results-folder.js';
import { renderResidualsCsv } from '../reports/residuals-csv.js';
import type { ValidationResult } from './validation-result.js';

/** Write the folder; returns its absolute path. */
export function writeValidationFolder(
  folder: string,
  result: ValidationResult,
  series: readonly ResidualSeries[],
  outputs: readonly string[],
  /** report.html, already rendered (rendering is asynchronous); omitted: no report. */
  reportHtml?: string,
): string {
  const files: Record<string, FolderEntry> = {
    'validation.json': () => toJson(result),
    'residuals.csv': () => renderResidualsCsv(series, outputs),
  };
  if (reportHtml !== undefined) files['report.html'] = reportHtml;
  return writeResultsFolder(folder, files, VALIDATION_FOLDER);
}
