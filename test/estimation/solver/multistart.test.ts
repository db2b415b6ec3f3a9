/** Seeded Latin hypercube starts and the distinct-optimum count. */
import { describe, expect, it } from 'vitest';
import { multistartPoints, runMultistart, samplingInterval, type MultistartEntry } from '../../../src/estimation/multistart.js';
import { latinHypercube } from '../../../src/estimation/solver/latin-hypercube.js';
import { mulberry32 } from '../../../src/util/random.js';
import { solveLeastSquares, type LeastSquaresProblem } from '../../../src/estimation/solver/index.js';

describe('latinHypercube', () => {
  it('puts exactly one point in each of the n strata of every dimension (McKay, Beckman and Conover 1979)', () => {
    const n = 17;
    const pts = latinHypercube(n, 4, mulberry32(7));
    expect(pts).toHaveLength(n);
    for (let j = 0; j < 4; j++) {
      const strata = pts.map((p) => Math.floor(p[j]! * n)).sort((a, b) => a - b);
      expect(strata).toEqual(Array.from({ length: n }, (_, k) => k));
    }
    for (const p of pts) for (const u of p) expect(u >= 0 && u < 1).toBe(true);
  });

  it('is reproducible from the seed and changes with it', () => {
    expect(latinHypercube(5, 3, mulberry32(42))).toEqual(latinHypercube(5, 3, mulberry32(42)));
    expect(latinHypercube(5, 3, mulberry32(42))).not.toEqual(latinHypercube(5, 3, mulberry32(43)));
  });
});

describe('mulberry32', () => {
  it('gives values in [0, 1) with mean near 1/2 and variance near 1/12 (uniform distribution)', () => {
    const r = mulberry32(1);
    const n = 20000;
    let s = 0;
    let s2 = 0;
    for (let i = 0; i < n; i++) {
      const u = r();
      expect(u >= 0 && u < 1).toBe(true);
      s += u;
      s2 += u * u;
    }
    const mean = s / n;
    // Standard error of the mean of n uniforms: sqrt(1/12/n) = 0.002; allow 4 of them.
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.008);
    expect(Math.abs(s2 / n - mean * mean - 1 / 12)).toBeLessThan(0.004);
  });
});

describe('multistartPoints', () => {
  const entries: MultistartEntry[] = [
    { scale: 'linear', lower: -2, upper: 6, start: 1 },
    { scale: 'log', lower: Math.log(1e-3), upper: Math.log(10), start: 0 },
  ];

  it("starts from the model's own start, then spreads the rest within the bounds", () => {
    const pts = multistartPoints(entries, { starts: 9, seed: 3 });
    expect(pts).toHaveLength(9);
    expect(pts[0]).toEqual([1, 0]);
    for (const p of pts.slice(1)) {
      expect(p[0]! >= -2 && p[0]! <= 6).toBe(true);
      expect(p[1]! >= Math.log(1e-3) && p[1]! <= Math.log(10)).toBe(true);
    }
  });

  it('is log-uniform for log-scaled entries: one start per decade-equal stratum of ln(value)', () => {
    const n = 12;
    const pts = multistartPoints(entries, { starts: n + 1, seed: 11 }).slice(1);
    const lo = Math.log(1e-3);
    const width = Math.log(10) - lo;
    const strata = pts.map((p) => Math.floor(((p[1]! - lo) / width) * n)).sort((a, b) => a - b);
    expect(strata).toEqual(Array.from({ length: n }, (_, k) => k));
    // Values span the decades: some below 1e-2 and some above 1.
    const values = pts.map((p) => Math.exp(p[1]!));
    expect(values.some((v) => v < 1e-2)).toBe(true);
    expect(values.some((v) => v > 1)).toBe(true);
  });

  it('samples around the start where a bound is infinite', () => {
    expect(samplingInterval({ scale: 'linear', lower: -Infinity, upper: Infinity, start: 5 })).toEqual([0, 10]);
    expect(samplingInterval({ scale: 'linear', lower: 0, upper: Infinity, start: 0.2 })).toEqual([0, 1.2]);
    expect(samplingInterval({ scale: 'linear', lower: -Infinity, upper: 0, start: -3 })).toEqual([-6, 0]);
    const [lo, hi] = samplingInterval({ scale: 'log', lower: -Infinity, upper: Infinity, start: Math.log(2) });
    expect(Math.exp(lo)).toBeCloseTo(0.02, 12);
    expect(Math.exp(hi)).toBeCloseTo(200, 10);
  });
});

describe('runMultistart', () => {
  // r = (t^2 - 1, 0.3 (t - 1)): global minimum t = 1 (cost 0), a local one near t = -1.
  const residuals = (t: readonly number[]) => [t[0]! ** 2 - 1, 0.3 * (t[0]! - 1)];
  const problem: LeastSquaresProblem = {
    lower: [-2],
    upper: [2],
    residuals,
    residualsAndJacobian: (t) => ({ residuals: residuals(t), jacobian: [[2 * t[0]!], [0.3]] }),
  };
  const entries: MultistartEntry[] = [{ scale: 'linear', lower: -2, upper: 2, start: -1.5 }];

  it('from the start alone, ends in the local minimum', () => {
    const out = runMultistart(entries, { starts: 1, seed: 1 }, (s) => solveLeastSquares(problem, s));
    expect(out.best.theta[0]!).toBeLessThan(0);
    expect(out.distinctOptima).toBe(1);
  });

  it('with 8 starts over the bounds, finds the global minimum and counts two distinct optima', () => {
    const out = runMultistart(entries, { starts: 8, seed: 1 }, (s) => solveLeastSquares(problem, s));
    expect(out.best.theta[0]).toBeCloseTo(1, 8);
    expect(out.best.cost).toBeLessThan(1e-20);
    expect(out.distinctOptima).toBe(2);
    expect(out.bestCosts).toHaveLength(2);
    expect(out.bestCosts[0]!).toBeLessThan(out.bestCosts[1]!);
    expect(out.bestIndex).toBeGreaterThan(0);
  });

  it('ignores failed starts when choosing the best', () => {
    let calls = 0;
    const out = runMultistart(entries, { starts: 4, seed: 2 }, (s) => {
      calls++;
      return calls === 2 ? { status: 'failed' as const, cost: Number.NaN, theta: s } : solveLeastSquares(problem, s);
    });
    expect(out.best.status).not.toBe('failed');
    expect(out.results).toHaveLength(4);
  });
});
