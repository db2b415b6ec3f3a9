/** Identifiability in words from the singular values of the scaled Jacobian. */
import { describe, expect, it } from 'vitest';
import { analyseIdentifiability } from '../../../src/estimation/identifiability.js';
import { solveLeastSquares } from '../../../src/estimation/solver/index.js';
import { computeUncertainty } from '../../../src/estimation/uncertainty.js';

const X = [0.5, 1, 1.5, 2, 2.5, 3, 3.5, 4];
const Y = [1.1, 1.9, 3.1, 4.0, 5.1, 5.9, 7.2, 7.9];

/** Fit y = f(x, p) (f and its gradient given per point) and analyse the result. */
function analyse(
  f: (x: number, p: number[]) => number,
  grad: (x: number, p: number[]) => number[],
  start: number[],
  names: string[],
  scales?: ('log' | 'linear')[],
) {
  // theta -> parameter values (exp for log coordinates)
  const val = (t: readonly number[]) => t.map((v, i) => (scales?.[i] === 'log' ? Math.exp(v) : v));
  const residuals = (t: readonly number[]) => X.map((x, i) => Y[i]! - f(x, val(t)));
  const jacobian = (t: readonly number[]) => {
    const p = val(t);
    return X.map((x) => grad(x, p).map((g, k) => -g * (scales?.[k] === 'log' ? p[k]! : 1)));
  };
  const theta0 = start.map((v, i) => (scales?.[i] === 'log' ? Math.log(v) : v));
  const res = solveLeastSquares({ residuals, residualsAndJacobian: (t) => ({ residuals: residuals(t), jacobian: jacobian(t) }) }, theta0);
  const unc = computeUncertainty({ jacobian: res.jacobian, residuals: res.residuals, theta: res.theta, names, scales, sigmaEstimated: true });
  const ident = analyseIdentifiability({
    jacobian: res.jacobian,
    observations: X.length,
    names,
    theta: res.theta,
    scales,
    correlation: unc.correlation.matrix,
  });
  return { res, unc, ident };
}

