/** What `validate` prints: a table for the terminal (its results folder: validation-folder.ts). */
import { formatNumber } from '../reports/summary-table.js';
import type { ValidationResult } from './validation-result.js';

export function validationText(result: ValidationResult): string {
  const header = ['experiment', 'output', 'samples', 'RMSE', 'NRMSE', 'R^2', 'residuals'];
  const rows = result.outputs.map((o) => [
    o.experiment,
    o.output,
    String(o.samples) + (o.missing ? ` (${o.missing} missing)` : ''),
    `${show(o.rmse)}${o.unit ? ' ' + o.unit : ''}`,
    show(o.nrmse, 3),
    show(o.r2, 4),
    o.whiteness ? (o.whiteness.white ? 'white' : 'not white') : 'not judged',
  ]);
  const widths = header.map((h, j) => Math.max(h.length, ...rows.map((r) => r[j].length)));
  const line = (cells: string[]) => cells.map((c, j) => (j < 2 || j === 6 ? c.padEnd(widths[j]) : c.padStart(widths[j]))).join('  ').trimEnd();
  const lines = [
    `Validation of ${result.model.name} with ${result.estimates.file} (never fitted to these data):`,
    line(header),
    widths.map((w) => '-'.repeat(w)).join('  '),
    ...rows.map(line),
    '',
    'NRMSE: RMSE over the standard deviation of the measurement (0 perfect, 1 no better than the mean).',
  ];
  for (const o of result.outputs) lines.push(`${o.experiment}/${o.output}: ${o.verdict}`);
  for (const w of result.warnings) lines.push(`warning: ${w}`);
  return `${lines.join('\n')}\n`;
}

/** Four significant digits, exponent form outside [1e-3, 1e6) (as the fit summary prints). */
function show(v: number, digits = 4): string {
  return formatNumber(v, digits);
}
