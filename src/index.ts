/**
 * The rigcal library: the same powers as the CLI, without printing or exiting.
 *
 *   const model = loadModel('models/flywheel.yaml');
 *   const { result, residuals, values } = fitModel(model, { starts: 4, seed: 1 });
 *   await writeResults('flywheel-fit', { result, residuals, values }, ...);
 *
 * Problem, solver, result: a loaded model is plain data; simulation and estimation are functions
 * of it; results are plain objects that the report functions render.
 */
export * from './errors.js';
export * from './version.js';

// The model language: loading (checked, with every problem located) and compiling.
export type * from './model/types.js';
export type * from './model/compiled-types.js';
export { loadModel, parseOverrides } from './model/load/index.js';
export type { LoadOptions } from './model/load/index.js';
export { compileModel } from './model/compile/index.js';
export type { CompiledModelDetails, CompileOptions } from './model/compile/index.js';
export { unitConverter } from './units/convert.js';

// Data and simulation.
export type * from './data/types.js';
export type * from './simulation/types.js';
export { loadExperimentData } from './data/index.js';
export { parameterVector, simulateExperiment, simulateSpan } from './simulation/index.js';

// Estimation.
export type * from './estimation/fit/fit-result.js';
export type * from './estimation/fit/fit-options.js';
export type * from './diagnostics/types.js';
export { fitModel, fitLoaded, loadAllData } from './estimation/fit/fit-model.js';
export { realCollaborators } from './estimation/fit/collaborators.js';
export type { FitCollaborators } from './estimation/fit/collaborators.js';
export { solveLeastSquares, SOLVER_DEFAULTS } from './estimation/solver/index.js';
export { computeUncertainty } from './estimation/uncertainty.js';
export { analyseIdentifiability } from './estimation/identifiability.js';
export { runMultistart } from './estimation/multistart.js';
export { gaussianLogLikelihood, aic, aicc, bic, akaikeWeights, likelihoodRatioTest } from './estimation/information-criteria.js';

// Diagnostics and reports.
export { residualDiagnostics, scoreSeries, ljungBox, autocorrelation, crossCorrelation } from './diagnostics/index.js';
export { renderFitReport, readResultsFolder } from './reports/html/index.js';
export { writeResults } from './reports/write-results.js';

// Files in and out: estimates.yaml and whether it belongs to a model version, results folders.
export { readEstimates, checkModelVersion } from './files/estimates-file.js';
export type { EstimatesFile, EstimateEntry, ModelVersionMismatch } from './files/estimates-file.js';
export { defaultResultsFolder, FIT_FOLDER, VALIDATION_FOLDER } from './files/results-folder.js';
export type { ResultsFolderKind } from './files/results-folder.js';

// Validation, ranking and hand-off.
export { validateModel } from './validation/index.js';
export { rankFits } from './comparison/index.js';
export { parameterTable } from './handoff/index.js';

// The commands as verbs: plain options in, a plain result out (what the CLI calls).
export * from './verbs/index.js';
// The names these verbs had before they were gathered in src/verbs.
export { runRank as rankModels, runFreeze as freezeModel } from './verbs/index.js';
