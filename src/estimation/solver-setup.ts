/**
 * How a fit poses its estimation problem to the generic solver: the residual callbacks, bounds,
 * per-entry step limits and the stopping and evaluation settings that differ between ODE and static
 * models. One place, so that the fit and the bench's solver row (bench/fd-baseline.ts) solve the
 * very same problem. Besides the problem and the options it answers the `regime`: the same choices
 * as a plain record, for the fit to copy into its result (and fit.json to print).
 */
import type { EstimationProblem } from './problem.js';
import { SOLVER_DEFAULTS } from './solver/defaults.js';
import type { LeastSquaresProblem, SolverOptions } from './solver/types.js';

/**
 * Largest factor by which a log-scale parameter may change in one trial step. Common practice, no
 * source; 2 keeps the demo fits on their cheap path, and a start off by two decades costs at most
 * about seven trials to cross them.
 */
const LOG_STEP_FACTOR = 2;
/** Largest remaining step, in standard errors, at which an ODE fit counts as converged. */
const ODE_STEP_IN_STANDARD_ERRORS = 1e-3;
const ODE_COST_TOLERANCE_CAP = 1e-10;
/** Degrees of freedom from which an ODE fit uses the relaxed stops (long logs). */
const ODE_RELAXED_FROM_DOF = 1000;
const ODE_NOISE_STEP_IN_STANDARD_ERRORS = 0.05;

export type FitSolverSettings = Pick<SolverOptions, 'costTolerance' | 'noisyCost' | 'costNoiseLimit' | 'speculativeJacobian'>;

/**
 * The solver regime chosen for a fit's problem, in plain data (finite numbers, no functions): what
 * solverSetup decided and the tolerances in effect. Options the fit passes itself (iteration limit,
 * warm starts) are not part of it.
 */
export interface SolverRegime {
  /** 'ode': the model has states (simulations integrate); 'static': outputs are row functions. */
  model: 'ode' | 'static';
  /** Residuals minus theta entries: what decides the relaxed stops. */
  degreesOfFreedom: number;
  /** Long ODE log (degrees of freedom >= 1000): relaxed cost tolerance and the noise stops. */
  relaxedStops: boolean;
  /** SolverOptions.noisyCost: the stops for a cost with evaluation noise (solver/types.ts). */
  noisyCost: boolean;
  /** SolverOptions.speculativeJacobian: trusted Gauss-Newton trials simulated with sensitivities at once. */
  speculativeJacobian: boolean;
  /** Theta entries with a per-step cap (log-scale entries of an ODE model); 0 when none. */
  stepCaps: number;
  /** Largest factor by which a capped entry may change in one trial step (only when stepCaps > 0). */
  stepCapFactor?: number;
  /** Relative cost-change tolerance in effect (the solver's default unless relaxed). */
  costTolerance: number;
  /** Upper limit on the cost noise the noisyCost stops use (only when noisyCost). */
  costNoiseLimit?: number;
  /** Step and gradient tolerances in effect (the solver's defaults: the fit does not change them). */
  stepTolerance: number;
  gradientTolerance: number;
}

function regimeOf(ode: boolean, dof: number, relaxed: boolean, lsq: LeastSquaresProblem, settings: FitSolverSettings): SolverRegime {
  const stepCaps = lsq.maxStep ? Array.from(lsq.maxStep).filter((m) => Number.isFinite(m)).length : 0;
  return {
    model: ode ? 'ode' : 'static',
    degreesOfFreedom: dof,
    relaxedStops: relaxed,
    noisyCost: settings.noisyCost === true,
    speculativeJacobian: settings.speculativeJacobian === true,
    stepCaps,
    ...(stepCaps > 0 ? { stepCapFactor: LOG_STEP_FACTOR } : {}),
    costTolerance: settings.costTolerance ?? SOLVER_DEFAULTS.costTolerance,
    ...(settings.costNoiseLimit !== undefined ? { costNoiseLimit: settings.costNoiseLimit } : {}),
    stepTolerance: SOLVER_DEFAULTS.stepTolerance,
    gradientTolerance: SOLVER_DEFAULTS.gradientTolerance,
  };
}

export function solverSetup(problem: EstimationProblem): { lsq: LeastSquaresProblem; settings: FitSolverSettings; regime: SolverRegime } {
  const ode = problem.compiled.nStates > 0;
  // A log-scale entry moves by at most a factor LOG_STEP_FACTOR per trial step. The trust region
  // measures a step by its predicted effect on the residuals (column scaling), so a parameter the
  // data barely see at the start may jump by decades in one step: in the flywheel demo the first
  // Gauss-Newton step, driven by the wrong motor constant, asked for 7 decades of inductance, was
  // cut at the bound 1e-4 H and stayed there for four steps, where every simulation is stiff and
  // 25-40 times as costly; the other entries' steps hardly depend on that move. Linear entries are
  // left alone: their ranges are at most a few decades (wider ones default to log scale). Static
  // models keep the plain solver: a long trial costs them nothing, and the published digits of the
  // benchmark problems are reached along the unlimited path.
  const lsq: LeastSquaresProblem = {
    residuals: (th) => problem.residuals(th),
    residualsAndJacobian: (th) => problem.residualsAndJacobian(th),
    lower: problem.entries.map((e) => e.lower),
    upper: problem.entries.map((e) => e.upper),
    ...(ode ? { maxStep: problem.entries.map((e) => (e.scale === 'log' ? Math.log(LOG_STEP_FACTOR) : Infinity)) } : {}),
  };
  // An ODE model's cost carries integration noise (tolerances 1e-8) far above the solver's default
  // 1e-14, which is meant for rounding noise: past some point trials only chase that noise and get
  // rejected one by one. A predicted relative reduction e means a remaining step of sqrt(e (N - p))
  // standard errors (solver/defaults.ts): e = 1e-6 / (N - p) leaves at most 1e-3 standard errors,
  // far below any statistical meaning; capped at 1e-10 so that short logs keep their digits.
  // Static models keep the default (the NIST digits need it). Where the integration noise of the
  // cost is larger still, the solver stops when a step's predicted gain is below that noise (it
  // cannot be judged), but never for a step longer than 0.05 standard errors.
  // Both bounds are common practice, no source. Short logs (published benchmark problems with tens
  // of samples) keep the defaults: their simulations are cheap and their published digits need them.
  const dof = problem.nResiduals - problem.entries.length;
  const relaxed = ode && dof >= ODE_RELAXED_FROM_DOF;
  const relaxedStops = () => ({
    costTolerance: Math.max(SOLVER_DEFAULTS.costTolerance, Math.min(ODE_COST_TOLERANCE_CAP, ODE_STEP_IN_STANDARD_ERRORS ** 2 / dof)),
    noisyCost: true,
    costNoiseLimit: ODE_NOISE_STEP_IN_STANDARD_ERRORS ** 2 / dof,
  });
  const settings: FitSolverSettings = {
    ...(relaxed ? relaxedStops() : {}),
    // A simulation with sensitivities costs two to three plain ones: far from the optimum, a
    // trial the linear model vouches for is simulated with them straight away (solver/types.ts).
    ...(ode ? { speculativeJacobian: true } : {}),
  };
  return { lsq, settings, regime: regimeOf(ode, dof, relaxed, lsq, settings) };
}
