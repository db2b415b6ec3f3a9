/**
 * `rigcal simulate` as a library verb: integrate the model for its experiments (their inputs and
 * time stamps) or over a given span without data, and write the CSV of cli-and-results.md (whole or
 * not at all) when an output file is given.
 *
 * Parameter values: declared (fixed value, free start), then the experiment's `set`, then the
 * estimates file (estimated values only), then `overrides` (win over everything).
 */
import { existsSync, statSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { UserError, type Problem } from '../errors.js';
import type { ExperimentData } from '../data/types.js';
import { loadExperimentData } from '../data/load-experiment.js';
import { writeFileAtomic } from '../files/atomic-file.js';
import { assertReplaceableFile, firstLine } from '../files/own-output.js';
import { checkModelVersion, readEstimates } from '../files/estimates-file.js';
import { inputsOfRun, refuseOverwritingInputs } from '../files/input-guard.js';
import { pathFromCwd } from '../files/paths.js';
import { compileModel } from '../model/compile/index.js';
import type { CompiledModel } from '../model/compiled-types.js';
import { loadModel } from '../model/load/index.js';
import type { Model } from '../model/types.js';
import { renderSimulationCsv, type SimulatedExperiment } from '../reports/simulation-csv.js';
import { parameterVector, splitParameterKey } from '../simulation/parameters.js';
import { simulateExperiment, simulateSpan } from '../simulation/index.js';

export interface SimulateOptions {
  modelFile: string;
  cwd?: string;
  /** Experiments to simulate (default: all). */
  experiments?: string[];
  /** Parameter values for this run, in each parameter's unit (`name` or `name@experiment`). */
  overrides?: Record<string, number>;
  /** estimates.yaml of `fit`: its estimated values are used. */
  estimatesFile?: string;
  /** CSV file to write; omitted: nothing is written (the CSV is in the result). */
  output?: string;
  /** Replace `output` even when it is not a simulation CSV of ours for this model. */
  overwrite?: boolean;
  /**
   * Simulate from t = 0 over this span (model time unit) without data, rows `interval` apart
   * (default duration / 1000). A number, or the text given on the command line (checked here).
   */
  duration?: number | string;
  interval?: number | string;
  /** With `duration`: constant inputs as `name=value` in the input's unit (default 0). */
  inputs?: string[];
  /** Notes for the user (a model version that differs, a missing estimate), as soon as they arise. */
  onNote?: (note: string) => void;
}

export interface SimulateResult {
  model: Model;
  runs: SimulatedExperiment[];
  /** The CSV text (written to `output` when given). */
  csv: string;
  rows: number;
  /** Absolute path of the CSV written, when `output` was given. */
  written?: string;
  notes: string[];
}

export function runSimulate(options: SimulateOptions): SimulateResult {
  const cwd = options.cwd ?? process.cwd();
  const overrides = options.overrides ?? {};
  const model = loadModel(pathFromCwd(options.modelFile, cwd), { overrides });
  const compiled = compileModel(model);
  const notes: string[] = [];
  const note = (text: string) => {
    notes.push(text);
    options.onNote?.(text);
  };
  const paramsFile = options.estimatesFile ? resolve(cwd, options.estimatesFile) : undefined;
  const values = paramsFile ? estimatedValues(paramsFile, options.estimatesFile!, model, overrides, note) : {};
  const outputPath = options.output ? resolve(cwd, options.output) : undefined;
  if (outputPath) checkOutput(outputPath, model, paramsFile);

  const runs = options.duration !== undefined ? [simulateWithoutData(model, compiled, options, values)] : simulateLogs(model, compiled, options, values);
  const csv = renderSimulationCsv(model, runs);
  if (outputPath) {
    assertReplaceableFile(outputPath, options.output!, options.overwrite, (head) => isSimulationCsvOf(model, head), `a simulation CSV of rigcal for model ${model.name}`);
    writeOutput(outputPath, options.output!, csv);
  }
  return { model, runs, csv, rows: runs.reduce((n, r) => n + r.result.time.length, 0), written: outputPath, notes };
}

/** Estimated values from estimates.yaml, minus those that overrides name (they win for this run). */
function estimatedValues(file: string, label: string, model: Model, overrides: Record<string, number>, note: (text: string) => void): Record<string, number> {
  const est = readEstimates(file);
  // A what-if like --set: estimates of another model version are used, and the user is told.
  const mismatch = checkModelVersion(est, model, { estimatesLabel: label, modelLabel: model.fileAsGiven, force: true });
  if (mismatch) note(mismatch.warning);
  if (est.fit.status !== 'converged') note(`the fit in ${file} ended with status ${est.fit.status}`);
  const values: Record<string, number> = {};
  for (const [key, entry] of Object.entries(est.parameters)) {
    // Fixed values come from the model file as it is now (and an experiment's `set`), not from the fit.
    if (entry.status !== 'estimated') continue;
    const { name } = splitParameterKey(key);
    if (key in overrides || name in overrides) continue;
    values[key] = entry.value;
  }
  // A free parameter the estimates do not hold (e.g. added to the model after the fit) runs at its start.
  const lacking = model.parameters.filter((q) => q.kind === 'free' && !q.perExperiment && !(q.name in values) && !(q.name in overrides)).map((q) => q.name);
  if (lacking.length) note(`${label} has no estimate of ${lacking.join(', ')}; using the start value${lacking.length > 1 ? 's' : ''}`);
  return values;
}

/** Checked before simulating, so that a long run does not end in a path mistake. */
function checkOutput(output: string, model: Model, paramsFile: string | undefined): void {
  const asOption = { file: output, where: { key: '-o' }, subject: `-o ${output}`, example: '-o simulation.csv' };
  refuseOverwritingInputs(asOption, inputsOfRun(model, paramsFile));
  const folder = dirname(output);
  if (!existsSync(folder) || !statSync(folder).isDirectory()) {
    throw new UserError({ where: { key: '-o' }, what: `cannot write ${output}: the folder ${folder} does not exist`, fix: 'create the folder first, or write the CSV elsewhere' });
  }
}

/** Parses a positive number (or the text given for it), naming the option when it is not one. */
function positiveNumber(given: number | string, option: string): number {
  const v = Number(given);
  if ((typeof given === 'string' && !given.trim()) || !Number.isFinite(v) || v <= 0) {
    throw new UserError({ where: { key: option }, what: `${option} must be a positive number, got "${given}"`, fix: `write e.g. ${option} 10 (in the model's time unit)` });
  }
  return v;
}

function simulateWithoutData(model: Model, compiled: CompiledModel, options: SimulateOptions, values: Record<string, number>): SimulatedExperiment {
  if (options.experiments?.length) {
    throw new UserError({ where: { key: '--duration' }, what: '--duration simulates without data and cannot be combined with -e', fix: 'drop -e, or drop --duration to simulate the experiment\'s log' });
  }
  if (model.isStatic) {
    throw new UserError({ where: { file: model.fileAsGiven }, what: 'a static model (no states) has no time to simulate over', fix: 'simulate it with an experiment\'s data instead of --duration' });
  }
  const duration = positiveNumber(options.duration!, '--duration');
  const interval = options.interval !== undefined ? positiveNumber(options.interval, '--interval') : duration / 1000;
  if (duration / interval > 5_000_000) {
    throw new UserError({ where: { key: '--interval' }, what: `--duration ${duration} with --interval ${interval} would make ${Math.round(duration / interval)} rows`, fix: 'choose a longer --interval (at most 5,000,000 rows)' });
  }
  const u = parseConstantInputs(model, options.inputs ?? []);
  const p = parameterVector(compiled, -1, values);
  return { result: simulateSpan(compiled, p, duration, u, interval) };
}

function simulateLogs(model: Model, compiled: CompiledModel, options: SimulateOptions, values: Record<string, number>): SimulatedExperiment[] {
  if (options.inputs?.length || options.interval !== undefined) {
    throw new UserError({ where: { key: options.inputs?.length ? '--input' : '--interval' }, what: '--input and --interval only go with --duration', fix: 'add --duration T, or drop them to simulate the experiments\' logs' });
  }
  const indices = selectExperiments(model, options.experiments ?? []);
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
  return loaded.map(({ index, data }) => ({ result: simulateExperiment(compiled, data, parameterVector(compiled, index, values)), data }));
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

/** A CSV that simulate wrote for this model: its header is experiment, time, then columns of the model's outputs and states. */
function isSimulationCsvOf(model: Model, head: string): boolean {
  const cells = firstLine(head).split(',');
  const known = new Set([...model.outputs.flatMap((o) => [o.name, `${o.name}_measured`]), ...model.states.map((s) => `${s.name}_state`)]);
  return cells[0] === 'experiment' && cells[1] === 'time' && cells.length > 2 && cells.slice(2).every((c) => known.has(c));
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
