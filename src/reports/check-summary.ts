/**
 * The summary `rigcal check` prints: what the model declares (states, inputs, parameters with
 * bounds, outputs) and what each experiment's log holds (rows, time span, sample interval, missing
 * samples). Plain text, fixed-width columns; every number carries its unit. Text from the model or
 * the log is made printable (presentation/printable.ts).
 */
import { outlierWarnings } from '../presentation/outlier-notes.js';
import type { ExperimentData } from '../data/types.js';
import type { Model, ParameterSpec } from '../model/types.js';
import { formatNumber, indentedTable, printable, printableLines, withUnit } from '../presentation/index.js';

/** True when not one symbol of the model declares a unit: then dimensional checks are skipped. */
function noSymbolCarriesUnit(model: Model): boolean {
  const units = [
    ...model.states.map((s) => s.unit),
    ...model.inputs.map((s) => s.unit),
    ...model.parameters.map((s) => s.unit),
    ...model.outputs.map((s) => s.unit),
  ];
  return units.every((u) => !u || !u.trim());
}

function unitCheckLine(model: Model): string {
  if (model.units === 'off') return 'unit checks: off (units: off in the model file)';
  if (noSymbolCarriesUnit(model)) return 'unit checks skipped: no symbol carries a unit';
  return 'unit checks: passed (every equation, output and function argument agrees)';
}

function parameterRow(p: ParameterSpec, model: Model): string[] {
  const sets = model.experiments.filter((e) => p.name in e.set).map((e) => `${e.name}: ${formatNumber(e.set[p.name])}`);
  if (p.kind === 'fixed') {
    return [p.name, 'fixed', formatNumber(p.value), '', '', p.unit || '-', sets.length ? `set in ${sets.join(', ')}` : ''];
  }
  const notes = [p.perExperiment ? 'one copy per fit experiment' : ''].filter(Boolean);
  return [p.name, 'free', `[${formatNumber(p.min)}, ${formatNumber(p.max)}]`, formatNumber(p.start), p.scale, p.unit || '-', notes.join(', ')];
}

/** Typical sample interval: the median spacing, with the range when the spacing varies. */
function sampleInterval(time: Float64Array, unit: string): string {
  if (time.length < 2) return '-';
  const d = Array.from({ length: time.length - 1 }, (_, k) => time[k + 1] - time[k]).sort((a, b) => a - b);
  // Rounded to 9 digits: 0.001 s logged as 0.000999999999999889 (binary) should read 0.001 s.
  const round = (x: number) => Number(x.toPrecision(9));
  const median = round(d[Math.floor(d.length / 2)]);
  const min = round(d[0]);
  const max = round(d[d.length - 1]);
  const uniform = max - min <= 1e-6 * Math.abs(median);
  return uniform ? withUnit(median, unit) : `${withUnit(median, unit)} (median; ${formatNumber(min)} to ${formatNumber(max)})`;
}

function experimentRow(model: Model, index: number, data: ExperimentData | undefined): string[] {
  const e = model.experiments[index];
  const name = e.name;
  const file = e.fileAsWritten;
  if (!data) return [name, e.role, file, 'not read (see the errors below)', '', '', ''];
  const n = data.time.length;
  const unit = model.timeUnit;
  const span = model.isStatic || n === 0 ? '-' : `${formatNumber(data.time[0])} to ${withUnit(data.time[n - 1], unit)}`;
  const interval = model.isStatic ? '-' : sampleInterval(data.time, unit);
  const logged = model.outputs.filter((_, j) => data.outputs[j] !== null).map((o) => o.name);
  const missing = model.outputs
    .map((o, j) => (data.outputs[j] !== null && data.missing[j] > 0 ? `${o.name}: ${data.missing[j]}` : ''))
    .filter(Boolean);
  const notLogged = model.outputs.filter((_, j) => data.outputs[j] === null).map((o) => o.name);
  const outputs = [logged.join(', ') || 'none', notLogged.length ? `(not logged: ${notLogged.join(', ')})` : ''].filter(Boolean).join(' ');
  return [name, e.role, file, String(n), span, interval, missing.length ? missing.join(', ') : '0', outputs];
}

function wrap(text: string, width: number): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(' ')) {
    if (line && line.length + 1 + word.length > width) {
      lines.push(line);
      line = word;
    } else line = line ? `${line} ${word}` : word;
  }
  if (line) lines.push(line);
  return lines;
}