describe('analyseIdentifiability', () => {
  it('y = (k/m) x in linear coordinates: only k/m is determined', () => {
    const { ident, unc } = analyse((x, [k, m]) => (k! / m!) * x, (x, [k, m]) => [x / m!, (-k! * x) / m! ** 2], [3, 2], ['k', 'm']);
    expect(ident.problems).toHaveLength(1);
    expect(ident.problems[0]!.parameters).toEqual(['k', 'm']);
    expect(ident.problems[0]!.message).toBe('k and m move together: only the ratio k/m is determined by these data');
    expect(ident.conditionNumber === null || ident.conditionNumber > 1e6).toBe(true);
    expect(unc.parameters.map((p) => p.stdError)).toEqual([null, null]);
    expect(JSON.stringify({ ident, unc })).not.toContain('NaN');
  });

  it('y = (k/m) x in log coordinates: a direction (+1, +1) in (ln k, ln m), only k/m', () => {
    const { ident } = analyse((x, [k, m]) => (k! / m!) * x, (x, [k, m]) => [x / m!, (-k! * x) / m! ** 2], [3, 2], ['k', 'm'], ['log', 'log']);
    expect(ident.problems[0]!.message).toBe('k and m move together: only the ratio k/m is determined by these data');
    const [a, b] = ident.problems[0]!.direction!;
    expect(Math.sign(a!)).toBe(Math.sign(b!));
  });

  it('y = k m x in log coordinates: a direction (+1, -1), only the product k*m', () => {
    const { ident } = analyse((x, [k, m]) => k! * m! * x, (x, [k, m]) => [m! * x, k! * x], [3, 0.5], ['k', 'm'], ['log', 'log']);
    expect(ident.problems[0]!.message).toBe('k and m move in opposite directions: only the product k*m is determined by these data');
  });

  it('y = (a + b) x in linear coordinates: only the sum a + b', () => {
    const { ident } = analyse((x, [a, b]) => (a! + b!) * x, (x) => [x, x], [0.3, 1.5], ['a', 'b']);
    expect(ident.problems[0]!.message).toBe('a and b move in opposite directions: only the sum a + b is determined by these data');
  });

  it('y = k m^2 x in log coordinates: a power law', () => {
    const { ident } = analyse((x, [k, m]) => k! * m! * m! * x, (x, [k, m]) => [m! * m! * x, 2 * k! * m! * x], [1, 1.5], ['k', 'm'], ['log', 'log']);
    // Invariant: ln k + 2 ln m, i.e. k*m^2.
    expect(ident.problems[0]!.message).toContain('only k*m^2 is determined');
  });

  it('a parameter without influence on the outputs', () => {
    const { ident, unc } = analyse((x, [s]) => s! * x, (x) => [x, 0], [1, 7], ['s', 'unused']);
    expect(ident.problems[0]!.message).toMatch(/^unused has no influence on the fit at these values: these data do not determine it/);
    expect(unc.parameters[0]!.stdError).not.toBeNull();
    expect(unc.parameters[1]!.stdError).toBeNull();
    expect(ident.conditionNumber).toBeNull(); // exactly zero singular value
  });

  it('three parameters in one weak direction are listed with their proportions', () => {
    const { ident } = analyse((x, [a, b, c]) => (a! + b! + c!) * x, (x) => [x, x, x], [1, 0.5, 0.5], ['a', 'b', 'c']);
    // Two null directions in the 3-d space orthogonal to (1, 1, 1).
    expect(ident.problems).toHaveLength(2);
    for (const pr of ident.problems) expect(pr.message).toMatch(/not determined separately|move/);
  });

  it('y = (k/m) x + (c/m) x^2: m, k and c move together, only the ratios k/m and c/m (a mass that was not weighed)', () => {
    const { ident, unc } = analyse(
      (x, [m, k, c]) => (k! / m!) * x + (c! / m!) * x * x,
      (x, [m, k, c]) => [-(k! * x + c! * x * x) / m! ** 2, x / m!, (x * x) / m!],
      [2, 3, 0.2],
      ['m', 'k', 'c'],
    );
    expect(ident.problems).toHaveLength(1);
    expect(ident.problems[0]!.message).toBe('m, k and c move together: only the ratios k/m and c/m are determined by these data, not each parameter');
    expect(unc.parameters.map((p) => p.stdError)).toEqual([null, null, null]);
  });

  it('flags a pair with |correlation| > 0.95 in a sentence, without calling it undetermined', () => {
    // Straight line far from x = 0: intercept and slope strongly (negatively) correlated.
    const x0 = 10;
    const { ident, unc } = analyse((x, [a, b]) => a! + b! * (x + x0), (x) => [1, x + x0], [0, 1], ['a', 'b']);
    expect(ident.problems).toHaveLength(0);
    expect(unc.correlation.matrix[0]![1]!).toBeLessThan(-0.95);
    expect(ident.warnings.some((w) => w.startsWith('a and b are strongly correlated (correlation -0.99') && w.includes('opposite directions'))).toBe(true);
  });

  it('a well-posed problem has no problems and a modest condition number', () => {
    const { ident } = analyse((x, [a, b]) => a! + b! * x, (x) => [1, x], [0, 1], ['a', 'b']);
    expect(ident.problems).toHaveLength(0);
    expect(ident.warnings).toHaveLength(0);
    expect(ident.conditionNumber!).toBeGreaterThan(1);
    expect(ident.conditionNumber!).toBeLessThan(10);
  });
});

describe('analyseIdentifiability, linear combinations', () => {
  it('y = (a + 2 b) x in linear coordinates: only a + 2*b', () => {
    const { ident } = analyse((x, [a, b]) => (a! + 2 * b!) * x, (x) => [x, 2 * x], [0.3, 1.5], ['a', 'b']);
    expect(ident.problems).toHaveLength(1);
    expect(ident.problems[0]!.message).toContain('a + 2*b');
  });
});
