/** Per-entry step limits of the solver (`maxStep`): trial steps cut entry by entry, same optimum. */
import { describe, expect, it } from 'vitest';
import { solveLeastSquares, type LeastSquaresProblem } from '../../../src/estimation/solver/index.js';

/**
 * y = A exp(-x / tau) on x = 0..10, exact data from A = 3, tau = 2, fitted in the coordinates
 * (A, ln tau) as the fit pipeline does for a log-scale parameter. `moves` records, for every trial
 * point, its distance in ln tau from the point the solver stood on (the last point where it asked
 * for a Jacobian: the start, then each accepted trial).
 */
function decay(moves: number[], maxStep?: number[]): LeastSquaresProblem {
  const x = Array.from({ length: 21 }, (_, i) => i / 2);
  const y = x.map((xi) => 3 * Math.exp(-xi / 2));
  let current: number | undefined;
  const model = (t: readonly number[]) => x.map((xi, i) => y[i]! - t[0]! * Math.exp(-xi / Math.exp(t[1]!)));
  return {
    residuals: (t) => {
      if (current !== undefined) moves.push(Math.abs(t[1]! - current));
      return model(t);
    },
    residualsAndJacobian: (t) => {
      current = t[1]!;
      const tau = Math.exp(t[1]!);
      // d r / d A = -exp(-x/tau); d r / d ln tau = -A exp(-x/tau) x / tau.
      return { residuals: model(t), jacobian: x.map((xi) => [-Math.exp(-xi / tau), (-t[0]! * Math.exp(-xi / tau) * xi) / tau]) };
    },
    lower: [0, Math.log(1e-3)],
    upper: [100, Math.log(1e4)],
    ...(maxStep ? { maxStep } : {}),
  };
}

describe('solveLeastSquares with per-entry step limits', () => {
  const start = [1, Math.log(200)]; // tau 100 times too long: ln tau must travel ln 100 = 4.6

  it('never moves a limited entry further than its limit in one trial, and reaches the same optimum', () => {
    const limit = Math.log(2);
    const limitedMoves: number[] = [];
    const limited = solveLeastSquares(decay(limitedMoves, [Infinity, limit]), start);
    const freeMoves: number[] = [];
    const free = solveLeastSquares(decay(freeMoves), start);

    // Without the limit some trial jumps further than a factor 2 in tau (else this test proves nothing).
    expect(Math.max(...freeMoves)).toBeGreaterThan(limit);
    for (const m of limitedMoves) expect(m).toBeLessThanOrEqual(limit * (1 + 1e-12));
    // Crossing ln 100 takes at least ceil(4.6 / ln 2) = 7 trials.
    expect(limited.iterations).toBeGreaterThanOrEqual(7);

    expect(limited.status).toBe('converged');
    expect(free.status).toBe('converged');
    // The exact data's optimum (A, tau) = (3, 2), reached with and without the limit.
    expect(limited.theta[0]).toBeCloseTo(3, 8);
    expect(Math.exp(limited.theta[1]!)).toBeCloseTo(2, 8);
    expect(free.theta[0]).toBeCloseTo(3, 8);
    expect(Math.exp(free.theta[1]!)).toBeCloseTo(2, 8);
  });

  it('rejects a step limit that is not positive', () => {
    expect(() => solveLeastSquares(decay([], [Infinity, 0]), start)).toThrow(/step limit/);
    expect(() => solveLeastSquares(decay([], [Number.NaN, 1]), start)).toThrow(/step limit/);
  });
});
