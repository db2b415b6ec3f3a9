/**
 * The CSV that `rigcal simulate` writes (cli-and-results.md): `experiment`, `time` (in the
 * experiment's time unit), every output (model units), `<output>_measured` for each output measured
 * in the simulated experiments (converted to the model's units, empty where missing or not logged),
 * then every state as `<state>_state`.
 */
import type { ExperimentData } from '../data/types.js';
import type { Model } from '../model/types.js';
import type { SimulationResult } from '../simulation/types.js';

export interface SimulatedExperiment {
  result: SimulationResult;
  /** The log it was driven by; undefined for a simulation over a given span without data. */
  data?: ExperimentData;
}

/** Full round-trip precision: the file is for further computation, not for reading. */
function cell(v: number): string {
  return Number.isFinite(v) ? String(v) : '';
}

/** A CSV field: quoted only when it holds a separator, a quote or a line break. */
function field(text: string): string {
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** Time in the log's own unit, rounded to 12 digits so that 0.007 stays 0.007 after a unit round trip. */
function columnTime(t: number, factor: number): string {
  const v = t * factor;
  return factor === 1 ? String(v) : String(Number(v.toPrecision(12)));
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
  const lines = [header.map(field).join(',')];
  for (const { result, data } of runs) {
    const name = field(result.experiment);
    const factor = data ? data.timeToColumnUnit : 1;
    const n = result.time.length;
    for (let i = 0; i < n; i++) {
      const row: string[] = [name, model.isStatic && !data ? String(i) : columnTime(result.time[i], factor)];
      for (const y of result.outputs) row.push(cell(y[i]));
      for (const { j } of measuredOutputs) {
        const logged = data?.outputs[j];
        row.push(logged ? cell(logged[i]) : '');
      }
      for (const x of result.states) row.push(cell(x[i]));
      lines.push(row.join(','));
    }
  }
  return lines.join('\n') + '\n';
}
