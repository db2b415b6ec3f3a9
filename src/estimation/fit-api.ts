/** The estimation entry point's contract, shared by `fit`, `rank`, `validate` and the reports. */
import type { FitResult } from './fit-result.js';

export interface FitProgress {
  start: number;
  iteration: number;
  /** Half the weighted sum of squared residuals, or the plain weighted SSE: see fit.ts. */
  cost: number;
  /** Relative step length of the last accepted step. */
  step: number;
  message?: string;
}

export interface FitOptions {
  /**
   * Number of starts spread over the bounds. Default: the model's start values only, unless that fit
   * ends with parameters on bounds and fit residuals that are not white (a likely local optimum):
   * then 8 seeded starts spread over the bounds are run too and the better result is reported, with
   * a warning that says so. Give 1 to keep to the model's start values whatever happens.
   */
  starts?: number;
  seed?: number;
  maxIterations?: number;
  onProgress?: (p: FitProgress) => void;
}

/** Measured and simulated values of one output in one experiment, for residuals.csv and reports. */
export interface ResidualSeries {
  experiment: string;
  role: 'fit' | 'validation';
  output: string;
  unit: string;
  /** Sample times in the model's time unit. */
  time: Float64Array;
  /** In the output's unit; NaN where the sample is missing. */
  measured: Float64Array;
  simulated: Float64Array;
}

export interface FitOutcome {
  result: FitResult;
  residuals: ResidualSeries[];
  /** Estimated and fixed values by name (`name` or `name@experiment`), in the parameters' units. */
  values: Record<string, number>;
}
