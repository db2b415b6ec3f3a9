/**
 * The results folder of `fit`: estimates.yaml, fit.json, residuals.csv and (when the HTML renderer
 * is part of the build) report.html, written as a whole (src/files/results-folder.ts). A folder that
 * is not a results folder of ours is never replaced.
 */
import type { CompletedFit } from '../estimation/fit/fit-result.js';
import { FIT_FOLDER, assertReplaceable, writeResultsFolder, type FolderEntry } from '../files/results-folder.js';
import { renderEstimatesYaml } from './estimates-yaml.js';
import { renderFitJson } from './fit-json.js';
import { renderResidualsCsv } from './residuals-csv.js';

export type HtmlRenderer = (outcome: CompletedFit) => string | Promise<string>;

/**
 * report.html from the in-memory results, by the report renderer. Loaded on first use: the renderer
 * brings vega and vega-lite (about 0.6 s of module loading), which a program that only writes the
 * other files, or fails before writing, should not pay for.
 */
export const reportRenderer: HtmlRenderer = async (outcome) => {
  const { renderFitReport } = await import('./html/render-fit-report.js');
  return renderFitReport(outcome.result, outcome.residuals);
};

export interface WriteResultsOptions {
  /** Every output of the model in model order (residuals.csv columns). */
  outputs: readonly string[];
  /** Renders report.html from the in-memory results; omitted: no report.html. */
  renderHtml?: HtmlRenderer;
  /** Test hook: extra entries (e.g. one that throws, to check that nothing half-written remains). */
  extraFiles?: Record<string, FolderEntry>;
}

/** Write the results folder; returns its absolute path. */
export async function writeResults(folder: string, outcome: CompletedFit, options: WriteResultsOptions): Promise<string> {
  // Refused before the report is rendered (plots take a while); checked again when the folder is swapped in.
  assertReplaceable(folder, FIT_FOLDER);
  const files: Record<string, FolderEntry> = {
    'estimates.yaml': () => renderEstimatesYaml(outcome.result),
    'fit.json': () => renderFitJson(outcome.result),
    'residuals.csv': () => renderResidualsCsv(outcome.residuals, options.outputs),
  };
  // The report renders asynchronously (plots); everything else is built while the folder is written.
  if (options.renderHtml) files['report.html'] = await options.renderHtml(outcome);
  Object.assign(files, options.extraFiles ?? {});
  return writeResultsFolder(folder, files, FIT_FOLDER);
}
