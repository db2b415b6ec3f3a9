/** Standard errors, intervals and correlations from the Jacobian at the optimum. */
import { describe, expect, it } from 'vitest';
import { solveLeastSquares, type LeastSquaresProblem } from '../../../src/estimation/solver/index.js';
import { computeUncertainty } from '../../../src/estimation/uncertainty.js';

// Anscombe's quartet, data set I (F. J. Anscombe, "Graphs in Statistical Analysis", The American
// Statistician 27(1), 1973, pp. 17-21).
const ANSCOMBE_X = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
const ANSCOMBE_Y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];

/** y = a + b x as a least-squares problem (residual = y - model), theta = (a, b). */
function straightLine(x: number[], y: number[]): LeastSquaresProblem {
  const residuals = (t: readonly number[]) => x.map((xi, i) => y[i]! - t[0]! - t[1]! * xi);
  return { residuals, residualsAndJacobian: (t) => ({ residuals: residuals(t), jacobian: x.map((xi) => [-1, -xi]) }) };
}

describe('computeUncertainty', () => {
  const fit = solveLeastSquares(straightLine(ANSCOMBE_X, ANSCOMBE_Y), [0, 0]);
  const unc = computeUncertainty({ jacobian: fit.jacobian, residuals: fit.residuals, theta: fit.theta, names: ['a', 'b'], sigmaEstimated: true });

  it("reproduces Anscombe's published regression (data set I)", () => {
    // Anscombe (1973), table of common statistics, quoted from memory: y = 3.00 + 0.500 x,
    // standard error of the slope 0.118, residual sum of squares 13.75, sum of squares of x - mean 110.
    expect(fit.theta[0]).toBeCloseTo(3.0, 2);
    expect(fit.theta[1]).toBeCloseTo(0.5, 3);
    expect(unc.parameters[1]!.stdError).toBeCloseTo(0.118, 3);
    expect(Math.abs(unc.weightedSSE - 13.75)).toBeLessThan(0.02); // the paper rounds the four sets' common value
    expect(unc.dof).toBe(9);
  });

  it('matches the closed form C = s^2 (X^T X)^-1 of linear regression', () => {
    // Any regression textbook: var(b) = s^2 / Sxx, var(a) = s^2 (1/n + mean^2 / Sxx), cov = -mean s^2 / Sxx.
    const n = ANSCOMBE_X.length;
    const mean = ANSCOMBE_X.reduce((s, v) => s + v, 0) / n;
    const sxx = ANSCOMBE_X.reduce((s, v) => s + (v - mean) ** 2, 0);
    const s2 = unc.weightedSSE / (n - 2);
    expect(unc.residualVariance).toBeCloseTo(s2, 12);
    expect(unc.covariance[1]![1]!).toBeCloseTo(s2 / sxx, 12);
    expect(unc.covariance[0]![0]!).toBeCloseTo(s2 * (1 / n + (mean * mean) / sxx), 12);
    expect(unc.covariance[0]![1]!).toBeCloseTo((-mean * s2) / sxx, 12);
    const corr = -mean / sxx / Math.sqrt((1 / n + (mean * mean) / sxx) / sxx);
    expect(unc.correlation.matrix[0]![1]!).toBeCloseTo(corr, 10);
    expect(unc.correlation.matrix[0]![0]).toBe(1);
  });

  it('gives Student-t 95 % intervals: estimate +- t(0.975, 9) se, t = 2.262', () => {
    // t(0.975, 9) = 2.262: table of Student's t in any statistics textbook.
    expect(unc.tQuantile!).toBeCloseTo(2.262, 3);
    const b = unc.parameters[1]!;
    expect(b.ci95![0]).toBeCloseTo(b.estimate - unc.tQuantile! * b.stdError!, 12);
    expect(b.ci95![1]).toBeCloseTo(b.estimate + unc.tQuantile! * b.stdError!, 12);
    expect(b.intervalReliable).toBe(true);
  });

  it('uses s^2 = 1 when every sigma was given, and reports the reduced chi-square', () => {
    const given = computeUncertainty({ jacobian: fit.jacobian, residuals: fit.residuals, theta: fit.theta, names: ['a', 'b'], sigmaEstimated: false });
    expect(given.residualVariance).toBe(1);
    expect(given.reducedChiSquare).toBeCloseTo(unc.weightedSSE / 9, 12);
    expect(unc.reducedChiSquare).toBeUndefined();
    // se scales with s: given-sigma se = estimated-sigma se / s.
    expect(given.parameters[1]!.stdError!).toBeCloseTo(unc.parameters[1]!.stdError! / Math.sqrt(unc.residualVariance!), 12);
  });

  it('returns null (never NaN) standard errors when only the ratio k/m is determined, and keeps the determined ones', () => {
    // y = (k/m) x + c: k and m enter only through k/m; c is separately determined.
    const x = [1, 2, 3, 4, 5, 6];
    const y = [2.1, 3.9, 6.2, 7.8, 10.1, 12.0].map((v) => v + 1);
    const residuals = (t: readonly number[]) => x.map((xi, i) => y[i]! - (t[0]! / t[1]!) * xi - t[2]!);
    const jac = (t: readonly number[]) => x.map((xi) => [-xi / t[1]!, (t[0]! * xi) / t[1]! ** 2, -1]);
    const res = solveLeastSquares({ residuals, residualsAndJacobian: (t) => ({ residuals: residuals(t), jacobian: jac(t) }) }, [3, 1.5, 0]);
    const u = computeUncertainty({ jacobian: res.jacobian, residuals: res.residuals, theta: res.theta, names: ['k', 'm', 'c'], sigmaEstimated: true });
    expect(u.parameters[0]!.stdError).toBeNull();
    expect(u.parameters[0]!.ci95).toBeNull();
    expect(u.parameters[1]!.stdError).toBeNull();
    expect(u.parameters[0]!.determined).toBe(false);
    expect(u.rank).toBe(2);
    // c is determined: the closed form of the intercept's variance for the line y = s x + c.
    const n = x.length;
    const mean = x.reduce((s, v) => s + v, 0) / n;
    const sxx = x.reduce((s, v) => s + (v - mean) ** 2, 0);
    const s2 = u.weightedSSE / (n - 3); // N - p with p = 3 free entries
    expect(u.parameters[2]!.stdError!).toBeCloseTo(Math.sqrt(s2 * (1 / n + (mean * mean) / sxx)), 10);
    expect(u.correlation.matrix[0]![2]).toBeNull();
    expect(JSON.stringify(u)).not.toContain('NaN');
  });

  it('log coordinates: delta-method se equals the se of a fit in linear coordinates, interval is exp of the log interval', () => {
    // y = b x, fitted once with theta = b and once with theta = ln b.
    const x = [1, 2, 3, 4, 5];
    const y = [2.2, 3.8, 6.3, 7.9, 10.4];
    const linRes = (t: readonly number[]) => x.map((xi, i) => y[i]! - t[0]! * xi);
    const logRes = (t: readonly number[]) => x.map((xi, i) => y[i]! - Math.exp(t[0]!) * xi);
    const lin = solveLeastSquares({ residuals: linRes, residualsAndJacobian: (t) => ({ residuals: linRes(t), jacobian: x.map((xi) => [-xi]) }) }, [1]);
    const log = solveLeastSquares(
      { residuals: logRes, residualsAndJacobian: (t) => ({ residuals: logRes(t), jacobian: x.map((xi) => [-Math.exp(t[0]!) * xi]) }) },
      [0],
    );
    const uLin = computeUncertainty({ jacobian: lin.jacobian, residuals: lin.residuals, theta: lin.theta, names: ['b'], sigmaEstimated: true });
    const uLog = computeUncertainty({ jacobian: log.jacobian, residuals: log.residuals, theta: log.theta, names: ['b'], scales: ['log'], sigmaEstimated: true });
    const bLin = uLin.parameters[0]!;
    const bLog = uLog.parameters[0]!;
    expect(bLog.estimate).toBeCloseTo(bLin.estimate, 10);
    // Delta method: se_b = b * se_ln(b); at the same optimum it equals the linear fit's se exactly.
    expect(bLog.stdError!).toBeCloseTo(bLin.stdError!, 10);
    expect(uLog.covariance[0]![0]!).toBeCloseTo(uLin.covariance[0]![0]!, 12);
    // Interval: exp(ln b -+ t se_ln b): positive, asymmetric (longer above), same t.
    const seLn = bLog.stdError! / bLog.estimate;
    const t = uLog.tQuantile!;
    expect(bLog.ci95![0]).toBeCloseTo(bLog.estimate * Math.exp(-t * seLn), 12);
    expect(bLog.ci95![1]).toBeCloseTo(bLog.estimate * Math.exp(t * seLn), 12);
    expect(bLog.ci95![1] - bLog.estimate).toBeGreaterThan(bLog.estimate - bLog.ci95![0]);
  });

  it('flags a parameter at a bound and marks its interval unreliable', () => {
    const u = computeUncertainty({
      jacobian: fit.jacobian,
      residuals: fit.residuals,
      theta: fit.theta,
      names: ['a', 'Tc'],
      sigmaEstimated: true,
      atBound: [false, 'lower'],
      bounds: [{ min: -10, max: 10 }, { min: 0, max: 0.2 }],
      units: ['', 'N*m'],
    });
    expect(u.parameters[1]!.intervalReliable).toBe(false);
    expect(u.parameters[1]!.atBound).toBe('lower');
    expect(u.warnings).toContain('Tc is at its lower bound 0 N*m; its interval is not reliable');
    expect(u.parameters[0]!.intervalReliable).toBe(true);
  });

  it('gives no intervals, and says why, when no degrees of freedom are left', () => {
    const r = straightLine([1, 2], [1, 3]);
    const res = solveLeastSquares(r, [0, 0]);
    const u = computeUncertainty({ jacobian: res.jacobian, residuals: res.residuals, theta: res.theta, names: ['a', 'b'], sigmaEstimated: true });
    expect(u.parameters.every((q) => q.stdError === null && q.ci95 === null)).toBe(true);
    expect(u.warnings[0]).toContain('no degrees of freedom');
    expect(JSON.stringify(u)).not.toContain('NaN');
  });
});
