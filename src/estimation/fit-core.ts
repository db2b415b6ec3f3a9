/**
 * The fit pipeline on an already compiled model and loaded data: starts, the least-squares solve,
 * the noise-level iteration, uncertainty, identifiability, scores of every experiment, and the
 * complete FitResult. Its collaborators (simulator, solver, uncertainty, identifiability,
 * multistart, residual diagnostics) come in as `FitDeps`, so that this file is about the order of
 * the work and nothing else; fit.ts wires the real ones.
 */
import type { RowMajorMatrix } from './solver/row-major.js';
import { RunFailure, UserError } from '../errors.js';
import type { ExperimentData } from '../data/types.js';
import type { CompiledModel } from '../model/compiled-types.js';
import type { Model } from '../model/types.js';
import type { SimulationResult } from '../simulation/types.js';
import { TOOL, VERSION } from '../version.js';
import { scoreSeries } from '../diagnostics/scores.js';
import type { FitOptions, FitOutcome, ResidualSeries } from './fit-api.js';
import type { FitResult, IdentifiabilityProblem, OutputResult, ParameterResult, WhitenessResult } from './fit-result.js';
import { aicc, bic, gaussianLogLikelihood } from './information-criteria.js';
import { initialNoise, largestRelativeChange, MAX_SIGMA_ROUNDS, SIGMA_TOLERANCE, updatedSigmas } from './noise.js';
import { buildProblem, perOutputSums, type EstimationProblem, type SimulatorFns } from './problem.js';
import { solverSetup } from './solver-setup.js';
import type { LeastSquaresProblem, SolverOptions, SolverResult } from './solver/types.js';
import type { MultistartEntry, MultistartOptions, MultistartOutcome } from './multistart.js';

export interface UncertaintyInput {
  /** Weighted Jacobian at the optimum, in the optimiser's coordinates. */
  jacobian: RowMajorMatrix;
  residuals: Float64Array;
  /** The optimum in the optimiser's coordinates, and the entries' names. */
  theta: number[];
  names: string[];
  scales: ('log' | 'linear')[];
  /** Estimates in the parameters' own units. */
  values: number[];
  bounds: { min: number; max: number }[];
  units: string[];
  /** True when any noise level was estimated (then s^2 = SSE/(N-p), else 1). */
  sigmaEstimated: boolean;
  atBound: (false | 'lower' | 'upper')[];
}
export interface UncertaintyOutput {
  /** Per theta entry, in the parameter's own unit; null when the data do not determine it. */
  stdError: (number | null)[];
  ci95: ([number, number] | null)[];
  correlation: (number | null)[][];
  /** Plain-word warnings (a parameter at a bound, no degrees of freedom...). */
  warnings: string[];
}
export interface IdentifiabilityInput {
  jacobian: RowMajorMatrix;
  /** The optimum in the optimiser's coordinates. */
  theta: number[];
  names: string[];
  scales: ('log' | 'linear')[];
  correlation: (number | null)[][];
}
export interface IdentifiabilityOutput {
  conditionNumber: number | null;
  singularValues: number[];
  problems: IdentifiabilityProblem[];
  /** Plain-word warnings (e.g. high pairwise correlation). */
  warnings: string[];
}
export interface DiagnosticsOutput {
  whiteness?: WhitenessResult;
  autocorrelation?: OutputResult['autocorrelation'];
  inputCorrelation?: OutputResult['inputCorrelation'];
  correlatedUpTo?: number;
  verdict: string;
}

export interface FitDeps {
  sim: SimulatorFns;
  solve(problem: LeastSquaresProblem, start: readonly number[], options: SolverOptions): SolverResult;
  uncertainty(input: UncertaintyInput): UncertaintyOutput;
  identifiability(input: IdentifiabilityInput): IdentifiabilityOutput;
  /** Several seeded starts spread over the bounds, the best kept (multistart.ts). */
  multistart(entries: readonly MultistartEntry[], options: MultistartOptions, solveFrom: (start: number[], index: number) => SolverResult): MultistartOutcome<SolverResult>;
  diagnostics?(series: ResidualSeries, inputs: { name: string; values: ArrayLike<number> }[], timeUnit: string): DiagnosticsOutput;
  /** Clock in seconds (injected so that tests can be deterministic). */
  now?(): number;
}

