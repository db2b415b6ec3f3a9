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
 */
import { Outcome, Solver } from './vendor/odex.js';
import type { CompiledModel, SensitivitySystem } from '../model/compiled-types.js';
import { InputTrack } from './input-track.js';
import { simulationFailed } from './outcome.js';
import { diagnoseStepLimit, stiffnessWarning } from './stiffness.js';
import { tolerances } from './tolerances.js';
import type { SimulationOptions, SimulationOutcome, SimulationStats } from './types.js';

/** What drives one simulation: sample times, the integration start, and the logged inputs. */
export interface Drive {
  /** Experiment name for results and messages. */
  name: string;
  /** Experiment index for initial values (-1: none, declared initial values). */
  experimentIndex: number;
  /** Sample times in model time units, strictly increasing, all >= start. */
  time: Float64Array;
  start: number;
  /** Per model input, one value per sample, in the input's unit. */
  inputs: Float64Array[];
}

/** Default step limit per segment: generous for logs (several steps per sample) yet finite. */
export function defaultMaxSteps(samplesInSegment: number): number {
  return Math.max(100_000, 8 * samplesInSegment);
}

/**
 * Internal control flow of the integrator, never seen outside this file: the right-hand side is
 * called from inside odex's step loop, which offers the callback no way to stop it, so a
 * non-finite derivative is thrown from the callback and caught in `integrate` around the
 * `solve` call, where it becomes a failure value with the time and state it was found at.
 */
class NonFiniteState extends Error {
  constructor(readonly t: number, readonly z: Float64Array, readonly dz: Float64Array) {
    super('non-finite');
  }
}

function formatParameters(compiled: CompiledModel, p: Float64Array): string {
  const names = [...compiled.paramSlot.entries()].sort((a, b) => a[1] - b[1]);
  const parts = names.map(([name, slot]) => `${name}=${Number(p[slot].toPrecision(6))}`);
  return parts.length > 12 ? parts.slice(0, 12).join(', ') + `, ... (${parts.length} in all)` : parts.join(', ');
}

function parameterRecord(compiled: CompiledModel, p: Float64Array): Record<string, number> {
  const out: Record<string, number> = {};
  for (const [name, slot] of compiled.paramSlot) out[name] = p[slot];
  return out;
}

/** Delay of each input in model time units: a number, or the value of the named parameter. */
export function inputDelays(compiled: CompiledModel, p: Float64Array): number[] {
  return compiled.model.inputs.map((inp) => {
    if (inp.delay === undefined) return 0;
    if (typeof inp.delay === 'number') return inp.delay;
    const slot = compiled.paramSlot.get(inp.delay);
    if (slot === undefined) throw new RangeError(`input ${inp.name}: delay parameter ${inp.delay} has no slot`);
    return p[slot];
  });
}

