/**
 * Adapters from the pipeline's needs (fit-core.ts `FitDeps`) to the uncertainty, identifiability and
 * multistart modules, which speak the generic solver's language.
 */
import { computeUncertainty } from './uncertainty.js';
import { analyseIdentifiability } from './identifiability.js';
import type { IdentifiabilityInput, IdentifiabilityOutput, UncertaintyInput, UncertaintyOutput } from './fit-core.js';

export function uncertaintyOf(input: UncertaintyInput): UncertaintyOutput {
  const u = computeUncertainty({
    jacobian: input.jacobian,
    residuals: input.residuals,
    theta: input.theta,
    names: input.names,
    scales: input.scales,
    sigmaEstimated: input.sigmaEstimated,
    atBound: input.atBound,
    bounds: input.bounds,
    units: input.units,
  });
  return {
    stdError: u.parameters.map((p) => p.stdError),
    ci95: u.parameters.map((p) => p.ci95),
    correlation: u.correlation.matrix,
    warnings: u.warnings,
  };
}

export function identifiabilityOf(input: IdentifiabilityInput): IdentifiabilityOutput {
  const r = analyseIdentifiability({
    jacobian: input.jacobian,
    observations: input.jacobian.rows,
    names: input.names,
    theta: input.theta,
    scales: input.scales,
    correlation: input.correlation,
  });
  return { conditionNumber: r.conditionNumber, singularValues: r.singularValues, problems: r.problems, warnings: r.warnings };
}
