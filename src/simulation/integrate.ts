/**
 * The integration core: odex (Gragg-Bulirsch-Stoer extrapolation) with dense output, values at the
 * sample times taken from the dense interpolant inside each accepted step (no restart per sample).
 * Linearly interpolated inputs have a kink at each sample: steps end there (breakpoints of the
 * vendored odex). When such kinks come at nearly every sample, every sample is a step end, and the
 * values are the step ends themselves (no dense output needed: "aligned" mode).
 *
 * Segments: the integrator restarts at `start` and wherever a `hold` input changes value (sample
 * time + delay), so that no step straddles a jump. Within a segment a hold input is a constant.
 * A sample exactly at a restart time belongs to the segment that starts there (hold inputs are
 * right-continuous).
 *
 * Sensitivities: z = [x, S] with the model's sensitivity system. For a `hold` input whose delay is
 * one of the sensitivity slots, the jump time tau = t_k + delay moves with the delay (d tau/d delay
 * = 1), and S jumps there: S+ = S- + (f- - f+) in that delay's column, where f- is the right-hand
 * side with the input's old value and f+ with its new one, both at x(tau). This is exact for the
 * sample times (a sample exactly at a jump is a set of measure zero and takes S+).
 *
 * The pieces: integration-run.ts (working set, right-hand side, samples, jump condition),
 * segments.ts (restarts and breakpoints), integration-failures.ts (the words of a failure).
 */
import { Outcome, Solver } from './vendor/odex.js';
import type { CompiledModel } from '../model/compiled-types.js';
import { nonFiniteInitial, nonFiniteState, stepLimitReached } from './integration-failures.js';
import { applyJumpCondition, holdValueIn, NonFiniteState, prepareRun, rightHandSide, sampleRecorder, type IntegrationRun } from './integration-run.js';
import { segmentBounds, stepEnds } from './segments.js';
import { diagnoseStepLimit, stiffnessWarning } from './stiffness.js';
import { tolerances, type Tolerances } from './tolerances.js';
import type { SimulationInputs, SimulationOptions, SimulationOutcome } from './types.js';

/** Default step limit per segment: generous for logs (several steps per sample) yet finite. */
function defaultMaxSteps(samplesInSegment: number): number {
  return Math.max(100_000, 8 * samplesInSegment);
}

/**
 * Solvers reused across simulations, one per system size: a solver keeps its work arrays (about
 * 2*km^2 rows of the system size), so reusing it spares their allocation and collection on every
 * simulation of a fit. Simulations are synchronous and never nest, so one per size is enough.
 */
const solvers = new Map<number, Solver>();
function solverOfSize(N: number): Solver {
  let s = solvers.get(N);
  if (!s) {
    if (solvers.size > 16) solvers.clear();
    s = new Solver(N);
    solvers.set(N, s);
  }
  return s;
}

/** Where the recording of samples stands; shared by the observer and the segment loop. */
interface Cursor {
  /** Next sample to record, and the end (exclusive) of the current segment's samples. */
  m: number;
  end: number;
  /** Last step end reached, its z, and the steps of the current segment (for failure words). */
  lastX: number;
  lastZ: Float64Array;
  stepsInSegment: number;
}

/**
 * Integrate the model along `drive`. A run that cannot finish (non-finite initial value or state,
 * step limit) answers a failure value that says where and with which parameter values.
 */
export function integrate(compiled: CompiledModel, drive: SimulationInputs, p: Float64Array, options: SimulationOptions = {}): SimulationOutcome {
  const run = prepareRun(compiled, drive, p, options);
  const { n, N, sens } = run;
  // Initial state at the start.
  const z0 = new Float64Array(N);
  if (sens) sens.initial(drive.experimentIndex, p, z0);
  else compiled.initial(drive.experimentIndex, p, z0);
  for (let i = 0; i < N; i++) if (!Number.isFinite(z0[i])) return nonFiniteInitial(compiled, drive.name, drive.start, p, i);
  const tol = tolerances(options.rtol, options.atol, z0, n, p, sens ? run.slots! : []);
  const cursor: Cursor = { m: 0, end: 0, lastX: drive.start, lastZ: new Float64Array(N), stepsInSegment: 0 };
  const { aligned, breakpoints } = stepEnds(drive, run.tracks, run.linearIdx);
  const solver = configuredSolver(run, tol, aligned, cursor, options);
  let z: Float64Array;
  try {
    const done = integrateSegments(run, solver, z0, cursor, aligned, breakpoints, options);
    if (!(done instanceof Float64Array)) return done;
    z = done;
  } catch (err) {
    if (err instanceof NonFiniteState) return nonFiniteState(compiled, drive.name, p, err, cursor.lastX);
    throw err;
  }
  const warnings = stiffnessWarnings(run, z);
  return {
    ok: true,
    result: {
      experiment: drive.name,
      time: drive.time,
      warnings: warnings.length ? warnings : undefined,
      states: run.states,
      outputs: run.outputs,
      sensitivities: run.slots ? { slots: [...run.slots], outputs: run.sensOut! } : undefined,
      stats: run.stats,
    },
  };
}

function configuredSolver(run: IntegrationRun, tol: Tolerances, aligned: boolean, cursor: Cursor, options: SimulationOptions): Solver {
  const solver = solverOfSize(run.N);
  const time = run.drive.time;
  solver.denseOutput = !aligned;
  solver.relativeTolerance = tol.rtol;
  solver.absoluteTolerance = tol.atol;
  // Partial error control (tolerances.ts), on request: the step size follows the states; the
  // sensitivities are integrated with the same steps.
  solver.errorComponents = (options.sensitivityErrorControl ?? true) ? run.N : run.n;
  // Build the interpolant only for steps that contain a sample (the observer samples exactly those).
  solver.denseNeeded = aligned ? null : (_xOld: number, x: number) => cursor.m < cursor.end && time[cursor.m] <= x;
  return solver;
}

