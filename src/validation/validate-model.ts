/**
 * What `validate` computes (the verb, which also writes the results folder: src/verbs/validate.ts): simulate a calibrated model (model file + estimates.yaml) on
 * data it was not fitted to and score it: per output RMSE, NRMSE, R^2 and the whiteness of the
 * residuals. Nothing is fitted here.
 */
import path from 'node:path';
import { UserError, type Problem } from '../errors.js';
import { residualDiagnostics, scoreSeries } from '../diagnostics/index.js';
import type { ResidualSeries } from '../diagnostics/types.js';
import { loadExperimentData } from '../data/load-experiment.js';
import { nearestNames } from '../presentation/nearest-names.js';
import { constantOutputWarning, withUnit } from '../presentation/index.js';
import { compileModel } from '../model/compile/index.js';
import { loadModel } from '../model/load/index.js';
import type { Model } from '../model/types.js';
import { checkDataVersions, checkModelVersion, readEstimates, type EstimatesFile } from '../files/estimates-file.js';
import { parameterVector } from '../simulation/parameters.js';
import { parseUnit } from '../units/registry.js';
import { simulateExperiment } from '../simulation/simulate.js';
import { VERSION } from '../version.js';
import { withNewLog } from './new-log-experiment.js';
import type { DataChange, ValidationData, ValidationOutputScore, ValidationResult } from './validation-result.js';

export interface ValidateOptions {
  modelFile: string;
  estimatesFile: string;
  /** Experiments of the model file to score (any role). */
  experiments?: string[];
  /** A new log (CSV) read with the model's columns. */
  dataFile?: string;
  /** Unit of the new log's time column (default: that of the model's first experiment). */
  dataTimeUnit?: string;
  /** `--set name=value` values (win over the estimates, e.g. a per-experiment initial value of a new log). */
  overrides?: Record<string, number>;
  /** Validate even when the estimates were made for another version of the model file or of a data file. */
  force?: boolean;
  cwd?: string;
  date?: string;
}

export interface ValidateOutcome {
  result: ValidationResult;
  series: ResidualSeries[];
  /** Noise level per output from the estimates (for the report, beside the RMSE). */
  noise: Record<string, { sigma: number; estimated: boolean }>;
}

