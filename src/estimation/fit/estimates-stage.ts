/**
 * From the solver's optimum to the reported parameters: uncertainty and identifiability at the
 * optimum, then one row per parameter in model order (per-experiment copies in place of their
 * parameter), and the warnings of both in plain words.
 */
import type { IdentifiabilityResult } from '../identifiability.js';
import type { SolverResult } from '../solver/types.js';
import type { UncertaintyResult } from '../uncertainty.js';
import type { ParameterResult } from './fit-result.js';
import { anyNoiseEstimated, type FitSetup } from './fit-setup.js';

export interface Estimates {
  /** Per theta entry, in the parameters' own units. */
  values: number[];
  parameters: ParameterResult[];
  valueByName: Record<string, number>;
  uncertainty: UncertaintyResult;
  identifiability: IdentifiabilityResult;
  warnings: string[];
}

export function estimatesAt(setup: FitSetup, run: SolverResult): Estimates {
  const { problem, model, collaborators } = setup;
  const entries = problem.entries;
  const names = entries.map((e) => e.name);
  const scales = entries.map((e) => e.scale);
  const uncertainty = collaborators.uncertainty({
    jacobian: run.jacobian,
    residuals: run.residuals,
    theta: run.theta.slice(),
    names,
    scales,
    bounds: entries.map((e) => ({ min: e.min, max: e.max })),
    units: entries.map((e) => model.parameters.find((q) => q.name === e.parameter)!.unit),
    sigmaEstimated: anyNoiseEstimated(setup),
    atBound: run.atBound,
  });
  const identifiability = collaborators.identifiability({
    jacobian: run.jacobian,
    observations: run.jacobian.rows,
    theta: run.theta.slice(),
    names,
    scales,
    correlation: uncertainty.correlation.matrix,
  });
  const values = problem.valuesOf(run.theta);
  const rows = parameterRows(setup, run, values, uncertainty);
  return { values, ...rows, uncertainty, identifiability, warnings: estimateWarnings(setup, uncertainty, identifiability) };
}

function parameterRows(setup: FitSetup, run: SolverResult, values: number[], unc: UncertaintyResult): Pick<Estimates, 'parameters' | 'valueByName'> {
  const entries = setup.problem.entries;
  const parameters: ParameterResult[] = [];
  const valueByName: Record<string, number> = {};
  for (const spec of setup.model.parameters) {
    if (spec.kind === 'fixed') {
      parameters.push({ name: spec.name, parameter: spec.name, unit: spec.unit, status: 'fixed', estimate: spec.value });
      valueByName[spec.name] = spec.value;
      continue;
    }
    entries.forEach((e, k) => {
      if (e.parameter !== spec.name) return;
      const u = unc.parameters[k];
      const row: ParameterResult = {
        name: e.name,
        parameter: e.parameter,
        unit: spec.unit,
        status: 'free',
        estimate: values[k],
        stdError: u.stdError,
        ci95: u.ci95,
        min: e.min,
        max: e.max,
        start: e.start,
        scale: e.scale,
        atBound: run.atBound[k] ?? false,
      };
      if (e.experiment !== undefined) row.experiment = e.experiment;
      parameters.push(row);
      valueByName[e.name] = values[k];
    });
  }
  return { parameters, valueByName };
}

function estimateWarnings(setup: FitSetup, unc: UncertaintyResult, ident: IdentifiabilityResult): string[] {
  const warnings = [...unc.warnings];
  for (const p of ident.problems) warnings.push(p.message);
  for (const w of ident.warnings) if (!warnings.includes(w)) warnings.push(w);
  const entries = setup.problem.entries;
  const undetermined = entries.filter((_, k) => unc.parameters[k].stdError === null).map((e) => e.name);
  if (undetermined.length && setup.problem.nResiduals > entries.length) {
    const one = undetermined.length === 1;
    const list = one ? undetermined[0] : `${undetermined.slice(0, -1).join(', ')} and ${undetermined[undetermined.length - 1]}`;
    warnings.push(`no standard error or interval for ${list}: the data do not determine ${one ? 'it' : 'them'} separately; ${one ? 'its value is' : 'their values are'} one of many that fit equally well`);
  }
  return warnings;
}
