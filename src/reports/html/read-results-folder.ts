/**
 * Reads a results folder of `fit` back into memory: fit.json as a FitResult and residuals.csv as
 * residual series (columns experiment, role, time, then per output <out>_measured, <out>_simulated,
 * <out>_residual; empty cell = missing). The residual column is not read: it is measured - simulated.
 */
import { repairInterruptedWrite } from '../../files/interrupted-writes.js';
import { existsSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import { formatFileSize } from '../../presentation/numbers.js';
import { UserError } from '../../errors.js';
import type { ResidualSeries } from '../../diagnostics/types.js';
import type { FitResult } from '../../estimation/fit/fit-result.js';

/**
 * residuals.csv larger than this is refused with a clear message rather than exhausting memory
 * (the file is parsed whole; V8 strings stop near 512 MiB and the parsed rows take several times the
 * file's size). 256 MiB is some three million rows of a few outputs.
 */
const MAX_RESIDUALS_BYTES = 256 * 2 ** 20;

export interface ResultsFolder {
  fit: FitResult;
  series: ResidualSeries[];
}

export function readResultsFolder(dir: string): ResultsFolder {
  // A write of this folder that was interrupted may have left it under a hidden name: put it back.
  repairInterruptedWrite(dir);
  if (!existsSync(dir) || !statSync(dir).isDirectory()) {
    throw new UserError({ where: { file: dir }, what: 'no such results folder', fix: 'give the folder that `rigcal fit` wrote (default ./<model name>-fit/)' });
  }
  const fit = readFitJson(join(dir, 'fit.json'));
  const series = readResidualsCsv(join(dir, 'residuals.csv'), fit);
  return { fit, series };
}

function readFitJson(file: string): FitResult {
  if (!existsSync(file)) {
    throw new UserError({ where: { file }, what: 'fit.json is missing: this is not a results folder of rigcal fit', fix: 'run `rigcal fit MODEL -o DIR` first, then `rigcal report DIR`' });
  }
  let data: unknown;
  try {
    data = JSON.parse(readFileSync(file, 'utf8'));
  } catch (err) {
    throw new UserError({ where: { file }, what: `fit.json is not valid JSON (${(err as Error).message})`, fix: 'run `rigcal fit` again to rewrite the results folder' });
  }
  const fit = data as Partial<FitResult>;
  const missing = (['model', 'parameters', 'correlation', 'statistics', 'outputs', 'identifiability', 'warnings', 'provenance'] as const).filter((k) => fit?.[k] === undefined);
  if (typeof fit !== 'object' || fit === null || fit.tool !== 'rigcal' || missing.length) {
    throw new UserError({
      where: { file, key: missing[0] },
      what: fit?.tool !== 'rigcal' ? 'this fit.json was not written by rigcal (no "tool": "rigcal")' : `fit.json lacks ${missing.join(', ')}`,
      fix: 'run `rigcal fit` again to rewrite the results folder',
    });
  }
  const notArray = (['parameters', 'outputs', 'warnings'] as const).find((k) => !Array.isArray(fit[k]));
  if (notArray || !Array.isArray(fit.correlation?.names) || !Array.isArray(fit.identifiability?.problems)) {
    throw new UserError({ where: { file, key: notArray ?? 'correlation' }, what: 'fit.json does not have the layout rigcal writes', fix: 'run `rigcal fit` again to rewrite the results folder' });
  }
  if (fit.format !== 1) {
    throw new UserError({ where: { file, key: 'format' }, what: `fit.json has format ${String(fit.format)}; this rigcal reads format 1`, fix: 'use the rigcal version that wrote it, or run `rigcal fit` again' });
  }
  return fit as FitResult;
}

const SUFFIXES = ['_measured', '_simulated', '_residual'] as const;

function readResidualsCsv(file: string, fit: FitResult): ResidualSeries[] {
  if (!existsSync(file)) {
    throw new UserError({ where: { file }, what: 'residuals.csv is missing from the results folder', fix: 'run `rigcal fit` again to rewrite the results folder' });
  }
  const size = statSync(file).size;
  if (size > MAX_RESIDUALS_BYTES) {
    throw new UserError({ where: { file }, what: `residuals.csv is ${formatFileSize(size)}, more than the ${MAX_RESIDUALS_BYTES / 2 ** 20} MiB a report reads`, fix: 'shorten the experiments (window) or thin the logs before fitting' });
  }
  // rigcal writes residuals.csv without comments or blank lines, so row i is line i + 1.
  const parsed = Papa.parse<string[]>(readFileSync(file, 'utf8').replace(/^\uFEFF/, ''), { skipEmptyLines: true });
  const rows = parsed.data;
  const broken = parsed.errors[0];
  if (broken) {
    throw new UserError({ where: { file, line: (broken.row ?? 0) + 1 }, what: `residuals.csv cannot be read as CSV (${broken.message})`, fix: 'run `rigcal fit` again to rewrite the results folder' });
  }
  const ragged = rows.findIndex((r) => r.length !== rows[0]!.length);
  if (ragged > 0) {
    throw new UserError({ where: { file, line: ragged + 1 }, what: `residuals.csv has ${rows[ragged]!.length} fields on this line and ${rows[0]!.length} in its header`, fix: 'run `rigcal fit` again to rewrite the results folder' });
  }
  if (rows.length === 0) throw new UserError({ where: { file }, what: 'residuals.csv is empty', fix: 'run `rigcal fit` again' });
  const header = rows[0];
  const col = (name: string) => header.indexOf(name);
  const [iExp, iRole, iTime] = [col('experiment'), col('role'), col('time')];
  if (iExp < 0 || iRole < 0 || iTime < 0) {
    throw new UserError({ where: { file, line: 1 }, what: 'residuals.csv lacks one of the columns experiment, role, time', fix: 'run `rigcal fit` again to rewrite the results folder' });
  }
  const outputs = header.filter((h) => h.endsWith(SUFFIXES[0])).map((h) => h.slice(0, -SUFFIXES[0].length));
  const columns = outputs.map((o) => ({ output: o, measured: col(o + '_measured'), simulated: col(o + '_simulated') }));
  const lacking = columns.find((c) => c.simulated < 0);
  if (lacking) throw new UserError({ where: { file, line: 1 }, what: `residuals.csv has ${lacking.output}_measured but no ${lacking.output}_simulated`, fix: 'run `rigcal fit` again' });

  // Rows of one experiment are contiguous in the file; collect the row ranges first.
  const groups: { experiment: string; role: 'fit' | 'validation'; first: number; last: number }[] = [];
  for (let i = 1; i < rows.length; i++) {
    const name = rows[i][iExp];
    const role = rows[i][iRole];
    if (role !== 'fit' && role !== 'validation') {
      throw new UserError({ where: { file, line: i + 1, key: 'role' }, what: `role "${role}" is neither fit nor validation`, fix: 'run `rigcal fit` again' });
    }
    const g = groups[groups.length - 1];
    if (g && g.experiment === name) g.last = i;
    else groups.push({ experiment: name, role, first: i, last: i });
  }
  const number = (text: string, line: number, key: string): number => {
    if (text === '') return NaN;
    const v = Number(text);
    if (!Number.isFinite(v)) throw new UserError({ where: { file, line, key }, what: `"${text}" is not a number`, fix: 'run `rigcal fit` again to rewrite the results folder' });
    return v;
  };

  const series: ResidualSeries[] = [];
  for (const g of groups) {
    const n = g.last - g.first + 1;
    const time = new Float64Array(n);
    for (let i = 0; i < n; i++) time[i] = number(rows[g.first + i][iTime], g.first + i + 1, 'time');
    for (const c of columns) {
      const measured = new Float64Array(n);
      const simulated = new Float64Array(n);
      let any = false;
      for (let i = 0; i < n; i++) {
        const row = rows[g.first + i];
        measured[i] = number(row[c.measured], g.first + i + 1, c.output + '_measured');
        simulated[i] = number(row[c.simulated], g.first + i + 1, c.output + '_simulated');
        if (Number.isFinite(measured[i])) any = true;
      }
      // An output not logged in this experiment has only empty measured cells: no series for it.
      if (!any) continue;
      const unit = fit.outputs.find((o) => o.experiment === g.experiment && o.output === c.output)?.unit ?? fit.outputs.find((o) => o.output === c.output)?.unit ?? '';
      series.push({ experiment: g.experiment, role: g.role, output: c.output, unit, time, measured, simulated });
    }
  }
  return series;
}
