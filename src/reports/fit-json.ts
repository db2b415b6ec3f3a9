/** fit.json: the whole FitResult, machine-readable. Non-finite numbers become null (JSON has none). */
import type { FitResult } from '../estimation/fit/fit-result.js';

export function renderFitJson(fit: FitResult): string {
  return JSON.stringify(fit, (_key, value) => (typeof value === 'number' && !Number.isFinite(value) ? null : value), 2) + '\n';
}
