/**
 * Test helper: the NIST StRD nonlinear regression problems (fixtures written by
 * scripts/make-nist-fixtures.mjs from NIST Statistical Reference Datasets, Nonlinear Regression,
 * itl.nist.gov/div898/strd/nls) as generic least-squares problems for the solver.
 *
 * Model and exact Jacobian come from the fixture's expression through mathjs `parse`, `derivative`
 * and `compile` (slow evaluation is fine for tests).
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { compile, derivative, parse } from 'mathjs';
import type { LeastSquaresProblem, ResidualsWithJacobian } from '../../../src/estimation/solver/index.js';

/** A NIST problem never fails to evaluate: its callbacks answer plain values. */
export interface NistLeastSquares extends LeastSquaresProblem {
  residuals(theta: readonly number[]): Float64Array;
  residualsAndJacobian(theta: readonly number[]): ResidualsWithJacobian & { residuals: Float64Array; jacobian: Float64Array };
  evaluations(): number;
}

export interface NistFixture {
  source: string;
  dataset: string;
  difficulty: 'lower' | 'average' | 'higher';
  response: string;
  model: string;
  predictors: string[];
  parameters: string[];
  start1: number[];
  start2: number[];
  certified: number[];
  certifiedStdDev: number[];
  residualSumOfSquares: number;
  residualStdDev: number;
  degreesOfFreedom: number;
  observations: number;
  data: Record<string, number[]>;
}

/** NIST's order (lower, average, higher difficulty). */
export const NIST_NAMES = [
  'Misra1a', 'Chwirut2', 'Chwirut1', 'Lanczos3', 'Gauss1', 'Gauss2', 'DanWood', 'Misra1b',
  'Kirby2', 'Hahn1', 'Nelson', 'MGH17', 'Lanczos1', 'Lanczos2', 'Gauss3', 'Misra1c', 'Misra1d', 'Roszman1', 'ENSO',
  'MGH09', 'Thurber', 'BoxBOD', 'Rat42', 'MGH10', 'Eckerle4', 'Rat43', 'Bennett5',
] as const;

const fixtureDir = join(dirname(fileURLToPath(import.meta.url)), '../../fixtures/nist');

export function loadNist(name: string): NistFixture {
  return JSON.parse(readFileSync(join(fixtureDir, `${name}.json`), 'utf8')) as NistFixture;
}

/** The measured response: y, or log(y) for Nelson (its model describes log(y)). */
export function responseValues(f: NistFixture): number[] {
  const y = f.data.y as number[];
  if (f.response === 'y') return y;
  if (f.response === 'log(y)') return y.map(Math.log);
  throw new Error(`unknown response ${f.response}`);
}

export function nistProblem(f: NistFixture): NistLeastSquares {
  const tree = parse(f.model);
  const model = tree.compile();
  const partials = f.parameters.map((b) => compile(derivative(tree, b).toString()));
  const y = responseValues(f);
  const n = y.length;
  const p = f.parameters.length;
  const scopes = Array.from({ length: n }, (_, i) => {
    const s: Record<string, number> = {};
    for (const c of f.predictors) s[c] = (f.data[c] as number[])[i] as number;
    return s;
  });
  let count = 0;
  const setParams = (theta: readonly number[]) => {
    for (const s of scopes) for (let k = 0; k < p; k++) s[f.parameters[k] as string] = theta[k] as number;
  };
  const residuals = (theta: readonly number[]) => {
    count++;
    setParams(theta);
    return Float64Array.from(scopes, (s, i) => (y[i] as number) - (model.evaluate(s) as number));
  };
  return {
    residuals,
    residualsAndJacobian(theta) {
      const r = residuals(theta);
      const jac = new Float64Array(n * p);
      for (let i = 0; i < n; i++) {
        for (let k = 0; k < p; k++) jac[i * p + k] = -((partials[k] as { evaluate(s: object): number }).evaluate(scopes[i] as object));
      }
      return { residuals: r, jacobian: jac };
    },
    evaluations: () => count,
  };
}

/** Log relative error: the number of correct significant digits (capped at 11, NIST's precision). */
export function lre(estimate: number, certified: number): number {
  if (estimate === certified) return 11;
  const rel = certified === 0 ? Math.abs(estimate) : Math.abs(estimate - certified) / Math.abs(certified);
  if (!Number.isFinite(rel)) return 0;
  return Math.max(0, Math.min(11, -Math.log10(rel)));
}
