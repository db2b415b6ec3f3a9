/** What the caller of a fit chooses, and the progress it is told about. */

export interface FitProgress {
  /** What the fit is doing: the fit from the start(s), a refit with estimated noise levels, or the search of starts that a fit stuck on its bounds runs by itself. */
  phase: 'fit' | 'noise refit' | 'search of starts';
  /** 1-based start, of `starts` in this phase. */
  start: number;
  starts: number;
  iteration: number;
  /** The solver's cost: the weighted sum of squared residuals (not half of it). */
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
