/**
 * `rigcal fit` as a library verb: estimate the free parameters from the model's fit experiments,
 * score the validation experiments, and write the results folder (estimates.yaml, fit.json,
 * residuals.csv, report.html).
 */
import { resolve } from 'node:path';
import type { FitOptions } from '../estimation/fit/fit-options.js';
import type { CompletedFit } from '../estimation/fit/fit-result.js';
import { fitModel } from '../estimation/fit/fit-model.js';
import { UserError } from '../errors.js';
import { formatSignificant } from '../presentation/numbers.js';
import { FIT_FOLDER, chooseResultsFolder } from '../files/results-folder.js';
import { loadModel } from '../model/load/index.js';
import type { Model } from '../model/types.js';
import { reportRenderer, writeResults, type HtmlRenderer } from '../reports/write-results.js';

export interface FitRunOptions {
  modelFile: string;
  cwd?: string;
  /** Results folder (default `./<model name>-fit/` below `cwd`). */
  output?: string;
  /** Parameter values for this fit, in each parameter's unit (`name` or `name@experiment`). */
  overrides?: Record<string, number>;
  starts?: number;
  seed?: number;
  maxIterations?: number;
  onProgress?: FitOptions['onProgress'];
  /** Renders report.html (default: the report renderer); false: no report.html. */
  renderHtml?: HtmlRenderer | false;
}

export interface FitRunResult {
  model: Model;
  outcome: CompletedFit;
  /** Absolute path of the results folder written. */
  folder: string;
}

export async function runFit(options: FitRunOptions): Promise<FitRunResult> {
  const cwd = options.cwd ?? process.cwd();
  const model = loadModel(resolve(cwd, options.modelFile), { overrides: options.overrides ?? {} });
  // Provenance names the model file as the user gave it, not as resolved here.
  model.fileAsGiven = options.modelFile;
  // Refuses a foreign folder before spending time on the fit.
  const folder = chooseResultsFolder(cwd, options.output, model.name, FIT_FOLDER);
  const outcome = fitModel(model, { starts: options.starts, seed: options.seed, maxIterations: options.maxIterations, onProgress: options.onProgress });
  const renderHtml = options.renderHtml === false ? undefined : (options.renderHtml ?? reportRenderer);
  try {
    const written = await writeResults(folder, outcome, { outputs: model.outputs.map((o) => o.name), renderHtml });
    return { model, outcome, folder: written };
  } catch (err) {
    if (err instanceof UserError) throw finishedButNotWritten(err, outcome);
    throw err;
  }
}

/**
 * The fit ran (seconds or minutes of work) but its folder could not be written, e.g. the disk filled
 * meanwhile: the message says so, and carries the estimates so that they are not lost with it.
 */
function finishedButNotWritten(err: UserError, outcome: CompletedFit): UserError {
  const r = outcome.result;
  const estimates = r.parameters
    .filter((p) => p.status === 'free')
    .map((p) => `${p.name} = ${formatSignificant(p.estimate, 6)}${p.unit && p.unit !== '1' ? ` ${p.unit}` : ''}`)
    .join(', ');
  return new UserError(err.problems.map((p) => ({
    ...p,
    what: `the fit finished (${r.status}, ${r.iterations} iterations) but ${p.what}`,
    fix: `${p.fix ?? 'choose another folder with -o'}; the estimates were ${estimates}`,
  })));
}
