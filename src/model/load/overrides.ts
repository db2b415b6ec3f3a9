/**
 * `--set name=value` and `--set name@experiment=value`: values for one run, in the parameter's
 * unit. Plain overrides change the model (a fixed parameter's value, a free parameter's start);
 * `name@experiment` overrides stay in `model.overrides` for whoever builds the parameter vector.
 * An experiment's own `set` still applies to that experiment (it describes that test's rig).
 */
import { ProblemList, type SourceLocation } from '../../errors.js';
import type { ExperimentSpec, ParameterSpec } from '../types.js';
import { NAME_PATTERN } from '../expression-scan.js';
import { suggestion } from '../../presentation/nearest-names.js';
import { isDecimalText } from '../../util/decimal.js';

/** Parse `--set` pairs; one UserError naming every bad pair. */
export function parseOverrides(pairs: readonly string[]): Record<string, number> {
  const problems = new ProblemList();
  const out: Record<string, number> = {};
  for (const pair of pairs) {
    const where: SourceLocation = { key: `--set ${pair}` };
    const eq = pair.indexOf('=');
    if (eq < 0) {
      problems.add(where, `"${pair}" is not of the form name=value`, 'write e.g. --set K=0.05 or --set w0@coast-down=1.2');
      continue;
    }
    const target = pair.slice(0, eq).trim();
    const text = pair.slice(eq + 1).trim();
    const [name, experiment, extra] = target.split('@');
    if (!NAME_PATTERN.test(name ?? '') || extra !== undefined || (experiment !== undefined && experiment.trim() === '')) {
      problems.add(where, `"${target}" is not a parameter name (or name@experiment)`, 'write e.g. --set K=0.05 or --set w0@coast-down=1.2');
      continue;
    }
    if (!isDecimalText(text) || !Number.isFinite(Number(text))) {
      problems.add(where, `the value "${text}" is not a finite decimal number`, 'write a plain number in the parameter\'s unit, e.g. 0.05 or 3.1e-3');
      continue;
    }
    const key = experiment === undefined ? name : `${name}@${experiment}`;
    if (Object.hasOwn(out, key)) {
      problems.add(where, `${key} is given twice with --set`, 'give each parameter once');
      continue;
    }
    out[key] = Number(text);
  }
  problems.throwIfAny();
  return out;
}

/**
 * Check overrides against the model and apply the plain ones. Returns new parameter specs;
 * problems go to `problems`.
 */
export function applyOverrides(
  overrides: Readonly<Record<string, number>>,
  parameters: readonly ParameterSpec[],
  experiments: readonly ExperimentSpec[],
  otherNames: ReadonlyMap<string, string>,
  problems: ProblemList,
  /** Parameters declared but not loaded (their problems are reported already). */
  broken: ReadonlySet<string> = new Set(),
): ParameterSpec[] {
  const byName = new Map(parameters.map((p) => [p.name, p]));
  const result = new Map(byName);
  for (const [key, value] of Object.entries(overrides)) {
    const where: SourceLocation = { key: `--set ${key}=${value}` };
    const [name, experiment] = key.split('@');
    const p = byName.get(name);
    if (!p && broken.has(name)) continue;
    if (!p) {
      const kind = otherNames.get(name);
      problems.add(where, kind ? `--set names ${name}, which is a ${kind}, not a parameter` : `--set names "${name}", which is not a parameter of this model`,
        suggestion(name, [...byName.keys()], 'parameters'));
      continue;
    }
    if (experiment !== undefined) {
      // A fixed parameter may differ in one experiment (as that experiment's `set` would); a free
      // parameter only when it has a copy per experiment.
      if (p.kind === 'free' && !p.perExperiment) {
        problems.add(where, `${name}@${experiment}: ${name} is estimated once for all experiments, so it takes no value per experiment`, `write --set ${name}=${value}, or make it per_experiment: true`);
        continue;
      }
      if (!experiments.some((x) => x.name === experiment)) {
        problems.add(where, `${name}@${experiment}: there is no experiment "${experiment}"`, suggestion(experiment, experiments.map((x) => x.name), 'experiments'));
        continue;
      }
      if (p.kind === 'free' && (value < p.min || value > p.max)) {
        problems.add(where, `${key} = ${value} is outside the bounds of ${name} [${p.min}, ${p.max}]`, 'give a value within the bounds');
      }
      continue;
    }
    if (p.kind === 'fixed') {
      result.set(name, { ...p, value });
    } else if (value < p.min || value > p.max) {
      problems.add(where, `${name} = ${value} is outside its bounds [${p.min}, ${p.max}]`, 'give a start value within the bounds, or widen them in the model file');
    } else {
      result.set(name, { ...p, start: value });
    }
  }
  return parameters.map((p) => result.get(p.name)!);
}
