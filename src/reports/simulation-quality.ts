/** The fit quality table that `rigcal simulate` prints where an experiment has data. */
import { scoreSeries } from '../diagnostics/scores.js';
import type { Model } from '../model/types.js';
import { constantOutputWarning, formatNumber, indentedTable as plainTable, withUnit } from '../presentation/index.js';
import type { SimulatedExperiment } from './simulation-csv.js';

/** Fit quality per experiment and measured output: samples, missing, RMSE (with unit), R^2. */
export function renderQuality(model: Model, runs: readonly SimulatedExperiment[]): string {
  const rows: string[][] = [];
  const warnings: string[] = [];
  for (const { result, data } of runs) {
    if (!data) continue;
    model.outputs.forEach((o, j) => {
      const measured = data.outputs[j];
      if (!measured) return;
      const s = scoreSeries(measured, result.outputs[j]);
      if (s.constantValue !== undefined) warnings.push(`warning: ${constantOutputWarning(o.name, result.experiment, withUnit(s.constantValue, o.unit))}\n`);
      rows.push([result.experiment, data.experiment.role, o.name, String(s.samples), String(data.missing[j]), withUnit(s.rmse, o.unit), formatNumber(s.r2, 5)]);
    });
  }
  if (!rows.length) return '';
  return `fit quality (measured - simulated)\n${plainTable(['experiment', 'role', 'output', 'samples', 'missing', 'RMSE', 'R^2'], rows)}\n${warnings.join('')}`;
}
