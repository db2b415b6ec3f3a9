import { describe, expect, it } from 'vitest';
import { residualOf, scoreSeries } from '../../src/diagnostics/index.js';

// Definitions (any statistics handbook): RMSE = sqrt(SSE/n); R^2 = 1 - SSE/SST with
// SST = sum (y - mean y)^2; NRMSE = RMSE / std(y) (divisor n), so NRMSE = sqrt(1 - R^2).
describe('scoreSeries', () => {
  it('computes RMSE, NRMSE and R^2 of a hand-worked example', () => {
    // y = 1,2,3,4 (mean 2.5, SST 5); simulated 1,2,3,5: SSE 1.
    const s = scoreSeries([1, 2, 3, 4], [1, 2, 3, 5]);
    expect(s.samples).toBe(4);
    expect(s.missing).toBe(0);
    expect(s.rmse).toBeCloseTo(0.5, 14);
    expect(s.r2).toBeCloseTo(0.8, 14);
    expect(s.nrmse).toBeCloseTo(Math.sqrt(0.2), 14);
  });

  it('skips and counts missing samples instead of filling them', () => {
    const s = scoreSeries([1, NaN, 2, 3, 4, NaN], [1, 7, 2, 3, 5, NaN]);
    expect(s.samples).toBe(4);
    expect(s.missing).toBe(2);
    expect(s.rmse).toBeCloseTo(0.5, 14);
  });

  it('gives NaN (not a number pretending to be one) for a constant measurement', () => {
    const s = scoreSeries([2, 2, 2], [2, 2.1, 1.9]);
    expect(s.r2).toBeNaN();
    expect(s.nrmse).toBeNaN();
    expect(s.rmse).toBeGreaterThan(0);
  });

  it('finds a constant log constant even when the rounding of its mean leaves SST above zero', () => {
    // 61 samples of 0.1: the summed mean is 0.09999999999999991, SST about 6e-31 > 0, and
    // 1 - SSE/SST would come out near -1e26. R^2 is not defined without variance (definition above).
    const measured = new Array(61).fill(0.1);
    const simulated = measured.map((_, i) => 0.1 + (i % 2 ? 1e-3 : -1e-3));
    const s = scoreSeries(measured, simulated);
    expect(s.r2).toBeNaN();
    expect(s.nrmse).toBeNaN();
    expect(s.constantValue).toBe(0.1);
    // RMSE = sqrt(SSE/n) is still defined: every residual is 1e-3 in size.
    expect(s.rmse).toBeCloseTo(1e-3, 15);
    expect(scoreSeries([1, 2, 3, 4], [1, 2, 3, 5]).constantValue).toBeUndefined();
  });

  it('residualOf is measured - simulated with NaN where either is missing', () => {
    expect(Array.from(residualOf([3, NaN, 1], [1, 1, NaN]))).toEqual([2, NaN, NaN]);
  });
});
