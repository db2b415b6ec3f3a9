/**
 * Simulation entry points: one experiment with its log, or a span with constant inputs and no data.
 * Results are plain objects (SimulationResult); nothing here prints or reads files.
 */
import { UserError } from '../errors.js';
import type { CompiledModel } from '../model/compiled-types.js';
import type { ExperimentData } from '../data/types.js';
import { nearestNames } from '../presentation/nearest-names.js';
import { integrate } from './integrate.js';
import { resultOrThrow } from './outcome.js';
import { evaluateStatic } from './static-model.js';
import type { SimulationInputs, SimulationOptions, SimulationOutcome, SimulationResult } from './types.js';

function run(compiled: CompiledModel, drive: SimulationInputs, p: Float64Array, options?: SimulationOptions): SimulationOutcome {
  if (p.length !== compiled.nParams) throw new RangeError(`parameter vector has ${p.length} entries, the model ${compiled.nParams}`);
  return compiled.nStates === 0 ? evaluateStatic(compiled, drive, p, options) : integrate(compiled, drive, p, options);
}

/**
 * Simulate one experiment at its sample times, from `data.start` with the experiment's initial
 * states. With `options.sensitivitySlots`, also the output sensitivities.
 * A simulation that cannot finish answers `{ ok: false, failure }` (words with time, experiment and
 * parameter values, and details); it throws only for a bug (e.g. a parameter vector of the wrong length).
 */
export function trySimulateExperiment(compiled: CompiledModel, data: ExperimentData, p: Float64Array, options?: SimulationOptions): SimulationOutcome {
  return run(compiled, { name: data.experiment.name, experimentIndex: data.index, time: data.time, start: data.start, inputs: data.inputs }, p, options);
}

/** trySimulateExperiment for callers that want the result or a thrown RunFailure (the CLI's simulate). */
export function simulateExperiment(compiled: CompiledModel, data: ExperimentData, p: Float64Array, options?: SimulationOptions): SimulationResult {
  return resultOrThrow(trySimulateExperiment(compiled, data, p, options));
}

/**
 * Simulate from t = 0 over `duration` (model time units) with constant inputs (by input name, or
 * in input order), sampled every `sampleInterval`; for `simulate --duration` without data.
 * Initial states are the declared ones (experiment index -1: no experiment's overrides).
 * Throws UserError for a bad request and RunFailure when the simulation cannot finish.
 */
export function simulateSpan(
  compiled: CompiledModel,
  p: Float64Array,
  duration: number,
  constantInputs: Readonly<Record<string, number>> | ArrayLike<number>,
  sampleInterval: number,
  options?: SimulationOptions,
): SimulationResult {
  const model = compiled.model;
  if (!(duration > 0) || !Number.isFinite(duration)) {
    throw new UserError({ where: { key: '--duration' }, what: `the duration must be a positive number of ${model.timeUnit}, not ${duration}`, fix: 'give e.g. --duration 10' });
  }
  if (!(sampleInterval > 0) || !Number.isFinite(sampleInterval)) {
    throw new UserError({ where: { key: 'sample interval' }, what: `the sample interval must be a positive number of ${model.timeUnit}, not ${sampleInterval}` });
  }
  const count = Math.floor(duration / sampleInterval + 1e-9) + 1;
  if (count > 5_000_000) {
    throw new UserError({ where: { key: 'sample interval' }, what: `${count} samples requested (duration ${duration} / interval ${sampleInterval} ${model.timeUnit}); at most 5000000`, fix: 'use a longer sample interval' });
  }
  const values = new Array<number>(compiled.nInputs);
  if (isArrayLike(constantInputs)) {
    if (constantInputs.length !== compiled.nInputs) throw new RangeError(`expected ${compiled.nInputs} input values, got ${constantInputs.length}`);
    for (let j = 0; j < compiled.nInputs; j++) values[j] = constantInputs[j];
  } else {
    const names = model.inputs.map((i) => i.name);
    for (const key of Object.keys(constantInputs)) {
      if (!names.includes(key)) throw new UserError({ where: { key: `input ${key}` }, what: `"${key}" is not an input of model ${model.name}; nearest: ${nearestNames(key, names).join(', ')}` });
    }
    const lacking = names.filter((n) => constantInputs[n] === undefined);
    if (lacking.length) throw new UserError({ where: { key: 'inputs' }, what: `no value for input${lacking.length > 1 ? 's' : ''} ${lacking.join(', ')}`, fix: 'give a constant value for every input when simulating without data' });
    names.forEach((n, j) => (values[j] = constantInputs[n]));
  }
  for (let j = 0; j < values.length; j++) {
    if (!Number.isFinite(values[j])) throw new UserError({ where: { key: `input ${model.inputs[j].name}` }, what: `the value of input ${model.inputs[j].name} is not a finite number` });
  }
  const time = new Float64Array(count);
  for (let i = 0; i < count; i++) time[i] = i * sampleInterval;
  const inputs = values.map((v) => new Float64Array(count).fill(v));
  return resultOrThrow(run(compiled, { name: 'span', experimentIndex: -1, time, start: 0, inputs }, p, options));
}

function isArrayLike(v: unknown): v is ArrayLike<number> {
  return Array.isArray(v) || ArrayBuffer.isView(v);
}