/** A refit's start: the previous optimum's evaluation at the new weighting, and the cost noise seen there. */
interface WarmStart {
  evaluation: NonNullable<SolverOptions['initial']>;
  costNoise: number;
}

/** Read-only summary of the solver run(s) kept for the result. */
interface SolveSummary {
  run: SolverResult;
  iterations: number;
  rounds: number;
  sigmaConverged: boolean;
}

/**
 * Starts spread over the bounds when a fit from the model's own start looks stuck in a local optimum
 * (parameters on bounds, fit residuals not white: see localOptimumHint), and the least gain in
 * log-likelihood for which their best replaces it (a likelihood ratio of e). Common practice, no source.
 */
const RESCUE_STARTS = 8;
const RESCUE_SEED = 1;
const RESCUE_MIN_GAIN = 1;

/**
 * The fit. When the caller asked for no particular number of starts and the fit from the model's
 * start looks stuck in a local optimum, RESCUE_STARTS seeded starts spread over the bounds are run
 * as well and the better result is reported, saying so; the work of both counts.
 */
export function runFit(model: Model, compiled: CompiledModel, data: readonly ExperimentData[], options: FitOptions, deps: FitDeps): FitOutcome {
  const first = fitOnce(model, compiled, data, options, deps);
  if (options.starts !== undefined || first.localOptimum === undefined) return first.outcome;
  const seed = options.seed ?? RESCUE_SEED;
  let spread: FitOutcome;
  try {
    spread = fitOnce(model, compiled, data, { ...options, starts: RESCUE_STARTS, seed }, deps).outcome;
  } catch (err) {
    // Every spread start failed to simulate: the fit from the model's start stands, with its warning.
    if (err instanceof RunFailure) return first.outcome;
    throw err;
  }
  const a = first.outcome.result;
  const b = spread.result;
  const better = b.statistics.logLikelihood > a.statistics.logLikelihood + RESCUE_MIN_GAIN;
  const chosen = better ? spread : first.outcome;
  const r = chosen.result;
  const logL = (x: number) => Number(x.toPrecision(8)).toString();
  const said = better
    ? `${first.localOptimum}; ${RESCUE_STARTS} starts spread over the bounds (seed ${seed}) found a better optimum (log-likelihood ${logL(b.statistics.logLikelihood)} against ${logL(a.statistics.logLikelihood)}), which is reported here`
    : `${first.localOptimum}; ${RESCUE_STARTS} starts spread over the bounds (seed ${seed}) found no better one (--starts 1 skips this search)`;
  r.warnings = [said, ...r.warnings.filter((w) => w !== first.localOptimumWarning)];
  r.iterations = a.iterations + b.iterations;
  r.simulations = a.simulations + b.simulations;
  r.sensitivitySimulations = (a.sensitivitySimulations ?? 0) + (b.sensitivitySimulations ?? 0);
  r.wallSeconds = a.wallSeconds + b.wallSeconds;
  return chosen;
}

