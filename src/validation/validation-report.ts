/**
 * What `validate` leaves behind: a table for the terminal and a small results folder
 * (validation.json, residuals.csv, and report.html when a renderer is given), written as a whole
 * through a temporary sibling folder and a rename. A folder that is not a validation folder of ours
 * is never replaced.
 */
import { existsSync, readFileSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { UserError } from '../errors.js';
import type { ResidualSeries } from '../estimation/fit-api.js';
import { renderResidualsCsv } from '../reports/residuals-csv.js';
import { formatNumber, textTable, whitenessLabel, withUnit } from '../presentation/index.js';
import { writeFolderAtomic, type FolderEntry } from '../util/atomic-write.js';
import type { ValidationResult } from './validation-result.js';

export const VALIDATION_FILES = ['validation.json', 'residuals.csv', 'report.html'] as const;

export function defaultValidationFolder(cwd: string, modelName: string): string {
  return path.resolve(cwd, `${modelName}-validate`);
}

export function writeValidationFolder(
  folder: string,
  result: ValidationResult,
  series: readonly ResidualSeries[],
  outputs: readonly string[],
  /** report.html, already rendered (rendering is asynchronous); omitted: no report. */
  reportHtml?: string,
): string {
  const target = path.resolve(folder);
  assertReplaceable(target);
  const files: Record<string, FolderEntry> = {
    'validation.json': () => `${JSON.stringify(result, jsonNumbers, 2)}\n`,
    'residuals.csv': () => renderResidualsCsv(series, outputs),
  };
  if (reportHtml !== undefined) files['report.html'] = reportHtml;
  writeFolderAtomic(target, files, () => true);
  return target;
}

/** NaN and infinities are not JSON: write null. */
function jsonNumbers(_key: string, value: unknown): unknown {
  return typeof value === 'number' && !Number.isFinite(value) ? null : value;
}

function assertReplaceable(folder: string): void {
  if (!existsSync(folder)) return;
  const fix = 'choose another folder with -o, or move that folder away';
  if (!statSync(folder).isDirectory()) throw new UserError({ where: { file: folder }, what: 'exists and is not a folder', fix });
  const entries = readdirSync(folder);
  let ours = false;
  try {
    const json = JSON.parse(readFileSync(path.join(folder, 'validation.json'), 'utf8')) as { tool?: unknown; kind?: unknown };
    ours = json.tool === 'rigcal' && json.kind === 'validation';
  } catch {
    ours = false;
  }
  if (!ours) throw new UserError({ where: { file: folder }, what: 'exists and is not a validation folder of rigcal (no validation.json of ours inside); it will not be replaced', fix });
  const foreign = entries.filter((e) => !(VALIDATION_FILES as readonly string[]).includes(e));
  if (foreign.length) throw new UserError({ where: { file: folder }, what: `holds files rigcal did not write (${foreign.slice(0, 5).join(', ')}); replacing it would delete them`, fix });
}

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
    `Validation of ${result.model.name} with ${result.estimates.file} (never fitted to these data):`,
    // Names and the verdict to the left, numbers to the right.
    textTable(header, rows, { rightAligned: [2, 3, 4, 5] }),
    '',
    'NRMSE: RMSE over the standard deviation of the measurement (0 perfect, 1 no better than the mean).',
  ];
  for (const o of result.outputs) lines.push(`${o.experiment}/${o.output}: ${o.verdict}`);
  for (const w of result.warnings) lines.push(`warning: ${w}`);
  return `${lines.join('\n')}\n`;
}
