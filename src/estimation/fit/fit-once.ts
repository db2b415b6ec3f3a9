/**
 * One fit, stage by stage: solve (starts and noise refits), estimates with their uncertainty,
 * statistics, scores of every experiment, and the record. The stages are in files of their own;
 * this one is about their order and the order of the warnings they give.
 */
import type { ExperimentData } from '../../data/types.js';
import type { CompiledModel } from '../../model/compiled-types.js';
import type { Model } from '../../model/types.js';
import { outlierWarnings } from '../../presentation/outlier-notes.js';
import { MAX_SIGMA_ROUNDS, SIGMA_TOLERANCE } from '../noise.js';
import { assembleResult } from './assemble-result.js';
import type { FitCollaborators } from './collaborators.js';
import { estimatesAt } from './estimates-stage.js';
import type { FitOptions } from './fit-options.js';
import type { CompletedFit } from './fit-result.js';
import { prepareFit } from './fit-setup.js';
import { fitStatistics } from './fit-statistics.js';
import { localOptimumHint, type LocalOptimumHint } from './local-optimum.js';
import { scoreFitExperiments, scoreValidationExperiments } from './score-experiments.js';
import { solveFit, type SolvedFit, type StartFailed } from './solve-stage.js';

export interface SingleFit {
  ok: true;
  fit: CompletedFit;
  /** Set when the fit looks stuck in a local optimum (see local-optimum.ts). */
  localOptimum?: LocalOptimumHint;
}

export function fitOnce(model: Model, compiled: CompiledModel, data: readonly ExperimentData[], options: FitOptions, collaborators: FitCollaborators): SingleFit | StartFailed {
  const now = collaborators.now ?? (() => performance.now() / 1000);
  const t0 = now();
  const setup = prepareFit(model, compiled, data, options, collaborators);
  const solved = solveFit(setup);
  if (!solved.ok) return solved;
  const { run } = solved;
  const solvingWarnings = [...solved.warnings, ...solverWarnings(setup.problem.lastFailure?.message, solved)];
  const estimates = estimatesAt(setup, run);
  const { statistics, warnings: statisticsWarnings } = fitStatistics(setup, run);
  const scored = scoreFitExperiments(setup, run.theta);
  const hint = localOptimumHint(solved.starts !== undefined, estimates.parameters, scored.outputs);
  const validationWarnings = scoreValidationExperiments(setup, estimates.values, scored);
  const warnings = [
    ...outlierWarnings(data),
    ...solvingWarnings,
    ...estimates.warnings,
    ...statisticsWarnings,
    ...(hint ? [hint.warning] : []),
    ...validationWarnings,
    ...scored.warnings,
  ];
  const result = assembleResult(setup, solved, estimates, statistics, scored.outputs, warnings);
  result.wallSeconds = now() - t0;
  const fit: CompletedFit = { result, residuals: scored.residuals, values: estimates.valueByName };
  return { ok: true, fit, ...(hint ? { localOptimum: hint } : {}) };
}

/** What the solving stage leaves to say: unsettled weighting, rejected trial points, an iteration limit. */
function solverWarnings(lastFailure: string | undefined, solved: SolvedFit): string[] {
  const warnings: string[] = [];
  const { run } = solved;
  if (!solved.sigmaConverged) {
    warnings.push(`the estimated noise levels still changed by more than ${SIGMA_TOLERANCE * 100} % after ${MAX_SIGMA_ROUNDS} refits; the weighting may not be settled`);
  }
  const failed = run.failedEvaluations;
  if (failed > 0 && lastFailure) {
    warnings.push(`${failed} trial point${failed > 1 ? 's' : ''} of the optimiser could not be simulated and ${failed > 1 ? 'were' : 'was'} rejected; the last reason: ${lastFailure}`);
  }
  if (run.status === 'stopped') warnings.push(`the fit stopped at the iteration limit before converging (${run.message}); raise --max-iterations or check the start values`);
  return warnings;
}
