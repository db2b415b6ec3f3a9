/**
 * What residual diagnostics read and return, as plain data. The fit result embeds these types; they
 * live here, the lower layer, so that estimation imports diagnostics and never the other way round.
 */

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

/** The Ljung-Box whiteness test of one residual series. */
export interface WhitenessResult {
  ljungBox: number;
  lags: number;
  pValue: number;
  white: boolean;
}

/** Residual autocorrelation at lags 0..L (sample steps) and its 95 % band half-width. */
export interface ResidualAutocorrelation {
  lagStep: number;
  values: number[];
  band: number;
}

/** Largest |cross-correlation| of residuals with one input, its lag and the 95 % band half-width. */
export interface InputCorrelation {
  input: string;
  maxAbs: number;
  lag: number;
  band: number;
}
