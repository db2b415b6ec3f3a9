/**
 * Default stopping rules of the least-squares solver, and why.
 *
 * - 500 trial steps (accepted or rejected; each costs one residual evaluation). A well-posed fit
 *   from a sensible start needs 5-50. Parameters strung along a curved valley make
 *   Levenberg-Marquardt crawl: on the NIST StRD problems from their close starts (start 2) this
 *   method needs up to 205 (Bennett5) and 125 (MGH10); from the far starts (start 1) MGH09, MGH17
 *   and Bennett5 need 500-760. A run that hits the limit says so (status 'stopped'); the user can
 *   raise it (`--max-iterations`) or start closer.
 * - 1e-14 on the relative cost change (actual and predicted reduction of the sum of squares). Its
 *   meaning in statistical terms: a step whose predicted relative reduction is e has the length
 *   sqrt(e * (N - p)) standard errors (Mahalanobis length under the fit's own covariance). So 1e-14
 *   stops when the remaining step is about 1e-6 standard errors, which is what the NIST StRD
 *   problems need for 6 correct digits on weakly determined parameters (ENSO, Thurber, MGH09 stop
 *   with 4-5 digits at 1e-10, because Gauss-Newton converges only linearly on large-residual
 *   problems). It is about 50 rounding units of the sum. When rounding or integration noise in the
 *   cost is larger, the actual change never passes it; a full (undamped) Gauss-Newton step whose
 *   predicted relative reduction is below it then counts as convergence (the linear model says
 *   nothing is left to gain), and otherwise rejected trials shrink the trust radius by 10 each until
 *   the step test below ends the run.
 * - 1e-10 on the relative step (trust radius against ||D theta||), 1e-10 on the scaled gradient
 *   (the largest cosine between a Jacobian column and the residual vector, MINPACK's measure).
 * - A first trust radius of 100 times the scaled length of the start vector (MINPACK's factor),
 *   cut to the first step's length: a start that is far off may move freely.
 */
export const SOLVER_DEFAULTS = {
  maxIterations: 500,
  costTolerance: 1e-14,
  stepTolerance: 1e-10,
  gradientTolerance: 1e-10,
  initialRadiusFactor: 100,
} as const;
