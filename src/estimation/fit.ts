/**
 * `fitModel(model, options)`: the library's fit entry point. Compiles the model, reads every
 * experiment's log (all data problems reported together), and runs the pipeline of fit-core.ts with
 * the real simulator, solver, uncertainty, identifiability, multistart and residual diagnostics.
 */
import { ProblemList, UserError } from '../errors.js';
import type { ExperimentData } from '../data/types.js';
import { loadExperimentData } from '../data/index.js';
import { compileModel } from '../model/compile/index.js';
import type { Model } from '../model/types.js';
import { parameterVector, simulateExperiment } from '../simulation/index.js';
import { residualDiagnostics } from '../diagnostics/index.js';
import type { FitOptions, FitOutcome } from './fit-api.js';
import { runFit, type FitDeps } from './fit-core.js';
import { solveLeastSquares } from './solver/index.js';
import { identifiabilityOf, uncertaintyOf } from './fit-adapters.js';
import { runMultistart } from './multistart.js';

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

export function defaultFitDeps(): FitDeps {
  return {
    sim: { simulateExperiment, parameterVector },
    solve: (problem, start, options) => solveLeastSquares(problem, start, options),
    uncertainty: uncertaintyOf,
    identifiability: identifiabilityOf,
    multistart: runMultistart,
    diagnostics: (series, inputs, timeUnit) => residualDiagnostics(series, inputs, { timeUnit }),
  };
}

export function fitModel(model: Model, options: FitOptions = {}): FitOutcome {
  const compiled = compileModel(model);
  const data = loadAllData(model);
  return runFit(model, compiled, data, options, defaultFitDeps());
}
