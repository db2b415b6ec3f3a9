/**
 * The working set of one integration (sizes, input tracks, result arrays, buffers allocated once
 * per simulation) and the callbacks built on it: the right-hand side handed to odex, the recording
 * of a sample, and the sensitivity jump at a delayed hold input's jump (see integrate.ts).
 */
import type { CompiledModel, SensitivitySystem } from '../model/compiled-types.js';
import { InputTrack } from './input-track.js';
import type { SimulationInputs, SimulationOptions, SimulationStats } from './types.js';

export interface IntegrationRun {
  compiled: CompiledModel;
  drive: SimulationInputs;
  p: Float64Array;
  /** States, inputs, outputs, samples, sensitivity columns; N = size of z = [x, S]. */
  n: number;
  nIn: number;
  nOut: number;
  M: number;
  slots?: readonly number[];
  q: number;
  sens?: SensitivitySystem;
  N: number;
  stats: SimulationStats;
  tracks: InputTrack[];
  linearIdx: number[];
  holdIdx: number[];
  /** For each sensitivity column, the hold inputs whose delay it is (their jumps move with it). */
  delayedHoldOfColumn: number[][];
  anyJumpCondition: boolean;
  /** Results. */
  states: Float64Array[];
  outputs: Float64Array[];
  sensOut?: Float64Array[];
  /** Work buffers: inputs for the right-hand side (u, udot) and for samples (uS, udotS). */
  u: Float64Array;
  udot: Float64Array;
  uS: Float64Array;
  udotS: Float64Array;
  zSample: Float64Array;
  yBuf: Float64Array;
  dyBuf: Float64Array;
}

/** Delay of each input in model time units: a number, or the value of the named parameter. */
function inputDelays(compiled: CompiledModel, p: Float64Array): number[] {
  return compiled.model.inputs.map((inp) => {
    if (inp.delay === undefined) return 0;
    if (typeof inp.delay === 'number') return inp.delay;
    const slot = compiled.paramSlot.get(inp.delay);
    if (slot === undefined) throw new RangeError(`input ${inp.name}: delay parameter ${inp.delay} has no slot`);
    return p[slot];
  });
}

export function prepareRun(compiled: CompiledModel, drive: SimulationInputs, p: Float64Array, options: SimulationOptions): IntegrationRun {
  const model = compiled.model;
  const { nStates: n, nInputs: nIn, nOutputs: nOut } = compiled;
  const M = drive.time.length;
  const slots = options.sensitivitySlots;
  const q = slots ? slots.length : 0;
  const sens: SensitivitySystem | undefined = slots && q > 0 ? compiled.sensitivity(slots) : undefined;
  const delays = inputDelays(compiled, p);
  const tracks = model.inputs.map((inp, j) => new InputTrack(drive.time, drive.inputs[j], inp.interpolate === 'hold', delays[j]));
  const holdIdx = tracks.map((t, j) => (t.hold ? j : -1)).filter((j) => j >= 0);
  const delayedHoldOfColumn: number[][] = (slots ?? []).map((slot) =>
    holdIdx.filter((j) => {
      const d = model.inputs[j].delay;
      return typeof d === 'string' && compiled.paramSlot.get(d) === slot;
    }),
  );
  return {
    compiled, drive, p, n, nIn, nOut, M, slots, q, sens,
    N: n * (1 + (sens ? q : 0)),
    stats: { rhsEvaluations: 0, steps: 0, rejectedSteps: 0, segments: 0 },
    tracks,
    linearIdx: tracks.map((t, j) => (t.hold ? -1 : j)).filter((j) => j >= 0),
    holdIdx,
    delayedHoldOfColumn,
    anyJumpCondition: sens !== undefined && delayedHoldOfColumn.some((l) => l.length > 0),
    states: Array.from({ length: n }, () => new Float64Array(M)),
    outputs: Array.from({ length: nOut }, () => new Float64Array(M)),
    sensOut: slots ? Array.from({ length: nOut }, () => new Float64Array(M * q)) : undefined,
    u: new Float64Array(nIn),
    udot: new Float64Array(nIn),
    uS: new Float64Array(nIn),
    udotS: new Float64Array(nIn),
    zSample: new Float64Array(n * (1 + (sens ? q : 0))),
    yBuf: new Float64Array(nOut),
    dyBuf: new Float64Array(nOut * q),
  };
}

/** Records the outputs (and their sensitivities) at sample m from run.zSample. */
export function sampleRecorder(run: IntegrationRun): (m: number) => void {
  const { compiled, drive, p, n, nIn, nOut, q, sens, tracks, states, outputs, sensOut, uS, udotS, zSample, yBuf, dyBuf } = run;
  return (m: number): void => {
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
}

/**
 * Internal control flow of the integrator, never seen outside this folder: the right-hand side is
 * called from inside odex's step loop, which offers the callback no way to stop it, so a
 * non-finite derivative is thrown from the callback and caught in `integrate` around the `solve`
 * call, where it becomes a failure value with the time and state it was found at.
 */
export class NonFiniteState extends Error {
  constructor(readonly t: number, readonly z: Float64Array, readonly dz: Float64Array) {
    super('non-finite');
  }
}

/** The right-hand side for odex, which hands 0-based views of its own work arrays: read z and write dz in place. */
export function rightHandSide(run: IntegrationRun): (t: number, zIn: Float64Array, dz: Float64Array, side: number) => void {
  const { compiled, p, N, sens, stats, u, udot, linearIdx } = run;
  const nLinear = linearIdx.length;
  const linearTracks = linearIdx.map((j) => run.tracks[j]);
  return (t: number, zIn: Float64Array, dz: Float64Array, side: number): void => {
    stats.rhsEvaluations++;
    for (let a = 0; a < nLinear; a++) linearTracks[a].fill(t, u, udot, linearIdx[a], side);
    if (sens) sens.rhs(t, zIn, u, udot, p, dz);
    else compiled.rhs(t, zIn, u, p, dz);
    let s = 0;
    for (let i = 0; i < N; i++) s += dz[i];
    // s - s is NaN exactly when some entry is NaN or infinite (or the sum overflows).
    if (s - s !== 0) throw new NonFiniteState(t, Float64Array.from(zIn), Float64Array.from(dz));
  };
}

/** The value of hold input j inside the segment (a, b): constant there. */
export function holdValueIn(run: IntegrationRun, j: number, a: number, b: number): number {
  return run.tracks[j].value(0.5 * (a + b));
}

/** At a jump tau of delayed hold inputs: S+ = S- + (f- - f+) in each delay's column (z changed in place). */
export function applyJumpCondition(run: IntegrationRun, z: Float64Array, tau: number, nextEnd: number, prevStart: number): void {
  const { compiled, p, n, q, uS, udotS, tracks } = run;
  // Input values just after tau (the next segment's), and the hold values just before.
  for (const j of run.linearIdx) tracks[j].fill(tau, uS, udotS, j);
  for (const j of run.holdIdx) uS[j] = holdValueIn(run, j, tau, nextEnd);
  const x = z.subarray(0, n);
  const fPlus = new Float64Array(n);
  const fMinus = new Float64Array(n);
  compiled.rhs(tau, x, uS, p, fPlus);
  for (let k = 0; k < q; k++) {
    for (const j of run.delayedHoldOfColumn[k]) {
      const before = holdValueIn(run, j, prevStart, tau);
      const after = uS[j];
      if (before === after) continue;
      uS[j] = before;
      compiled.rhs(tau, x, uS, p, fMinus);
      uS[j] = after;
      for (let i = 0; i < n; i++) z[n + i * q + k] += fMinus[i] - fPlus[i];
    }
  }
}