export function validateModel(options: ValidateOptions): ValidateOutcome {
  const cwd = options.cwd ?? process.cwd();
  const loaded = loadModel(path.resolve(cwd, options.modelFile), { overrides: options.overrides });
  const estimates = readEstimates(path.resolve(cwd, options.estimatesFile));
  const warnings: string[] = [];
  const dataChanges = checkVersions(estimates, loaded, options, warnings);
  const { model: calibrated, values } = applyEstimates(loaded, estimates, options.estimatesFile, warnings);

  const { model, indices } = chooseExperiments(calibrated, options, cwd);

  const compiled = compileModel(model);
  const series: ResidualSeries[] = [];
  const outputs: ValidationOutputScore[] = [];
  const data: ValidationData[] = [];
  const used: Record<string, number> = {};
  for (const index of indices) {
    const exp = model.experiments[index];
    const d = loadExperimentData(model, index);
    const isNew = options.dataFile !== undefined;
    const inSample = !isNew && wasFitted(estimates, exp.name, exp.role);
    data.push({ experiment: exp.name, source: isNew ? 'new log' : exp.role, inSample, file: exp.fileAsWritten, sha256: d.sha256, rows: d.time.length });
    noteStartValues(model, exp.name, values, options.overrides ?? {}, warnings);
    const p = parameterVector(compiled, index, { ...values, ...(options.overrides ?? {}) });
    for (const spec of model.parameters) {
      const slot = compiled.paramSlot.get(spec.name);
      if (slot === undefined) continue;
      used[spec.kind === 'free' && spec.perExperiment ? `${spec.name}@${exp.name}` : spec.name] = p[slot];
    }
    const sim = simulateExperiment(compiled, d, p);
    model.outputs.forEach((o, j) => {
      const measured = d.outputs[j];
      if (!measured) return;
      const s: ResidualSeries = { experiment: exp.name, role: inSample ? 'fit' : 'validation', output: o.name, unit: o.unit, time: d.time, measured, simulated: sim.outputs[j] };
      series.push(s);
      const score = scoreSeries(measured, sim.outputs[j]);
      if (score.constantValue !== undefined) warnings.push(constantOutputWarning(o.name, exp.name, withUnit(score.constantValue, o.unit)));
      const diag = residualDiagnostics(s, model.inputs.map((inp, k) => ({ name: inp.name, values: d.inputs[k] })), { timeUnit: model.isStatic ? undefined : model.timeUnit });
      outputs.push({
        experiment: exp.name,
        output: o.name,
        unit: o.unit,
        samples: score.samples,
        missing: score.missing,
        rmse: score.rmse,
        nrmse: score.nrmse,
        r2: score.r2,
        inSample,
        whiteness: diag.whiteness,
        verdict: diag.verdict,
        correlatedUpTo: diag.correlatedUpTo,
      });
    });
    if (!model.outputs.some((_, j) => d.outputs[j])) warnings.push(`experiment ${exp.name} logs none of the model's outputs: nothing to score`);
  }
  if (estimates.fit.status && estimates.fit.status !== 'converged') {
    warnings.push(`the fit behind these estimates ended with status "${estimates.fit.status}"`);
  }

  const result: ValidationResult = {
    tool: 'rigcal',
    version: VERSION,
    kind: 'validation',
    date: options.date ?? new Date().toISOString(),
    model: { name: model.name, file: options.modelFile, sha256: loaded.sha256 },
    estimates: { file: options.estimatesFile, modelSha256: estimates.model.sha256, fitDate: estimates.fit.date, fitStatus: estimates.fit.status },
    timeUnit: model.timeUnit,
    isStatic: model.isStatic,
    data,
    outputs,
    parameters: used,
    warnings,
  };
  if (dataChanges.length) result.dataChanges = dataChanges;
  const noise = Object.fromEntries(Object.entries(estimates.noise).map(([k, v]) => [k, { sigma: v.sigma, estimated: v.estimated }]));
  return { result, series, noise };
}

/**
 * The estimates must belong to this model file and to the data files as they are now; a mismatch
 * accepted with --force becomes a warning, and each changed data file is returned with both hashes.
 */
function checkVersions(estimates: EstimatesFile, model: Model, options: ValidateOptions, warnings: string[]): DataChange[] {
  const mismatch = checkModelVersion(estimates, model, { estimatesLabel: options.estimatesFile, modelLabel: options.modelFile, force: options.force });
  if (mismatch) warnings.push(`${mismatch.warning}; validated anyway because of --force`);
  const changed = checkDataVersions(estimates, model, { estimatesLabel: options.estimatesFile, force: options.force });
  for (const c of changed) warnings.push(`${c.warning}; validated anyway because of --force`);
  return changed.map((c) => ({ experiment: c.experiment, file: c.file, recordedSha256: c.recorded, currentSha256: c.current }));
}

/**
 * Whether the estimates were fitted to an experiment: by the record of the fit in estimates.yaml
 * (each data file with its role), or by the model file's role when the record has none.
 */
function wasFitted(estimates: EstimatesFile, experiment: string, role: 'fit' | 'validation'): boolean {
  const recorded = estimates.data.find((d) => d.experiment === experiment);
  return recorded ? recorded.role === 'fit' : role === 'fit';
}

