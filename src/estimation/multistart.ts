/**
 * Several starts spread over the bounds, the best fit kept: a guard against local minima.
 *
 * Start 1 is the model's own start; starts 2..N come from a Latin hypercube sample (seeded,
 * mulberry32) in the optimiser's coordinates, which makes them uniform in value for linear-scaled
 * parameters and log-uniform for log-scaled ones (their coordinate is ln(value)). An infinite bound
 * is replaced, for sampling only, by start -+ w: w = max(|start|, 1) in linear coordinates, w =
 * ln(100) (two decades) in log coordinates.
 *
 * Distinct optima: the successful fits are sorted by cost; a fit belongs to an optimum already found
 * when its cost agrees with that optimum's to relative 1e-6 and every coordinate agrees to 0.1 %
 * (|d theta| <= 1e-3 for log coordinates, i.e. 0.1 % of the value; <= 1e-3 max(|a|, |b|) + 1e-6 of
 * the sampling width for linear ones). Equal costs at different parameters count as different
 * optima: that is a ridge (see the identifiability report), which the user should know about.
 */
import { latinHypercube } from './solver/latin-hypercube.js';
import { mulberry32 } from '../util/random.js';

export interface MultistartEntry {
  scale: 'log' | 'linear';
  /** Bounds and start in the optimiser's coordinates (ln(value) for log-scaled entries). */
  lower: number;
  upper: number;
  start: number;
}

export interface MultistartOptions {
  /** Total number of starts, the model's own start included (>= 1). */
  starts: number;
  seed: number;
}

/** What each start returns; the solver's result and any wrapper around it fit this shape. */
export interface StartResult {
  status: 'converged' | 'stopped' | 'failed';
  cost: number;
  theta: readonly number[];
}

export interface MultistartOutcome<R extends StartResult> {
  best: R;
  /** Index (0-based) of the start that gave `best`. */
  bestIndex: number;
  /** Start points in the optimiser's coordinates, and what each gave. */
  points: number[][];
  results: R[];
  /** Number of distinct optima among the starts that did not fail. */
  distinctOptima: number;
  /** Cost of each distinct optimum, lowest first. */
  bestCosts: number[];
}

const SAME_COST_RELATIVE = 1e-6;
const SAME_THETA_RELATIVE = 1e-3;

/** The sampling interval of one entry (finite), in the optimiser's coordinates. */
export function samplingInterval(e: MultistartEntry): [number, number] {
  const w = e.scale === 'log' ? Math.log(100) : Math.max(Math.abs(e.start), 1);
  const lo = Number.isFinite(e.lower) ? e.lower : Math.min(e.start, Number.isFinite(e.upper) ? e.upper : e.start) - w;
  const hi = Number.isFinite(e.upper) ? e.upper : Math.max(e.start, lo) + w;
  return [lo, hi];
}

/** The N start points: the model's start first, then N-1 Latin hypercube points. */
export function multistartPoints(entries: readonly MultistartEntry[], options: MultistartOptions): number[][] {
  const n = Math.max(1, Math.floor(options.starts));
  const points: number[][] = [entries.map((e) => e.start)];
  if (n === 1) return points;
  const intervals = entries.map(samplingInterval);
  const unit = latinHypercube(n - 1, entries.length, mulberry32(options.seed));
  for (const u of unit) points.push(u.map((x, j) => intervals[j]![0] + x * (intervals[j]![1] - intervals[j]![0])));
  return points;
}

function sameOptimum(a: StartResult, b: StartResult, entries: readonly MultistartEntry[], widths: readonly number[]): boolean {
  const scale = Math.max(Math.abs(a.cost), Math.abs(b.cost));
  if (Math.abs(a.cost - b.cost) > SAME_COST_RELATIVE * scale) return false;
  return entries.every((e, i) => {
    const x = a.theta[i]!;
    const y = b.theta[i]!;
    const tol = e.scale === 'log' ? SAME_THETA_RELATIVE : SAME_THETA_RELATIVE * Math.max(Math.abs(x), Math.abs(y)) + 1e-6 * widths[i]!;
    return Math.abs(x - y) <= tol;
  });
}

/** Run `solveFrom` from each start point and keep the lowest cost among the starts that did not fail. */
export function runMultistart<R extends StartResult>(
  entries: readonly MultistartEntry[],
  options: MultistartOptions,
  solveFrom: (start: number[], index: number) => R,
): MultistartOutcome<R> {
  const points = multistartPoints(entries, options);
  const results = points.map((pt, i) => solveFrom(pt, i));
  const widths = entries.map((e) => {
    const [lo, hi] = samplingInterval(e);
    return hi - lo;
  });

  const ok = results.map((r, i) => ({ r, i })).filter(({ r }) => r.status !== 'failed' && Number.isFinite(r.cost));
  ok.sort((a, b) => a.r.cost - b.r.cost);
  const optima: StartResult[] = [];
  for (const { r } of ok) if (!optima.some((o) => sameOptimum(o, r, entries, widths))) optima.push(r);

  const bestIndex = ok.length ? ok[0]!.i : 0;
  return {
    best: results[bestIndex]!,
    bestIndex,
    points,
    results,
    distinctOptima: optima.length,
    bestCosts: optima.map((o) => o.cost),
  };
}