/** The union of increasing arrays, increasing, without duplicates. */
export function mergeSorted(lists: readonly Float64Array[]): Float64Array {
  let out: Float64Array = new Float64Array(0);
  for (const b of lists) {
    const a = out;
    const r = new Float64Array(a.length + b.length);
    let i = 0;
    let j = 0;
    let c = 0;
    while (i < a.length || j < b.length) {
      const v = j >= b.length || (i < a.length && a[i] <= b[j]) ? a[i++] : b[j++];
      if (c === 0 || v !== r[c - 1]) r[c++] = v;
    }
    out = r.subarray(0, c);
  }
  return out;
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

/**
 * Integrate the model along `drive`. A run that cannot finish (non-finite initial value or state,
 * step limit) answers a failure value that says where and with which parameter values.
 */
export function integrate(compiled: CompiledModel, drive: Drive, p: Float64Array, options: SimulationOptions = {}): SimulationOutcome {
  const model = compiled.model;
  const n = compiled.nStates;
  const nIn = compiled.nInputs;
  const nOut = compiled.nOutputs;
  const M = drive.time.length;
  const slots = options.sensitivitySlots;
  const q = slots ? slots.length : 0;
  const sens: SensitivitySystem | undefined = slots && q > 0 ? compiled.sensitivity(slots) : undefined;
  const N = n * (1 + (sens ? q : 0));
  const stats: SimulationStats = { rhsEvaluations: 0, steps: 0, rejectedSteps: 0, segments: 0 };

  const delays = inputDelays(compiled, p);
  const tracks = model.inputs.map((inp, j) => new InputTrack(drive.time, drive.inputs[j], inp.interpolate === 'hold', delays[j]));
  const linearIdx = tracks.map((t, j) => (t.hold ? -1 : j)).filter((j) => j >= 0);
  const holdIdx = tracks.map((t, j) => (t.hold ? j : -1)).filter((j) => j >= 0);

  // For each sensitivity column, the hold inputs whose delay it is (their jumps move with it).
  const delayedHoldOfColumn: number[][] = (slots ?? []).map((slot) =>
    holdIdx.filter((j) => {
      const d = model.inputs[j].delay;
      return typeof d === 'string' && compiled.paramSlot.get(d) === slot;
    }),
  );
  const anyJumpCondition = sens !== undefined && delayedHoldOfColumn.some((l) => l.length > 0);

  // Results.
  const states = Array.from({ length: n }, () => new Float64Array(M));
  const outputs = Array.from({ length: nOut }, () => new Float64Array(M));
  const sensOut = slots ? Array.from({ length: nOut }, () => new Float64Array(M * q)) : undefined;

  // Work buffers, allocated once per simulation.
  const u = new Float64Array(nIn);
  const udot = new Float64Array(nIn);
  const uS = new Float64Array(nIn);
  const udotS = new Float64Array(nIn);
  const zSample = new Float64Array(N);
  const yBuf = new Float64Array(nOut);
  const dyBuf = new Float64Array(nOut * q);

  // Initial state at the start.
  let z = new Float64Array(N);
  if (sens) sens.initial(drive.experimentIndex, p, z);
  else compiled.initial(drive.experimentIndex, p, z);
  for (let i = 0; i < N; i++) {
    if (!Number.isFinite(z[i])) {
      return simulationFailed(
        `cannot simulate experiment ${drive.name}: the initial value of ${i < n ? `state ${model.states[i].name}` : 'a sensitivity'} is not finite (parameters ${formatParameters(compiled, p)})`,
        { experiment: drive.name, time: drive.start, parameters: parameterRecord(compiled, p) },
      );
    }
  }
  const tol = tolerances(options.rtol, options.atol, z, n, p, sens ? slots! : []);

  /** Outputs (and their sensitivities) at sample m from zSample. */
  const recordSample = (m: number): void => {
    const t = drive.time[m];
    for (let j = 0; j < nIn; j++) tracks[j].fill(t, uS, udotS, j);
    for (let i = 0; i < n; i++) states[i][m] = zSample[i];
    if (sens) {
      sens.outputs(t, zSample, uS, udotS, p, yBuf, dyBuf);
      const base = m * q;
      for (let j = 0; j < nOut; j++) {
        outputs[j][m] = yBuf[j];
        const col = sensOut![j];
        for (let k = 0; k < q; k++) col[base + k] = dyBuf[j * q + k];
      }
    } else {
      compiled.outputs(t, zSample, uS, p, yBuf);
      for (let j = 0; j < nOut; j++) outputs[j][m] = yBuf[j];
    }
  };

  // The integrator hands 0-based views of its own work arrays: read z and write dz in place.
  const nLinear = linearIdx.length;
  const linearTracks = linearIdx.map((j) => tracks[j]);
  const rhs = (t: number, zIn: Float64Array, dz: Float64Array, side: number): void => {
    stats.rhsEvaluations++;
    for (let a = 0; a < nLinear; a++) linearTracks[a].fill(t, u, udot, linearIdx[a], side);
    if (sens) sens.rhs(t, zIn, u, udot, p, dz);
    else compiled.rhs(t, zIn, u, p, dz);
    let s = 0;
    for (let i = 0; i < N; i++) s += dz[i];
    // s - s is NaN exactly when some entry is NaN or infinite (or the sum overflows).
    if (s - s !== 0) throw new NonFiniteState(t, Float64Array.from(zIn), Float64Array.from(dz));
  };

  // Segment boundaries: start, every jump of a hold input, the last sample.
  const tEnd = drive.time[M - 1];
  const jumpSet = new Set<number>();
  for (const j of holdIdx) for (const tau of tracks[j].jumpTimes(drive.start, tEnd)) jumpSet.add(tau);
  const bounds = [drive.start, ...[...jumpSet].sort((a, b) => a - b), tEnd];

  // Linear inputs that move have a kink at every sample (+ delay): steps end there (breakpoints),
  // so that no step straddles a kink and no short feature of the input falls between steps.
  // Built as sorted typed arrays merged without duplicates (a Set of boxed doubles and a sort per
  // simulation were a visible share of a 10,000-sample simulation, and its garbage).
  const kinkLists: Float64Array[] = [];
  for (const j of linearIdx) {
    const v = drive.inputs[j];
    const d = tracks[j].delay;
    const time = drive.time;
    const list = new Float64Array(v.length);
    let c = 0;
    // The ends of the log: constant before the first sample and after the last.
    if (v.length > 1 && v[1] !== v[0]) list[c++] = time[0] + d;
    for (let i = 1; i + 1 < v.length; i++) {
      // A sample where the slope does not change is no kink.
      const before = (v[i] - v[i - 1]) / (time[i] - time[i - 1]);
      const after = (v[i + 1] - v[i]) / (time[i + 1] - time[i]);
      if (before !== after) list[c++] = time[i] + d;
    }
    if (v.length > 1 && v[v.length - 1] !== v[v.length - 2]) list[c++] = time[v.length - 1] + d;
    kinkLists.push(list.subarray(0, c));
  }
  const kinks = mergeSorted(kinkLists);
  // When kinks come at (nearly) every sample, steps end on the samples anyway: then every sample
  // is made a breakpoint, the samples are step ends, and no dense output is needed (which also lets
  // the integrator use its cheaper step-number sequence: measured ~2x faster on a 1 kHz log).
  const aligned = M > 2 && kinks.length >= 0.5 * M;
  const breakpoints = aligned ? mergeSorted([kinks, drive.time]) : kinks;

  const solver = solverOfSize(N);
  solver.denseOutput = !aligned;
  solver.relativeTolerance = tol.rtol;
  solver.absoluteTolerance = tol.atol;
  // Partial error control (tolerances.ts), on request: the step size follows the states; the
  // sensitivities are integrated with the same steps.
  solver.errorComponents = (options.sensitivityErrorControl ?? true) ? N : n;
  // Build the interpolant only for steps that contain a sample (the observer samples exactly those).
  solver.denseNeeded = aligned ? null : (_xOld: number, x: number) => m < end && drive.time[m] <= x;

  let m = 0; // next sample to record
  const lastZ = new Float64Array(N);
  let lastX = drive.start;
  let stepsInSegment = 0;
  let end = 0; // the current segment's samples end here (exclusive)
  const time = drive.time;
  const dense = !aligned;
  // One observer for all segments (no closure per segment or step).
  const observer = (nr: number, xOld: number, x: number, y: Float64Array): boolean | void => {
    if (nr > 1) {
      stepsInSegment++;
      lastX = x;
      lastZ.set(y);
    }
    if (dense && nr > 1) {
      while (m < end && time[m] <= x) {
        solver.denseInto(time[m], zSample);
        recordSample(m++);
      }
      return;
    }
    // The start point, or a step that ended on a sample (aligned mode): x may differ from the
    // breakpoint by rounding, and the integrator treats breakpoints within 1e-8 of a step as
    // reached, so the same reach applies here.
    const reach = x + 1e-8 * (x - xOld) + 4 * Number.EPSILON * Math.abs(x);
    while (m < end && time[m] <= reach) {
      zSample.set(y);
      recordSample(m++);
    }
  };

  const holdValueIn = (j: number, a: number, b: number): number => tracks[j].value(0.5 * (a + b));

  try {
    for (let s = 0; s + 1 < bounds.length; s++) {
      const a = bounds[s];
      const b = bounds[s + 1];
      const lastSegment = s + 2 === bounds.length;
      for (const j of holdIdx) {
        u[j] = holdValueIn(j, a, b);
        udot[j] = 0;
      }
      if (b <= a) {
        // Degenerate (single sample at the start): nothing to integrate.
        zSample.set(z);
        while (m < M && drive.time[m] <= b) recordSample(m++);
        continue;
      }
      stats.segments++;
      let first = m;
      let count = 0;
      while (first + count < M && (drive.time[first + count] < b || (lastSegment && drive.time[first + count] <= b))) count++;
      solver.maxSteps = options.maxSteps ?? defaultMaxSteps(count);
      solver.maxStepSize = b - a;
      solver.breakpoints = breakpoints.length ? breakpoints : null;
      solver.initialStepSize = Math.min(1e-4, (b - a) / 2);
      end = first + count; // exclusive
      lastX = a;
      lastZ.set(z);
      stepsInSegment = 0;
      const res = solver.solve(rhs, a, z, b, observer);
      stats.steps += res.nAccept;
      stats.rejectedSteps += res.nReject;
      if (res.outcome === Outcome.MaxStepsExceeded) {
        const xs = lastZ.subarray(0, n);
        for (const j of linearIdx) tracks[j].fill(lastX, u, udot, j);
        const d = diagnoseStepLimit(compiled, lastX, Float64Array.from(xs), u, p, a, lastX, b - a, stepsInSegment);
        return simulationFailed(`cannot simulate experiment ${drive.name}: ${d.text} (parameters ${formatParameters(compiled, p)})`, {
          experiment: drive.name,
          time: lastX,
          stiff: d.stiff,
          fastestTimeConstant: d.fastest,
          slowestTimeConstant: d.slowest,
          parameters: parameterRecord(compiled, p),
        });
      }
      z = Float64Array.from(res.y);
      // Samples the last step did not reach by rounding (within a few ulps of b).
      while (m < end) {
        zSample.set(z);
        recordSample(m++);
      }
      if (!lastSegment && anyJumpCondition) applyJumpCondition(b, bounds[s + 2] ?? b, a);
    }
  } catch (err) {
    if (err instanceof NonFiniteState) {
      const bad = Array.from(err.z.subarray(0, n)).findIndex((v) => !Number.isFinite(v));
      const badRate = Array.from(err.dz.subarray(0, n)).findIndex((v) => !Number.isFinite(v));
      const what =
        bad >= 0 ? `state ${model.states[bad].name} became ${err.z[bad]}`
        : badRate >= 0 ? `the derivative of state ${model.states[badRate].name} became ${err.dz[badRate]}`
        : 'a sensitivity became non-finite';
      // The step size itself may have turned NaN first: then name the last time reached.
      const known = Number.isFinite(err.t);
      const time = known ? err.t : lastX;
      return simulationFailed(
        `cannot simulate experiment ${drive.name}: ${what} ${known ? 'at' : 'after'} t=${Number(time.toPrecision(6))} ${model.timeUnit} (parameters ${formatParameters(compiled, p)}); check the equations for division by zero or overflow at these values`,
        { experiment: drive.name, time, parameters: parameterRecord(compiled, p) },
      );
    }
    throw err;
  }

  function applyJumpCondition(tau: number, nextEnd: number, prevStart: number): void {
    // Input values just after tau (the next segment's), and the hold values just before.
    for (const j of linearIdx) tracks[j].fill(tau, uS, udotS, j);
    for (const j of holdIdx) uS[j] = holdValueIn(j, tau, nextEnd);
    const x = z.subarray(0, n);
    const fPlus = new Float64Array(n);
    const fMinus = new Float64Array(n);
    compiled.rhs(tau, x, uS, p, fPlus);
    for (let k = 0; k < q; k++) {
      for (const j of delayedHoldOfColumn[k]) {
        const before = holdValueIn(j, prevStart, tau);
        const after = uS[j];
        if (before === after) continue;
        uS[j] = before;
        compiled.rhs(tau, x, uS, p, fMinus);
        uS[j] = after;
        for (let i = 0; i < n; i++) z[n + i * q + k] += fMinus[i] - fPlus[i];
      }
    }
  }

  // A run that succeeded but crawled: say so when the model looks stiff (slow, and a sign that the
  // fast part might be better modelled as quasi-steady).
  const warnings: string[] = [];
  if (stats.steps > Math.max(20_000, 5 * M)) {
    const xEnd = z.subarray(0, n);
    for (const j of linearIdx) tracks[j].fill(tEnd, u, udot, j);
    const w = stiffnessWarning(compiled, tEnd, Float64Array.from(xEnd), u, p, drive.start, tEnd, stats.steps);
    if (w) warnings.push(`experiment ${drive.name}: ${w}`);
  }

  return {
    ok: true,
    result: {
      experiment: drive.name,
      time: drive.time,
      warnings: warnings.length ? warnings : undefined,
      states,
      outputs,
      sensitivities: slots ? { slots: [...slots], outputs: sensOut! } : undefined,
      stats,
    },
  };
}
