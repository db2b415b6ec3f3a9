/** The generic bounded least-squares solver (see levenberg-marquardt.ts). */
export { solveLeastSquares } from './levenberg-marquardt.js';
export { SOLVER_DEFAULTS } from './defaults.js';
export { RowMajorMatrix } from './row-major.js';
export type {
  JacobianInput,
  LeastSquaresProblem,
  ResidualsWithJacobian,
  SolverOptions,
  SolverProgress,
  SolverResult,
  StopReason,
} from './types.js';
