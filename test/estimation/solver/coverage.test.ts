/**
 * Statistical honesty of the 95 % intervals: over many noise realisations of a synthetic problem
 * with known truth, each interval must cover the truth about 95 % of the time. Bounds: binomial
 * with n = 400 and p = 0.95 has mean 380 and standard deviation 4.36; 366..394 is +-3.2 standard
 * deviations (a false alarm about once in 700 runs; the seed is fixed, so the test is repeatable).
 */
import { describe, expect, it } from 'vitest';
import { normalDeviates } from '../../../src/util/random.js';
import { solveLeastSquares } from '../../../src/estimation/solver/index.js';
import { computeUncertainty } from '../../../src/estimation/uncertainty.js';


describe('coverage of the 95 % intervals (synthetic data, known truth)', () => {
  it('covers A and tau of y = A exp(-x/tau) + noise about 95 % of the time, tau in log coordinates', () => {
    const A = 3;
    const tau = 2;
    const sigma = 0.05;
    const x = Array.from({ length: 30 }, (_, i) => (i * 6) / 29);
    const noise = normalDeviates(20261201);
    const runs = 400;
    let coverA = 0;
    let coverTau = 0;
    for (let k = 0; k < runs; k++) {
      const y = x.map((xi) => A * Math.exp(-xi / tau) + sigma * noise());
      // theta = (A, ln tau)
      const residuals = (t: readonly number[]) => x.map((xi, i) => y[i]! - t[0]! * Math.exp(-xi / Math.exp(t[1]!)));
      const jacobian = (t: readonly number[]) => {
        const ta = Math.exp(t[1]!);
        return x.map((xi) => {
          const e = Math.exp(-xi / ta);
          return [-e, -t[0]! * e * (xi / ta)];
        });
      };
      const res = solveLeastSquares({ residuals, residualsAndJacobian: (t) => ({ residuals: residuals(t), jacobian: jacobian(t) }) }, [1, 0]);
      expect(res.status).toBe('converged');
      const u = computeUncertainty({ jacobian: res.jacobian, residuals: res.residuals, theta: res.theta, names: ['A', 'tau'], scales: ['linear', 'log'], sigmaEstimated: true });
      const [ia, it2] = [u.parameters[0]!.ci95!, u.parameters[1]!.ci95!];
      if (ia[0] <= A && A <= ia[1]) coverA++;
      if (it2[0] <= tau && tau <= it2[1]) coverTau++;
    }
    console.log(`coverage over ${runs} runs: A ${coverA}, tau ${coverTau}`);
    expect(coverA).toBeGreaterThanOrEqual(366);
    expect(coverA).toBeLessThanOrEqual(394);
    expect(coverTau).toBeGreaterThanOrEqual(366);
    expect(coverTau).toBeLessThanOrEqual(394);
  });
});
