/** The fit quality that `rigcal simulate` prints where an experiment has data (a table, or rows for --json). */
import { scoreSeries } from '../diagnostics/scores.js';
import type { Model } from '../model/types.js';
import { constantOutputWarning, formatNumber, indentedTable as plainTable, printableLines, withUnit } from '../presentation/index.js';
import type { SimulatedExperiment } from './simulation-csv.js';

/** One experiment's measured output against the simulation: RMSE in the output's unit. */
export interface QualityRow {
  experiment: string;
  role: string;
  output: string;
  unit: string;
  samples: number;
  missing: number;
  rmse: number;
  /** NaN (null in JSON) when the measurement is constant: R^2 is not defined then. */
  r2: number;
  /** The value of a constant measurement, when it is one. */
  constantValue?: number;
}

/** Fit quality per experiment and measured output, as plain data (full precision). */
export function qualityRows(model: Model, runs: readonly SimulatedExperiment[]): QualityRow[] {
  const rows: QualityRow[] = [];
  for (const { result, data } of runs) {
    if (!data) continue;
    model.outputs.forEach((o, j) => {
      const measured = data.outputs[j];
      if (!measured) return;
      const s = scoreSeries(measured, result.outputs[j]);
      rows.push({
        experiment: result.experiment, role: data.experiment.role, output: o.name, unit: o.unit, samples: s.samples, missing: data.missing[j], rmse: s.rmse, r2: s.r2,
        ...(s.constantValue !== undefined ? { constantValue: s.constantValue } : {}),
      });
    });
  }
  return rows;
}

/** Fit quality per experiment and measured output: samples, missing, RMSE (with unit), R^2; then why an R^2 is missing. */
export function renderQuality(model: Model, runs: readonly SimulatedExperiment[]): string {
  const quality = qualityRows(model, runs);
  if (!quality.length) return '';
  const rows = quality.map((r) => [r.experiment, r.role, r.output, String(r.samples), String(r.missing), withUnit(r.rmse, r.unit), formatNumber(r.r2, 5)]);
  const warnings = quality.filter((r) => r.constantValue !== undefined).map((r) => `warning: ${constantOutputWarning(r.output, r.experiment, withUnit(r.constantValue, r.unit))}\n`);
  return printableLines(`fit quality (measured - simulated)\n${plainTable(['experiment', 'role', 'output', 'samples', 'missing', 'RMSE', 'R^2'], rows)}\n${warnings.join('')}`);
}
