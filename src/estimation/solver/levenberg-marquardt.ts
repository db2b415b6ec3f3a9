/**
 * Bounded trust-region Levenberg-Marquardt in the style of Moré (1978), the method of MINPACK's
 * lmder, with bounds kept by projection.
 *
 * Each iteration: the Jacobian's columns set the scaling D (running maximum of the column norms, so
 * the trust region never widens in a direction only because its column shrank); the damped step
 * comes from `dampedStep` (QR, trust radius Delta); the trial point is projected onto the bounds;
 * the ratio of actual to predicted cost reduction decides whether the step is taken (only when the
 * cost falls) and how Delta and the damping change. A trial whose residuals cannot be computed (a
 * diverging simulation) is a rejected step that shrinks Delta. Optional per-entry step limits
 * (`maxStep`) cut a trial step entry by entry, the same way as the bounds.
 *
 * cost = sum of squared residuals (SSE) throughout.
 */
import { RunFailure } from '../../errors.js';
import { boundStatus, movableEntries, project } from './bounds.js';
import { dampedStep } from './damped-step.js';
import { SOLVER_DEFAULTS } from './defaults.js';
import { allFinite, norm2, scaledNorm } from './dense.js';
import { columnNorms, multiplyColumns, RowMajorMatrix, toRowMajor, transposeTimes } from './row-major.js';
import { triangularFactor } from './tall-qr.js';
import type { LeastSquaresProblem, SolverOptions, SolverResult, StopReason } from './types.js';

const EPS = 2.220446049250313e-16;
/** A step is taken when it achieves at least this share of the predicted reduction (MINPACK's 1e-4). */
const ACCEPT_RATIO = 1e-4;
/**
 * Speculative Jacobian trials (SolverOptions.speculativeJacobian): least ratio of the last taken step,
 * least predicted gain. Only Gauss-Newton steps qualify: a step held to the trust radius just after
 * the radius grew is the solver probing, and is rejected often (measured on a saturating-curve fit
 * y = a (1 - exp(-b x)) from a far start: 5 of the 9 such trials that followed a step with ratio
 * >= 0.75 were rejected). On the ODE demo fits the trials in question are Gauss-Newton steps.
 */
const SPECULATE_AFTER_RATIO = 0.75;
const SPECULATE_MIN_GAIN = 1e-3;

type Evaluation = { ok: true; residuals: Float64Array; jacobian?: RowMajorMatrix } | { ok: false; why: string };

function describeFailure(err: unknown): string {
  return err instanceof Error ? err.message : String(err);
}

/** The caller's evaluation at the start, checked like one of ours; undefined when unusable. */
function takeInitial(initial: NonNullable<SolverOptions['initial']>, p: number): Evaluation | undefined {
  const residuals = Float64Array.from(initial.residuals);
  if (!allFinite(residuals)) return undefined;
  const jacobian = toRowMajor(initial.jacobian, residuals.length, p);
  return allFinite(jacobian.data) ? { ok: true, residuals, jacobian } : undefined;
}

function fmt(x: number): string {
  return x.toExponential(0).replace('e+', 'e');
}

/**
 * Minimise the sum of squared residuals of `problem` from `start` within its bounds.
 * Never throws for a failed evaluation (that is a rejected step, or status 'failed' at the start);
 * errors other than RunFailure thrown by the callbacks are bugs and propagate.
 */
