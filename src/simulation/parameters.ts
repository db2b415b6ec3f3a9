/**
 * The parameter vector of one experiment, in slot order: declared values (fixed value or free
 * start), then the experiment's `set`, then `model.overrides` (the command line's --set), then
 * `values` (e.g. estimates). Keys are `name`, or `name@experiment` for the copy used in that
 * experiment only; a per-experiment parameter's slot holds the copy of the experiment simulated.
 */
import { ProblemList } from '../errors.js';
import type { CompiledModel } from '../model/compiled-types.js';
import { nearestNames } from '../presentation/nearest-names.js';

/** Split `name@experiment` into its parts (`experiment` undefined for a plain name). */
export function splitParameterKey(key: string): { name: string; experiment?: string } {
  const at = key.indexOf('@');
  return at < 0 ? { name: key } : { name: key.slice(0, at), experiment: key.slice(at + 1) };
}

/**
 * Values for experiment `experimentIndex` (or -1: no experiment, e.g. a simulation over a given
 * duration; then `name@experiment` keys are checked but not applied).
 */
export function parameterVector(compiled: CompiledModel, experimentIndex: number, values?: Record<string, number>): Float64Array {
  const model = compiled.model;
  const p = Float64Array.from(compiled.defaultParams());
  const exp = experimentIndex >= 0 ? model.experiments[experimentIndex] : undefined;
  if (experimentIndex >= 0 && !exp) throw new RangeError(`model has no experiment ${experimentIndex}`);
  const problems = new ProblemList();
  const paramNames = [...compiled.paramSlot.keys()];
  const experimentNames = model.experiments.map((e) => e.name);

  if (exp) {
    for (const [name, value] of Object.entries(exp.set)) {
      const slot = compiled.paramSlot.get(name);
      if (slot === undefined) {
        problems.add({ key: `experiments[${experimentIndex}].set.${name}` }, `"${name}" is not a parameter; nearest: ${nearestNames(name, paramNames).join(', ')}`, 'name a declared parameter');
      } else p[slot] = value;
    }
  }
  const apply = (source: Record<string, number>, label: string) => {
    for (const [key, value] of Object.entries(source)) {
      const { name, experiment } = splitParameterKey(key);
      const slot = compiled.paramSlot.get(name);
      if (slot === undefined) {
        problems.add({ key: `${label} ${key}` }, `"${name}" is not a parameter of model ${model.name}; nearest: ${nearestNames(name, paramNames).join(', ')}`, 'use a declared parameter name, or name@experiment for a per-experiment copy');
        continue;
      }
      if (experiment !== undefined && !experimentNames.includes(experiment)) {
        problems.add({ key: `${label} ${key}` }, `"${experiment}" is not an experiment of model ${model.name}; nearest: ${nearestNames(experiment, experimentNames).join(', ')}`, 'write name@experiment with the name of an experiment in the model file');
        continue;
      }
      if (typeof value !== 'number' || !Number.isFinite(value)) {
        problems.add({ key: `${label} ${key}` }, `the value of ${key} is not a finite number (${String(value)})`, 'give a number in the parameter\'s unit');
        continue;
      }
      if (experiment === undefined || (exp && experiment === exp.name)) p[slot] = value;
    }
  };
  // Plain names first, then name@experiment, so that the specific copy wins within one source.
  const ordered = (r: Record<string, number>) =>
    Object.fromEntries(Object.entries(r).sort(([a], [b]) => Number(a.includes('@')) - Number(b.includes('@'))));
  apply(ordered(model.overrides ?? {}), '--set');
  if (values) apply(ordered(values), 'parameter');
  problems.throwIfAny();
  return p;
}
