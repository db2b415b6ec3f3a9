/**
 * One experiment's log: read the CSV, keep the rows inside the window, convert time into the
 * model's time unit and every used column into its input's or output's unit.
 *
 * Rules (model-format.md, experiments): time column `time`, else "t", else "time" (static models
 * need none: their rows are numbered 0, 1, 2...); time strictly increasing among the kept rows for
 * dynamic models; inputs and time never missing; outputs may be missing (empty, NaN, nan), counted.
 * An output whose column is absent is "not logged" (null), unless an unused column in the file has
 * nearly its name: that is taken for a typo and reported.
 */
import { relative } from 'node:path';
import { ProblemList, UserError, type Problem } from '../errors.js';
import type { ExperimentSpec, Model } from '../model/types.js';
import { unitConverter, type Converter } from '../units/convert.js';
import { readCsv } from './csv-table.js';
import { GrowableF64, GrowableI32 } from './growable.js';
import { isLikelyTypo, nearestNames } from '../presentation/nearest-names.js';
import { badCellHint, readCell } from './numbers.js';
import type { ExperimentData } from './types.js';
import { shownText } from '../util/printable.js';

/** The path as the user best recognises it: relative to the working directory when shorter. */
function shownPath(file: string): string {
  const rel = relative(process.cwd(), file);
  return rel && !rel.startsWith('..') && rel.length < file.length ? rel : file;
}

