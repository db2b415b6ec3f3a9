import { describe, expect, it } from 'vitest';
import { benchmarkReport } from '../../../bench/report-bench.js';

describe('report of a 200,000-sample log', () => {
  it('stays under 3 MB and renders in seconds', async () => {
    const b = await benchmarkReport(200_000);
    // Targets of our own (issue): under 3 MB, under 2 s. Measured alone on a 2-core machine the
    // render takes under 1 s (benchmarkReport, `npm run bench`); the time limit here leaves room for
    // a machine shared with other test workers. Without the reduction for display (decimate.ts)
    // the page would hold 200,000-point paths: tens of MB and far slower.
    expect(b.bytes).toBeLessThan(3 * 2 ** 20);
    expect(b.renderSeconds).toBeLessThan(8);
    expect(b.renderWithDiagnosticsSeconds).toBeLessThan(10);
  });
});
