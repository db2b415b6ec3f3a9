/** The generic bounded least-squares solver (see levenberg-marquardt.ts). */
export { solveLeastSquares } from './levenberg-marquardt.js';
export { SOLVER_DEFAULTS } from './defaults.js';
export { STOP_REASONS, stopMessage, type StopDetails, type StopReasonEntry } from './stop-reasons.js';
export type {
  EvaluationAnswer,
  EvaluationFailed,
  JacobianInput,
  LeastSquaresProblem,
  ResidualsWithJacobian,
  SolverOptions,
  SolverProgress,
  SolverResult,
  StopReason,
  StopStatus,
} from './types.js';
