/** Hand-off to a simulation team: the calibrated copy of the model, or the parameter table (the verb: src/verbs/freeze.ts). */
export type { FreezeDocumentOptions, FreezeSummary } from './freeze-document.js';
export { parameterTable } from './parameter-table.js';
export type { ParameterTableRow } from './parameter-table.js';
