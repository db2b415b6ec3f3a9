/**
 * The numbers shown for one output of one experiment: taken from fit.json where `fit` wrote them,
 * computed here from the residual series where it did not (an older or partial fit.json).
 */
import type { ResidualSeries } from '../../diagnostics/types.js';
import type { FitResult, OutputResult } from '../../estimation/fit/fit-result.js';
import { residualDiagnostics } from '../../diagnostics/residual-diagnostics.js';
import { residualOf, scoreSeries } from '../../diagnostics/scores.js';

export interface ShownOutput {
  series: ResidualSeries;
  residual: Float64Array;
  result: OutputResult;
}

export function outputForDisplay(fit: FitResult, series: ResidualSeries): ShownOutput {
  const residual = residualOf(series.measured, series.simulated);
  const stored = fit.outputs.find((o) => o.experiment === series.experiment && o.output === series.output);
  const score = scoreSeries(series.measured, series.simulated);
  // fit.json stores an undefined R^2 or NRMSE (constant measurement) as null: shown as not defined
  // (n/a), as on the first rendering, not as missing.
  const result: OutputResult = stored
    ? { ...stored, nrmse: stored.nrmse ?? score.nrmse, r2: stored.r2 ?? score.r2 }
    : {
        experiment: series.experiment,
        output: series.output,
        unit: series.unit,
        role: series.role,
        samples: score.samples,
        missing: score.missing,
        sigma: score.rmse,
        sigmaEstimated: true,
        rmse: score.rmse,
        nrmse: score.nrmse,
        r2: score.r2,
      };
  if (!result.verdict || !result.autocorrelation) {
    const d = residualDiagnostics(series, [], { timeUnit: fit.timeUnit });
    result.whiteness ??= d.whiteness;
    result.autocorrelation ??= d.autocorrelation;
    result.verdict ??= d.verdict;
    if (result.correlatedUpTo === undefined && d.correlatedUpTo !== undefined) result.correlatedUpTo = d.correlatedUpTo;
  }
  return { series, residual, result };
}
