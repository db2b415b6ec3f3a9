/** fit.json: the whole FitResult, machine-readable (non-finite numbers become null: src/files/json.ts). */
import type { FitResult } from '../estimation/fit/fit-result.js';
import { toJson } from '../files/json.js';

export function renderFitJson(fit: FitResult): string {
  return toJson(fit);
}
