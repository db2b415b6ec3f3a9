/**
 * The commands' work as library verbs: each takes plain options and returns a plain result; none
 * prints or exits. The CLI (src/cli/commands) parses, calls one of these and renders its result.
 */
export { runCheck } from './check.js';
export type { CheckOptions, CheckResult } from './check.js';
export { runSimulate } from './simulate.js';
export type { SimulateOptions, SimulateResult } from './simulate.js';
export { runFit } from './fit.js';
export type { FitRunOptions, FitRunResult } from './fit.js';
export { runValidate } from './validate.js';
export type { ValidateRunOptions, ValidateRunResult } from './validate.js';
export { runRank } from './rank.js';
export type { RankOptions, RankOutcome } from './rank.js';
export { runFreeze, prepareFreeze } from './freeze.js';
export type { FreezeFormat, FreezeOptions, FreezeOutcome } from './freeze.js';
export { runReport } from './report.js';
export type { ReportOptions, WrittenReport } from './report.js';
