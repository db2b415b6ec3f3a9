/** `validate`: a calibrated model scored on data it was not fitted to. */
export { validateModel } from './validate-model.js';
export type { ValidateOptions, ValidateOutcome } from './validate-model.js';
export type { ValidationData, ValidationOutputScore, ValidationResult } from './validation-result.js';
