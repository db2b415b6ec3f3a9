/**
 * When the caller asked for no particular number of starts and the fit from the model's start looks
 * stuck in a local optimum (local-optimum.ts), RESCUE_STARTS seeded starts spread over the bounds
 * are run as well and the better result is reported, saying so; the work of both counts.
 */
import type { ExperimentData } from '../../data/types.js';
import type { CompiledModel } from '../../model/compiled-types.js';
import type { Model } from '../../model/types.js';
import { formatSignificant } from '../../presentation/numbers.js';
import type { FitCollaborators } from './collaborators.js';
import { fitOnce } from './fit-once.js';
import type { FitOptions } from './fit-options.js';
import type { CompletedFit } from './fit-result.js';
import type { LocalOptimumHint } from './local-optimum.js';
import type { StartFailed } from './solve-stage.js';

/**
 * How many starts the search runs, its seed when the caller gave none, and the least gain in
 * log-likelihood for which its best replaces the first fit (a likelihood ratio of e). Common
 * practice, no source.
 */
const RESCUE_STARTS = 8;
const RESCUE_SEED = 1;
const RESCUE_MIN_GAIN = 1;

/** The fit of a compiled model to loaded data, with the search of starts when the first looks stuck. */
export function fitWithRescue(model: Model, compiled: CompiledModel, data: readonly ExperimentData[], options: FitOptions, collaborators: FitCollaborators): CompletedFit | StartFailed {
  const first = fitOnce(model, compiled, data, options, collaborators);
  if (!first.ok) return first;
  if (options.starts !== undefined || first.localOptimum === undefined) return first.fit;
  const seed = options.seed ?? RESCUE_SEED;
  const tell = options.onProgress;
  const onProgress = tell ? (p: Parameters<typeof tell>[0]) => tell({ ...p, phase: p.phase === 'fit' ? 'search of starts' : p.phase }) : undefined;
  const spread = fitOnce(model, compiled, data, { ...options, starts: RESCUE_STARTS, seed, onProgress }, collaborators);
  // Every spread start failed to simulate: the fit from the model's start stands, with its warning.
  if (!spread.ok) return first.fit;
  return betterOfBoth(first.fit, spread.fit, first.localOptimum, seed);
}

function betterOfBoth(first: CompletedFit, spread: CompletedFit, hint: LocalOptimumHint, seed: number): CompletedFit {
  const a = first.result;
  const b = spread.result;
  const better = b.statistics.logLikelihood > a.statistics.logLikelihood + RESCUE_MIN_GAIN;
  const chosen = better ? spread : first;
  const r = chosen.result;
  const logL = (x: number) => formatSignificant(x, 8);
  const searched = `${hint.finding}; ${RESCUE_STARTS} starts spread over the bounds (seed ${seed})`;
  const said = better
    ? `${searched} found a better optimum (log-likelihood ${logL(b.statistics.logLikelihood)} against ${logL(a.statistics.logLikelihood)}), which is reported here`
    : `${searched} found no better one (--starts 1 skips this search)`;
  r.warnings = [said, ...r.warnings.filter((w) => w !== hint.warning)];
  r.iterations = a.iterations + b.iterations;
  r.simulations = a.simulations + b.simulations;
  r.sensitivitySimulations = (a.sensitivitySimulations ?? 0) + (b.sensitivitySimulations ?? 0);
  r.wallSeconds = a.wallSeconds + b.wallSeconds;
  return chosen;
}
