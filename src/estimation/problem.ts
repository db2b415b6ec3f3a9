/**
 * The estimation problem: the vector theta the optimiser moves, how it maps onto the compiled
 * model's parameter slots in each fit experiment, and the weighted residuals and their Jacobian.
 *
 * theta has one entry per free parameter, and one per fit experiment for a per-experiment parameter
 * (`name@experiment`). Entries with `scale: log` hold ln(value) (bounds ln(min), ln(max)), so the
 * optimiser keeps them positive and moves them by ratios.
 *
 * Residual of output j at a non-missing sample: (measured - simulated) / sigma_j, over all fit
 * experiments, outputs logged there and samples, in that order. The Jacobian comes from the
 * simulator's output sensitivities (forward sensitivity equations), never from finite differences:
 * d r / d theta_k = -(d y / d value_k) * (d value_k / d theta_k) / sigma_j, where d value/d theta is 1
 * in linear coordinates and `value` in log coordinates. A per-experiment copy only has a nonzero
 * column in the rows of its own experiment.
 */
import { type JacobianInput, type RowMajorMatrix, toRowMajor } from './solver/row-major.js';
import type { CompiledModel } from '../model/compiled-types.js';
import type { ExperimentData } from '../data/types.js';
import type { FreeParameterSpec } from '../model/types.js';
import { resultOrThrow } from '../simulation/outcome.js';
import type { SimulationFailure, SimulationOptions, SimulationOutcome, SimulationResult } from '../simulation/types.js';

/** The simulator's entry points, passed in so that the problem is a pure function of its parts. */
export interface SimulatorFns {
  /**
   * One experiment simulated, a failure (diverged, stiff...) answered as a value
   * (simulation/simulate.ts trySimulateExperiment).
   */
  trySimulateExperiment(compiled: CompiledModel, data: ExperimentData, p: Float64Array, options?: SimulationOptions): SimulationOutcome;
  /** Declared values, then the experiment's `set`, then `values` and `model.overrides`. */
  parameterVector(compiled: CompiledModel, experimentIndex: number, values?: Record<string, number>): Float64Array;
}

export interface ThetaEntry {
  /** `name`, or `name@experiment` for a per-experiment copy. */
  name: string;
  parameter: string;
  slot: number;
  /** For a per-experiment copy: the experiment's name and its index in `fitData`. */
  experiment?: string;
  fitIndex?: number;
  scale: 'log' | 'linear';
  /** Bounds and start in the parameter's own unit. */
  min: number;
  max: number;
  start: number;
  /** Bounds in the optimiser's coordinate. */
  lower: number;
  upper: number;
}

/** Where each residual comes from (for rebuilding series and per-output sums). */
export interface ResidualBlock {
  fitIndex: number;
  output: number;
  /** Sample indices (into the experiment's time array) with a measured value. */
  samples: Int32Array;
  /** Offset of this block's first residual. */
  offset: number;
}

export interface ResidualsAndJacobian {
  residuals: Float64Array;
  /** Row-major, nResiduals x nTheta. */
  jacobian: Float64Array;
}

export interface EstimationProblem {
  compiled: CompiledModel;
  fitData: readonly ExperimentData[];
  entries: readonly ThetaEntry[];
  blocks: readonly ResidualBlock[];
  nResiduals: number;
  /** Current weighting, one sigma per output (in the output's unit); change with `setSigmas`. */
  sigmas: readonly number[];
  setSigmas(sigmas: readonly number[]): void;
  startTheta(): number[];
  /** Parameter values (own unit) from theta. */
  valuesOf(theta: readonly number[]): number[];
  thetaOf(values: readonly number[]): number[];
  /** The compiled model's parameter vector for fit experiment `fitIndex` at theta. */
  paramsFor(theta: readonly number[], fitIndex: number): Float64Array;
  /**
   * Weighted residuals, or null when a simulation failed (the optimiser rejects the step; the words
   * are in `lastFailure`). Null rather than the solver's `{ failed: why }`: the solver's own words
   * for a failure without words are part of the fit's messages users know.
   */
  residuals(theta: readonly number[]): Float64Array | null;
  residualsAndJacobian(theta: readonly number[]): ResidualsAndJacobian | null;
  /**
   * Simulated outputs per fit experiment at theta (throws RunFailure when it cannot simulate).
   * The plain simulations of the point the solver last moved to (the one where it asked for a
   * Jacobian) are kept, so the optimum's final residuals and scores cost no simulation.
   */
  simulateAll(theta: readonly number[]): SimulationResult[];
  /**
   * Residuals and Jacobian computed with the weighting `from`, rescaled row by row to the current
   * weighting (sigma_from / sigma_now per output): a refit after the noise levels changed starts
   * from them without simulating again.
   */
  reweighted(residuals: Float64Array, jacobian: JacobianInput, from: readonly number[]): { residuals: Float64Array; jacobian: RowMajorMatrix };
  counters: { simulations: number; sensitivitySimulations: number };
  /** The last simulation failure seen (for messages when every trial fails, or the start does). */
  lastFailure?: SimulationFailure;
}

