/**
 * The CSV that `rigcal simulate` writes (cli-and-results.md): `experiment`, `time` (in the
 * experiment's time unit), every output (model units), `<output>_measured` for each output measured
 * in the simulated experiments (converted to the model's units, empty where missing or not logged),
 * then every state as `<state>_state`.
 */
import type { ExperimentData } from '../data/types.js';
import type { Model } from '../model/types.js';
import type { SimulationResult } from '../simulation/types.js';
import { CsvText, type CsvCell } from '../files/csv.js';

export interface SimulatedExperiment {
  result: SimulationResult;
  /** The log it was driven by; undefined for a simulation over a given span without data. */
  data?: ExperimentData;
}

/** Time in the log's own unit, rounded to 12 digits so that 0.007 stays 0.007 after a unit round trip. */
function columnTime(t: number, factor: number): number {
  const v = t * factor;
  return factor === 1 ? v : Number(v.toPrecision(12));
}

export function renderSimulationCsv(model: Model, runs: readonly SimulatedExperiment[]): string {
  const measuredOutputs = model.outputs
    .map((o, j) => ({ name: o.name, j }))
    .filter(({ j }) => runs.some((r) => r.data?.outputs[j]));
  const header = [
    'experiment',
    'time',
    ...model.outputs.map((o) => o.name),
    ...measuredOutputs.map((o) => `${o.name}_measured`),
    ...model.states.map((s) => `${s.name}_state`),
  ];
  // Values at full round-trip precision: the file is for further computation, not for reading.
  const csv = new CsvText(header);
  for (const { result, data } of runs) {
    const name = result.experiment;
    const factor = data ? data.timeToColumnUnit : 1;
    const n = result.time.length;
    for (let i = 0; i < n; i++) {
      const row: CsvCell[] = [name, model.isStatic && !data ? i : columnTime(result.time[i], factor)];
      for (const y of result.outputs) row.push(y[i]);
      for (const { j } of measuredOutputs) {
        const logged = data?.outputs[j];
        row.push(logged ? logged[i] : '');
      }
      for (const x of result.states) row.push(x[i]);
      csv.row(row);
    }
  }
  return csv.toString();
}
