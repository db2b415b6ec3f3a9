/**
 * Speed and size of report.html for a long log, for the benchmark table: renders the demo results
 * (test/helpers/demo-results.ts) with `samples` samples per experiment, one fit experiment with two outputs.
 */
import { demoResults } from '../test/helpers/demo-results.js';
import { renderFitReport } from '../src/reports/html/index.js';

export interface ReportBenchmark {
  samples: number;
  /** Seconds to render report.html from the in-memory results (diagnostics precomputed, as `fit` writes them). */
  renderSeconds: number;
  /** Seconds when the report has to compute the residual diagnostics itself (older fit.json). */
  renderWithDiagnosticsSeconds: number;
  bytes: number;
}

export async function benchmarkReport(samples = 200_000): Promise<ReportBenchmark> {
  const { fit, series } = demoResults({ samples, validation: false });
  let t0 = performance.now();
  const text = await renderFitReport(fit, series);
  const renderSeconds = (performance.now() - t0) / 1000;
  const bare = { ...fit, outputs: fit.outputs.map(({ verdict: _v, autocorrelation: _a, whiteness: _w, ...rest }) => rest) };
  t0 = performance.now();
  await renderFitReport(bare, series);
  const renderWithDiagnosticsSeconds = (performance.now() - t0) / 1000;
  return { samples, renderSeconds, renderWithDiagnosticsSeconds, bytes: Buffer.byteLength(text) };
}
