/** `rigcal report` as a library verb: rebuild report.html in a results folder of `fit` from its fit.json and residuals.csv. */
import { isAbsolute, join, resolve } from 'node:path';
import { writeFileAtomic } from '../files/atomic-file.js';
import { readResultsFolder } from '../reports/html/read-results-folder.js';
import { renderFitReport } from '../reports/html/render-fit-report.js';

export interface ReportOptions {
  /** The results folder that `fit` wrote (relative to `cwd`). */
  folder: string;
  cwd?: string;
}

export interface WrittenReport {
  file: string;
  bytes: number;
  seconds: number;
}

export async function runReport(options: ReportOptions): Promise<WrittenReport> {
  const t0 = performance.now();
  const dir = isAbsolute(options.folder) ? options.folder : resolve(options.cwd ?? process.cwd(), options.folder);
  const { fit, series } = readResultsFolder(dir);
  const text = await renderFitReport(fit, series);
  const file = join(dir, 'report.html');
  writeFileAtomic(file, text);
  return { file, bytes: Buffer.byteLength(text), seconds: (performance.now() - t0) / 1000 };
}
