/**
 * One experiment's log: read the CSV, keep the rows inside the window, convert time into the
 * model's time unit and every used column into its input's or output's unit.
 *
 * Rules (model-format.md, experiments): time column `time`, else "t", else "time" (static models
 * need none: their rows are numbered 0, 1, 2...); time strictly increasing among the kept rows for
 * dynamic models; inputs and time never missing; outputs may be missing (empty, NaN, nan), counted.
 * An output whose column is absent is "not logged" (null), unless an unused column in the file has
 * nearly its name: that is taken for a typo and reported. The steps: column-plan.ts (columns and
 * units), log-header.ts (the header), log-rows.ts (the rows), then the checks of time below.
 */
import { relative } from 'node:path';
import { UserError } from '../errors.js';
import type { ExperimentSpec, Model } from '../model/types.js';
import { logPlan } from './column-plan.js';
import { readCsv } from './csv-table.js';
import { matchHeader, type HeaderLayout } from './log-header.js';
import { RowCollector } from './log-rows.js';
import { grossOutliers } from './gross-outliers.js';
import type { ExperimentData, GrossOutlier } from './types.js';

/** The path as the user best recognises it: relative to the working directory when shorter. */
function shownPath(file: string): string {
  const rel = relative(process.cwd(), file);
  return rel && !rel.startsWith('..') && rel.length < file.length ? rel : file;
}

/** Load, window and convert the log of experiment `index` of `model`. */
export function loadExperimentData(model: Model, index: number): ExperimentData {
  const exp: ExperimentSpec | undefined = model.experiments[index];
  if (!exp) throw new RangeError(`model has no experiment ${index}`);
  const shown = shownPath(exp.file);
  const expKey = `experiments[${index}]`;
  const plan = logPlan(model, exp, expKey);
  const rows = new RowCollector(plan, exp, shown);
  let header: HeaderLayout | undefined;
  const info = readCsv(exp.file, shown, {
    header: (names, line) => void (header = matchHeader(names, line, { model, exp, expKey, shown, plan })),
    row: (cells, line) => rows.row(cells, line, header!),
  });
  if (rows.time.length === 0) throw emptyLog(exp, expKey, shown, rows);
  const rawTime = rows.time.toArray();
  const lines = rows.lines.toArray();
  if (!model.isStatic) checkTimeIncreases(rawTime, lines, exp, shown);
  const start = model.isStatic ? rawTime[0] : integrationStart(exp, expKey, rawTime[0], lines[0]);
  const inputs = rows.inputs.map((c) => c.toArray());
  refuseGrossInputs(model, inputs, lines, shown);
  const outputs = plan.outputs.map((p, j) => (p.index >= 0 ? rows.outputs[j].toArray() : null));
  const outliers = excludeGrossOutputs(model, outputs, rows.missing, lines);
  const f = plan.timeFactor;
  return {
    experiment: exp,
    index,
    sha256: info.sha256,
    time: f === 1 ? rawTime : rawTime.map((t) => t * f),
    timeToColumnUnit: 1 / f,
    start: start * f,
    inputs,
    outputs,
    missing: rows.missing,
    lines,
    outliers,
  };
}

/** An input drives the simulation: a gross error in it is refused with its line (never guessed around). */
function refuseGrossInputs(model: Model, inputs: Float64Array[], lines: Int32Array, shown: string): void {
  const problems = model.inputs.flatMap((inp, j) =>
    grossOutliers(inputs[j], !model.isStatic).slice(0, 3).map((i) => ({
      where: { file: shown, line: lines[i] },
      what: `input ${inp.name} has ${inputs[j][i]}${inp.unit ? ` ${inp.unit}` : ''} here, a gross error: far outside the rest of the column${model.isStatic ? '' : ' and apart from its neighbours'} (a logger's over-range marker, or a wild cell?)`,
      fix: 'repair or remove the row, or leave it out with the experiment\'s window',
    })),
  );
  if (problems.length) throw new UserError(problems);
}

/** Gross errors in outputs become missing samples, kept for the warnings that name their lines. */
function excludeGrossOutputs(model: Model, outputs: (Float64Array | null)[], missing: number[], lines: Int32Array): GrossOutlier[] {
  const found: GrossOutlier[] = [];
  outputs.forEach((values, j) => {
    if (!values) return;
    for (const i of grossOutliers(values, !model.isStatic)) {
      found.push({ output: model.outputs[j].name, line: lines[i], value: values[i], unit: model.outputs[j].unit });
      values[i] = NaN;
      missing[j]++;
    }
  });
  return found.sort((a, b) => a.line - b.line);
}

function emptyLog(exp: ExperimentSpec, expKey: string, shown: string, rows: RowCollector): UserError {
  const win = exp.window;
  const what = win
    ? `no rows inside the window [${win[0]}, ${win[1]}] ${exp.timeUnit}; the file's times run from ${rows.firstRowTime} to ${rows.lastRowTime} ${exp.timeUnit}`
    : 'the data file has a header but no data rows';
  return new UserError({ where: { file: shown, key: win ? `${expKey}.window` : undefined }, what, fix: win ? 'choose a window inside the logged time span' : 'log at least one row' });
}

function checkTimeIncreases(time: Float64Array, lines: Int32Array, exp: ExperimentSpec, shown: string): void {
  for (let i = 1; i < time.length; i++) {
    if (time[i] > time[i - 1]) continue;
    throw new UserError({
      where: { file: shown, line: lines[i] },
      what: `time does not increase: ${time[i]} ${exp.timeUnit} follows ${time[i - 1]} ${exp.timeUnit} (line ${lines[i - 1]})`,
      fix: 'time must increase strictly from row to row; remove repeated rows, or split a log that restarts its clock into two experiments',
    });
  }
}

/** Where the integration starts, in the log's time unit: the experiment's `start`, else the first sample. */
function integrationStart(exp: ExperimentSpec, expKey: string, firstTime: number, firstLine: number): number {
  if (exp.start === undefined) return firstTime;
  if (exp.start > firstTime) {
    throw new UserError({
      where: { key: `${expKey}.start` },
      what: `start ${exp.start} ${exp.timeUnit} is after the first sample at ${firstTime} ${exp.timeUnit} (line ${firstLine})`,
      fix: 'the integration must start at or before the first measurement; lower `start` or move the window',
    });
  }
  return exp.start;
}
