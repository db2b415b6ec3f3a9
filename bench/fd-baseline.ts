/**
 * The baseline of the fit bench: the same least-squares problem (same residuals, weighting, theta
 * coordinates and bounds as rigcal's first solve) minimised by ml-levenberg-marquardt, whose Jacobian
 * comes from forward finite differences: every Jacobian costs one simulation per free entry on top of
 * the simulation at the point. It has no convergence test of its own, so it runs until its cost comes
 * within 1e-6 (relative) of the cost rigcal's solver reached, or until the iteration cap.
 *
 * Work is counted in simulations of one experiment, like FitResult.simulations; rigcal's
 * simulations with sensitivities are counted apart (each costs several plain ones).
 */
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import type { CompiledModel } from '../src/model/compiled-types.js';
import type { ExperimentData } from '../src/data/types.js';
import type { Model } from '../src/model/types.js';
import { realCollaborators } from '../src/estimation/fit/collaborators.js';
import { initialNoise } from '../src/estimation/noise.js';
import { buildProblem, type EstimationProblem } from '../src/estimation/problem.js';
import { solveLeastSquares } from '../src/estimation/solver/index.js';
import { solverSetup } from '../src/estimation/solver-setup.js';

/** Iteration cap of the baseline (each iteration costs p + 2 simulations per fit experiment). */
export const BASELINE_MAX_ITERATIONS = 100;
/**
 * The baseline counts as done when its cost is within this (relative) of rigcal's: with N residuals
 * a relative cost excess e is a distance of about sqrt(e N) standard errors from the optimum, so
 * 1e-8 is about 0.01 standard errors on a 10,000-sample log (common practice, no source).
 */
export const BASELINE_COST_MARGIN = 1e-8;

export interface SolveCount {
  cost: number;
  seconds: number;
  /** Simulations of one experiment, plain and with sensitivities. */
  simulations: number;
  sensitivitySimulations: number;
  iterations: number;
  /** Baseline only: whether it came within the margin of rigcal's cost before the cap. */
  reached?: boolean;
  /**
   * Baseline only: simulations of a full run as the library does it (it has no convergence test and
   * stops at the iteration cap): 1 + cap x (p + 2) per fit experiment.
   */
  fullRunSimulations?: number;
}

function fitProblem(model: Model, compiled: CompiledModel, data: readonly ExperimentData[]): EstimationProblem {
  const fitData = data.filter((d) => d.experiment.role === 'fit');
  return buildProblem(compiled, fitData, initialNoise(model, fitData).sigmas, realCollaborators().sim);
}

/** rigcal's solver as the fit sets it up (solverSetup), on the first weighting (no noise refits), from the model's start. */
export function ourSolve(model: Model, compiled: CompiledModel, data: readonly ExperimentData[]): SolveCount {
  const problem = fitProblem(model, compiled, data);
  const t0 = performance.now();
  const { lsq, settings } = solverSetup(problem);
  const run = solveLeastSquares(lsq, problem.startTheta(), settings);
  return { cost: run.cost, seconds: (performance.now() - t0) / 1000, simulations: problem.counters.simulations, sensitivitySimulations: problem.counters.sensitivitySimulations, iterations: run.iterations };
}

class Reached extends Error {}

/** ml-levenberg-marquardt with finite differences on the same problem, until `targetCost` (within the margin) or the cap. */
export function baselineSolve(model: Model, compiled: CompiledModel, data: readonly ExperimentData[], targetCost: number): SolveCount {
  const problem = fitProblem(model, compiled, data);
  const start = problem.startTheta();
  const n = problem.nResiduals;
  // Damping on the scale of J^T J at the start (Marquardt's choice; common practice, no source):
  // the library adds it to the diagonal unscaled. This Jacobian is setup, not counted.
  const j0 = problem.residualsAndJacobian(start);
  if (!j0) throw new Error('cannot simulate at the start values');
  let diag = 0;
  for (let k = 0; k < start.length; k++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += j0.jacobian[i * start.length + k] ** 2;
    diag = Math.max(diag, s);
  }
  const before = problem.counters.simulations;
  const goal = targetCost * (1 + BASELINE_COST_MARGIN);
  let iterations = 0;
  let reached = false;
  let best = Infinity;
  const t0 = performance.now();
  try {
    const out = levenbergMarquardt(
      { x: Array.from({ length: n }, (_, i) => i), y: new Array<number>(n).fill(0) },
      (theta) => {
        const r = problem.residuals(theta);
        if (!r) return () => Number.NaN;
        let cost = 0;
        for (let i = 0; i < n; i++) cost += r[i] * r[i];
        best = Math.min(best, cost);
        if (cost <= goal) throw new Reached();
        return (i) => r[i];
      },
      {
        initialValues: start,
        minValues: problem.entries.map((e) => e.lower),
        maxValues: problem.entries.map((e) => e.upper),
        // Forward differences of 1e-6 relative (at least 1e-6 absolute) in the optimiser's coordinates.
        gradientDifference: start.map((v) => 1e-6 * Math.max(Math.abs(v), 1)),
        damping: Math.max(1e-3 * diag, 1e-7),
        maxIterations: BASELINE_MAX_ITERATIONS,
        errorTolerance: 1e-300,
      },
    );
    iterations = out.iterations;
  } catch (err) {
    if (!(err instanceof Reached)) throw err;
    reached = true;
  }
  const fitExperiments = problem.fitData.length;
  if (reached) iterations = Math.ceil((problem.counters.simulations - before) / fitExperiments / (start.length + 2));
  const fullRunSimulations = (1 + BASELINE_MAX_ITERATIONS * (start.length + 2)) * fitExperiments;
  return { cost: best, seconds: (performance.now() - t0) / 1000, simulations: problem.counters.simulations - before, sensitivitySimulations: 0, iterations, reached, fullRunSimulations };
}
