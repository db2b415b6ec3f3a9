/**
 * The solver's warm start (an evaluation already known at the start) and its stops for a cost with
 * evaluation noise, checked against NIST StRD certified values (itl.nist.gov/div898/strd/nls,
 * Misra1a, fixture written by scripts/make-nist-fixtures.mjs).
 */
import { describe, expect, it } from 'vitest';
import { solveLeastSquares, type LeastSquaresProblem } from '../../../src/estimation/solver/index.js';
import { loadNist, lre, nistProblem } from './nist-problem.js';

describe('solveLeastSquares warm start', () => {
  const f = loadNist('Misra1a');

  it('a start with its evaluation given costs no evaluation there and ends on the certified values', () => {
    const cold = solveLeastSquares(nistProblem(f), f.start2);
    // Restart from the optimum with its own residuals and Jacobian: nothing is left to do.
    const problem = nistProblem(f);
    const atOptimum = problem.residualsAndJacobian(cold.theta)!;
    const before = problem.evaluations();
    const warm = solveLeastSquares(problem, cold.theta, { initial: atOptimum });
    expect(warm.status).toBe('converged');
    // NIST certified values of Misra1a: 6 digits (LRE >= 6).
    f.certified.forEach((c, k) => expect(lre(warm.theta[k], c)).toBeGreaterThanOrEqual(6));
    // No evaluation at the start: only trials (at most one, rejected or not) after it.
    expect(warm.jacobianEvaluations + warm.residualEvaluations).toBeLessThanOrEqual(2);
    expect(problem.evaluations() - before).toBe(warm.jacobianEvaluations + warm.residualEvaluations);
  });

  it('a warm start from the certified start 2 with its evaluation given reaches the same optimum as a cold one', () => {
    const problem = nistProblem(f);
    const first = problem.residualsAndJacobian(f.start2)!;
    const warm = solveLeastSquares(problem, f.start2, { initial: first });
    const cold = solveLeastSquares(nistProblem(f), f.start2);
    // The cold start evaluates the start twice (with and without Jacobian); the warm one never.
    expect(cold.jacobianEvaluations + cold.residualEvaluations - (warm.jacobianEvaluations + warm.residualEvaluations)).toBe(2);
    f.certified.forEach((c, k) => expect(lre(warm.theta[k], c)).toBeGreaterThanOrEqual(6));
  });
});

describe('solveLeastSquares with noisyCost', () => {
  // y = a exp(b x) with a small misfit; the plain path's model carries a deterministic jitter of
  // relative 1e-9 that changes with theta (like adaptive integration), the Jacobian path a fixed
  // relative offset of 1e-9 (the other integration path). Invented for the test.
  const x = Array.from({ length: 41 }, (_, i) => i / 40);
  const y = x.map((xi) => 2 * Math.exp(1.5 * xi) + 0.01 * Math.sin(40 * xi));
  const jitter = (t: readonly number[], i: number) => {
    const h = Math.sin((t[0]! * 1e9 + t[1]! * 7e9 + i * 13.1) % 1e4) * 43758.5453;
    return (h - Math.floor(h) - 0.5) * 2e-9;
  };
  const model = (t: readonly number[], xi: number) => t[0]! * Math.exp(t[1]! * xi);
  const problem: LeastSquaresProblem = {
    residuals: (t) => x.map((xi, i) => y[i]! - model(t, xi) * (1 + jitter(t, i))),
    residualsAndJacobian: (t) => ({
      residuals: x.map((xi, i) => y[i]! - model(t, xi) * (1 + 1e-9)),
      jacobian: x.map((xi) => [-Math.exp(t[1]! * xi), -t[0]! * xi * Math.exp(t[1]! * xi)]),
    }),
  };

  it('stops once the predicted gain is below the measured noise, with fewer trials, at the same optimum to 1e-6', () => {
    const plain = solveLeastSquares(problem, [1, 1]);
    const noisy = solveLeastSquares(problem, [1, 1], { noisyCost: true });
    expect(noisy.status).toBe('converged');
    expect(noisy.message).toMatch(/evaluation noise of the cost/);
    expect(noisy.costNoise).toBeGreaterThan(0);
    expect(noisy.iterations).toBeLessThanOrEqual(plain.iterations);
    expect(noisy.residualEvaluations).toBeLessThanOrEqual(plain.residualEvaluations);
    for (let k = 0; k < 2; k++) expect(Math.abs(noisy.theta[k]! - plain.theta[k]!) / Math.abs(plain.theta[k]!)).toBeLessThan(1e-6);
  });

  it('costNoiseLimit caps the noise the stops use: a limit of 0 behaves like the default tests', () => {
    const limited = solveLeastSquares(problem, [1, 1], { noisyCost: true, costNoiseLimit: 0, costTolerance: 1e-14 });
    const plain = solveLeastSquares(problem, [1, 1]);
    expect(limited.message).not.toMatch(/noise/);
    expect(Math.abs(limited.theta[1]! - plain.theta[1]!)).toBeLessThan(1e-7);
  });
});
