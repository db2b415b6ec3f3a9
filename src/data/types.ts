/** One experiment's log, read, windowed and converted into the model's units. */
import type { ExperimentSpec } from '../model/types.js';

export interface ExperimentData {
  experiment: ExperimentSpec;
  /** Index of the experiment in model.experiments. */
  index: number;
  /** SHA-256 (hex) of the data file's bytes. */
  sha256: string;
  /** Sample times in the MODEL's time unit (strictly increasing for dynamic models). */
  time: Float64Array;
  /** Multiply a time in the model's unit by this to get the time column's unit (for writing CSVs). */
  timeToColumnUnit: number;
  /** Integration start in the model's time unit (<= time[0]). */
  start: number;
  /** Per model input, in the input's unit (no missing values allowed). */
  inputs: Float64Array[];
  /** Per model output, in the output's unit; NaN marks a missing sample; null when not logged. */
  outputs: (Float64Array | null)[];
  /** Per model output: number of missing samples (0 when not logged). */
  missing: number[];
  /** 1-based line number in the file of each kept row, for messages. */
  lines: Int32Array;
  /**
   * Output samples excluded as gross errors (gross-outliers.ts), in file order: they are NaN in
   * `outputs` and counted in `missing`, and the fit and `check` name them.
   */
  outliers: GrossOutlier[];
}

export interface GrossOutlier {
  output: string;
  /** 1-based line in the file. */
  line: number;
  /** The value as logged, converted into the output's unit. */
  value: number;
  unit: string;
}
