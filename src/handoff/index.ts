/** Hand-off to a simulation team: `freeze` (a calibrated copy of the model, or the parameter table). */
export { freezeModel, prepareFreeze } from './freeze.js';
export type { FreezeFormat, FreezeOptions, FreezeOutcome } from './freeze.js';
export { freezeModelText } from './freeze-document.js';
export type { FreezeDocumentOptions, FreezeSummary } from './freeze-document.js';
export { parameterTable, parameterTableCsv, parameterTableJson, PARAMETER_TABLE_COLUMNS } from './parameter-table.js';
export type { ParameterTableRow } from './parameter-table.js';