function fitOnce(
  model: Model,
  compiled: CompiledModel,
  data: readonly ExperimentData[],
  options: FitOptions,
  deps: FitDeps,
): { outcome: FitOutcome; localOptimum?: string; localOptimumWarning?: string } {
  const now = deps.now ?? (() => performance.now() / 1000);
  const t0 = now();
  const fitData = data.filter((d) => d.experiment.role === 'fit');
  const validationData = data.filter((d) => d.experiment.role === 'validation');
  if (!model.parameters.some((p) => p.kind === 'free')) {
    throw new UserError({ where: { file: model.fileAsGiven, key: 'parameters' }, what: 'no free parameter to estimate', fix: 'mark at least one parameter `free: [min, max]`' });
  }
  if (fitData.length === 0) {
    throw new UserError({ where: { file: model.fileAsGiven, key: 'experiments' }, what: 'no experiment with role `fit`', fix: 'give at least one experiment `role: fit` (the default)' });
  }
  const noise = initialNoise(model, fitData);
  const problem = buildProblem(compiled, fitData, noise.sigmas, deps.sim);
  if (problem.nResiduals === 0) {
    throw new UserError({ where: { file: model.fileAsGiven, key: 'outputs' }, what: 'the fit experiments hold no measured output samples', fix: 'check the output columns of the fit experiments' });
  }
  const warnings: string[] = [];
  const maxIterations = options.maxIterations;
  const { lsq, settings } = solverSetup(problem);
  // Progress reports the solver's cost convention: the weighted sum of squared residuals.
  const solveFrom = (start: readonly number[], startIndex: number, message?: string, initial?: WarmStart): SolverResult =>
    deps.solve(lsq, start, {
      maxIterations,
      ...settings,
      ...(initial ? { initial: initial.evaluation, costNoise: initial.costNoise } : {}),
      onIteration: options.onProgress
        ? (p) => options.onProgress!({ start: startIndex, iteration: p.iteration, cost: p.cost, step: p.step, ...(message ? { message } : {}) })
        : undefined,
    });

  // 1. Starts: the model's start, or N seeded starts spread over the bounds; the best is kept.
  const startTheta = problem.startTheta();
  let best: SolverResult;
  let startsInfo: FitResult['starts'];
  let totalIterations = 0;
  const requested = Math.max(1, Math.floor(options.starts ?? 1));
  if (requested > 1) {
    const seed = options.seed ?? 1;
    const ms = deps.multistart(
      problem.entries.map((e, k) => ({ scale: e.scale, lower: e.lower, upper: e.upper, start: startTheta[k] })),
      { starts: requested, seed },
      (pt, i) => {
        const r = solveFrom(pt, i + 1);
        totalIterations += r.iterations;
        return r;
      },
    );
    const failed = ms.results.filter((r) => r.status === 'failed' || !Number.isFinite(r.cost)).length;
    if (failed === ms.results.length) throw startFailure(problem, ms.results[0]);
    best = ms.best;
    startsInfo = { requested, seed, distinctOptima: ms.distinctOptima, bestCosts: ms.bestCosts };
    if (failed) warnings.push(`${failed} of ${ms.results.length} starts could not be simulated or failed; the best of the others is kept`);
    if (ms.distinctOptima > 1) {
      warnings.push(`the ${requested} starts ended in ${ms.distinctOptima} different optima; the best (lowest cost) is kept, but the cost surface has several minima`);
    }
  } else {
    best = solveFrom(startTheta, 1);
    totalIterations += best.iterations;
    if (best.status === 'failed') throw startFailure(problem, best);
  }

  // 2. Noise levels not given: refit with sigma = RMS residual per output until they settle.
  const summary = iterateNoise(problem, noise, best, solveFrom);
  totalIterations += summary.iterations;
  const run = summary.run;
  if (!summary.sigmaConverged) {
    warnings.push(`the estimated noise levels still changed by more than ${SIGMA_TOLERANCE * 100} % after ${MAX_SIGMA_ROUNDS} refits; the weighting may not be settled`);
  }
  if (run.failedEvaluations > 0 && problem.lastFailure) {
    warnings.push(
      `${run.failedEvaluations} trial point${run.failedEvaluations > 1 ? 's' : ''} of the optimiser could not be simulated and ${run.failedEvaluations > 1 ? 'were' : 'was'} rejected; the last reason: ${problem.lastFailure.message}`,
    );
  }
  if (run.status === 'stopped') warnings.push(`the fit stopped at the iteration limit before converging (${run.message}); raise --max-iterations or check the start values`);

  // 3. Uncertainty and identifiability at the optimum.
  const entries = problem.entries;
  const values = problem.valuesOf(run.theta);
  const scales = entries.map((e) => e.scale);
  const anyEstimated = noise.estimated.some((e, j) => e && problem.blocks.some((b) => b.output === j));
  const unc = deps.uncertainty({
    jacobian: run.jacobian,
    residuals: run.residuals,
    theta: run.theta.slice(),
    names: entries.map((e) => e.name),
    scales,
    values,
    bounds: entries.map((e) => ({ min: e.min, max: e.max })),
    units: entries.map((e) => model.parameters.find((q) => q.name === e.parameter)!.unit),
    sigmaEstimated: anyEstimated,
    atBound: run.atBound,
  });
  warnings.push(...unc.warnings);
  const ident = deps.identifiability({ jacobian: run.jacobian, theta: run.theta.slice(), names: entries.map((e) => e.name), scales, correlation: unc.correlation });

  // 4. Parameters: model order, per-experiment copies in place of their parameter.
  const parameters: ParameterResult[] = [];
  const valueByName: Record<string, number> = {};
  for (const spec of model.parameters) {
    if (spec.kind === 'fixed') {
      parameters.push({ name: spec.name, parameter: spec.name, unit: spec.unit, status: 'fixed', estimate: spec.value });
      valueByName[spec.name] = spec.value;
      continue;
    }
    entries.forEach((e, k) => {
      if (e.parameter !== spec.name) return;
      const atBound = run.atBound[k] ?? false;
      const row: ParameterResult = {
        name: e.name,
        parameter: e.parameter,
        unit: spec.unit,
        status: 'free',
        estimate: values[k],
        stdError: unc.stdError[k],
        ci95: unc.ci95[k],
        min: e.min,
        max: e.max,
        start: e.start,
        scale: e.scale,
        atBound,
      };
      if (e.experiment !== undefined) row.experiment = e.experiment;
      parameters.push(row);
      valueByName[e.name] = values[k];
    });
  }
  for (const p of ident.problems) warnings.push(p.message);
  for (const w of ident.warnings) if (!warnings.includes(w)) warnings.push(w);
  const undetermined = entries.filter((_, k) => unc.stdError[k] === null).map((e) => e.name);
  if (undetermined.length && problem.nResiduals > entries.length) {
    const list = undetermined.length === 1 ? undetermined[0] : `${undetermined.slice(0, -1).join(', ')} and ${undetermined[undetermined.length - 1]}`;
    warnings.push(`no standard error or interval for ${list}: the data do not determine ${undetermined.length === 1 ? 'it' : 'them'} separately; ${undetermined.length === 1 ? 'its value is' : 'their values are'} one of many that fit equally well`);
  }

  // 5. Statistics with the final weighting.
  const sums = perOutputSums(problem, run.residuals);
  const N = problem.nResiduals;
  const p = entries.length;
  const weightedSSE = run.cost;
  const terms = problem.sigmas.map((s, j) => ({ samples: sums.samples[j], sigma: s, weightedSSE: sums.sse[j] })).filter((t) => t.samples > 0);
  const logLikelihood = gaussianLogLikelihood(terms);
  const estimatedSigmas = noise.estimated.filter((e, j) => e && sums.samples[j] > 0).length;
  const k = p + estimatedSigmas;
  const statistics: FitResult['statistics'] = {
    observations: N,
    freeParameters: p,
    dof: N - p,
    weightedSSE,
    logLikelihood,
    aicc: aicc(logLikelihood, k, N),
    bic: bic(logLikelihood, k, N),
  };
  if (!anyEstimated && N > p) statistics.reducedChiSquare = weightedSSE / (N - p);
  if (N <= p) warnings.push(`only ${N} measured samples for ${p} free parameters: nothing is left to judge the fit`);

  // 6. Every experiment simulated at the estimates: fit ones for the residuals, validation ones scored.
  const residuals: ResidualSeries[] = [];
  const outputs: OutputResult[] = [];
  const score = (d: ExperimentData, res: SimulationResult) => {
    model.outputs.forEach((o, j) => {
      const meas = d.outputs[j];
      if (!meas) return;
      const series: ResidualSeries = { experiment: d.experiment.name, role: d.experiment.role, output: o.name, unit: o.unit, time: d.time, measured: meas, simulated: res.outputs[j] };
      residuals.push(series);
      const q = scoreSeries(meas, res.outputs[j]);
      const row: OutputResult = {
        experiment: d.experiment.name,
        output: o.name,
        unit: o.unit,
        role: d.experiment.role,
        samples: q.samples,
        missing: d.missing[j],
        sigma: problem.sigmas[j],
        sigmaEstimated: noise.estimated[j],
        rmse: q.rmse,
        nrmse: q.nrmse,
        r2: q.r2,
      };
      if (deps.diagnostics) {
        const inputs = model.inputs.map((inp, i) => ({ name: inp.name, values: d.inputs[i] }));
        const diag = deps.diagnostics(series, inputs, model.timeUnit);
        if (diag.whiteness) row.whiteness = diag.whiteness;
        if (diag.autocorrelation) row.autocorrelation = diag.autocorrelation;
        if (diag.inputCorrelation) row.inputCorrelation = diag.inputCorrelation;
        if (diag.correlatedUpTo !== undefined) row.correlatedUpTo = diag.correlatedUpTo;
        row.verdict = diag.verdict;
      }
      outputs.push(row);
    });
  };
  // The solver's last point: its plain simulations are usually kept by the problem (no new run).
  const fitSims = problem.simulateAll(run.theta);
  fitData.forEach((d, i) => score(d, fitSims[i]));
  const hint = localOptimumHint(startsInfo !== undefined, parameters, outputs);
  if (hint) warnings.push(hint.warning);
  const perExperiment = model.parameters.filter((s) => s.kind === 'free' && s.perExperiment).map((s) => s.name);
  for (const d of validationData) {
    // A validation experiment has no copy of a per-experiment parameter: it keeps the start value.
    const pv = deps.sim.parameterVector(compiled, d.index);
    entries.forEach((e, i) => {
      if (e.fitIndex === undefined) pv[e.slot] = values[i];
    });
    if (perExperiment.length) {
      warnings.push(`validation experiment ${d.experiment.name} has no estimate of the per-experiment parameter${perExperiment.length > 1 ? 's' : ''} ${perExperiment.join(', ')}; the start value${perExperiment.length > 1 ? 's were' : ' was'} used`);
    }
    try {
      problem.counters.simulations++;
      score(d, deps.sim.simulateExperiment(compiled, d, pv));
    } catch (err) {
      if (!(err instanceof RunFailure)) throw err;
      warnings.push(`validation experiment ${d.experiment.name} could not be simulated at the estimates: ${err.message}`);
    }
  }

  const result: FitResult = {
    tool: TOOL,
    version: VERSION,
    format: 1,
    model: { name: model.name, file: model.fileAsGiven, sha256: model.sha256, ...(model.description ? { description: model.description } : {}) },
    timeUnit: model.timeUnit,
    experiments: data.map((d) => ({ name: d.experiment.name, role: d.experiment.role, file: d.experiment.fileAsWritten, sha256: d.sha256, rows: d.time.length })),
    status: run.status,
    message: run.message,
    iterations: totalIterations,
    simulations: problem.counters.simulations,
    sensitivitySimulations: problem.counters.sensitivitySimulations,
    wallSeconds: 0,
    ...(startsInfo ? { starts: startsInfo } : {}),
    parameters,
    correlation: { names: entries.map((e) => e.name), matrix: unc.correlation },
    statistics,
    outputs,
    identifiability: { conditionNumber: ident.conditionNumber, singularValues: ident.singularValues, problems: ident.problems },
    warnings,
    provenance: {
      modelFile: model.fileAsGiven,
      modelSha256: model.sha256,
      dataFiles: data.map((d) => ({ experiment: d.experiment.name, file: d.experiment.fileAsWritten, sha256: d.sha256 })),
      toolVersion: VERSION,
      date: new Date().toISOString(),
      overrides: { ...model.overrides },
    },
  };
  if (summary.rounds > 1) result.message += `; noise levels settled after ${summary.rounds} fits`;
  result.wallSeconds = now() - t0;
  return { outcome: { result, residuals, values: valueByName }, ...(hint ? { localOptimum: hint.finding, localOptimumWarning: hint.warning } : {}) };
}

