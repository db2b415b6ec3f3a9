/**
 * `rigcal validate` as a library verb: score a calibrated model (model file + estimates.yaml) on data
 * it was not fitted to (src/validation/validate-model.ts), and write its results folder
 * (validation.json, residuals.csv, report.html).
 */
import { resolve } from 'node:path';
import { VALIDATION_FOLDER, defaultResultsFolder } from '../files/results-folder.js';
import { validateModel, type ValidateOptions, type ValidateOutcome } from '../validation/validate-model.js';
import { writeValidationFolder } from '../validation/validation-folder.js';
import { renderValidationReport } from '../validation/validation-html.js';

export interface ValidateRunOptions extends ValidateOptions {
  /** Results folder (default `./<model name>-validate/` below `cwd`). */
  output?: string;
}

export interface ValidateRunResult extends ValidateOutcome {
  /** Absolute path of the results folder written. */
  folder: string;
}

export async function runValidate(options: ValidateRunOptions): Promise<ValidateRunResult> {
  const cwd = options.cwd ?? process.cwd();
  const outcome = validateModel(options);
  const folder = options.output ? resolve(cwd, options.output) : defaultResultsFolder(cwd, outcome.result.model.name, VALIDATION_FOLDER);
  const report = await renderValidationReport(outcome.result, outcome.series, outcome.noise);
  const outputs = outcome.result.outputs.map((o) => o.output).filter((o, i, a) => a.indexOf(o) === i);
  return { ...outcome, folder: writeValidationFolder(folder, outcome.result, outcome.series, outputs, report) };
}
