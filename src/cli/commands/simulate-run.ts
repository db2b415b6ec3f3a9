/** What `rigcal simulate` does (its options and help: simulate.ts). */
import { existsSync, realpathSync, statSync } from 'node:fs';
import { dirname, isAbsolute, resolve } from 'node:path';
import { UserError, type Problem } from '../../errors.js';
import type { ExperimentData } from '../../data/types.js';
import { loadExperimentData } from '../../data/load-experiment.js';
import { scoreSeries } from '../../diagnostics/scores.js';
import { compileModel } from '../../model/compile/index.js';
import { loadModel, parseOverrides } from '../../model/load/index.js';
import type { Model } from '../../model/types.js';
import { formatNumber, indentedTable as plainTable, withUnit } from '../../presentation/index.js';
import { readEstimates } from '../../reports/read-estimates.js';
import { renderSimulationCsv, type SimulatedExperiment } from '../../reports/simulation-csv.js';
import { parameterVector, splitParameterKey } from '../../simulation/parameters.js';
import { simulateExperiment, simulateSpan } from '../../simulation/index.js';
import { writeFileAtomic } from '../../util/atomic-write.js';
import type { CommandContext } from '../io.js';
import { pathFromCwd } from '../paths.js';
import type { SimulateOptions } from './simulate.js';


/** Canonical path for comparisons (follows links; for a file that does not exist yet, its folder). */
function canonical(path: string): string {
  const abs = resolve(path);
  try {
    return realpathSync(abs);
  } catch {
    return abs;
  }
}

/** Parses a positive number given on the command line, naming the option when it is not one. */
function positiveNumber(text: string, option: string): number {
  const v = Number(text);
  if (!text.trim() || !Number.isFinite(v) || v <= 0) {
    throw new UserError({ where: { key: option }, what: `${option} must be a positive number, got "${text}"`, fix: `write e.g. ${option} 10 (in the model's time unit)` });
  }
  return v;
}

/** Estimated values from estimates.yaml, minus those that --set names (--set wins for this run). */
function estimatedValues(file: string, overrides: Record<string, number>): { values: Record<string, number>; note?: string; sha?: string } {
  const est = readEstimates(file);
  const values: Record<string, number> = {};
  for (const [key, entry] of Object.entries(est.parameters)) {
    // Fixed values come from the model file as it is now (and an experiment's `set`), not from the fit.
    if (entry.status !== 'estimated') continue;
    const { name } = splitParameterKey(key);
    if (key in overrides || name in overrides) continue;
    values[key] = entry.value;
  }
  return { values, sha: est.model.sha256, note: est.fit.status !== 'converged' ? `the fit in ${file} ended with status ${est.fit.status}` : undefined };
}

function refuseOverwritingInputs(output: string, model: Model, paramsFile: string | undefined): void {
  const target = canonical(output);
  const protectedFiles = [model.file, ...model.experiments.map((e) => e.file), ...(paramsFile ? [paramsFile] : [])];
  for (const f of protectedFiles) {
    if (canonical(f) === target) {
      throw new UserError({ where: { key: '-o' }, what: `-o ${output} is an input of this run (${f}); rigcal never overwrites a model, data or estimates file`, fix: 'write the simulation to a new file, e.g. -o simulation.csv' });
    }
  }
  // Checked before simulating, so that a long run does not end in a path mistake.
  const folder = dirname(resolve(output));
  if (!existsSync(folder) || !statSync(folder).isDirectory()) {
    throw new UserError({ where: { key: '-o' }, what: `cannot write ${output}: the folder ${folder} does not exist`, fix: 'create the folder first, or write the CSV elsewhere' });
  }
  if (existsSync(target) && statSync(target).isDirectory()) {
    throw new UserError({ where: { key: '-o' }, what: `-o ${output} is a folder`, fix: 'give a file name, e.g. -o simulation.csv' });
  }
}

function parseConstantInputs(model: Model, pairs: string[]): Float64Array {
  const u = new Float64Array(model.inputs.length);
  const problems: Problem[] = [];
  for (const pair of pairs) {
    const eq = pair.indexOf('=');
    const name = eq < 0 ? pair : pair.slice(0, eq).trim();
    const value = eq < 0 ? NaN : Number(pair.slice(eq + 1));
    const j = model.inputs.findIndex((i) => i.name === name);
    if (j < 0) {
      problems.push({ where: { key: `--input ${pair}` }, what: `"${name}" is not an input of model ${model.name}`, fix: model.inputs.length ? `inputs: ${model.inputs.map((i) => i.name).join(', ')}` : 'this model has no inputs' });
    } else if (eq < 0 || !pair.slice(eq + 1).trim() || !Number.isFinite(value)) {
      problems.push({ where: { key: `--input ${pair}` }, what: `--input needs name=value with a number, got "${pair}"`, fix: `write e.g. --input ${name}=1 (in ${model.inputs[j].unit || 'the input\'s unit'})` });
    } else u[j] = value;
  }
  if (problems.length) throw new UserError(problems);
  return u;
}