/** One observer for all segments (no closure per segment or step): records the samples each step reaches. */
function sampleObserver(run: IntegrationRun, solver: Solver, cursor: Cursor, dense: boolean): (nr: number, xOld: number, x: number, y: Float64Array) => boolean | void {
  const time = run.drive.time;
  const zSample = run.zSample;
  const recordSample = sampleRecorder(run);
  return (nr, xOld, x, y) => {
    if (nr > 1) {
      cursor.stepsInSegment++;
      cursor.lastX = x;
      cursor.lastZ.set(y);
    }
    if (dense && nr > 1) {
      while (cursor.m < cursor.end && time[cursor.m] <= x) {
        solver.denseInto(time[cursor.m], zSample);
        recordSample(cursor.m++);
      }
      return;
    }
    // The start point, or a step that ended on a sample (aligned mode): x may differ from the
    // breakpoint by rounding, and the integrator treats breakpoints within 1e-8 of a step as
    // reached, so the same reach applies here.
    const reach = x + 1e-8 * (x - xOld) + 4 * Number.EPSILON * Math.abs(x);
    while (cursor.m < cursor.end && time[cursor.m] <= reach) {
      zSample.set(y);
      recordSample(cursor.m++);
    }
  };
}

/** Integrate segment by segment; the final z, or the failure at a step limit. Throws NonFiniteState (see integration-run.ts). */
function integrateSegments(
  run: IntegrationRun,
  solver: Solver,
  z0: Float64Array,
  cursor: Cursor,
  aligned: boolean,
  breakpoints: Float64Array,
  options: SimulationOptions,
): Float64Array | SimulationOutcome {
  const { drive, M, u, udot, zSample } = run;
  const bounds = segmentBounds(drive, run.tracks, run.holdIdx);
  const rhs = rightHandSide(run);
  const observer = sampleObserver(run, solver, cursor, !aligned);
  const recordSample = sampleRecorder(run);
  let z = z0;
  for (let s = 0; s + 1 < bounds.length; s++) {
    const a = bounds[s];
    const b = bounds[s + 1];
    const lastSegment = s + 2 === bounds.length;
    for (const j of run.holdIdx) {
      u[j] = holdValueIn(run, j, a, b);
      udot[j] = 0;
    }
    if (b <= a) {
      // Degenerate (single sample at the start): nothing to integrate.
      zSample.set(z);
      while (cursor.m < M && drive.time[cursor.m] <= b) recordSample(cursor.m++);
      continue;
    }
    run.stats.segments++;
    const first = cursor.m;
    let count = 0;
    while (first + count < M && (drive.time[first + count] < b || (lastSegment && drive.time[first + count] <= b))) count++;
    solver.maxSteps = options.maxSteps ?? defaultMaxSteps(count);
    solver.maxStepSize = b - a;
    solver.breakpoints = breakpoints.length ? breakpoints : null;
    solver.initialStepSize = Math.min(1e-4, (b - a) / 2);
    cursor.end = first + count; // exclusive
    cursor.lastX = a;
    cursor.lastZ.set(z);
    cursor.stepsInSegment = 0;
    const res = solver.solve(rhs, a, z, b, observer);
    run.stats.steps += res.nAccept;
    run.stats.rejectedSteps += res.nReject;
    if (res.outcome === Outcome.MaxStepsExceeded) return stepLimitFailure(run, cursor, a, b);
    z = Float64Array.from(res.y);
    // Samples the last step did not reach by rounding (within a few ulps of b).
    while (cursor.m < cursor.end) {
      zSample.set(z);
      recordSample(cursor.m++);
    }
    if (!lastSegment && run.anyJumpCondition) applyJumpCondition(run, z, b, bounds[s + 2] ?? b, a);
  }
  return z;
}

function stepLimitFailure(run: IntegrationRun, cursor: Cursor, a: number, b: number): SimulationOutcome {
  const { compiled, p, u, udot } = run;
  const xs = cursor.lastZ.subarray(0, run.n);
  for (const j of run.linearIdx) run.tracks[j].fill(cursor.lastX, u, udot, j);
  const d = diagnoseStepLimit({ compiled, t: cursor.lastX, x: Float64Array.from(xs), u, p }, { from: a, to: cursor.lastX, steps: cursor.stepsInSegment }, b - a);
  return stepLimitReached(compiled, run.drive.name, cursor.lastX, p, d);
}

/** A run that succeeded but crawled: say so when the model looks stiff (slow, and a sign that the fast part might be better modelled as quasi-steady). */
function stiffnessWarnings(run: IntegrationRun, z: Float64Array): string[] {
  const { drive, stats, M, u, udot } = run;
  if (!(stats.steps > Math.max(20_000, 5 * M))) return [];
  const tEnd = drive.time[M - 1];
  const xEnd = z.subarray(0, run.n);
  for (const j of run.linearIdx) run.tracks[j].fill(tEnd, u, udot, j);
  const w = stiffnessWarning({ compiled: run.compiled, t: tEnd, x: Float64Array.from(xEnd), u, p: run.p }, { from: drive.start, to: tEnd, steps: stats.steps });
  return w ? [`experiment ${drive.name}: ${w}`] : [];
}
