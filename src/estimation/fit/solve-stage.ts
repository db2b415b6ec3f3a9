/**
 * The solving stage of one fit: the model's start or N seeded starts spread over the bounds (the best
 * kept), then, where noise levels are estimated, refits until they settle. A fit that cannot be
 * simulated at any start is a value (`StartFailed`), not an exception.
 */
import { RunFailure } from '../../errors.js';
import { largestRelativeChange, MAX_SIGMA_ROUNDS, SIGMA_TOLERANCE, updatedSigmas } from '../noise.js';
import { perOutputSums, type EstimationProblem } from '../problem.js';
import type { SolverOptions, SolverResult } from '../solver/types.js';
import type { FitResult } from './fit-result.js';
import { anyNoiseEstimated, type FitSetup } from './fit-setup.js';

/** A refit's start: the previous optimum's evaluation at the new weighting, and the cost noise seen there. */
interface WarmStart {
  evaluation: NonNullable<SolverOptions['initial']>;
  costNoise: number;
}

type SolveFrom = (start: readonly number[], startIndex: number, message?: string, initial?: WarmStart) => SolverResult;

/** Starts of the fit's first phase: the model's own, or --starts N. */
function startsOf(setup: FitSetup): number {
  return Math.max(1, Math.floor(setup.options.starts ?? 1));
}

export interface SolvedFit {
  ok: true;
  /** The solver run whose point is reported. */
  run: SolverResult;
  /** Trial steps of every run, all starts and refits. */
  iterations: number;
  /** Fits with successive noise weightings (1 when no noise level is estimated). */
  rounds: number;
  sigmaConverged: boolean;
  starts?: FitResult['starts'];
  warnings: string[];
}

export interface StartFailed {
  ok: false;
  failure: RunFailure;
}

export function solveFit(setup: FitSetup): SolvedFit | StartFailed {
  const solveFrom = solverFor(setup);
  const first = runStarts(setup, solveFrom);
  if (!first.ok) return first;
  const refits = iterateNoise(setup, first.best, solveFrom);
  return {
    ok: true,
    run: refits.run,
    iterations: first.iterations + refits.iterations,
    rounds: refits.rounds,
    sigmaConverged: refits.sigmaConverged,
    ...(first.starts ? { starts: first.starts } : {}),
    warnings: first.warnings,
  };
}

/** One solver run from a start; progress is reported in the solver's cost convention (weighted SSE). */
function solverFor(setup: FitSetup): SolveFrom {
  const { collaborators, options, solver } = setup;
  return (start, startIndex, message, initial) =>
    collaborators.solve(solver.lsq, start, {
      maxIterations: options.maxIterations,
      ...solver.settings,
      ...(initial ? { initial: initial.evaluation, costNoise: initial.costNoise } : {}),
      onIteration: options.onProgress
        ? (p) => options.onProgress!({ phase: message ? 'noise refit' : 'fit', start: startIndex, starts: message ? 1 : startsOf(setup), iteration: p.iteration, cost: p.cost, step: p.step, ...(message ? { message } : {}) })
        : undefined,
    });
}

interface StartsDone {
  ok: true;
  best: SolverResult;
  iterations: number;
  starts?: FitResult['starts'];
  warnings: string[];
}

function runStarts(setup: FitSetup, solveFrom: SolveFrom): StartsDone | StartFailed {
  const { problem, options } = setup;
  const startTheta = problem.startTheta();
  const requested = startsOf(setup);
  if (requested === 1) {
    const best = solveFrom(startTheta, 1);
    if (best.status === 'failed') return { ok: false, failure: startFailure(problem, best) };
    return { ok: true, best, iterations: best.iterations, warnings: [] };
  }
  const seed = options.seed ?? 1;
  let iterations = 0;
  const ms = setup.collaborators.multistart(
    problem.entries.map((e, k) => ({ scale: e.scale, lower: e.lower, upper: e.upper, start: startTheta[k] })),
    { starts: requested, seed },
    (pt, i) => {
      const r = solveFrom(pt, i + 1);
      iterations += r.iterations;
      return r;
    },
  );
  const failed = ms.results.filter((r) => r.status === 'failed' || !Number.isFinite(r.cost)).length;
  if (failed === ms.results.length) return { ok: false, failure: startFailure(problem, ms.results[0]) };
  const warnings: string[] = [];
  if (failed) warnings.push(`${failed} of ${ms.results.length} starts could not be simulated or failed; the best of the others is kept`);
  if (ms.distinctOptima > 1) {
    warnings.push(`the ${requested} starts ended in ${ms.distinctOptima} different optima; the best (lowest cost) is kept, but the cost surface has several minima`);
  }
  const starts = { requested, seed, distinctOptima: ms.distinctOptima, bestCosts: ms.bestCosts };
  return { ok: true, best: ms.best, iterations, starts, warnings };
}

function startFailure(problem: EstimationProblem, run: SolverResult | undefined): RunFailure {
  const why = problem.lastFailure?.message ?? run?.message ?? 'the residuals could not be computed';
  const values = Object.fromEntries(problem.entries.map((e) => [e.name, e.start]));
  return new RunFailure(`cannot simulate at the start values: ${why}`, { ...(problem.lastFailure?.details ?? {}), start: values });
}

/** Noise levels not given: refit with sigma = RMS residual per output until no sigma moves by 1 %. */
function iterateNoise(setup: FitSetup, first: SolverResult, solveFrom: SolveFrom): { run: SolverResult; iterations: number; rounds: number; sigmaConverged: boolean } {
  const { problem, noise } = setup;
  let run = first;
  let iterations = 0;
  let rounds = 1;
  if (!anyNoiseEstimated(setup)) return { run, iterations, rounds, sigmaConverged: true };
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