function sameTheta(a: readonly number[], b: readonly number[]): boolean {
  if (a.length !== b.length) return false;
  for (let k = 0; k < a.length; k++) if (!Object.is(a[k], b[k])) return false;
  return true;
}

function toTheta(e: { scale: 'log' | 'linear' }, v: number): number {
  return e.scale === 'log' ? Math.log(v) : v;
}
function fromTheta(e: { scale: 'log' | 'linear' }, th: number): number {
  return e.scale === 'log' ? Math.exp(th) : th;
}

/**
 * Build the problem for the model's `fit` experiments. `fitData` are those experiments' data in
 * model order; `sigmas` the initial weighting per output.
 */
export function buildProblem(compiled: CompiledModel, fitData: readonly ExperimentData[], sigmas: readonly number[], sim: SimulatorFns): EstimationProblem {
  const { free, entries } = thetaEntries(compiled, fitData);
  const nTheta = entries.length;
  // The sensitivity slots (same in every experiment: the free parameters' slots) and, per fit
  // experiment, the theta column of each slot.
  const slots = free.map((p) => compiled.paramSlot.get(p.name)!);
  const columnOf: number[][] = fitData.map((_, fitIndex) =>
    free.map((p) => entries.findIndex((e) => e.parameter === p.name && (e.fitIndex === undefined || e.fitIndex === fitIndex))),
  );
  const baseParams = fitData.map((d) => sim.parameterVector(compiled, d.index));
  const { blocks, nResiduals } = residualBlocks(fitData);
  let weights = sigmas.slice();

  const counters = { simulations: 0, sensitivitySimulations: 0 };
  // The plain simulations of the last residual evaluation, and of the point where the solver last
  // asked for a Jacobian (its current point: the solver evaluates a point plainly, then with
  // sensitivities once it takes it, or the other way round at its start).
  let lastPlain: { theta: number[]; results: SimulationResult[] } | undefined;
  let lastJacobianTheta: number[] | undefined;
  let kept: { theta: number[]; results: SimulationResult[] } | undefined;

  /** A simulation at a trial point: a failure (diverged, stiff...) is a failed trial, kept for its words. */
  const trialSimulation = (fitIndex: number, p: Float64Array, options?: { sensitivitySlots: readonly number[] }): SimulationResult | null => {
    const outcome = sim.trySimulateExperiment(compiled, fitData[fitIndex], p, options);
    if (outcome.ok) return outcome.result;
    problem.lastFailure = outcome.failure;
    return null;
  };

  const problem: EstimationProblem = {
    compiled,
    fitData,
    entries,
    blocks,
    nResiduals,
    get sigmas() {
      return weights;
    },
    setSigmas(s) {
      if (s.length !== compiled.nOutputs || s.some((x) => !(x > 0) || !Number.isFinite(x))) throw new Error('sigmas must be positive and finite, one per output');
      weights = s.slice();
    },
    startTheta: () => entries.map((e) => toTheta(e, e.start)),
    valuesOf: (theta) => entries.map((e, k) => fromTheta(e, theta[k])),
    thetaOf: (values) => entries.map((e, k) => toTheta(e, values[k])),
    paramsFor(theta, fitIndex) {
      const p = Float64Array.from(baseParams[fitIndex]);
      entries.forEach((e, k) => {
        if (e.fitIndex === undefined || e.fitIndex === fitIndex) p[e.slot] = fromTheta(e, theta[k]);
      });
      return p;
    },
    simulateAll(theta) {
      if (kept && sameTheta(kept.theta, theta)) return kept.results.slice();
      return fitData.map((d, fitIndex) => {
        counters.simulations++;
        return resultOrThrow(sim.trySimulateExperiment(compiled, d, problem.paramsFor(theta, fitIndex)));
      });
    },
    residuals(theta) {
      const r = new Float64Array(nResiduals);
      const results: SimulationResult[] = [];
      for (let fitIndex = 0; fitIndex < fitData.length; fitIndex++) {
        counters.simulations++;
        const res = trialSimulation(fitIndex, problem.paramsFor(theta, fitIndex));
        if (!res || !fillResiduals(fitIndex, res, r)) return null;
        results.push(res);
      }
      lastPlain = { theta: theta.slice(), results };
      if (lastJacobianTheta && sameTheta(lastJacobianTheta, theta)) kept = lastPlain;
      return r;
    },
    reweighted: (residuals, jacobian, from) => rescaledRows(blocks, nTheta, residuals, jacobian, from, weights),
    residualsAndJacobian(theta) {
      lastJacobianTheta = theta.slice();
      if (lastPlain && sameTheta(lastPlain.theta, theta)) kept = lastPlain;
      const r = new Float64Array(nResiduals);
      const J = new Float64Array(nResiduals * nTheta);
      for (let fitIndex = 0; fitIndex < fitData.length; fitIndex++) {
        const p = problem.paramsFor(theta, fitIndex);
        counters.sensitivitySimulations++;
        const res = trialSimulation(fitIndex, p, { sensitivitySlots: slots });
        if (!res || !fillResiduals(fitIndex, res, r)) return null;
        // d value / d theta per sensitivity column (1, or the value itself in log coordinates).
        const cols = columnOf[fitIndex];
        const chain = cols.map((c) => (c < 0 ? 0 : entries[c].scale === 'log' ? p[entries[c].slot] : 1));
        const failure = fillJacobianRows(fitData[fitIndex], fitIndex, res, { blocks, weights, nTheta, cols, chain }, J);
        if (failure) {
          problem.lastFailure = failure;
          return null;
        }
      }
      return { residuals: r, jacobian: J };
    },
    counters,
  };

  /** The weighted residuals of one experiment into r; false (and the words kept) when one is not finite. */
  function fillResiduals(fitIndex: number, res: SimulationResult, r: Float64Array): boolean {
    const failure = fillResidualRows(compiled, fitData[fitIndex], fitIndex, res, blocks, weights, r);
    if (failure) problem.lastFailure = failure;
    return failure === undefined;
  }

  return problem;
}

