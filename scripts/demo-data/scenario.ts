/** What one scenario produces: CSV files and the true values behind them. */
import type { Column } from './csv.js';
import type { SeededRandom as Rng } from '../../src/util/random.js';

export interface ScenarioFile {
  /** Path relative to the project root. */
  path: string;
  /** Extra comment lines (the generator adds the provenance line). */
  comment: string[];
  columns: Column[];
}

export interface ExperimentTruth {
  file: string;
  samples: number;
  /** Noise standard deviation added to each logged output, in the column's unit. */
  noise: Record<string, string>;
  missing: Record<string, number>;
  /** Values that differ in this experiment (set, per-experiment parameters, initial states). */
  values?: Record<string, number | string>;
}

export interface ScenarioTruth {
  model: string;
  /** True parameter values with units, e.g. { K: '0.08 N*m/A' }. */
  parameters: Record<string, string>;
  experiments: Record<string, ExperimentTruth>;
  notes?: string;
}

export interface ScenarioOutput {
  files: ScenarioFile[];
  truth: ScenarioTruth;
}

export type Scenario = (rng: Rng) => ScenarioOutput;

/** Adds Gaussian noise of standard deviation `std`; the indices in `missing` become NaN (empty cells). */
export function noisy(values: Float64Array, std: number, rng: Rng, missing: number[] = []): Float64Array {
  const out = values.map((v) => v + std * rng.normal());
  for (const k of missing) out[k] = NaN;
  return out;
}

/** `count` distinct random row indices in [from, to), sorted. */
export function randomRows(count: number, from: number, to: number, rng: Rng): number[] {
  const set = new Set<number>();
  while (set.size < count) set.add(from + Math.floor(rng.uniform() * (to - from)));
  return [...set].sort((a, b) => a - b);
}
