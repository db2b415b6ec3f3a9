/**
 * Every experiment simulated at the estimates: fit experiments give the residual series, validation
 * experiments are scored on data the fit never saw. Each measured output gets its scores and, when
 * diagnostics are wired, its residual diagnosis.
 */
import type { ExperimentData } from '../../data/types.js';
import type { ResidualSeries } from '../../diagnostics/types.js';
import { scoreSeries } from '../../diagnostics/scores.js';
import { constantOutputWarning, withUnit } from '../../presentation/index.js';
import type { SimulationResult } from '../../simulation/types.js';
import type { OutputResult } from './fit-result.js';
import type { FitSetup } from './fit-setup.js';

export interface ScoredExperiments {
  residuals: ResidualSeries[];
  outputs: OutputResult[];
  /** Scores that need a word (a constant measurement has no R^2). */
  warnings: string[];
}

/** Scores of the fit experiments at the solver's last point (whose plain simulations the problem usually keeps). */
export function scoreFitExperiments(setup: FitSetup, theta: readonly number[]): ScoredExperiments {
  const scored: ScoredExperiments = { residuals: [], outputs: [], warnings: [] };
  const sims = setup.problem.simulateAll(theta);
  setup.fitData.forEach((d, i) => scoreExperiment(setup, d, sims[i], scored));
  return scored;
}

/**
 * Scores of the validation experiments, added to `scored`; returns the warnings. A validation
 * experiment has no copy of a per-experiment parameter: it keeps the start value, and says so.
 */
export function scoreValidationExperiments(setup: FitSetup, values: readonly number[], scored: ScoredExperiments): string[] {
  const { model, compiled, problem, collaborators } = setup;
  const warnings: string[] = [];
  const perExperiment = model.parameters.filter((s) => s.kind === 'free' && s.perExperiment).map((s) => s.name);
  const plural = perExperiment.length > 1;
  for (const d of setup.validationData) {
    const pv = collaborators.sim.parameterVector(compiled, d.index);
    problem.entries.forEach((e, i) => {
      if (e.fitIndex === undefined) pv[e.slot] = values[i];
    });
    if (perExperiment.length) {
      warnings.push(`validation experiment ${d.experiment.name} has no estimate of the per-experiment parameter${plural ? 's' : ''} ${perExperiment.join(', ')}; the start value${plural ? 's were' : ' was'} used`);
    }
    problem.counters.simulations++;
    const simulated = collaborators.sim.trySimulateExperiment(compiled, d, pv);
    if (simulated.ok) scoreExperiment(setup, d, simulated.result, scored);
    else warnings.push(`validation experiment ${d.experiment.name} could not be simulated at the estimates: ${simulated.failure.message}`);
  }
  return warnings;
}

function scoreExperiment(setup: FitSetup, d: ExperimentData, res: SimulationResult, scored: ScoredExperiments): void {
  const { model, problem, noise, collaborators } = setup;
  model.outputs.forEach((o, j) => {
    const meas = d.outputs[j];
    if (!meas) return;
    const series: ResidualSeries = { experiment: d.experiment.name, role: d.experiment.role, output: o.name, unit: o.unit, time: d.time, measured: meas, simulated: res.outputs[j] };
    scored.residuals.push(series);
    const q = scoreSeries(meas, res.outputs[j]);
    if (q.constantValue !== undefined) scored.warnings.push(constantOutputWarning(o.name, d.experiment.name, withUnit(q.constantValue, o.unit)));
    const row: OutputResult = {
      experiment: d.experiment.name,
      output: o.name,
      unit: o.unit,
      role: d.experiment.role,
      samples: q.samples,
      missing: d.missing[j],
      sigma: problem.sigmas[j],
      sigmaEstimated: noise.estimated[j],
      rmse: q.rmse,
      nrmse: q.nrmse,
      r2: q.r2,
    };
    if (collaborators.diagnostics) {
      const inputs = model.inputs.map((inp, i) => ({ name: inp.name, values: d.inputs[i] }));
      const diag = collaborators.diagnostics(series, inputs, model.timeUnit);
      if (diag.whiteness) row.whiteness = diag.whiteness;
      if (diag.autocorrelation) row.autocorrelation = diag.autocorrelation;
      if (diag.inputCorrelation) row.inputCorrelation = diag.inputCorrelation;
      if (diag.correlatedUpTo !== undefined) row.correlatedUpTo = diag.correlatedUpTo;
      row.verdict = diag.verdict;
    }
    scored.outputs.push(row);
  });
}
