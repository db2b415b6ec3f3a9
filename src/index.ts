/** The rigcal library: the same powers as the CLI, without printing or exiting. */
export * from './errors.js';
export * from './version.js';
export type * from './model/types.js';
export type * from './model/compiled-types.js';
export type * from './data/types.js';
export type * from './simulation/types.js';
export type * from './estimation/fit-result.js';
export type * from './estimation/fit-api.js';
export { fitModel, loadAllData } from './estimation/fit.js';
export { gaussianLogLikelihood, aic, aicc, bic, akaikeWeights, likelihoodRatioTest } from './estimation/information-criteria.js';
export { readEstimates } from './reports/read-estimates.js';
export type { EstimatesFile, EstimateEntry } from './reports/read-estimates.js';
export { writeResults, defaultResultsFolder } from './reports/write-results.js';
