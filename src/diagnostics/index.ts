/** Residual diagnostics: fit scores, whiteness, autocorrelation, input cross-correlation, verdicts. */
export { residualDiagnostics } from './residual-diagnostics.js';
export type { InputSignal, DiagnosticsOptions, ResidualDiagnostics } from './residual-diagnostics.js';
export { scoreSeries, residualOf } from './scores.js';
export type { SeriesScore } from './scores.js';
export { autocorrelation, crossCorrelation } from './correlation.js';
export { ljungBox } from './ljung-box.js';
export type { LjungBox } from './ljung-box.js';
export { testLags } from './lag-rule.js';
