/**
 * `fitModel(model, options)`: the library's fit entry point. Compiles the model, reads every
 * experiment's log (all data problems reported together), and fits with the real collaborators.
 * A model that cannot be simulated at its start values is a RunFailure (the work ran but failed);
 * input mistakes are UserErrors.
 */
import { loadExperimentData } from '../../data/index.js';
import type { ExperimentData } from '../../data/types.js';
import { ProblemList, UserError } from '../../errors.js';
import { compileModel } from '../../model/compile/index.js';
import type { CompiledModel } from '../../model/compiled-types.js';
import type { Model } from '../../model/types.js';
import { realCollaborators, type FitCollaborators } from './collaborators.js';
import type { FitOptions } from './fit-options.js';
import type { CompletedFit } from './fit-result.js';
import { fitWithRescue } from './rescue-search.js';

/** Read the log of every experiment; throws one UserError listing the problems of all of them. */
export function loadAllData(model: Model): ExperimentData[] {
  const problems = new ProblemList();
  const data: ExperimentData[] = [];
  model.experiments.forEach((_, i) => {
    try {
      data.push(loadExperimentData(model, i));
    } catch (err) {
      if (!(err instanceof UserError)) throw err;
      problems.items.push(...err.problems);
    }
  });
  problems.throwIfAny();
  return data;
}

export function fitModel(model: Model, options: FitOptions = {}): CompletedFit {
  return fitLoaded(model, compileModel(model), loadAllData(model), options);
}

/** The fit of an already compiled model to loaded data; throws the RunFailure of a fit that cannot start. */
export function fitLoaded(
  model: Model,
  compiled: CompiledModel,
  data: readonly ExperimentData[],
  options: FitOptions = {},
  collaborators: FitCollaborators = realCollaborators(),
): CompletedFit {
  const fit = fitWithRescue(model, compiled, data, options, collaborators);
  if ('ok' in fit) throw fit.failure;
  return fit;
}
