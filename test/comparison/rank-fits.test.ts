/**
 * The ranking arithmetic on residual series built by hand (no fitting): the concentrated Gaussian
 * likelihood, AICc/BIC, Akaike weights, the preferred model and the < 2 rule, and the
 * likelihood-ratio p-values against closed forms and table values of the chi-square distribution.
 */
import { describe, expect, it } from 'vitest';
import type { CompletedFit } from '../../src/estimation/fit/fit-result.js';
import type { ResidualSeries } from '../../src/diagnostics/types.js';
import type { FitResult } from '../../src/estimation/fit/fit-result.js';
import type { Model } from '../../src/model/types.js';
import { fitLikelihood } from '../../src/comparison/likelihood.js';
import { rankFits, type CandidateFit } from '../../src/comparison/rank-fits.js';

/** n residuals alternating +a, -a (sum of squares n*a^2), on a measured signal of zeros. */
function series(n: number, a: number, role: 'fit' | 'validation' = 'fit', output = 'y', experiment = 'e1'): ResidualSeries {
  const measured = new Float64Array(n);
  const simulated = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    measured[i] = Math.sin(i); // a measurement with spread, so that NRMSE is defined
    simulated[i] = measured[i] - (i % 2 ? a : -a);
  }
  return { experiment, role, output, unit: 'm', time: Float64Array.from({ length: n }, (_, i) => i * 0.01), measured, simulated };
}

function candidate(name: string, freeParameters: number, residuals: ResidualSeries[], sigma?: number): CandidateFit {
  const model = { name, timeUnit: 's', outputs: [{ name: 'y', unit: 'm', sigma }], inputs: [] } as unknown as Model;
  const result = { status: 'converged', statistics: { freeParameters } } as unknown as FitResult;
  return { name, file: `${name}.yaml`, model, outcome: { result, residuals, values: {} } as CompletedFit };
}

describe('fitLikelihood', () => {
  it('uses the maximum-likelihood sigma when the noise is estimated (concentrated likelihood)', () => {
    // SSE = n a^2, sigma^2 = a^2: log L = -n/2 (ln(2 pi a^2) + 1) (Gaussian ML, any statistics text).
    const n = 200;
    const a = 0.3;
    const ll = fitLikelihood([series(n, a)], [{ output: 'y' }], 3);
    expect(ll.logLikelihood).toBeCloseTo((-n / 2) * (Math.log(2 * Math.PI * a * a) + 1), 10);
    expect(ll.k).toBe(4); // 3 parameters + 1 noise level
    expect(ll.observations).toBe(n);
    // AICc = -2 log L + 2k + 2k(k+1)/(n-k-1) (Hurvich & Tsai 1989); BIC = -2 log L + k ln n (Schwarz 1978).
    expect(ll.aicc).toBeCloseTo(-2 * ll.logLikelihood + 8 + (2 * 4 * 5) / (n - 5), 10);
    expect(ll.bic).toBeCloseTo(-2 * ll.logLikelihood + 4 * Math.log(n), 10);
  });

  it('uses a given sigma as given and does not count it', () => {
    const n = 100;
    const ll = fitLikelihood([series(n, 0.2)], [{ output: 'y', givenSigma: 0.5 }], 2);
    // log L = -n/2 ln(2 pi sigma^2) - SSE/(2 sigma^2)
    expect(ll.logLikelihood).toBeCloseTo((-n / 2) * Math.log(2 * Math.PI * 0.25) - (n * 0.04) / (2 * 0.25), 10);
    expect(ll.k).toBe(2);
  });

  it('skips missing samples and validation series', () => {
    const s = series(50, 0.1);
    s.measured[3] = NaN;
    const ll = fitLikelihood([s, series(70, 5, 'validation')], [{ output: 'y' }], 1);
    expect(ll.observations).toBe(49);
  });
});