export function solveLeastSquares(problem: LeastSquaresProblem, start: ArrayLike<number>, options: SolverOptions = {}): SolverResult {
  const maxIterations = options.maxIterations ?? SOLVER_DEFAULTS.maxIterations;
  const ftol = options.costTolerance ?? SOLVER_DEFAULTS.costTolerance;
  const xtol = options.stepTolerance ?? SOLVER_DEFAULTS.stepTolerance;
  const gtol = options.gradientTolerance ?? SOLVER_DEFAULTS.gradientTolerance;
  const factor = options.initialRadiusFactor ?? SOLVER_DEFAULTS.initialRadiusFactor;

  const p = start.length;
  const lower = Float64Array.from({ length: p }, (_, i) => (problem.lower ? (problem.lower[i] as number) : -Infinity));
  const upper = Float64Array.from({ length: p }, (_, i) => (problem.upper ? (problem.upper[i] as number) : Infinity));
  for (let i = 0; i < p; i++) {
    if (!(lower[i]! <= upper[i]!)) throw new Error(`solver: bounds of entry ${i} are empty or not numbers (${lower[i]}, ${upper[i]})`);
    if (!Number.isFinite(start[i] as number)) throw new Error(`solver: start value of entry ${i} is not finite`);
  }

  let residualEvaluations = 0;
  let jacobianEvaluations = 0;
  let failedEvaluations = 0;
  let nResiduals = -1;

  const checkResiduals = (raw: ArrayLike<number>): Evaluation => {
    if (nResiduals >= 0 && raw.length !== nResiduals) {
      throw new Error(`solver: the problem returned ${raw.length} residuals, earlier ${nResiduals}`);
    }
    const residuals = Float64Array.from(raw);
    if (!allFinite(residuals)) return { ok: false, why: 'some residuals are not finite numbers' };
    return { ok: true, residuals };
  };
  const evaluate = (theta: number[], withJacobian: boolean): Evaluation => {
    if (withJacobian) jacobianEvaluations++;
    else residualEvaluations++;
    let out: Evaluation;
    try {
      if (withJacobian) {
        const rj = problem.residualsAndJacobian(theta.slice());
        if (rj === null) {
          out = { ok: false, why: 'the residuals and Jacobian could not be computed' };
        } else {
          out = checkResiduals(rj.residuals);
          if (out.ok) {
            const jac = toRowMajor(rj.jacobian, out.residuals.length, p);
            out = allFinite(jac.data) ? { ...out, jacobian: jac } : { ok: false, why: 'some Jacobian entries are not finite numbers' };
          }
        }
      } else {
        const r = problem.residuals(theta.slice());
        out = r === null ? { ok: false, why: 'the residuals could not be computed' } : checkResiduals(r);
      }
    } catch (err) {
      if (!(err instanceof RunFailure)) throw err;
      out = { ok: false, why: describeFailure(err) };
    }
    if (!out.ok) failedEvaluations++;
    return out;
  };

  const maxStep = problem.maxStep ? Float64Array.from({ length: p }, (_, i) => problem.maxStep![i] as number) : undefined;
  if (maxStep?.some((m) => !(m > 0))) throw new Error('solver: every per-entry step limit must be positive (Infinity for none)');
  const stepLower = (th: readonly number[]) => Float64Array.from(th, (v, i) => Math.max(lower[i]!, v - maxStep![i]!));
  const stepUpper = (th: readonly number[]) => Float64Array.from(th, (v, i) => Math.min(upper[i]!, v + maxStep![i]!));

  const startProjection = project(start, lower, upper);
  let theta = startProjection.theta;
  // A warm start reuses the caller's evaluation at the start (only when the start needed no projection).
  const warm = options.initial && !startProjection.clipped ? takeInitial(options.initial, p) : undefined;
  const first = warm ?? evaluate(theta, true);
  if (!first.ok || !first.jacobian) {
    const why = first.ok ? 'no Jacobian' : first.why;
    return {
      status: 'failed',
      reason: 'start-failed',
      message: `the residuals cannot be computed at the start point: ${why}`,
      theta,
      cost: Number.NaN,
      residuals: new Float64Array(0),
      jacobian: RowMajorMatrix.zeros(0, p),
      gradientNorm: Number.NaN,
      scaledGradient: Number.NaN,
      iterations: 0,
      acceptedSteps: 0,
      residualEvaluations,
      jacobianEvaluations,
      failedEvaluations,
      atBound: boundStatus(theta, lower, upper),
    };
  }
  let J = first.jacobian;
  nResiduals = first.residuals.length;
  // The cost is always taken from `residuals`, the same path that evaluates the trial points: for
  // ODE models the simulation with sensitivities takes other integration steps, and its cost can
  // differ by a relative 1e-6; comparing trials with it would reject every small step near the
  // optimum. One plain evaluation at the start buys that consistency.
  const firstPlain = warm ?? evaluate(theta, false);
  let r = firstPlain.ok ? firstPlain.residuals : first.residuals;
  let fnorm = norm2(r);
  // Evaluation noise of the cost: how far the two paths disagree at one point (see noisyCost).
  let costNoise = options.costNoise ?? 0;
  const noteNoise = (withJacobian: Float64Array, plain: Float64Array) => {
    const a = norm2(withJacobian);
    const b = norm2(plain);
    if (b > 0 && Number.isFinite(a)) costNoise = Math.max(costNoise, Math.abs(a * a - b * b) / (b * b));
  };
  const noiseLevel = () => Math.min(costNoise, options.costNoiseLimit ?? Infinity);
  if (!warm && firstPlain.ok) noteNoise(first.residuals, firstPlain.residuals);

  // Scaling: column norms, a zero column counting as 1 (MINPACK), then a running maximum.
  const D = columnNorms(J);
  for (let k = 0; k < p; k++) if (D[k] === 0) D[k] = 1;
  let xnorm = scaledNorm(D, theta);
  let delta = factor * xnorm;
  if (delta === 0) delta = factor;
  let damping = 0;

  let iterations = 0;
  let acceptedSteps = 0;
  let lastTrial: { theta: number[]; ev: Evaluation } | undefined;
  let scaledGradient = Number.NaN;
  let gradientNorm = Number.NaN;
  let status: SolverResult['status'] = 'converged';
  let reason: StopReason = 'cost';
  let message = '';

  // True while r (and fnorm) came with the Jacobian of a speculative trial rather than from a plain
  // evaluation; `onPlainPath` evaluates the point plainly before a plain comparison or the return.
  let rFromJacobianPath = false;
  let lastTakenRatio = 0;
  const onPlainPath = () => {
    if (!rFromJacobianPath) return;
    rFromJacobianPath = false;
    const plain = evaluate(theta, false);
    if (!plain.ok) return; // keeps r: its path differs from the plain one only by evaluation noise
    noteNoise(r, plain.residuals);
    r = plain.residuals;
    fnorm = norm2(r);
  };

  const finish = (): SolverResult => {
    onPlainPath();
    return finished();
  };
  const finished = (): SolverResult => ({
    status,
    reason,
    message,
    theta,
    cost: fnorm * fnorm,
    residuals: r,
    jacobian: J,
    gradientNorm,
    scaledGradient,
    iterations,
    acceptedSteps,
    residualEvaluations,
    jacobianEvaluations,
    failedEvaluations,
    atBound: boundStatus(theta, lower, upper),
    costNoise,
  });

  outer: for (;;) {
    // Gradient (of cost/2) and the entries free to move in this iteration.
    const g = transposeTimes(J, r);
    const free = movableEntries(theta, g, lower, upper);
    const cn = columnNorms(J);
    for (let k = 0; k < p; k++) D[k] = Math.max(D[k]!, cn[k]!);
    scaledGradient = 0;
    gradientNorm = 0;
    for (const k of free) {
      gradientNorm = Math.max(gradientNorm, 2 * Math.abs(g[k]!));
      if (cn[k]! > 0 && fnorm > 0) scaledGradient = Math.max(scaledGradient, Math.abs(g[k]!) / (cn[k]! * fnorm));
    }

    if (fnorm === 0) {
      reason = 'zero-residual';
      message = 'the residuals are zero: the model reproduces the data exactly';
      return finish();
    }
    if (scaledGradient <= gtol) {
      reason = 'gradient';
      message = free.length
        ? `scaled gradient below ${fmt(gtol)}`
        : 'every entry is held at a bound and the cost would only fall outside the bounds';
      return finish();
    }

    const { R, qtr } = triangularFactor(J, free, r);
    const Df = Float64Array.from(free, (k) => D[k]!);

    // On request, the Gauss-Newton certificate of the stopping tests before a trial is spent: no step
    // of the free entries can reduce the linear model's cost by more than ||Q^T r||^2, so when that
    // is below ftol of the cost nothing is left to gain. Near the optimum of an ODE fit this saves
    // the trials that integration noise in the cost would reject one by one until the step test.
    const bestPredicted = (norm2(qtr) / fnorm) ** 2;
    if (options.noisyCost && bestPredicted <= Math.max(ftol, noiseLevel())) {
      reason = 'cost';
      message =
        bestPredicted <= ftol
          ? `relative cost change predicted by a full Gauss-Newton step below ${fmt(ftol)}`
          : `relative cost change predicted by a full Gauss-Newton step below the evaluation noise of the cost (${fmt(noiseLevel())})`;
      return finish();
    }

    // Inner loop: trial steps until one is taken (or a stopping test passes).
    for (;;) {
      if (iterations >= maxIterations) {
        status = 'stopped';
        reason = 'iterations';
        message = `iteration limit ${maxIterations} reached before convergence`;
        return finish();
      }
      const ds = dampedStep(R, qtr, Df, delta, damping);
      damping = ds.damping;
      const full = theta.slice();
      for (let k = 0; k < free.length; k++) full[free[k]!]! += ds.step[k]!;
      // Per-entry step limits act as a box around theta, intersected with the bounds.
      const projected = maxStep ? project(full, stepLower(theta), stepUpper(theta)) : project(full, lower, upper);
      const trial = projected.theta;
      const actual = Float64Array.from(free, (k) => trial[k]! - theta[k]!);
      const pnorm = scaledNorm(Df, actual);
      if (acceptedSteps === 0) delta = Math.min(delta, pnorm);

      // Predicted relative reduction of the linear model, and the directional derivative.
      const predict = (): { prered: number; dirder: number } => {
        if (!projected.clipped) {
          const t1 = norm2(multiplyColumns(J, free, ds.step)) / fnorm;
          const t2 = (Math.sqrt(damping) * ds.scaledLength) / fnorm;
          return { prered: t1 * t1 + 2 * t2 * t2, dirder: -(t1 * t1 + t2 * t2) };
        }
        const ja = multiplyColumns(J, free, actual);
        const lin = new Float64Array(r.length);
        let rja = 0;
        for (let i = 0; i < r.length; i++) {
          lin[i] = r[i]! + ja[i]!;
          rja += r[i]! * ja[i]!;
        }
        return { prered: 1 - (norm2(lin) / fnorm) ** 2, dirder: rja / (fnorm * fnorm) };
      };
      let { prered, dirder } = predict();

      // After a rejected trial the shrunk region may still hold the same Gauss-Newton step: the
      // evaluation is deterministic, so the same point is not evaluated twice.
      const repeated = lastTrial !== undefined && lastTrial.theta.length === trial.length && lastTrial.theta.every((v, k) => v === trial[k]);
      const speculate =
        options.speculativeJacobian === true &&
        !repeated &&
        ds.damping === 0 && // a Gauss-Newton step: the linear model's own minimiser lies inside the region
        lastTakenRatio >= SPECULATE_AFTER_RATIO &&
        prered >= Math.max(SPECULATE_MIN_GAIN, 100 * noiseLevel());
      if (!speculate && rFromJacobianPath) {
        // A plain trial is compared with a plain cost: evaluate the point plainly, and since the step
        // came from the other path's residuals (Q^T r), factor again before stepping.
        onPlainPath();
        continue outer;
      }
      iterations++;
      const ev = repeated ? lastTrial!.ev : evaluate(trial, speculate);
      lastTrial = { theta: trial, ev };
      let accepted = false;
      let trialCost = Infinity;
      let actred = -1;
      let ratio = 0;
      if (!ev.ok) {
        // A trial that cannot be evaluated: reject and shrink the region (the step went too far).
        delta = 0.25 * Math.min(delta, pnorm > 0 ? pnorm : delta);
        damping *= 4;
        prered = 0;
      } else {
        const fnorm1 = norm2(ev.residuals);
        trialCost = fnorm1 * fnorm1;
        actred = 0.1 * fnorm1 < fnorm ? 1 - (fnorm1 / fnorm) ** 2 : -1;
        ratio = prered > 0 ? actred / prered : 0;

        if (ratio <= 0.25) {
          let temp = actred >= 0 ? 0.5 : (0.5 * dirder) / (dirder + 0.5 * actred);
          if (0.1 * fnorm1 >= fnorm || !(temp >= 0.1)) temp = 0.1;
          delta = temp * Math.min(delta, pnorm / 0.1);
          damping /= temp;
        } else if (damping === 0 || ratio >= 0.75) {
          delta = pnorm / 0.5;
          damping *= 0.5;
        }

        if (ratio >= ACCEPT_RATIO) {
          // The step is taken: now (and only now) the costly Jacobian is needed, unless the trial
          // was evaluated with it.
          const withJ = ev.jacobian ? ev : evaluate(trial, true);
          if (withJ.ok && withJ.jacobian) {
            if (withJ !== ev) noteNoise(withJ.residuals, ev.residuals);
            theta = trial;
            r = ev.residuals; // the plain evaluation's residuals (see the start), unless speculative
            rFromJacobianPath = withJ === ev;
            J = withJ.jacobian;
            fnorm = norm2(r);
            xnorm = scaledNorm(D, theta);
            acceptedSteps++;
            accepted = true;
          } else {
            delta = 0.25 * Math.min(delta, pnorm > 0 ? pnorm : delta);
            damping *= 4;
          }
        }
      }
      lastTakenRatio = accepted ? ratio : 0;

      options.onIteration?.({
        iteration: iterations,
        cost: fnorm * fnorm,
        trialCost,
        step: xnorm > 0 ? pnorm / xnorm : pnorm,
        accepted,
        radius: delta,
        damping,
        stepDamping: ds.damping,
        predictedReduction: ev.ok ? prered : Number.NaN,
        actualReduction: ev.ok ? actred : Number.NaN,
      });

      // Stopping tests (MINPACK's, in words).
      if (fnorm === 0) {
        reason = 'zero-residual';
        message = 'the residuals are zero: the model reproduces the data exactly';
        return finish();
      }
      if (ev.ok) {
        const costDone = Math.abs(actred) <= ftol && prered <= ftol && 0.5 * ratio <= 1;
        // A full (undamped, unprojected) Gauss-Newton step that predicts less than ftol is a
        // certificate of convergence whatever the actual change: when rounding or integration noise
        // in the cost exceeds ftol, |actred| would never pass, and the run would end only after the
        // trust region had been shrunk to the step tolerance by rejected (noise-driven) trials.
        const newtonDone = !costDone && ds.damping === 0 && !projected.clipped && prered <= ftol && actred <= ftol;
        const stepDone = delta <= xtol * xnorm || delta === 0;
        if (costDone || newtonDone || stepDone) {
          reason = (costDone || newtonDone) && stepDone ? 'cost-and-step' : costDone || newtonDone ? 'cost' : 'step';
          const parts: string[] = [];
          if (costDone) parts.push(`relative cost change below ${fmt(ftol)}`);
          if (newtonDone) parts.push(`relative cost change predicted by a full Gauss-Newton step below ${fmt(ftol)}`);
          if (stepDone) parts.push(`relative step below ${fmt(xtol)}`);
          message = parts.join(' and ');
          return finish();
        }
        if ((Math.abs(actred) <= EPS && prered <= EPS && 0.5 * ratio <= 1) || delta <= EPS * xnorm) {
          reason = 'machine-precision';
          message = 'no step can reduce the cost further at machine precision';
          return finish();
        }
      } else if (delta <= xtol * xnorm || delta === 0) {
        reason = 'step';
        message = `relative step below ${fmt(xtol)} (trial points beyond could not be evaluated: ${ev.why})`;
        return finish();
      }
      // Only a positive gain predicted for the unprojected step counts: a projected step's linear
      // model can predict a loss (prered < 0), which says nothing about noise.
      if (options.noisyCost && ev.ok && !accepted && !projected.clipped && prered > 0 && prered <= noiseLevel()) {
        reason = 'cost';
        message = `relative cost change predicted by the trial step below the evaluation noise of the cost (${fmt(noiseLevel())})`;
        return finish();
      }
      if (accepted) break;
    }
  }
}