/** (measured - simulated) / sigma for the blocks of experiment `fitIndex`; the failure when one is not finite. */
function fillResidualRows(
  compiled: CompiledModel,
  d: ExperimentData,
  fitIndex: number,
  res: SimulationResult,
  blocks: readonly ResidualBlock[],
  weights: readonly number[],
  r: Float64Array,
): SimulationFailure | undefined {
  for (const b of blocks) {
    if (b.fitIndex !== fitIndex) continue;
    const meas = d.outputs[b.output]!;
    const y = res.outputs[b.output];
    const w = 1 / weights[b.output];
    for (let s = 0; s < b.samples.length; s++) {
      const i = b.samples[s];
      const v = (meas[i] - y[i]) * w;
      if (!Number.isFinite(v)) {
        return {
          message: `the simulated output ${compiled.model.outputs[b.output].name} is not finite at time ${d.time[i]} in experiment ${d.experiment.name}`,
          details: {},
        };
      }
      r[b.offset + s] = v;
    }
  }
  return undefined;
}

/** How the sensitivity columns of one experiment map onto theta: column per slot (-1: none) and d value / d theta. */
interface JacobianLayout {
  blocks: readonly ResidualBlock[];
  weights: readonly number[];
  nTheta: number;
  cols: readonly number[];
  chain: readonly number[];
}

