/**
 * `rigcal check` as a library verb: load the model and every experiment's log and collect every
 * problem found (model file and all data files together, not only the first).
 */
import { UserError, type Problem } from '../errors.js';
import type { ExperimentData } from '../data/types.js';
import { loadExperimentData } from '../data/load-experiment.js';
import { pathFromCwd } from '../files/paths.js';
import { compileModel } from '../model/compile/index.js';
import { loadModel } from '../model/load/index.js';
import type { Model } from '../model/types.js';

export interface CheckOptions {
  modelFile: string;
  /** Folder relative paths are read from (default: the process's). */
  cwd?: string;
}

export interface CheckResult {
  model: Model;
  /** Per experiment its data, or undefined where the log has problems. */
  data: (ExperimentData | undefined)[];
  /** Problems of the compiled model and of the data files; none when all is well. */
  problems: Problem[];
}

/**
 * Throws one UserError listing every problem of the model file when it does not load (the data
 * files can only be read against a loaded model); the problems found after that are returned.
 */
export function runCheck(options: CheckOptions): CheckResult {
  const model = loadModel(pathFromCwd(options.modelFile, options.cwd ?? process.cwd()));
  const problems: Problem[] = [];
  const collect = (err: unknown) => {
    if (err instanceof UserError) problems.push(...err.problems);
    else throw err;
  };
  try {
    compileModel(model);
  } catch (err) {
    collect(err);
  }
  const data: (ExperimentData | undefined)[] = model.experiments.map((_, k) => {
    try {
      return loadExperimentData(model, k);
    } catch (err) {
      collect(err);
      return undefined;
    }
  });
  return { model, data, problems };
}