/**
 * A fit from one start that ends with parameters on their bounds while the residuals of a fit output
 * are not white may have stopped in a local optimum: a lightly damped resonance, for one, has a
 * "rigid" solution that a start on the wrong side of it slides into. Said in words, with the way to
 * look further; estimates on a bound with white residuals (a true value at the bound) say nothing.
 */
function localOptimumHint(multistart: boolean, parameters: readonly ParameterResult[], outputs: readonly OutputResult[]): { finding: string; warning: string } | undefined {
  if (multistart) return undefined;
  const onBound = parameters.filter((p) => p.atBound);
  const notWhite = outputs.filter((o) => o.role === 'fit' && o.whiteness && !o.whiteness.white);
  if (onBound.length === 0 || notWhite.length === 0) return undefined;
  const names = onBound.map((p) => `${p.name} (${p.atBound})`).join(', ');
  const series = notWhite.map((o) => `${o.output} in ${o.experiment}`).join(', ');
  const finding =
    `from the model's start values ${names} ended on ${onBound.length === 1 ? 'its bound' : 'their bounds'} while the residuals of ${series} ` +
    `were not white: the fit may have stopped in a local optimum rather than at the best fit`;
  return { finding, warning: `${finding}; try several starts spread over the bounds (--starts 8)` };
}