interface ColumnPlan {
  /** Input or output name in the model. */
  name: string;
  column: string;
  /** Model key that set the column, for messages. */
  key: string;
  convert: Converter;
  index: number;
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

/** Load, window and convert the log of experiment `index` of `model`. */
export function loadExperimentData(model: Model, index: number): ExperimentData {
  const exp: ExperimentSpec | undefined = model.experiments[index];
  if (!exp) throw new RangeError(`model has no experiment ${index}`);
  const shown = shownPath(exp.file);
  const expKey = `experiments[${index}]`;
  const problems = new ProblemList();

  // Time: column unit -> model unit is a pure factor (no time unit has an offset).
  let timeFactor = 1;
  if (exp.timeUnit.trim() !== model.timeUnit.trim()) {
    const c = unitConverter(exp.timeUnit, model.timeUnit);
    if (!c.ok) problems.add({ key: `${expKey}.time_unit` }, `cannot convert the time column: ${c.reason}`, 'use a unit of time such as s, ms or min');
    else timeFactor = c.factor;
  }
  const inputs: ColumnPlan[] = model.inputs.map((inp, i) => ({
    name: inp.name,
    column: exp.columns[inp.name] ?? inp.column,
    key: exp.columns[inp.name] !== undefined ? `${expKey}.columns.${inp.name}` : `inputs.${inp.name}.column`,
    convert: converterFor(inp.columnUnit, inp.unit, `inputs.${inp.name}.column_unit`, problems),
    index: -1,
  }));
  const outputs: ColumnPlan[] = model.outputs.map((out) => ({
    name: out.name,
    column: exp.columns[out.name] ?? out.column,
    key: exp.columns[out.name] !== undefined ? `${expKey}.columns.${out.name}` : `outputs.${out.name}.column`,
    convert: converterFor(out.columnUnit, out.unit, `outputs.${out.name}.column_unit`, problems),
    index: -1,
  }));
  problems.throwIfAny();

  let timeIndex = -1;
  let timeColumn = '';
  let headerCount = 0;
  let headerLineNo = 0;
  const win = exp.window;

  const time = new GrowableF64();
  const lines = new GrowableI32();
  const inputCols = inputs.map(() => new GrowableF64());
  const outputCols = outputs.map(() => new GrowableF64());
  const missing = outputs.map(() => 0);
  let firstRowTime = Infinity;
  let lastRowTime = -Infinity;
  let rowNumber = 0;

  const badCell = (line: number, column: string, text: string, role: string): UserError =>
    new UserError({
      where: { file: shown, line },
      what: `${role} column "${shownText(column)}" has "${shownText(text)}", which is not a number`,
      fix: badCellHint(text),
    });

  const info = readCsv(exp.file, shown, {
    header(names, line) {
      headerCount = names.length;
      headerLineNo = line;
      const where = new Map<string, number>();
      const headerProblems: Problem[] = [];
      // One problem per repeated name (a hostile header may repeat one name 100 000 times).
      const repeats = new Map<string, number[]>();
      names.forEach((n, i) => {
        if (n === '') return;
        if (where.has(n)) {
          const fields = repeats.get(n) ?? [where.get(n)! + 1];
          fields.push(i + 1);
          repeats.set(n, fields);
        } else where.set(n, i);
      });
      for (const [n, fields] of repeats) {
        const what = fields.length === 2
          ? `appears twice in the header (fields ${fields[0]} and ${fields[1]})`
          : `appears ${fields.length.toLocaleString('en-US')} times in the header (fields ${fields.slice(0, 5).join(', ')}${fields.length > 5 ? ', ...' : ''})`;
        headerProblems.push({ where: { file: shown, line }, what: `column "${shownText(n)}" ${what}`, fix: 'give every column a distinct name' });
      }
      const available = names.filter((n) => n !== '');
      const list = (n: string) => nearestNames(n, available).map((s) => `"${shownText(s)}"`).join(', ');
      // Time column.
      if (exp.time !== undefined) {
        timeColumn = exp.time;
        timeIndex = where.get(exp.time) ?? -1;
        if (timeIndex < 0) headerProblems.push({ where: { file: shown, line, key: `${expKey}.time` }, what: `the time column "${exp.time}" is not in the file; nearest columns: ${list(exp.time)}`, fix: 'set `time:` of the experiment to the name of the time column' });
      } else {
        for (const candidate of ['t', 'time']) {
          if (where.has(candidate)) {
            timeColumn = candidate;
            timeIndex = where.get(candidate)!;
            break;
          }
        }
        if (timeIndex < 0 && !model.isStatic) {
          headerProblems.push({ where: { file: shown, line, key: `${expKey}.time` }, what: `no time column: neither "t" nor "time" is in the file; columns: ${available.slice(0, 12).map((s) => `"${shownText(s)}"`).join(', ')}`, fix: 'name the time column with `time:` in the experiment' });
        }
      }
      if (timeIndex < 0 && model.isStatic && win) {
        headerProblems.push({ where: { key: `${expKey}.window` }, what: 'a window needs a time column, and this file has none', fix: 'remove the window or name the time column with `time:`' });
      }
      // Inputs must all be there.
      for (const plan of inputs) {
        plan.index = where.get(plan.column) ?? -1;
        if (plan.index < 0) headerProblems.push({ where: { file: shown, line, key: plan.key }, what: `the column "${plan.column}" of input ${plan.name} is not in the file; nearest columns: ${list(plan.column)}`, fix: `rename it with \`columns: { ${plan.name}: <column> }\` in the experiment, or set the input's \`column\`` });
      }
      // Outputs may be absent (not logged), unless the name looks like a typo of an unused column.
      const used = new Set<number>([timeIndex, ...inputs.map((p) => p.index)]);
      for (const plan of outputs) {
        plan.index = where.get(plan.column) ?? -1;
        if (plan.index >= 0) used.add(plan.index);
      }
      for (const plan of outputs) {
        if (plan.index >= 0) continue;
        const renamed = exp.columns[plan.name] !== undefined;
        const close = available.filter((n) => !used.has(where.get(n)!) && isLikelyTypo(plan.column, n));
        if (renamed || close.length) {
          headerProblems.push({ where: { file: shown, line, key: plan.key }, what: `the column "${plan.column}" of output ${plan.name} is not in the file; nearest columns: ${list(plan.column)}`, fix: `rename it with \`columns: { ${plan.name}: <column> }\` in the experiment, or set the output's \`column\`` });
        }
      }
      if (outputs.length > 0 && outputs.every((p) => p.index < 0) && !headerProblems.length) {
        headerProblems.push({ where: { file: shown, line }, what: `none of the outputs (${outputs.map((p) => `"${p.column}"`).join(', ')}) is a column of this file; columns: ${available.slice(0, 12).map((s) => `"${shownText(s)}"`).join(', ')}`, fix: 'check the outputs\' `column` names or rename them with `columns:` in the experiment' });
      }
      if (headerProblems.length) throw new UserError(headerProblems);
    },

    row(cells, line) {
      rowNumber++;
      if (cells.length !== headerCount && (cells.length < headerCount || cells.slice(headerCount).some((c) => c !== ''))) {
        throw new UserError({ where: { file: shown, line }, what: `this row has ${cells.length} fields, the header (line ${headerLineNo}) has ${headerCount}`, fix: 'every row needs one value per header column (an empty field for a missing output sample)' });
      }
      let tColumnUnit: number;
      if (timeIndex >= 0) {
        const c = readCell(cells[timeIndex]);
        if (c === null) throw badCell(line, timeColumn, cells[timeIndex], 'time');
        if (Number.isNaN(c)) throw new UserError({ where: { file: shown, line }, what: `the time column "${timeColumn}" is empty or NaN`, fix: 'every row needs a time; remove rows without one' });
        tColumnUnit = c;
        if (tColumnUnit < firstRowTime) firstRowTime = tColumnUnit;
        if (tColumnUnit > lastRowTime) lastRowTime = tColumnUnit;
        if (win && (tColumnUnit < win[0] || tColumnUnit > win[1])) return;
      } else {
        tColumnUnit = rowNumber - 1;
      }
      time.push(tColumnUnit);
      lines.push(line);
      for (let j = 0; j < inputs.length; j++) {
        const plan = inputs[j];
        const text = cells[plan.index];
        const c = readCell(text);
        if (c === null) throw badCell(line, plan.column, text, `input ${plan.name}:`);
        if (Number.isNaN(c)) throw new UserError({ where: { file: shown, line }, what: `input column "${plan.column}" (input ${plan.name}) has a missing value ("${shownText(text)}")`, fix: 'inputs drive the simulation and cannot be missing: fill the gap in the log or window it out' });
        inputCols[j].push(plan.convert(c));
      }
      for (let j = 0; j < outputs.length; j++) {
        const plan = outputs[j];
        if (plan.index < 0) continue;
        const text = cells[plan.index];
        const c = readCell(text);
        if (c === null) throw badCell(line, plan.column, text, `output ${plan.name}:`);
        if (Number.isNaN(c)) {
          missing[j]++;
          outputCols[j].push(NaN);
        } else outputCols[j].push(plan.convert(c));
      }
    },
  });

  if (time.length === 0) {
    const what = win
      ? `no rows inside the window [${win[0]}, ${win[1]}] ${exp.timeUnit}; the file's times run from ${firstRowTime} to ${lastRowTime} ${exp.timeUnit}`
      : 'the data file has a header but no data rows';
    throw new UserError({ where: { file: shown, key: win ? `${expKey}.window` : undefined }, what, fix: win ? 'choose a window inside the logged time span' : 'log at least one row' });
  }

  const rawTime = time.toArray();
  const lineArr = lines.toArray();
  if (!model.isStatic) {
    for (let i = 1; i < rawTime.length; i++) {
      if (!(rawTime[i] > rawTime[i - 1])) {
        throw new UserError({
          where: { file: shown, line: lineArr[i] },
          what: `time does not increase: ${rawTime[i]} ${exp.timeUnit} follows ${rawTime[i - 1]} ${exp.timeUnit} (line ${lineArr[i - 1]})`,
          fix: 'time must increase strictly from row to row; remove repeated rows, or split a log that restarts its clock into two experiments',
        });
      }
    }
  }
  let startColumnUnit = rawTime[0];
  if (exp.start !== undefined && !model.isStatic) {
    if (exp.start > rawTime[0]) {
      throw new UserError({
        where: { key: `${expKey}.start` },
        what: `start ${exp.start} ${exp.timeUnit} is after the first sample at ${rawTime[0]} ${exp.timeUnit} (line ${lineArr[0]})`,
        fix: 'the integration must start at or before the first measurement; lower `start` or move the window',
      });
    }
    startColumnUnit = exp.start;
  }

  const timeModel = timeFactor === 1 ? rawTime : rawTime.map((t) => t * timeFactor);
  return {
    experiment: exp,
    index,
    sha256: info.sha256,
    time: timeModel,
    timeToColumnUnit: 1 / timeFactor,
    start: startColumnUnit * timeFactor,
    inputs: inputCols.map((c) => c.toArray()),
    outputs: outputs.map((p, j) => (p.index >= 0 ? outputCols[j].toArray() : null)),
    missing,
    lines: lineArr,
  };
}
