/**
 * Which column of an experiment's log feeds each input and output, with the converter from the
 * column's unit into the model's, and the factor from the log's time unit into the model's.
 */
import { ProblemList } from '../errors.js';
import type { ExperimentSpec, Model } from '../model/types.js';
import { unitConverter, type Converter } from '../units/convert.js';

export interface ColumnPlan {
  /** Input or output name in the model. */
  name: string;
  column: string;
  /** Model key that set the column, for messages. */
  key: string;
  convert: Converter;
  /** Field index in the header, -1 until the header is read (and for an output not logged). */
  index: number;
}

export interface LogPlan {
  inputs: ColumnPlan[];
  outputs: ColumnPlan[];
  /** Log time unit -> model time unit: a pure factor (no time unit has an offset). */
  timeFactor: number;
}

/** The plan of experiment `exp` (at `expKey`); throws one UserError listing every unit problem. */
export function logPlan(model: Model, exp: ExperimentSpec, expKey: string): LogPlan {
  const problems = new ProblemList();
  let timeFactor = 1;
  if (exp.timeUnit.trim() !== model.timeUnit.trim()) {
    const c = unitConverter(exp.timeUnit, model.timeUnit);
    if (!c.ok) problems.add({ key: `${expKey}.time_unit` }, `cannot convert the time column: ${c.reason}`, 'use a unit of time such as s, ms or min');
    else timeFactor = c.factor;
  }
  const plan = (kind: 'inputs' | 'outputs', v: { name: string; column: string; columnUnit?: string; unit: string }): ColumnPlan => ({
    name: v.name,
    column: exp.columns[v.name] ?? v.column,
    key: exp.columns[v.name] !== undefined ? `${expKey}.columns.${v.name}` : `${kind}.${v.name}.column`,
    convert: converterFor(v.columnUnit, v.unit, `${kind}.${v.name}.column_unit`, problems),
    index: -1,
  });
  const inputs = model.inputs.map((inp) => plan('inputs', inp));
  const outputs = model.outputs.map((out) => plan('outputs', out));
  problems.throwIfAny();
  return { inputs, outputs, timeFactor };
}

/** Converter from a column unit into the model unit, or a problem at `key`. */
function converterFor(from: string | undefined, to: string, key: string, problems: ProblemList): Converter {
  if (from === undefined || from.trim() === to.trim()) return (v) => v;
  const c = unitConverter(from, to);
  if (!c.ok) {
    problems.add({ key }, `cannot convert the logged column: ${c.reason}`, 'give a `column_unit` of the same kind as the `unit`');
    return (v) => v;
  }
  return c.convert;
}