function startFailure(problem: EstimationProblem, run: SolverResult | undefined): RunFailure {
  const why = problem.lastFailure?.message ?? run?.message ?? 'the residuals could not be computed';
  const values = Object.fromEntries(problem.entries.map((e) => [e.name, e.start]));
  return new RunFailure(`cannot simulate at the start values: ${why}`, { ...(problem.lastFailure?.details ?? {}), start: values });
}

function iterateNoise(
  problem: EstimationProblem,
  noise: ReturnType<typeof initialNoise>,
  first: SolverResult,
  solveFrom: (start: readonly number[], startIndex: number, message?: string, initial?: WarmStart) => SolverResult,
): SolveSummary {
  let run = first;
  let iterations = 0;
  let rounds = 1;
  const anyEstimated = noise.estimated.some((e, j) => e && problem.blocks.some((b) => b.output === j));
  if (!anyEstimated) return { run, iterations, rounds, sigmaConverged: true };
  for (;;) {
    const sums = perOutputSums(problem, run.residuals);
    const next = updatedSigmas(noise, problem.sigmas, sums.sse, sums.samples);
    const change = largestRelativeChange(problem.sigmas, next);
    if (change < SIGMA_TOLERANCE) return { run, iterations, rounds, sigmaConverged: true };
    if (rounds >= MAX_SIGMA_ROUNDS) return { run, iterations, rounds, sigmaConverged: false };
    const before = problem.sigmas;
    problem.setSigmas(next);
    // Warm start: the previous optimum's residuals and Jacobian, rescaled to the new weighting, so
    // the refit simulates only if the optimum moves (a small change of sigma often leaves it in place).
    const initial =
      run.jacobian.rows === run.residuals.length ? { evaluation: problem.reweighted(run.residuals, run.jacobian, before), costNoise: run.costNoise ?? 0 } : undefined;
    const again = solveFrom(run.theta, 1, `refit ${rounds + 1} with the estimated noise levels`, initial);
    iterations += again.iterations;
    rounds++;
    if (again.status === 'failed') return { run, iterations, rounds, sigmaConverged: false };
    run = again;
  }
}
