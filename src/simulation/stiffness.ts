/**
 * Words for a step-limit failure: is the model stiff (time constants far apart, so an explicit
 * integrator crawls at the fastest one), or does its solution just change very fast?
 *
 * The Jacobian of the right-hand side at the last accepted state is taken by central differences
 * and its eigenvalues give the time constants 1/|lambda|.
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import type { CompiledModel } from '../model/compiled-types.js';
import { formatSignificant } from '../presentation/numbers.js';

export interface StepLimitDiagnosis {
  stiff: boolean;
  /** Fastest and slowest time constants (model time units); undefined when not computable. */
  fastest?: number;
  slowest?: number;
  text: string;
}

/** Where the integrator stands: the model, time, states, inputs and parameters. */
export interface ModelPoint {
  compiled: CompiledModel;
  t: number;
  x: Float64Array;
  u: Float64Array;
  p: Float64Array;
}

/** The stretch the integrator covered: from `from` to `to` in `steps` accepted steps. */
export interface StepRun {
  from: number;
  to: number;
  steps: number;
}

const fmt = (v: number): string => formatSignificant(v, 3);

/** Time constants 1/|lambda| of df/dx at (t, x, u), largest first; [] when not computable. */
function timeConstants(compiled: CompiledModel, t: number, x: Float64Array, u: Float64Array, p: Float64Array): number[] {
  const n = compiled.nStates;
  const xp = Float64Array.from(x);
  const fp = new Float64Array(n);
  const fm = new Float64Array(n);
  const jac = Matrix.zeros(n, n);
  for (let j = 0; j < n; j++) {
    const h = 1e-6 * Math.max(Math.abs(x[j]), 1e-3);
    xp[j] = x[j] + h;
    compiled.rhs(t, xp, u, p, fp);
    xp[j] = x[j] - h;
    compiled.rhs(t, xp, u, p, fm);
    xp[j] = x[j];
    for (let i = 0; i < n; i++) jac.set(i, j, (fp[i] - fm[i]) / (2 * h));
  }
  if (!jac.to1DArray().every(Number.isFinite)) return [];
  const eig = new EigenvalueDecomposition(jac);
  const re = eig.realEigenvalues;
  const im = eig.imaginaryEigenvalues;
  const mods = re.map((r, i) => Math.hypot(r, im[i]));
  const top = Math.max(...mods);
  return mods.filter((m) => m > top * 1e-12 && m > 0).map((m) => 1 / m).sort((a, b) => b - a);
}

/**
 * Diagnose a step limit hit at `at`, the run having reached `run.to` from `run.from` in `run.steps`
 * accepted steps. `span` is the length of the segment the integrator was asked to cover.
 */
export function diagnoseStepLimit(at: ModelPoint, run: StepRun, span: number): StepLimitDiagnosis {
  const { from, to: reached, steps } = run;
  const unit = at.compiled.model.timeUnit;
  const meanStep = steps > 0 ? (reached - from) / steps : 0;
  const taus = timeConstants(at.compiled, at.t, at.x, at.u, at.p);
  const where = `between t=${fmt(from)} and ${fmt(reached)} ${unit}`;
  if (taus.length) {
    const fastest = taus[taus.length - 1];
    const slowest = taus[0];
    const ratio = slowest / fastest;
    // An explicit method is held at a step of a few fastest time constants by stability alone;
    // the model is stiff when that step is tiny against the span to cover (common practice, no source).
    const stabilityBound = meanStep > 0 && meanStep < 20 * fastest;
    if (stabilityBound && span / fastest > 1e4) {
      const spread = taus.length > 1 && ratio > 10 ? `time constants differ by ~1e${Math.round(Math.log10(ratio))} (fastest ${fmt(fastest)} ${unit}, slowest ${fmt(slowest)} ${unit})` : `its fastest time constant is ${fmt(fastest)} ${unit}`;
      return {
        stiff: true,
        fastest,
        slowest,
        text:
          `the model looks stiff ${where}: ${spread}, so the explicit integrator needs steps of about ${fmt(meanStep)} ${unit} to cover ${fmt(span)} ${unit} ` +
          `(${steps} steps, the step limit). Make the fast part quasi-steady (replace its equation by its equilibrium), or shorten the experiment; a stiff integrator is not available yet`,
      };
    }
    return {
      stiff: false,
      fastest,
      slowest,
      text: `step limit reached ${where} after ${steps} steps of ${fmt(meanStep)} ${unit} on average (time constants ${fmt(fastest)} to ${fmt(slowest)} ${unit}): the solution changes very fast there, or a parameter value makes the model misbehave`,
    };
  }
  return {
    stiff: false,
    text: `step limit reached ${where} after ${steps} steps of ${fmt(meanStep)} ${unit} on average: the solution changes very fast there, or a parameter value makes the model misbehave`,
  };
}

/**
 * For a run that succeeded with many steps: words when the model looks stiff (time constants
 * more than 1e3 apart and the steps held near the fastest one), else undefined.
 */
export function stiffnessWarning(at: ModelPoint, run: StepRun): string | undefined {
  const { from, to, steps } = run;
  const taus = timeConstants(at.compiled, at.t, at.x, at.u, at.p);
  if (taus.length < 2) return undefined;
  const fastest = taus[taus.length - 1];
  const slowest = taus[0];
  const meanStep = (to - from) / steps;
  if (slowest / fastest < 1e3 || meanStep > 20 * fastest) return undefined;
  const unit = at.compiled.model.timeUnit;
  return (
    `the model looks stiff between t=${fmt(from)} and ${fmt(to)} ${unit}: time constants differ by ~1e${Math.round(Math.log10(slowest / fastest))} ` +
    `(fastest ${fmt(fastest)} ${unit}, slowest ${fmt(slowest)} ${unit}), so it took ${steps} steps of about ${fmt(meanStep)} ${unit}; ` +
    'making the fast part quasi-steady would make it faster'
  );
}