/** d r / d theta = -(d y / d value) (d value / d theta) / sigma for the rows of experiment `fitIndex`. */
function fillJacobianRows(d: ExperimentData, fitIndex: number, res: SimulationResult, layout: JacobianLayout, J: Float64Array): SimulationFailure | undefined {
  const sens = res.sensitivities;
  if (!sens) throw new Error('the simulator returned no sensitivities');
  const { blocks, weights, nTheta, cols, chain } = layout;
  const q = cols.length;
  for (const b of blocks) {
    if (b.fitIndex !== fitIndex) continue;
    const dy = sens.outputs[b.output];
    const w = 1 / weights[b.output];
    for (let s = 0; s < b.samples.length; s++) {
      const i = b.samples[s];
      const row = (b.offset + s) * nTheta;
      for (let k = 0; k < q; k++) {
        const c = cols[k];
        if (c < 0) continue;
        const v = -dy[i * q + k] * chain[k] * w;
        if (!Number.isFinite(v)) return { message: `the output sensitivities are not finite in experiment ${d.experiment.name}`, details: {} };
        J[row + c] = v;
      }
    }
  }
  return undefined;
}

/** Residuals and Jacobian computed with the weighting `from`, rescaled row by row to `weights`. */
function rescaledRows(
  blocks: readonly ResidualBlock[],
  nTheta: number,
  residuals: Float64Array,
  jacobian: JacobianInput,
  from: readonly number[],
  weights: readonly number[],
): { residuals: Float64Array; jacobian: RowMajorMatrix } {
  const r = Float64Array.from(residuals);
  const J = toRowMajor(jacobian, r.length, nTheta).clone();
  const data = J.data;
  for (const b of blocks) {
    const f = from[b.output] / weights[b.output];
    if (f === 1) continue;
    for (let s = 0; s < b.samples.length; s++) {
      const i = b.offset + s;
      r[i] *= f;
      for (let k = i * nTheta; k < (i + 1) * nTheta; k++) data[k] *= f;
    }
  }
  return { residuals: r, jacobian: J };
}

/** One theta entry per free parameter, and one per fit experiment for a per-experiment parameter. */
function thetaEntries(compiled: CompiledModel, fitData: readonly ExperimentData[]): { free: FreeParameterSpec[]; entries: ThetaEntry[] } {
  const model = compiled.model;
  const free = model.parameters.filter((p): p is FreeParameterSpec => p.kind === 'free');
  const entries: ThetaEntry[] = [];
  for (const p of free) {
    const slot = compiled.paramSlot.get(p.name);
    if (slot === undefined) throw new Error(`compiled model has no slot for parameter ${p.name}`);
    const base = { parameter: p.name, slot, scale: p.scale, min: p.min, max: p.max };
    const bounds = p.scale === 'log' ? { lower: Math.log(p.min), upper: Math.log(p.max) } : { lower: p.min, upper: p.max };
    if (p.perExperiment) {
      fitData.forEach((d, fitIndex) => {
        const name = `${p.name}@${d.experiment.name}`;
        // A start given with --set name@experiment=value applies to that copy only.
        const start = model.overrides[name] ?? p.start;
        entries.push({ ...base, ...bounds, name, experiment: d.experiment.name, fitIndex, start });
      });
    } else {
      entries.push({ ...base, ...bounds, name: p.name, start: p.start });
    }
  }
  return { free, entries };
}

/** Where each residual comes from: per fit experiment and logged output, the samples with a measured value. */
function residualBlocks(fitData: readonly ExperimentData[]): { blocks: ResidualBlock[]; nResiduals: number } {
  const blocks: ResidualBlock[] = [];
  let n = 0;
  fitData.forEach((d, fitIndex) => {
    d.outputs.forEach((meas, output) => {
      if (!meas) return;
      const idx: number[] = [];
      for (let i = 0; i < meas.length; i++) if (!Number.isNaN(meas[i])) idx.push(i);
      if (idx.length === 0) return;
      blocks.push({ fitIndex, output, samples: Int32Array.from(idx), offset: n });
      n += idx.length;
    });
  });
  return { blocks, nResiduals: n };
}

/** Sum of squared (weighted) residuals per output over the fit experiments, and sample counts. */
export function perOutputSums(problem: EstimationProblem, residuals: Float64Array): { sse: number[]; samples: number[] } {
  const nOut = problem.compiled.nOutputs;
  const sse = new Array<number>(nOut).fill(0);
  const samples = new Array<number>(nOut).fill(0);
  for (const b of problem.blocks) {
    for (let s = 0; s < b.samples.length; s++) {
      const v = residuals[b.offset + s];
      sse[b.output] += v * v;
    }
    samples[b.output] += b.samples.length;
  }
  return { sse, samples };
}
