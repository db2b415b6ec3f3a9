/**
 * `validate --data FILE.csv`: a log that is not in the model file becomes an extra experiment of a
 * copy of the model, read with the model's column names (inputs' and outputs' `column` and
 * `column_unit`). Time column and time unit are those of the model's first experiment (the usual case:
 * the same logger wrote the new file), unless `timeUnit` is given; without experiments, `t`/`time` in
 * the model's time unit.
 * Per-experiment column renames (`columns`), windows, `set` and `initial` of other experiments do not
 * apply to the new log.
 */
import { existsSync, statSync } from 'node:fs';
import path from 'node:path';
import { UserError } from '../errors.js';
import type { ExperimentSpec, Model } from '../model/types.js';

export function withNewLog(model: Model, dataFile: string, cwd: string, timeUnit?: string): { model: Model; index: number } {
  const file = path.resolve(cwd, dataFile);
  if (!existsSync(file) || !statSync(file).isFile()) {
    throw new UserError({ where: { file: dataFile }, what: 'no such data file', fix: 'give the path of a CSV log, relative to the current folder' });
  }
  const first = model.experiments[0];
  const base = path.basename(dataFile).replace(/\.[^.]*$/, '') || 'new-log';
  let name = base;
  for (let i = 2; model.experiments.some((e) => e.name === name); i++) name = `${base}-${i}`;
  const spec: ExperimentSpec = {
    name,
    file,
    fileAsWritten: dataFile,
    time: first?.time,
    timeUnit: timeUnit ?? first?.timeUnit ?? model.timeUnit,
    role: 'validation',
    set: {},
    initial: {},
    columns: {},
    where: { file: dataFile },
  };
  return { model: { ...model, experiments: [...model.experiments, spec] }, index: model.experiments.length };
}
