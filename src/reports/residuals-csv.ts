/**
 * residuals.csv: one row per experiment and sample, per output measured, simulated and residual
 * (measured - simulated), time in the model's time unit, values in the output's unit. Empty cells
 * where a sample is missing or the output is not logged in that experiment.
 */
import type { ResidualSeries } from '../diagnostics/types.js';
import { CsvText } from '../files/csv.js';

/** `outputs`: every output of the model, in model order (columns appear even where not logged). */
export function renderResidualsCsv(series: readonly ResidualSeries[], outputs: readonly string[]): string {
  const header = ['experiment', 'role', 'time'];
  for (const o of outputs) header.push(`${o}_measured`, `${o}_simulated`, `${o}_residual`);
  const csv = new CsvText(header);
  const experiments: string[] = [];
  const byExperiment = new Map<string, Map<string, ResidualSeries>>();
  for (const s of series) {
    let m = byExperiment.get(s.experiment);
    if (!m) {
      m = new Map();
      byExperiment.set(s.experiment, m);
      experiments.push(s.experiment);
    }
    m.set(s.output, s);
  }
  for (const name of experiments) {
    const m = byExperiment.get(name)!;
    const first = m.values().next().value as ResidualSeries;
    const n = first.time.length;
    for (const s of m.values()) {
      if (s.time.length !== n) throw new Error(`residual series of experiment ${name} differ in length`);
    }
    const cols = outputs.map((o) => m.get(o));
    for (let i = 0; i < n; i++) {
      const row: (string | number)[] = [name, first.role, first.time[i]];
      for (const s of cols) {
        if (!s) {
          row.push('', '', '');
          continue;
        }
        const meas = s.measured[i];
        const sim = s.simulated[i];
        row.push(meas, sim, Number.isFinite(meas) && Number.isFinite(sim) ? meas - sim : '');
      }
      csv.row(row);
    }
  }
  return csv.toString();
}
