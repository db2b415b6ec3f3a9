/**
 * The solver's side of the callbacks: one evaluation at a time, counted, checked (length, finite
 * numbers) and turned into a value that says ok or failed-with-words. Expected failures arrive as
 * values (EvaluationFailed or null, solver/types.ts); nothing here catches an exception, so an
 * error a callback throws is a bug and propagates.
 */
import { allFinite } from './dense.js';
import { RowMajorMatrix, toRowMajor } from './row-major.js';
import type { EvaluationAnswer, EvaluationFailed, LeastSquaresProblem, SolverOptions } from './types.js';

export type Evaluation = { ok: true; residuals: Float64Array; jacobian?: RowMajorMatrix } | { ok: false; why: string };

export interface Evaluator {
  /** Residuals (plain path) or residuals and Jacobian at theta; counted. */
  evaluate(theta: number[], withJacobian: boolean): Evaluation;
  /** From now on every evaluation must return this many residuals. */
  fixResidualCount(n: number): void;
  readonly counts: { residualEvaluations: number; jacobianEvaluations: number; failedEvaluations: number };
}

function isFailed<T>(answer: EvaluationAnswer<T>): answer is EvaluationFailed | null {
  return answer === null || (typeof answer === 'object' && typeof (answer as Partial<EvaluationFailed>).failed === 'string');
}

export function createEvaluator(problem: LeastSquaresProblem, p: number): Evaluator {
  const counts = { residualEvaluations: 0, jacobianEvaluations: 0, failedEvaluations: 0 };
  let nResiduals = -1;

  const checkResiduals = (raw: ArrayLike<number>): Evaluation => {
    if (nResiduals >= 0 && raw.length !== nResiduals) {
      throw new Error(`solver: the problem returned ${raw.length} residuals, earlier ${nResiduals}`);
    }
    const residuals = Float64Array.from(raw);
    if (!allFinite(residuals)) return { ok: false, why: 'some residuals are not finite numbers' };
    return { ok: true, residuals };
  };
  const withJacobian = (theta: number[]): Evaluation => {
    const rj = problem.residualsAndJacobian(theta.slice());
    if (isFailed(rj)) return { ok: false, why: rj?.failed ?? 'the residuals and Jacobian could not be computed' };
    const out = checkResiduals(rj.residuals);
    if (!out.ok) return out;
    const jac = toRowMajor(rj.jacobian, out.residuals.length, p);
    return allFinite(jac.data) ? { ...out, jacobian: jac } : { ok: false, why: 'some Jacobian entries are not finite numbers' };
  };
  const plain = (theta: number[]): Evaluation => {
    const r = problem.residuals(theta.slice());
    return isFailed(r) ? { ok: false, why: r?.failed ?? 'the residuals could not be computed' } : checkResiduals(r);
  };

  return {
    evaluate(theta, jacobianToo) {
      if (jacobianToo) counts.jacobianEvaluations++;
      else counts.residualEvaluations++;
      const out = jacobianToo ? withJacobian(theta) : plain(theta);
      if (!out.ok) counts.failedEvaluations++;
      return out;
    },
    fixResidualCount(n) {
      nResiduals = n;
    },
    counts,
  };
}

/** The caller's evaluation at the start, checked like one of ours; undefined when unusable. */
export function takeInitial(initial: NonNullable<SolverOptions['initial']>, p: number): Evaluation | undefined {
  const residuals = Float64Array.from(initial.residuals);
  if (!allFinite(residuals)) return undefined;
  const jacobian = toRowMajor(initial.jacobian, residuals.length, p);
  return allFinite(jacobian.data) ? { ok: true, residuals, jacobian } : undefined;
}
