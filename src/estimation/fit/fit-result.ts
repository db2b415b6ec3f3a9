/**
 * What a fit produces. `FitResult` is the record of the fit, a plain object written as fit.json
 * (shared spec cli-and-results.md; the keys listed there are a contract, more may be added) and
 * rendered by reports. `CompletedFit` is what `fitModel` returns: that record, plus the residual
 * series at the estimates and the values by name, which the results folder and reports need.
 */
import type { SolverRegime } from '../solver-setup.js';
import type { StopReason } from '../solver/stop-reasons.js';
import type { InputCorrelation, ResidualAutocorrelation, ResidualSeries, WhitenessResult } from '../../diagnostics/types.js';

export interface ParameterResult {
  /** `name`, or `name@experiment` for a per-experiment copy. */
  name: string;
  /** The declared parameter this row belongs to (equal to `name` unless per-experiment). */
  parameter: string;
  unit: string;
  status: 'free' | 'fixed';
  experiment?: string;
  estimate: number;
  /** Free only; null when the data do not determine it (singular information). */
  stdError?: number | null;
  ci95?: [number, number] | null;
  min?: number;
  max?: number;
  start?: number;
  scale?: 'log' | 'linear';
  atBound?: false | 'lower' | 'upper';
}

export interface OutputResult {
  experiment: string;
  output: string;
  unit: string;
  role: 'fit' | 'validation';
  samples: number;
  missing: number;
  sigma: number;
  sigmaEstimated: boolean;
  rmse: number;
  /** RMSE over the standard deviation of the measurement. */
  nrmse: number;
  r2: number;
  whiteness?: WhitenessResult;
  /** Verdict in words, e.g. "residuals are white: the model explains this output within noise". */
  verdict?: string;
  /** Lag (in the model's time unit) up to which residuals stay correlated, when they do. */
  correlatedUpTo?: number;
  /** Residual autocorrelation at lags 0..L (sample steps) and its 95 % band half-width. */
  autocorrelation?: ResidualAutocorrelation;
  /** Largest |cross-correlation| of residuals with each input, and its lag. */
  inputCorrelation?: InputCorrelation[];
}

export interface IdentifiabilityProblem {
  /** Parameters the weak direction mixes (names as in `parameters`). */
  parameters: string[];
  /** The direction (unit vector over `parameters`) in the scaled coordinates. */
  direction?: number[];
  singularValue?: number;
  /** In words, e.g. "k and m move together: only k/m is determined by these data". */
  message: string;
}

export interface FitStatistics {
  observations: number;
  freeParameters: number;
  dof: number;
  weightedSSE: number;
  /** Reduced chi-square: only when every sigma was given. */
  reducedChiSquare?: number;
  logLikelihood: number;
  aicc: number;
  bic: number;
}

export interface Provenance {
  modelFile: string;
  modelSha256: string;
  dataFiles: { experiment: string; file: string; sha256: string }[];
  toolVersion: string;
  date: string;
  overrides: Record<string, number>;
}

export interface FitResult {
  tool: 'rigcal';
  version: string;
  format: 1;
  model: { name: string; file: string; sha256: string; description?: string };
  /** The model's time unit (times in residuals.csv are in it). */
  timeUnit?: string;
  experiments?: { name: string; role: 'fit' | 'validation'; file: string; sha256: string; rows: number }[];
  status: 'converged' | 'stopped' | 'failed';
  message: string;
  /** Which test ended the solver's last run: a code of STOP_REASONS (solver/stop-reasons.ts, README "Why a fit stopped"). */
  stopReason: StopReason;
  /** How the solver was set up for this problem (solver-setup.ts SolverRegime). */
  solver: SolverRegime;
  iterations: number;
  simulations: number;
  /** Simulations that also integrated sensitivities. */
  sensitivitySimulations?: number;
  wallSeconds: number;
  starts?: { requested: number; seed: number; distinctOptima: number; bestCosts: number[] };
  parameters: ParameterResult[];
  correlation: { names: string[]; matrix: (number | null)[][] };
  statistics: FitStatistics;
  outputs: OutputResult[];
  identifiability: { conditionNumber: number | null; singularValues?: number[]; problems: IdentifiabilityProblem[] };
  warnings: string[];
  provenance: Provenance;
}

/** What `fitModel` returns: the record, the residual series at the estimates, the values by name. */
export interface CompletedFit {
  result: FitResult;
  residuals: ResidualSeries[];
  /** Estimated and fixed values by name (`name` or `name@experiment`), in the parameters' units. */
  values: Record<string, number>;
}
