/** Residual diagnostics: fit scores, whiteness, autocorrelation, input cross-correlation, verdicts. */
export { residualDiagnostics } from './residual-diagnostics.js';
export type { InputSignal, DiagnosticsOptions, ResidualDiagnostics } from './residual-diagnostics.js';
export { scoreSeries, residualOf } from './scores.js';
export type { SeriesScore } from './scores.js';
export { autocorrelation, crossCorrelation } from './correlation.js';
export { ljungBox } from './ljung-box.js';
export type { LjungBox } from './ljung-box.js';
export { testLags, displayLags, MIN_SAMPLES_FOR_TESTS, MAX_DISPLAY_LAGS } from './lag-rule.js';
export { sampleInterval } from './sample-interval.js';
