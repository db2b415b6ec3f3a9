/**
 * The result of `validate`: a plain object, written as validation.json into the output folder and
 * rendered as a table by the CLI.
 */
import type { WhitenessResult } from '../diagnostics/types.js';

export interface ValidationOutputScore {
  experiment: string;
  output: string;
  unit: string;
  /** Samples with both a measurement and a simulated value; missing measurements are skipped. */
  samples: number;
  missing: number;
  /** Root-mean-square error, in `unit`. */
  rmse: number;
  /** RMSE over the standard deviation of the measurement (dimensionless; 0 is perfect, 1 is no better than the mean). */
  nrmse: number;
  r2: number;
  /**
   * True when the estimates were fitted to this experiment's data: the score is then in-sample and
   * says how well the fit matched, not how well the model predicts data it has not seen.
   */
  inSample: boolean;
  whiteness?: WhitenessResult;
  /** In words: are the residuals plain noise, or does the model miss something? */
  verdict: string;
  correlatedUpTo?: number;
}

export interface ValidationData {
  experiment: string;
  /** `fit` or `validation` for an experiment of the model file; `new log` for --data. */
  source: 'fit' | 'validation' | 'new log';
  /** The estimates were fitted to these data (see ValidationOutputScore.inSample). */
  inSample: boolean;
  file: string;
  sha256: string;
  rows: number;
}

/** A data file accepted with --force although it is not the one the estimates were made from. */
export interface DataChange {
  experiment: string;
  file: string;
  /** The SHA-256 estimates.yaml records for the file. */
  recordedSha256: string;
  /** The SHA-256 of the file as validated (or why it could not be read). */
  currentSha256: string;
}

export interface ValidationResult {
  tool: 'rigcal';
  version: string;
  kind: 'validation';
  date: string;
  model: { name: string; file: string; sha256: string };
  estimates: { file: string; modelSha256: string; fitDate: string; fitStatus: string };
  timeUnit: string;
  /** A static model: rows are not time (lags in the diagnostics count rows). */
  isStatic: boolean;
  data: ValidationData[];
  outputs: ValidationOutputScore[];
  /** Values used for the parameters, by name (`name@experiment` for per-experiment copies). */
  parameters: Record<string, number>;
  warnings: string[];
  /** Present when --force let changed data files through: both hashes of each. */
  dataChanges?: DataChange[];
}