/** Which experiments to score: named ones, a new log (added to a copy of the model), or every validation experiment. */
function chooseExperiments(calibrated: Model, options: ValidateOptions, cwd: string): { model: Model; indices: number[] } {
  if (options.dataTimeUnit !== undefined && !options.dataFile) {
    throw new UserError({ where: { key: '--time-unit' }, what: '--time-unit applies to a new log given with --data only', fix: 'drop --time-unit, or give --data FILE.csv' });
  }
  if (options.dataTimeUnit !== undefined && !parseUnit(options.dataTimeUnit)) {
    throw new UserError({ where: { key: '--time-unit' }, what: `"${options.dataTimeUnit}" is not a unit rigcal knows`, fix: 'e.g. --time-unit ms' });
  }
  if (options.dataFile && options.experiments?.length) {
    throw new UserError({ where: { key: '--data' }, what: 'give either -e NAME or --data FILE, not both', fix: 'run validate once per choice' });
  }
  if (options.dataFile) {
    const extended = withNewLog(calibrated, options.dataFile, cwd, options.dataTimeUnit);
    return { model: extended.model, indices: [extended.index] };
  }
  if (options.experiments?.length) {
    const names = calibrated.experiments.map((e) => e.name);
    const problems: Problem[] = [];
    const indices: number[] = [];
    for (const name of options.experiments) {
      const i = names.indexOf(name);
      if (i < 0) problems.push({ where: { file: options.modelFile, key: 'experiments' }, what: `has no experiment "${name}"`, fix: `name one of: ${nearestNames(name, names).join(', ') || names.join(', ')}` });
      else indices.push(i);
    }
    if (problems.length) throw new UserError(problems);
    return { model: calibrated, indices };
  }
  const indices = calibrated.experiments.flatMap((e, i) => (e.role === 'validation' ? [i] : []));
  if (!indices.length) {
    throw new UserError({
      where: { file: options.modelFile, key: 'experiments' },
      what: 'has no experiment with `role: validation`',
      fix: 'name an experiment with -e NAME, or give a new log with --data FILE.csv',
    });
  }
  return { model: calibrated, indices };
}

/**
 * The estimated values to pass to the parameter vector, and a copy of the model whose fixed values
 * are those the fit used (a `--set` at fit time changes a fixed value in estimates.yaml). Only
 * estimated values go through `values`: a fixed value there would override an experiment's `set`.
 */
function applyEstimates(model: Model, estimates: EstimatesFile, label: string, warnings: string[]): { model: Model; values: Record<string, number> } {
  const values: Record<string, number> = {};
  const problems: Problem[] = [];
  const fitExperiments = model.experiments.filter((e) => e.role === 'fit').map((e) => e.name);
  const parameters = model.parameters.map((spec) => {
    const entry = estimates.parameters[spec.name];
    if (spec.kind === 'fixed') {
      if (entry && entry.status === 'fixed' && entry.value !== spec.value && !(spec.name in model.overrides)) {
        warnings.push(`${spec.name}: the fit used ${entry.value}${spec.unit ? ' ' + spec.unit : ''}, the model file says ${spec.value}; using the fit's value`);
        return { ...spec, value: entry.value };
      }
      return spec;
    }
    if (spec.perExperiment) {
      for (const e of fitExperiments) {
        const copy = estimates.parameters[`${spec.name}@${e}`];
        if (copy) values[`${spec.name}@${e}`] = copy.value;
        else problems.push({ where: { file: label, key: `parameters.${spec.name}@${e}` }, what: `is missing: the model declares ${spec.name} free per experiment`, fix: 'use the estimates.yaml of a fit of this model' });
      }
    } else if (entry) {
      values[spec.name] = entry.value;
    } else {
      problems.push({ where: { file: label, key: `parameters.${spec.name}` }, what: `is missing: the model declares ${spec.name} free`, fix: 'use the estimates.yaml of a fit of this model' });
    }
    return spec;
  });
  if (problems.length) throw new UserError(problems);
  return { model: { ...model, parameters }, values };
}

function noteStartValues(model: Model, experiment: string, values: Record<string, number>, overrides: Record<string, number>, warnings: string[]): void {
  for (const spec of model.parameters) {
    if (spec.kind !== 'free' || !spec.perExperiment) continue;
    const key = `${spec.name}@${experiment}`;
    if (key in values || key in overrides || spec.name in overrides) continue;
    warnings.push(
      `${spec.name} is estimated per experiment and ${experiment} has no estimate of its own: its start value ${spec.start}${spec.unit ? ' ' + spec.unit : ''} is used (give --set ${spec.name}=VALUE if it is known)`,
    );
  }
}