export interface CheckSummaryInput {
  model: Model;
  /** Per experiment, its data, or undefined when it could not be read. */
  data: (ExperimentData | undefined)[];
}

export function renderCheckSummary({ model, data }: CheckSummaryInput): string {
  const out: string[] = [];
  const kind = model.isStatic ? 'static model (no states)' : `time unit ${model.timeUnit}`;
  out.push(`model ${model.name} (${model.fileAsGiven}), format ${model.format}, ${kind}`);
  if (model.description) out.push(...wrap(model.description.trim().replace(/\s+/g, ' '), 96).map((l) => `  ${l}`));

  if (!model.isStatic) {
    out.push('', `states (${model.states.length})`);
    out.push(indentedTable(['name', 'unit', 'initial'], model.states.map((s) => [s.name, s.unit || '-', s.initial.text])));
  }
  if (model.inputs.length) {
    out.push('', `inputs (${model.inputs.length})`);
    out.push(indentedTable(['name', 'unit', 'column', 'interpolate', 'delay'], model.inputs.map((i) => [
      i.name,
      i.unit || '-',
      i.columnUnit ? `${i.column} (${i.columnUnit})` : i.column,
      i.interpolate,
      i.delay === undefined ? '' : typeof i.delay === 'number' ? withUnit(i.delay, model.timeUnit) : `parameter ${i.delay}`,
    ])));
  }
  const free = model.parameters.filter((p) => p.kind === 'free').length;
  out.push('', `parameters (${model.parameters.length}: ${model.parameters.length - free} fixed, ${free} free)`);
  out.push(indentedTable(['name', 'kind', 'value / bounds', 'start', 'scale', 'unit', 'note'], model.parameters.map((p) => parameterRow(p, model))));
  if (model.defines.length) {
    out.push('', `defines (${model.defines.length})`);
    out.push(indentedTable(['name', 'expression'], model.defines.map((d) => [d.name, d.expr.text])));
  }
  out.push('', `outputs (${model.outputs.length})`);
  out.push(indentedTable(['name', 'unit', 'expression', 'column', 'sigma'], model.outputs.map((o) => [
    o.name,
    o.unit || '-',
    o.expr.text,
    o.columnUnit ? `${o.column} (${o.columnUnit})` : o.column,
    o.sigma === undefined ? 'estimated' : withUnit(o.sigma, o.unit),
  ])));
  out.push('', `experiments (${model.experiments.length})`);
  if (model.experiments.length) {
    out.push(indentedTable(['name', 'role', 'file', 'rows', 'time span', 'sample interval', 'missing', 'outputs logged'],
      model.experiments.map((_, k) => experimentRow(model, k, data[k]))));
  } else {
    out.push('  none: fit and simulate with data need at least one experiment');
  }
  out.push('', unitCheckLine(model));
  return printableLines(out.join('\n') + '\n');
}

/**
 * What `fit` will need that the model or its logs do not give (not errors: a model can be checked
 * or simulated without them).
 */
export function fitReadinessNotes(model: Model, data: (ExperimentData | undefined)[]): string[] {
  const notes: string[] = [];
  if (!model.parameters.some((p) => p.kind === 'free')) notes.push('no free parameter: `fit` needs at least one (write `free: [min, max]`)');
  if (!model.outputs.length) notes.push('no outputs: `fit` needs at least one measured output');
  if (!model.experiments.some((e) => e.role === 'fit')) notes.push('no experiment with role fit: `fit` needs at least one');
  model.outputs.forEach((o, j) => {
    const loaded = data.filter((d): d is ExperimentData => d !== undefined);
    if (loaded.length === model.experiments.length && loaded.length > 0 && loaded.every((d) => d.outputs[j] === null)) {
      notes.push(`output ${o.name} is not logged in any experiment (column "${o.column}"): it cannot be fitted or scored`);
    }
  });
  data.forEach((d, k) => {
    if (!d) return;
    d.missing.forEach((m, j) => {
      const logged = d.outputs[j];
      if (logged && m > 0 && m === logged.length) notes.push(`experiment ${model.experiments[k].name}: output ${model.outputs[j].name} has no sample at all (all ${m} missing)`);
    });
  });
  notes.push(...outlierWarnings(data.filter((d): d is ExperimentData => d !== undefined)));
  return notes.map(printable);
}
