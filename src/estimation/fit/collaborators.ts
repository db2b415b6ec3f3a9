/**
 * The modules a fit hands work to: simulator, solver, uncertainty, identifiability, multistart and
 * residual diagnostics. They come in as one object so that the pipeline is about the order of the
 * work and nothing else, and tests can replace one of them; `realCollaborators` wires the real ones.
 * Each speaks its own module's types: the pipeline builds their inputs, no adapter copies fields.
 */
import { residualDiagnostics, type InputSignal, type ResidualDiagnostics } from '../../diagnostics/residual-diagnostics.js';
import type { ResidualSeries } from '../../diagnostics/types.js';
import { parameterVector, trySimulateExperiment } from '../../simulation/index.js';
import { analyseIdentifiability, type IdentifiabilityInput, type IdentifiabilityResult } from '../identifiability.js';
import { runMultistart, type MultistartEntry, type MultistartOptions, type MultistartOutcome } from '../multistart.js';
import type { SimulatorFns } from '../problem.js';
import { solveLeastSquares } from '../solver/index.js';
import type { LeastSquaresProblem, SolverOptions, SolverResult } from '../solver/types.js';
import { computeUncertainty, type UncertaintyInput, type UncertaintyResult } from '../uncertainty.js';

/** The part of a residual diagnosis the fit result keeps. */
export type DiagnosticsOutput = Pick<ResidualDiagnostics, 'whiteness' | 'autocorrelation' | 'inputCorrelation' | 'correlatedUpTo' | 'verdict'>;

export interface FitCollaborators {
  sim: SimulatorFns;
  solve(problem: LeastSquaresProblem, start: readonly number[], options: SolverOptions): SolverResult;
  uncertainty(input: UncertaintyInput): UncertaintyResult;
  identifiability(input: IdentifiabilityInput): IdentifiabilityResult;
  /** Several seeded starts spread over the bounds, the best kept (multistart.ts). */
  multistart(entries: readonly MultistartEntry[], options: MultistartOptions, solveFrom: (start: number[], index: number) => SolverResult): MultistartOutcome<SolverResult>;
  /** Residual diagnostics of one series; absent: outputs carry scores only. */
  diagnostics?(series: ResidualSeries, inputs: InputSignal[], timeUnit: string): DiagnosticsOutput;
  /** Clock in seconds (injected so that tests can be deterministic). */
  now?(): number;
}

export function realCollaborators(): FitCollaborators {
  return {
    sim: { trySimulateExperiment, parameterVector },
    solve: solveLeastSquares,
    uncertainty: computeUncertainty,
    identifiability: analyseIdentifiability,
    multistart: runMultistart,
    diagnostics: (series, inputs, timeUnit) => residualDiagnostics(series, inputs, { timeUnit }),
  };
}
