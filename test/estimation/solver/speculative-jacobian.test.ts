/**
 * SolverOptions.speculativeJacobian: trials the linear model vouches for are evaluated with their
 * Jacobian straight away. Checked on a problem whose two evaluation paths differ (the Jacobian
 * path's model is off by a relative 1e-7, as a simulation with sensitivities takes other
 * integration steps than a plain one): same optimum, fewer evaluations in all, and every cost
 * compared or returned comes from the plain path.
 */
import { describe, expect, it } from 'vitest';
import { solveLeastSquares } from '../../../src/estimation/solver/index.js';
import type { LeastSquaresProblem, SolverOptions } from '../../../src/estimation/solver/index.js';

// y = a exp(-b x) + c with a small misfit, data of our own (only the solver's behaviour is checked).
const x = Array.from({ length: 40 }, (_, i) => i * 0.1);
const y = x.map((xi, i) => 5 * Math.exp(-0.7 * xi) + 0.5 + 0.01 * Math.sin(3 * i));

function counted(): { problem: LeastSquaresProblem; plain: () => number; withJacobian: () => number } {
  let plain = 0;
  let withJacobian = 0;
  const model = (t: readonly number[], xi: number) => t[0]! * Math.exp(-t[1]! * xi) + t[2]!;
  return {
    problem: {
      residuals: (t) => {
        plain++;
        return x.map((xi, i) => y[i]! - model(t, xi));
      },
      residualsAndJacobian: (t) => {
        withJacobian++;
        return {
          residuals: x.map((xi, i) => y[i]! - model(t, xi) * (1 + 1e-7)),
          jacobian: x.map((xi) => [-Math.exp(-t[1]! * xi), t[0]! * xi * Math.exp(-t[1]! * xi), -1]),
        };
      },
    },
    plain: () => plain,
    withJacobian: () => withJacobian,
  };
}

const plainCost = (p: LeastSquaresProblem, theta: readonly number[]) => Array.from(p.residuals(theta) as ArrayLike<number>).reduce((s, r) => s + r * r, 0);

describe('speculative Jacobian trials', () => {
  const start = [2, 0.2, 0.1];
  const options: SolverOptions = { costTolerance: 1e-12 };

  it('reach the same optimum with fewer evaluations, comparing and returning plain-path costs only', () => {
    const off = counted();
    const on = counted();
    const progressOn: { cost: number; trialCost: number; accepted: boolean }[] = [];
    const a = solveLeastSquares(off.problem, start, options);
    const b = solveLeastSquares(on.problem, start, { ...options, speculativeJacobian: true, onIteration: (p) => progressOn.push(p) });
    expect(a.status).toBe('converged');
    expect(b.status).toBe('converged');
    for (let k = 0; k < 3; k++) expect(Math.abs(b.theta[k]! / a.theta[k]! - 1)).toBeLessThan(1e-6);
    // Work: a simulation with sensitivities is weighed as 2.5 plain ones (the ODE case it is for).
    const work = (c: ReturnType<typeof counted>) => c.plain() + 2.5 * c.withJacobian();
    expect(work(on)).toBeLessThan(work(off));
    expect(on.plain()).toBeLessThan(off.plain());
    // Returned cost from the plain path, at the returned point (the Jacobian path's differs by ~1e-5 here).
    expect(Math.abs(b.cost / plainCost(on.problem, b.theta) - 1)).toBeLessThan(1e-12);
    // Taken steps: the cost never rises.
    for (let k = 1; k < progressOn.length; k++) expect(progressOn[k]!.cost).toBeLessThanOrEqual(progressOn[k - 1]!.cost);
  });

  it('is off by default: every Jacobian evaluation is at the start or at a taken step', () => {
    const c = counted();
    const res = solveLeastSquares(c.problem, start, options);
    expect(res.jacobianEvaluations).toBe(res.acceptedSteps + 1);
    expect(c.withJacobian()).toBe(res.acceptedSteps + 1);
  });

  it('treats a speculative trial that fails or raises the cost as a rejected step', () => {
    const c = counted();
    let calls = 0;
    const flaky: LeastSquaresProblem = {
      residuals: c.problem.residuals,
      // Every third Jacobian evaluation after the start fails, as a diverging simulation would.
      residualsAndJacobian: (t) => (++calls > 1 && calls % 3 === 0 ? null : c.problem.residualsAndJacobian(t)),
    };
    const res = solveLeastSquares(flaky, start, { ...options, speculativeJacobian: true });
    expect(res.status).toBe('converged');
    expect(res.failedEvaluations).toBeGreaterThan(0);
    const ref = solveLeastSquares(counted().problem, start, options);
    for (let k = 0; k < 3; k++) expect(Math.abs(res.theta[k]! / ref.theta[k]! - 1)).toBeLessThan(1e-6);
  });
});
