/** Behaviour of the bounded Levenberg-Marquardt solver beyond the NIST accuracy tests. */
import { Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { RunFailure } from '../../../src/errors.js';
import { solveLeastSquares, type EvaluationFailed, type LeastSquaresProblem } from '../../../src/estimation/solver/index.js';

/** Rosenbrock's function as least squares: r = (10 (x2 - x1^2), 1 - x1). */
function rosenbrock(): LeastSquaresProblem {
  const residuals = (t: readonly number[]) => [10 * (t[1]! - t[0]! ** 2), 1 - t[0]!];
  return {
    residuals,
    residualsAndJacobian: (t) => ({ residuals: residuals(t), jacobian: [[-20 * t[0]!, 10], [-1, 0]] }),
  };
}

/** y = a exp(b x) on x = 0..1 with data from a = 2, b = 1.5 (exact, no noise). */
function exponential(opts: { failAbove?: number; failWithWordsAbove?: number; throwAbove?: number } = {}): LeastSquaresProblem {
  const x = Array.from({ length: 11 }, (_, i) => i / 10);
  const y = x.map((xi) => 2 * Math.exp(1.5 * xi));
  const failure = (t: readonly number[]): EvaluationFailed | null | undefined => {
    if (opts.throwAbove !== undefined && t[1]! > opts.throwAbove) throw new RunFailure('trial simulation diverged', { b: t[1] });
    if (opts.failWithWordsAbove !== undefined && t[1]! > opts.failWithWordsAbove) return { failed: 'trial simulation diverged' };
    return opts.failAbove !== undefined && t[1]! > opts.failAbove ? null : undefined;
  };
  const residuals = (t: readonly number[]) => {
    const failed = failure(t);
    return failed !== undefined ? failed : x.map((xi, i) => y[i]! - t[0]! * Math.exp(t[1]! * xi));
  };
  return {
    residuals,
    residualsAndJacobian: (t) => {
      const r = residuals(t);
      if (!Array.isArray(r)) return r;
      return { residuals: r, jacobian: new Matrix(x.map((xi) => [-Math.exp(t[1]! * xi), -t[0]! * xi * Math.exp(t[1]! * xi)])) };
    },
  };
}

describe('solveLeastSquares', () => {
  it("finds Rosenbrock's minimum (1, 1) from (-1.2, 1) (Moré, Garbow and Hillstrom 1981, test problem 1)", () => {
    const res = solveLeastSquares(rosenbrock(), [-1.2, 1]);
    expect(res.status).toBe('converged');
    expect(res.theta[0]).toBeCloseTo(1, 8);
    expect(res.theta[1]).toBeCloseTo(1, 8);
    expect(res.cost).toBeLessThan(1e-20);
  });

  it('evaluates the Jacobian only at the start and after accepted steps', () => {
    const res = solveLeastSquares(rosenbrock(), [-1.2, 1]);
    expect(res.jacobianEvaluations).toBe(res.acceptedSteps + 1);
    expect(res.residualEvaluations).toBe(res.iterations + 1); // one plain evaluation at the start
    expect(res.iterations).toBeGreaterThan(res.acceptedSteps); // some trials were rejected
  });

  it('reports every trial step, with a cost that never rises', () => {
    const costs: number[] = [];
    let count = 0;
    const res = solveLeastSquares(rosenbrock(), [-1.2, 1], {
      onIteration: (p) => {
        count++;
        costs.push(p.cost);
        if (p.accepted) expect(p.trialCost).toBeLessThan(costs.at(-2) ?? Infinity);
      },
    });
    expect(count).toBe(res.iterations);
    for (let i = 1; i < costs.length; i++) expect(costs[i]!).toBeLessThanOrEqual(costs[i - 1]!);
  });

  it('says in words why it stopped', () => {
    const res = solveLeastSquares(exponential(), [1, 1]);
    expect(res.status).toBe('converged');
    expect(res.message).toMatch(/relative cost change below 1e-14|relative step below 1e-10|scaled gradient below 1e-10|residuals are zero/);
    expect(res.theta[0]).toBeCloseTo(2, 8);
    expect(res.theta[1]).toBeCloseTo(1.5, 8);
  });

  it('treats a failed trial evaluation (null) as a rejected step and still converges', () => {
    // From (1, 1) the first trial step overshoots to b = 2.3, where the "simulation" fails (b > 2).
    const res = solveLeastSquares(exponential({ failAbove: 2 }), [1, 1]);
    expect(res.status).toBe('converged');
    expect(res.failedEvaluations).toBeGreaterThan(0);
    expect(res.theta[1]).toBeCloseTo(1.5, 6);
  });

  it('treats a failure answered with its words ({ failed }) as a rejected step', () => {
    const res = solveLeastSquares(exponential({ failWithWordsAbove: 2 }), [1, 1]);
    expect(res.status).toBe('converged');
    expect(res.failedEvaluations).toBeGreaterThan(0);
    expect(res.theta[0]).toBeCloseTo(2, 6);
  });

  it('fails clearly, without throwing, when the start point cannot be evaluated', () => {
    const res = solveLeastSquares(exponential({ failWithWordsAbove: 1 }), [1, 3]);
    expect(res.status).toBe('failed');
    expect(res.reason).toBe('start-failed');
    expect(res.message).toContain('cannot be computed at the start point');
    expect(res.message).toContain('trial simulation diverged');
    expect(res.iterations).toBe(0);
  });

  it('catches nothing: an error a callback throws (a bug, or even a RunFailure) propagates', () => {
    expect(() => solveLeastSquares(exponential({ throwAbove: 1 }), [1, 3])).toThrow(RunFailure);
    const p: LeastSquaresProblem = {
      residuals: () => {
        throw new TypeError('bug');
      },
      residualsAndJacobian: () => {
        throw new TypeError('bug');
      },
    };
    expect(() => solveLeastSquares(p, [1])).toThrow(TypeError);
  });

  it('keeps the bounds and ends on the bound that holds back the unconstrained optimum', () => {
    const p = { ...exponential(), lower: [0, 0], upper: [10, 1.2] };
    const res = solveLeastSquares(p, [1, 0.5]);
    expect(res.status).toBe('converged');
    expect(res.theta[1]).toBe(1.2);
    expect(res.atBound).toEqual([false, 'upper']);
    // With b held at 1.2, a is the linear least-squares fit of y on exp(1.2 x): sum(y e)/sum(e^2).
    const x = Array.from({ length: 11 }, (_, i) => i / 10);
    const e = x.map((xi) => Math.exp(1.2 * xi));
    const y = x.map((xi) => 2 * Math.exp(1.5 * xi));
    const aBest = e.reduce((s, ei, i) => s + ei * y[i]!, 0) / e.reduce((s, ei) => s + ei * ei, 0);
    expect(res.theta[0]).toBeCloseTo(aBest, 8);
  });

  it('never evaluates outside the bounds', () => {
    const seen: number[][] = [];
    const base = exponential();
    const p: LeastSquaresProblem = {
      lower: [0.5, -1],
      upper: [3, 1.2],
      residuals: (t) => (seen.push([...t]), base.residuals(t)),
      residualsAndJacobian: (t) => (seen.push([...t]), base.residualsAndJacobian(t)),
    };
    solveLeastSquares(p, [5, -3]); // start outside: projected first
    for (const t of seen) {
      expect(t[0]).toBeGreaterThanOrEqual(0.5);
      expect(t[0]).toBeLessThanOrEqual(3);
      expect(t[1]).toBeGreaterThanOrEqual(-1);
      expect(t[1]).toBeLessThanOrEqual(1.2);
    }
  });

  it("stops with status 'stopped' at the iteration limit", () => {
    const res = solveLeastSquares(rosenbrock(), [-1.2, 1], { maxIterations: 3 });
    expect(res.status).toBe('stopped');
    expect(res.reason).toBe('iterations');
    expect(res.message).toBe('iteration limit 3 reached before convergence');
    expect(res.iterations).toBe(3);
    expect(res.jacobian.rows).toBe(2); // still a usable Jacobian at the last point
  });

  it('stops at once, and says why, when every entry sits on a bound the cost wants to cross', () => {
    const p: LeastSquaresProblem = {
      lower: [0],
      upper: [2],
      residuals: (t) => [t[0]! - 5],
      residualsAndJacobian: (t) => ({ residuals: [t[0]! - 5], jacobian: [[1]] }),
    };
    const res = solveLeastSquares(p, [2]);
    expect(res.status).toBe('converged');
    expect(res.message).toBe('every entry is held at a bound and the cost would only fall outside the bounds');
    expect(res.atBound).toEqual(['upper']);
    expect(res.iterations).toBe(0);
  });

  it('reports zero residuals as an exact fit', () => {
    const p: LeastSquaresProblem = {
      residuals: (t) => [t[0]! - 3],
      residualsAndJacobian: (t) => ({ residuals: [t[0]! - 3], jacobian: [[1]] }),
    };
    const res = solveLeastSquares(p, [3]);
    expect(res.reason).toBe('zero-residual');
    expect(res.cost).toBe(0);
  });

  it('accepts a row-major Float64Array Jacobian', () => {
    const base = exponential();
    const p: LeastSquaresProblem = {
      residuals: base.residuals,
      residualsAndJacobian: (t) => {
        const rj = base.residualsAndJacobian(t);
        if (rj === null || 'failed' in rj) return rj;
        const m = rj.jacobian as Matrix;
        return { residuals: rj.residuals, jacobian: Float64Array.from(m.to1DArray()) };
      },
    };
    const res = solveLeastSquares(p, [1, 1]);
    expect(res.theta[1]).toBeCloseTo(1.5, 8);
  });
});

describe('solveLeastSquares with a noisy cost (as from adaptive ODE integration)', () => {
  // y = a exp(b x) fitted to data with a small misfit; the plain path adds a deterministic but
  // discontinuous relative error of about 1e-13 to the model (rounding-like noise that makes the
  // cost jitter by about 1e-11, well above the 1e-14 cost tolerance), and the Jacobian path returns
  // residuals whose model differs from the plain one by a relative 1e-6 (as a simulation with
  // sensitivities, which takes other integration steps, does).
  const x = Array.from({ length: 21 }, (_, i) => i / 20);
  const y = x.map((xi) => 2 * Math.exp(1.5 * xi) + 0.01 * Math.sin(40 * xi)); // a small misfit, nonzero optimum cost
  const jitter = (t: readonly number[], i: number) => {
    const h = Math.sin((t[0]! * 1e9 + t[1]! * 7e9 + i * 13.1) % 1e4) * 43758.5453;
    return (h - Math.floor(h) - 0.5) * 2e-13;
  };
  const model = (t: readonly number[], xi: number) => t[0]! * Math.exp(t[1]! * xi);
  const problem: LeastSquaresProblem = {
    residuals: (t) => x.map((xi, i) => y[i]! - model(t, xi) * (1 + jitter(t, i))),
    residualsAndJacobian: (t) => ({
      residuals: x.map((xi, i) => y[i]! - model(t, xi) * (1 + 1e-6)),
      jacobian: x.map((xi) => [-Math.exp(t[1]! * xi), -t[0]! * xi * Math.exp(t[1]! * xi)]),
    }),
  };

  it('converges in a few steps instead of shrinking the trust region trial after trial', () => {
    const res = solveLeastSquares(problem, [1, 1]);
    expect(res.status).toBe('converged');
    expect(res.theta[0]).toBeCloseTo(2, 2);
    expect(res.theta[1]).toBeCloseTo(1.5, 2);
    // Which convergence test fires first (cost, or a step already below 1e-10 relative) depends on
    // the last bits of the steps, since the jitter hashes theta; trial-after-trial shrinking (the
    // failure this guards against) shows in the rejected-trial count below.
    expect(['cost-change', 'newton-gain', 'cost-change-and-step', 'newton-gain-and-step', 'step']).toContain(res.reason);
    expect(res.message).toMatch(/relative (cost change|step)/);
    // A rejected first trial (far start) and at most one noise-rejected trial at the end.
    expect(res.iterations).toBeLessThanOrEqual(9);
    expect(res.iterations - res.acceptedSteps).toBeLessThanOrEqual(2);
    // The cost reported is the plain path's, the one the trials were compared with.
    expect(res.cost).toBeCloseTo(Array.from(problem.residuals(res.theta) as ArrayLike<number>).reduce((s, r) => s + r * r, 0), 15);
  });
});
