/**
 * Where the integrator restarts and where its steps must end: segment bounds at the start and at
 * every jump of a `hold` input; breakpoints at the kinks of linearly interpolated inputs.
 */
import type { InputTrack } from './input-track.js';
import type { SimulationInputs } from './types.js';

/** The union of increasing arrays, increasing, without duplicates. */
function mergeSorted(lists: readonly Float64Array[]): Float64Array {
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

/** Segment boundaries: start, every jump of a hold input, the last sample. */
export function segmentBounds(drive: SimulationInputs, tracks: readonly InputTrack[], holdIdx: readonly number[]): number[] {
  const tEnd = drive.time[drive.time.length - 1];
  const jumpSet = new Set<number>();
  for (const j of holdIdx) for (const tau of tracks[j].jumpTimes(drive.start, tEnd)) jumpSet.add(tau);
  return [drive.start, ...[...jumpSet].sort((a, b) => a - b), tEnd];
}

/**
 * Linear inputs that move have a kink at every sample (+ delay): steps end there (breakpoints),
 * so that no step straddles a kink and no short feature of the input falls between steps.
 * Built as sorted typed arrays merged without duplicates (a Set of boxed doubles and a sort per
 * simulation were a visible share of a 10,000-sample simulation, and its garbage).
 * When kinks come at (nearly) every sample, steps end on the samples anyway: then every sample
 * is made a breakpoint, the samples are step ends, and no dense output is needed (which also lets
 * the integrator use its cheaper step-number sequence: measured ~2x faster on a 1 kHz log).
 */
export function stepEnds(drive: SimulationInputs, tracks: readonly InputTrack[], linearIdx: readonly number[]): { aligned: boolean; breakpoints: Float64Array } {
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
  const M = drive.time.length;
  const aligned = M > 2 && kinks.length >= 0.5 * M;
  return { aligned, breakpoints: aligned ? mergeSorted([kinks, drive.time]) : kinks };
}
