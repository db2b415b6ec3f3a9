/** `rigcal report DIR`: rebuild DIR/report.html from fit.json and residuals.csv (atomic write). */
import { join } from 'node:path';
import { writeFileAtomic } from '../../util/atomic-write.js';
import { readResultsFolder } from './read-results-folder.js';
import { renderFitReport } from './render-fit-report.js';

export interface WrittenReport {
  file: string;
  bytes: number;
  seconds: number;
}

export async function writeReportForFolder(dir: string): Promise<WrittenReport> {
  const t0 = performance.now();
  const { fit, series } = readResultsFolder(dir);
  const text = await renderFitReport(fit, series);
  const file = join(dir, 'report.html');
  writeFileAtomic(file, text);
  return { file, bytes: Buffer.byteLength(text), seconds: (performance.now() - t0) / 1000 };
}