export function runSimulate(modelArg: string, options: Required<Pick<SimulateOptions, 'experiment' | 'set' | 'input'>> & SimulateOptions, ctx: CommandContext): number {
  const { io } = ctx;
  const overrides = parseOverrides(options.set);
  const model = loadModel(pathFromCwd(modelArg, io.cwd), { overrides });
  const compiled = compileModel(model);
  const paramsFile = options.params ? resolve(io.cwd, options.params) : undefined;
  const fromEstimates = paramsFile ? estimatedValues(paramsFile, overrides) : { values: {} as Record<string, number> };
  if (fromEstimates.sha && fromEstimates.sha !== model.sha256) {
    io.stderr(`rigcal: note: ${options.params} was fitted to a different version of ${model.fileAsGiven} (SHA-256 differs)\n`);
  }
  if (fromEstimates.note) io.stderr(`rigcal: note: ${fromEstimates.note}\n`);
  if (paramsFile) {
    // A free parameter the estimates do not hold (e.g. added to the model after the fit) runs at its start.
    const lacking = model.parameters
      .filter((q) => q.kind === 'free' && !q.perExperiment && !(q.name in fromEstimates.values) && !(q.name in overrides))
      .map((q) => q.name);
    if (lacking.length) io.stderr(`rigcal: note: ${options.params} has no estimate of ${lacking.join(', ')}; using the start value${lacking.length > 1 ? 's' : ''}\n`);
  }
  const outputPath = options.output ? resolve(io.cwd, options.output) : undefined;
  if (outputPath) refuseOverwritingInputs(outputPath, model, paramsFile);

  const runs: SimulatedExperiment[] = [];
  if (options.duration !== undefined) {
    if (options.experiment.length) {
      throw new UserError({ where: { key: '--duration' }, what: '--duration simulates without data and cannot be combined with -e', fix: 'drop -e, or drop --duration to simulate the experiment\'s log' });
    }
    if (model.isStatic) {
      throw new UserError({ where: { file: model.fileAsGiven }, what: 'a static model (no states) has no time to simulate over', fix: 'simulate it with an experiment\'s data instead of --duration' });
    }
    const duration = positiveNumber(options.duration, '--duration');
    const interval = options.interval !== undefined ? positiveNumber(options.interval, '--interval') : duration / 1000;
    if (duration / interval > 5_000_000) {
      throw new UserError({ where: { key: '--interval' }, what: `--duration ${duration} with --interval ${interval} would make ${Math.round(duration / interval)} rows`, fix: 'choose a longer --interval (at most 5,000,000 rows)' });
    }
    const u = parseConstantInputs(model, options.input);
    const p = parameterVector(compiled, -1, fromEstimates.values);
    runs.push({ result: simulateSpan(compiled, p, duration, u, interval) });
  } else {
    if (options.input.length || options.interval !== undefined) {
      throw new UserError({ where: { key: options.input.length ? '--input' : '--interval' }, what: '--input and --interval only go with --duration', fix: 'add --duration T, or drop them to simulate the experiments\' logs' });
    }
    const indices = selectExperiments(model, options.experiment);
    const problems: Problem[] = [];
    const loaded: { index: number; data: ExperimentData }[] = [];
    for (const index of indices) {
      try {
        loaded.push({ index, data: loadExperimentData(model, index) });
      } catch (err) {
        if (err instanceof UserError) problems.push(...err.problems);
        else throw err;
      }
    }
    if (problems.length) throw new UserError(problems);
    for (const { index, data } of loaded) {
      const p = parameterVector(compiled, index, fromEstimates.values);
      runs.push({ result: simulateExperiment(compiled, data, p), data });
    }
  }

  const csv = renderSimulationCsv(model, runs);
  const quality = renderQuality(model, runs);
  if (outputPath) {
    writeOutput(outputPath, options.output!, csv);
    io.stdout(`wrote ${options.output} (${runs.reduce((n, r) => n + r.result.time.length, 0)} rows)\n`);
    if (quality) io.stdout(quality);
  } else {
    io.stdout(csv);
    if (quality) io.stderr(quality);
  }
  return 0;
}

/** Writes the CSV whole or not at all; a folder that is missing or not writable is the user's to mend. */
function writeOutput(path: string, asGiven: string, csv: string): void {
  try {
    writeFileAtomic(path, csv);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'EACCES' || code === 'EPERM' || code === 'EROFS' || code === 'EISDIR' || code === 'ENOTDIR') {
      throw new UserError({ where: { key: '-o' }, what: `cannot write ${asGiven} (${code})`, fix: 'choose a file in a folder you may write to' });
    }
    throw err;
  }
}

function selectExperiments(model: Model, names: string[]): number[] {
  if (!model.experiments.length) {
    throw new UserError({ where: { file: model.fileAsGiven, key: 'experiments' }, what: 'the model has no experiments to simulate', fix: 'add an experiment with a data file, or simulate over a span with --duration T' });
  }
  if (!names.length) return model.experiments.map((_, k) => k);
  const all = model.experiments.map((e) => e.name);
  const problems: Problem[] = [];
  const indices: number[] = [];
  for (const name of names) {
    const k = all.indexOf(name);
    if (k < 0) problems.push({ where: { key: `-e ${name}` }, what: `model ${model.name} has no experiment "${name}"`, fix: `experiments: ${all.join(', ')}` });
    else if (!indices.includes(k)) indices.push(k);
  }
  if (problems.length) throw new UserError(problems);
  return indices;
}

/** Fit quality per experiment and measured output: samples, missing, RMSE (with unit), R^2. */
export function renderQuality(model: Model, runs: readonly SimulatedExperiment[]): string {
  const rows: string[][] = [];
  for (const { result, data } of runs) {
    if (!data) continue;
    model.outputs.forEach((o, j) => {
      const measured = data.outputs[j];
      if (!measured) return;
      const s = scoreSeries(measured, result.outputs[j]);
      rows.push([result.experiment, data.experiment.role, o.name, String(s.samples), String(data.missing[j]), withUnit(s.rmse, o.unit), formatNumber(s.r2, 5)]);
    });
  }
  if (!rows.length) return '';
  return `fit quality (measured - simulated)\n${plainTable(['experiment', 'role', 'output', 'samples', 'missing', 'RMSE', 'R^2'], rows)}\n`;
}
