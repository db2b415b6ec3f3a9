/**
 * Bench row of report generation: report.html for 200,000 samples per output (benchmarkReport of
 * bench/report-bench.ts). Rendering is asynchronous and the bench runner times synchronous work, so the
 * renders run in setup (one warm-up, then the measured one) and the note carries their own timing;
 * the table's time columns of this row measure nothing.
 */
import { benchmarkReport } from '../report-bench.js';
import type { BenchCase } from '../case.js';

const SAMPLES = 200_000;

export const cases: BenchCase[] = [
  {
    name: `report.html of ${SAMPLES.toLocaleString('en-US')} samples (timed in setup, see note)`,
    group: 'report',
    runs: 1,
    async setup() {
      await benchmarkReport(SAMPLES); // warm-up: module loading and JIT
      const b = await benchmarkReport(SAMPLES);
      const note =
        `render ${b.renderSeconds.toFixed(2)} s (diagnostics from fit), ${b.renderWithDiagnosticsSeconds.toFixed(2)} s computing the diagnostics; ` +
        `${(b.bytes / 1e6).toFixed(2)} MB`;
      return () => ({ note });
    },
  },
];
