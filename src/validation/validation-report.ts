/** What `validate` prints: a table for the terminal (its results folder: validation-folder.ts). */
import { formatNumber, printableLines, textTable, whitenessLabel, withUnit } from '../presentation/index.js';
import type { ValidationResult } from './validation-result.js';

export function validationText(result: ValidationResult): string {
  const header = ['experiment', 'output', 'samples', 'RMSE', 'NRMSE', 'R^2', 'residuals'];
  const rows = result.outputs.map((o) => [
    o.experiment,
    o.output,
    String(o.samples) + (o.missing ? ` (${o.missing} missing)` : ''),
    withUnit(o.rmse, o.unit),
    formatNumber(o.nrmse, 3),
    formatNumber(o.r2, 4),
    whitenessLabel(o.whiteness),
  ]);
  const lines = [
    `Validation of ${result.model.name} with ${result.estimates.file} ${sampleClause(result)}:`,
    // Names and the verdict to the left, numbers to the right.
    textTable(header, rows, { rightAligned: [2, 3, 4, 5] }),
    '',
    'NRMSE: RMSE over the standard deviation of the measurement (0 perfect, 1 no better than the mean).',
  ];
  for (const o of result.outputs) lines.push(`${o.experiment}/${o.output}: ${o.verdict}`);
  for (const w of result.warnings) lines.push(`warning: ${w}`);
  return printableLines(`${lines.join('\n')}\n`);
}

/**
 * What the scores are: on data the estimates never saw, or in-sample (an experiment the estimates
 * were fitted to), which says how well the fit matched, not how well the model predicts.
 */
export function sampleClause(result: ValidationResult): string {
  const fitted = result.data.filter((d) => d.inSample).map((d) => d.experiment);
  const unseen = result.data.filter((d) => !d.inSample).map((d) => d.experiment);
  if (!fitted.length) return '(never fitted to these data)';
  const inSample = `(IN-SAMPLE score on ${fitted.join(', ')}: the estimates were fitted to these data, so this shows how well the fit matched them, not how well the model predicts new data`;
  return unseen.length ? `${inSample}; never fitted to ${unseen.join(', ')})` : `${inSample})`;
}