describe('rankFits', () => {
  const n = 300;

  it('prefers the lowest AICc and explains why; weights sum to 1', () => {
    const good = candidate('with-damper', 3, [series(n, 0.1), series(n, 0.12, 'validation', 'y', 'held-out')]);
    const bad = candidate('no-damper', 2, [series(n, 0.5), series(n, 0.9, 'validation', 'y', 'held-out')]);
    const r = rankFits([bad, good]);
    expect(r.preferred).toBe('with-damper');
    expect(r.models.map((m) => m.name)).toEqual(['with-damper', 'no-damper']);
    expect(r.models[0].weight + r.models[1].weight).toBeCloseTo(1, 12);
    expect(r.models[0].weight).toBeGreaterThan(0.99);
    expect(r.reason).toMatch(/lowest AICc/);
    expect(r.reason).not.toMatch(/Burnham/);
    // Validation NRMSE per held-out experiment: the good model scores lower.
    expect(r.models[0].validation[0].experiment).toBe('held-out');
    expect(r.models[0].validation[0].nrmse).toBeLessThan(r.models[1].validation[0].nrmse);
  });

  it('says when a simpler model is within 2 AICc units (Burnham & Anderson 2002)', () => {
    // Same residual level: the extra parameter costs about 2 units of AICc; make the larger model a
    // little better (-2 log L lower by 3) so that it still wins, by about 1 AICc unit.
    const simple = candidate('simple', 2, [series(n, 0.1)]);
    const larger = candidate('larger', 3, [series(n, 0.1 * Math.exp(-3 / (2 * n)))]);
    const r = rankFits([simple, larger]);
    expect(r.preferred).toBe('larger');
    const delta = r.models.find((m) => m.name === 'simple')!.deltaAicc;
    expect(delta).toBeGreaterThan(0);
    expect(delta).toBeLessThan(2);
    expect(r.reason).toMatch(/simple, with 2 instead of 3 free parameters, is within .* < 2 AICc units.*Burnham & Anderson 2002/);
  });

  it('likelihood-ratio test: statistic, dof and p-value against the chi-square closed form and table', () => {
    // Concentrated likelihood: statistic = n ln(SSE_small / SSE_large) (Wilks 1938 with ML sigma).
    // Choose the ratio so that the statistic is 5.991464547107979: with 2 degrees of freedom the
    // chi-square upper tail is exp(-x/2) (closed form of the chi-square(2) distribution), i.e. 0.05,
    // the tabulated 95 % point of chi-square(2) = 5.991 (NIST/SEMATECH e-Handbook of Statistical
    // Methods, 1.3.6.7.4, upper critical values of the chi-square distribution).
    const x = 5.991464547107979;
    const aLarge = 0.1;
    const aSmall = aLarge * Math.exp(x / (2 * n));
    const small = candidate('small', 1, [series(n, aSmall)]);
    const large = candidate('large', 3, [series(n, aLarge)]);
    const r = rankFits([large, small], { nested: true });
    expect(r.nested).toHaveLength(1);
    const t = r.nested![0];
    expect(t.smaller).toBe('small');
    expect(t.larger).toBe('large');
    expect(t.dof).toBe(2);
    expect(t.statistic).toBeCloseTo(x, 9);
    expect(t.pValue).toBeCloseTo(Math.exp(-x / 2), 9);
    expect(t.pValue).toBeCloseTo(0.05, 6);
  });

  it('likelihood-ratio test with 1 degree of freedom against the tabulated 3.841 point', () => {
    // chi-square(1) 95 % point 3.841 (same table): p = 0.05 to the table's 4 digits.
    const x = 3.841458820694124;
    const small = candidate('small', 2, [series(n, 0.2 * Math.exp(x / (2 * n)))]);
    const large = candidate('large', 3, [series(n, 0.2)]);
    const middle = candidate('same-size', 3, [series(n, 0.21)]);
    const r = rankFits([small, large, middle], { nested: true });
    // Consecutive by free parameters; a pair with equal counts is not tested.
    const tests = r.nested!;
    expect(tests.every((t) => t.dof > 0)).toBe(true);
    const t = tests.find((q) => q.smaller === 'small')!;
    expect(t.dof).toBe(1);
    expect(t.pValue).toBeCloseTo(0.05, 4);
    expect(tests.some((q) => (q.smaller === 'large' && q.larger === 'same-size') || (q.smaller === 'same-size' && q.larger === 'large'))).toBe(false);
  });

  it('ranks a failed fit last with weight 0', () => {
    const ok = candidate('ok', 2, [series(n, 0.1)]);
    const failed = candidate('failed', 2, [series(n, 0.01)]);
    (failed.outcome.result as { status: string }).status = 'failed';
    const r = rankFits([failed, ok]);
    expect(r.preferred).toBe('ok');
    expect(r.models[1].name).toBe('failed');
    expect(r.models[1].weight).toBe(0);
  });
});
