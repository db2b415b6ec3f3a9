/** The record of one fit (fit.json) from what its stages produced. */
import { TOOL, VERSION } from '../../version.js';
import type { Estimates } from './estimates-stage.js';
import type { FitResult, FitStatistics, OutputResult } from './fit-result.js';
import type { FitSetup } from './fit-setup.js';
import type { SolvedFit } from './solve-stage.js';

export function assembleResult(setup: FitSetup, solved: SolvedFit, estimates: Estimates, statistics: FitStatistics, outputs: OutputResult[], warnings: string[]): FitResult {
  const { model, data, problem } = setup;
  const { run } = solved;
  const ident = estimates.identifiability;
  const noiseRounds = solved.rounds > 1 ? `; noise levels settled after ${solved.rounds} fits` : '';
  return {
    tool: TOOL,
    version: VERSION,
    format: 1,
    model: { name: model.name, file: model.fileAsGiven, sha256: model.sha256, ...(model.description ? { description: model.description } : {}) },
    timeUnit: model.timeUnit,
    experiments: data.map((d) => ({ name: d.experiment.name, role: d.experiment.role, file: d.experiment.fileAsWritten, sha256: d.sha256, rows: d.time.length })),
    status: run.status,
    message: run.message + noiseRounds,
    stopReason: run.reason,
    solver: setup.solver.regime,
    iterations: solved.iterations,
    simulations: problem.counters.simulations,
    sensitivitySimulations: problem.counters.sensitivitySimulations,
    wallSeconds: 0,
    ...(solved.starts ? { starts: solved.starts } : {}),
    parameters: estimates.parameters,
    correlation: { names: problem.entries.map((e) => e.name), matrix: estimates.uncertainty.correlation.matrix },
    statistics,
    outputs,
    identifiability: { conditionNumber: ident.conditionNumber, singularValues: ident.singularValues, problems: ident.problems },
    warnings,
    provenance: {
      modelFile: model.fileAsGiven,
      modelSha256: model.sha256,
      dataFiles: data.map((d) => ({ experiment: d.experiment.name, file: d.experiment.fileAsWritten, sha256: d.sha256 })),
      toolVersion: VERSION,
      date: new Date().toISOString(),
      overrides: { ...model.overrides },
    },
  };
}
