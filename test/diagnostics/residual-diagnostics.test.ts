import { describe, expect, it } from 'vitest';
import type { ResidualSeries } from '../../src/diagnostics/types.js';
import { residualDiagnostics } from '../../src/diagnostics/index.js';
import { normalDeviates as normalNoise } from '../../src/util/random.js';

function seriesOf(residual: ArrayLike<number>, dt = 0.01): ResidualSeries {
  const n = residual.length;
  const time = Float64Array.from({ length: n }, (_, i) => i * dt);
  const simulated = Float64Array.from({ length: n }, (_, i) => Math.sin(i * dt));
  const measured = Float64Array.from(simulated, (s, i) => s + residual[i]);
  return { experiment: 'e1', role: 'fit', output: 'speed', unit: 'rad/s', time, measured, simulated };
}

function white(n: number, seed: number, sd = 1): Float64Array {
  const g = normalNoise(seed);
  return Float64Array.from({ length: n }, () => sd * g());
}

function ar1(n: number, phi: number, seed: number): Float64Array {
  const g = normalNoise(seed);
  const x = new Float64Array(n);
  for (let t = 1; t < n; t++) x[t] = phi * x[t - 1] + g();
  return x;
}

describe('residualDiagnostics', () => {
  it('calls white noise white, with the band 1.96/sqrt(n)', () => {
    const d = residualDiagnostics(seriesOf(white(2000, 1)), [], { timeUnit: 's' });
    expect(d.whiteness!.white).toBe(true);
    expect(d.verdict).toMatch(/^residuals are white/);
    expect(d.correlatedUpTo).toBeUndefined();
    // Box & Jenkins: large-lag standard error 1/sqrt(n) under whiteness; 1.96 for 95 %.
    expect(d.autocorrelation!.band).toBeCloseTo(1.959964 / Math.sqrt(2000), 6);
    expect(d.autocorrelation!.lagStep).toBeCloseTo(0.01, 12);
  });

  it('locates the time scale of correlated residuals (AR(1), phi 0.9)', () => {
    // Theory: r_k = 0.9^k meets Bartlett's band 1.96 sqrt((1 + 2 sum 0.81^j)/2000) ~ 0.136 near lag 19 (0.19 s).
    const d = residualDiagnostics(seriesOf(ar1(2000, 0.9, 2)), [], { timeUnit: 's' });
    expect(d.whiteness!.white).toBe(false);
    expect(d.whiteness!.pValue).toBeLessThan(1e-6);
    expect(d.correlatedUpTo!).toBeGreaterThan(0.15);
    expect(d.correlatedUpTo!).toBeLessThan(0.5);
    expect(d.verdict).toMatch(/^residuals are correlated up to 0\.\d+ s: the model misses dynamics on that time scale$/);
  });

  it('says "beyond" when the correlation outlasts every lag examined', () => {
    // A slow drift over a long log: r_k stays near 1 for every lag examined (250 lags = 2.5 s).
    const n = 20000;
    const drift = Float64Array.from({ length: n }, (_, i) => i / n + 0.01 * Math.sin(i));
    const d = residualDiagnostics(seriesOf(drift), [], { timeUnit: 's' });
    expect(d.verdict).toMatch(/^residuals are correlated beyond 2\.\d+ s \(near the longest lag examined, 2\.5 s\)/);
  });

  it('names the strongest lag, without a time scale, when the correlation is not a run from lag 1', () => {
    // e_t = w_t + 0.15 w_{t-20}: theory r_20 = 0.15/(1 + 0.0225) = 0.147, every other lag 0.
    const n = 2000;
    const w = white(n + 20, 8);
    const e = Float64Array.from({ length: n }, (_, t) => w[t + 20] + 0.15 * w[t]);
    const d = residualDiagnostics(seriesOf(e), [], { timeUnit: 's' });
    expect(d.whiteness!.white).toBe(false);
    expect(d.correlatedUpTo).toBeUndefined();
    expect(d.verdict).toMatch(/^residuals are weakly correlated \(Ljung-Box p = [\d.e-]+\), most at lag 0\.2 s: the model may miss a small effect on that time scale$/);
  });

  it('finds residuals that follow a delayed input, and names the delay', () => {
    const n = 3000;
    const u = white(n, 3);
    const noise = white(n, 4);
    const e = Float64Array.from({ length: n }, (_, t) => noise[t] + (t >= 5 ? 0.3 * u[t - 5] : 0));
    const other = white(n, 5);
    const d = residualDiagnostics(seriesOf(e), [{ name: 'V', values: u }, { name: 'load', values: other }], { timeUnit: 's' });
    expect(d.inputsFollowed).toEqual(['V']);
    const v = d.inputCorrelation!.find((c) => c.input === 'V')!;
    expect(v.lag).toBeCloseTo(0.05, 12);
    // Theory: corr = 0.3 / sqrt(1 + 0.09) = 0.287.
    expect(v.maxAbs).toBeGreaterThan(0.24);
    expect(v.maxAbs).toBeLessThan(0.34);
    expect(d.verdict).toContain('residuals follow input V (cross-correlation 0.');
    expect(d.verdict).not.toContain('input load');
  });

  it('does not blame a slow input for residuals that are merely correlated (Bartlett band)', () => {
    const n = 3000;
    // A square wave input (long steps) and AR(1) residuals independent of it.
    const u = Float64Array.from({ length: n }, (_, t) => (Math.floor(t / 400) % 2 ? 1 : -1));
    let blamed = 0;
    for (let seed = 10; seed < 30; seed++) {
      const d = residualDiagnostics(seriesOf(ar1(n, 0.95, seed)), [{ name: 'V', values: u }]);
      if (d.inputsFollowed.length) blamed++;
    }
    // 20 trials at a nominal level of at most 5 %: 5 or more would have probability < 0.003 (binomial).
    expect(blamed).toBeLessThan(5);
  });

  it('rejects white noise about 5 % of the time (the test keeps its level)', () => {
    // 300 independent white series; binomial(300, 0.05): mean 15, 99.9 % range about 4..30.
    let rejected = 0;
    for (let seed = 100; seed < 400; seed++) {
      if (!residualDiagnostics(seriesOf(white(300, seed))).whiteness!.white) rejected++;
    }
    expect(rejected).toBeGreaterThanOrEqual(4);
    expect(rejected).toBeLessThanOrEqual(30);
  });

  it('handles missing samples explicitly and still concludes', () => {
    const e = ar1(1500, 0.8, 6);
    const s = seriesOf(e);
    for (let i = 0; i < 1500; i += 7) s.measured[i] = NaN;
    const d = residualDiagnostics(s, [], { timeUnit: 's' });
    expect(d.samples).toBe(1500 - Math.ceil(1500 / 7));
    expect(d.whiteness!.white).toBe(false);
    expect(d.autocorrelation!.values.every(Number.isFinite)).toBe(true);
    expect(d.verdict).toContain('correlated up to');
  });

  it('says when there are too few samples to judge', () => {
    const d = residualDiagnostics(seriesOf(white(8, 7)));
    expect(d.whiteness).toBeUndefined();
    expect(d.verdict).toBe('too few samples (8) to judge the residuals');
  });

  it('speaks in samples when the time unit is unknown', () => {
    const d = residualDiagnostics(seriesOf(ar1(2000, 0.9, 2), 1));
    expect(d.verdict).toMatch(/correlated up to \d+ time units/);
  });
});
