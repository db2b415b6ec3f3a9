/**
 * What `rigcal check --json` prints: the summary of check-summary.ts as plain data (no expression
 * trees, no typed arrays), for a program that wants to know what a model declares and what its logs
 * hold. Times are in the model's time unit; numbers keep full precision.
 */
import type { ExperimentData } from '../data/types.js';
import type { Model, ParameterSpec } from '../model/types.js';
import type { CheckSummaryInput } from './check-summary.js';

function parameterData(p: ParameterSpec) {
  if (p.kind === 'fixed') return { name: p.name, kind: p.kind, unit: p.unit, value: p.value };
  return { name: p.name, kind: p.kind, unit: p.unit, min: p.min, max: p.max, start: p.start, scale: p.scale, perExperiment: p.perExperiment };
}

function experimentData(model: Model, index: number, data: ExperimentData | undefined) {
  const e = model.experiments[index];
  const base = { name: e.name, role: e.role, file: e.fileAsWritten, read: data !== undefined };
  if (!data) return base;
  const n = data.time.length;
  const logged = (j: number) => data.outputs[j] !== null;
  return {
    ...base,
    rows: n,
    timeSpan: model.isStatic || n === 0 ? null : [data.time[0], data.time[n - 1]],
    outputsLogged: model.outputs.filter((_, j) => logged(j)).map((o) => o.name),
    outputsNotLogged: model.outputs.filter((_, j) => !logged(j)).map((o) => o.name),
    missing: Object.fromEntries(model.outputs.flatMap((o, j) => (logged(j) ? [[o.name, data.missing[j]]] : []))),
  };
}

/** The loaded model and logs as plain data; `notes` are what `fit` will need that they do not give. */
export function checkSummaryData({ model, data }: CheckSummaryInput, notes: string[]) {
  return {
    model: { name: model.name, file: model.fileAsGiven, format: model.format, timeUnit: model.isStatic ? null : model.timeUnit, static: model.isStatic, units: model.units },
    states: model.states.map((s) => ({ name: s.name, unit: s.unit, initial: s.initial.text })),
    inputs: model.inputs.map((i) => ({ name: i.name, unit: i.unit, column: i.column, columnUnit: i.columnUnit ?? null, interpolate: i.interpolate, delay: i.delay ?? null })),
    parameters: model.parameters.map(parameterData),
    defines: model.defines.map((d) => ({ name: d.name, expression: d.expr.text })),
    outputs: model.outputs.map((o) => ({ name: o.name, unit: o.unit, expression: o.expr.text, column: o.column, columnUnit: o.columnUnit ?? null, sigma: o.sigma ?? null })),
    experiments: model.experiments.map((_, k) => experimentData(model, k, data[k])),
    notes,
  };
}
