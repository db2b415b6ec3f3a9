/**
 * What every stage of one fit reads: the model, its fit and validation data, the noise plan, the
 * estimation problem and the solver's options for it. Built once, after the checks that make a fit
 * possible at all (a free parameter, a fit experiment, a measured sample), each a user error.
 */
import type { ExperimentData } from '../../data/types.js';
import { UserError } from '../../errors.js';
import type { CompiledModel } from '../../model/compiled-types.js';
import type { Model } from '../../model/types.js';
import { initialNoise, type NoisePlan } from '../noise.js';
import { buildProblem, type EstimationProblem } from '../problem.js';
import { solverSetup } from '../solver-setup.js';
import type { FitCollaborators } from './collaborators.js';
import type { FitOptions } from './fit-options.js';

export interface FitSetup {
  model: Model;
  compiled: CompiledModel;
  /** Every experiment in model order, and the two roles apart. */
  data: readonly ExperimentData[];
  fitData: readonly ExperimentData[];
  validationData: readonly ExperimentData[];
  noise: NoisePlan;
  problem: EstimationProblem;
  solver: ReturnType<typeof solverSetup>;
  options: FitOptions;
  collaborators: FitCollaborators;
}

export function prepareFit(model: Model, compiled: CompiledModel, data: readonly ExperimentData[], options: FitOptions, collaborators: FitCollaborators): FitSetup {
  const where = (key: string) => ({ file: model.fileAsGiven, key });
  const fitData = data.filter((d) => d.experiment.role === 'fit');
  const validationData = data.filter((d) => d.experiment.role === 'validation');
  if (!model.parameters.some((p) => p.kind === 'free')) {
    throw new UserError({ where: where('parameters'), what: 'no free parameter to estimate', fix: 'mark at least one parameter `free: [min, max]`' });
  }
  if (fitData.length === 0) {
    throw new UserError({ where: where('experiments'), what: 'no experiment with role `fit`', fix: 'give at least one experiment `role: fit` (the default)' });
  }
  const noise = initialNoise(model, fitData);
  const problem = buildProblem(compiled, fitData, noise.sigmas, collaborators.sim);
  if (problem.nResiduals === 0) {
    throw new UserError({ where: where('outputs'), what: 'the fit experiments hold no measured output samples', fix: 'check the output columns of the fit experiments' });
  }
  return { model, compiled, data, fitData, validationData, noise, problem, solver: solverSetup(problem), options, collaborators };
}

/** True when the fit estimates the noise level of an output that has fit samples. */
export function anyNoiseEstimated(setup: Pick<FitSetup, 'noise' | 'problem'>): boolean {
  return setup.noise.estimated.some((e, j) => e && setup.problem.blocks.some((b) => b.output === j));
}
