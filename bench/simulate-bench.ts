/**
 * Simulation speed: a 4-state linear model (two masses, springs and dampers, force input) over a
 * 10,000-sample log (10 s at 1 kHz; signals of our own): a multisine read with linear
 * interpolation (a kink at every sample, so at least one step per sample), and a binary signal
 * read as a hold input (restarts at its switches only), each with and without sensitivities.
 * Goal: median < 20 ms for the plain simulation.
 * Then every experiment of each demo model (and the two-mass fixture) at its start values, plain and
 * with sensitivities of every free parameter: CPU ms (median and min), rhs evaluations, steps.
 * Run: npx tsx bench/simulate-bench.ts [demo]
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { compileModel } from '../src/model/compile/index.js';
import { loadModel } from '../src/model/load/index.js';
import type { CompiledModel } from '../src/model/compiled-types.js';
import { handData, handModel } from '../test/simulation/hand-models.js';
import { simulateExperiment } from '../src/simulation/simulate.js';
import { parameterVector } from '../src/simulation/parameters.js';
import { loadExperimentData } from '../src/data/load-experiment.js';
import type { SimulationOptions } from '../src/simulation/types.js';

export function twoMassModel(interpolate: 'linear' | 'hold' = 'linear') {
  // x = [x1, v1, x2, v2]; p = [m1, m2, k1, k2, c1, c2]
  return handModel({
    name: 'two-mass-bench',
    states: ['x1', 'v1', 'x2', 'v2'],
    inputs: [{ name: 'F', interpolate }],
    params: [
      { name: 'm1', value: 1, free: [0.1, 10] },
      { name: 'm2', value: 0.5, free: [0.1, 10] },
      { name: 'k1', value: 400, free: [1, 1e4] },
      { name: 'k2', value: 250, free: [1, 1e4] },
      { name: 'c1', value: 2, free: [0, 100] },
      { name: 'c2', value: 1, free: [0, 100] },
    ],
    outputs: ['x1', 'x2'],
    rhs: (_t, x, u, p, dx) => {
      const s1 = p[2] * x[0] + p[4] * x[1];
      const s2 = p[3] * (x[2] - x[0]) + p[5] * (x[3] - x[1]);
      dx[0] = x[1];
      dx[1] = (u[0] - s1 + s2) / p[0];
      dx[2] = x[3];
      dx[3] = -s2 / p[1];
    },
    outputsFn: (_t, x, _u, _p, y) => {
      y[0] = x[0];
      y[1] = x[2];
    },
    fx: (_t, _x, _u, p, J) => {
      J[1] = 1;
      J[4] = (-p[2] - p[3]) / p[0]; J[5] = (-p[4] - p[5]) / p[0]; J[6] = p[3] / p[0]; J[7] = p[5] / p[0];
      J[11] = 1;
      J[12] = p[3] / p[1]; J[13] = p[5] / p[1]; J[14] = -p[3] / p[1]; J[15] = -p[5] / p[1];
    },
    fp: (_t, x, u, p, J) => {
      const s1 = p[2] * x[0] + p[4] * x[1];
      const s2 = p[3] * (x[2] - x[0]) + p[5] * (x[3] - x[1]);
      // row 1 (v1'), columns m1, m2, k1, k2, c1, c2
      J[6 + 0] = -(u[0] - s1 + s2) / (p[0] * p[0]);
      J[6 + 2] = -x[0] / p[0];
      J[6 + 3] = (x[2] - x[0]) / p[0];
      J[6 + 4] = -x[1] / p[0];
      J[6 + 5] = (x[3] - x[1]) / p[0];
      // row 3 (v2')
      J[18 + 1] = s2 / (p[1] * p[1]);
      J[18 + 3] = -(x[2] - x[0]) / p[1];
      J[18 + 5] = -(x[3] - x[1]) / p[1];
    },
    gx: (_t, _x, _u, _p, J) => {
      J[0] = 1;
      J[4 + 2] = 1;
    },
  });
}

export function multisineLog(samples: number, rate: number) {
  const time = new Float64Array(samples);
  const force = new Float64Array(samples);
  for (let i = 0; i < samples; i++) {
    const t = i / rate;
    time[i] = t;
    force[i] = Math.sin(2 * Math.PI * 0.7 * t) + 0.5 * Math.sin(2 * Math.PI * 3.1 * t + 1) + 0.3 * Math.sin(2 * Math.PI * 11.3 * t + 2);
  }
  return { time, force };
}

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  return s[s.length >> 1];
}

/** A pseudo-random binary force (+-1 N) that switches on average every 100 samples (seeded LCG). */
export function binaryLog(samples: number, rate: number) {
  const time = new Float64Array(samples);
  const force = new Float64Array(samples);
  let seed = 12345;
  let level = 1;
  for (let i = 0; i < samples; i++) {
    seed = (seed * 1103515245 + 12345) % 2147483648;
    if (seed / 2147483648 < 0.01) level = -level;
    time[i] = i / rate;
    force[i] = level;
  }
  return { time, force };
}

/** The same two-mass model written as a model file and compiled by the model compiler. */
export function twoMassCompiled(interpolate: 'linear' | 'hold'): CompiledModel {
  const dir = mkdtempSync(join(tmpdir(), 'rigcal-bench-'));
  const file = join(dir, 'two-mass.yaml');
  writeFileSync(file, `format: 1
name: two-mass-bench
description: Two masses, springs and dampers, force input (a benchmark scenario of our own).
states:
  x1: { unit: m, initial: 0 }
  v1: { unit: m/s, initial: 0 }
  x2: { unit: m, initial: 0 }
  v2: { unit: m/s, initial: 0 }
inputs:
  F: { unit: N, interpolate: ${interpolate} }
parameters:
  m1: { free: [0.1, 10], start: 1, unit: kg }
  m2: { free: [0.1, 10], start: 0.5, unit: kg }
  k1: { free: [1, 1e4], start: 400, unit: N/m }
  k2: { free: [1, 1e4], start: 250, unit: N/m }
  c1: { free: [0, 100], start: 2, unit: N*s/m }
  c2: { free: [0, 100], start: 1, unit: N*s/m }
define:
  s1: k1*x1 + c1*v1
  s2: k2*(x2 - x1) + c2*(v2 - v1)
equations:
  x1: v1
  v1: (F - s1 + s2) / m1
  x2: v2
  v2: -s2 / m2
outputs:
  y1: { expr: x1, unit: m }
  y2: { expr: x2, unit: m }
`);
  return compileModel(loadModel(file));
}

function bench(label: string, options: SimulationOptions, input: 'multisine' | 'binary' = 'multisine', runs = 20, compiledBy: 'hand' | 'compiler' = 'compiler') {
  const interpolate = input === 'binary' ? 'hold' : 'linear';
  const compiled = compiledBy === 'hand' ? twoMassModel(interpolate) : twoMassCompiled(interpolate);
  const { time, force } = input === 'binary' ? binaryLog(10_000, 1000) : multisineLog(10_000, 1000);
  const data = handData(compiled, time, [force]);
  const p = compiled.defaultParams();
  for (let i = 0; i < 3; i++) simulateExperiment(compiled, data, p, options); // warm-up (JIT)
  const ms: number[] = [];
  const cpu: number[] = [];
  let stats;
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    const c0 = process.cpuUsage();
    stats = simulateExperiment(compiled, data, p, options).stats;
    const c1 = process.cpuUsage(c0);
    ms.push(performance.now() - t0);
    cpu.push((c1.user + c1.system) / 1000);
  }
  // CPU time is reported too: on a shared machine the wall time mostly measures the other jobs.
  console.log(`${label}: median ${median(ms).toFixed(2)} ms wall (min ${Math.min(...ms).toFixed(2)}), median ${median(cpu).toFixed(2)} ms CPU, over ${runs} runs; ${JSON.stringify(stats)}`);
  return median(ms);
}

/** Every experiment of a model file, plain and with sensitivities of every free parameter. */
function benchModel(file: string, runs: number) {
  const model = loadModel(join(import.meta.dirname, '..', file));
  const compiled = compileModel(model);
  const jobs = model.experiments.map((_, k) => ({ data: loadExperimentData(model, k), p: parameterVector(compiled, k) }));
  const free = model.parameters.filter((q) => q.kind === 'free').map((q) => compiled.paramSlot.get(q.name)!);
  for (const sens of [false, true]) {
    const options: SimulationOptions | undefined = sens ? { sensitivitySlots: free } : undefined;
    let totals = { rhs: 0, steps: 0, rejected: 0, segments: 0 };
    const once = () => {
      totals = { rhs: 0, steps: 0, rejected: 0, segments: 0 };
      for (const { data, p } of jobs) {
        const s = simulateExperiment(compiled, data, p, options).stats;
        totals.rhs += s.rhsEvaluations;
        totals.steps += s.steps;
        totals.rejected += s.rejectedSteps;
        totals.segments += s.segments;
      }
    };
    once();
    once(); // warm-up (JIT)
    const cpu: number[] = [];
    for (let i = 0; i < runs; i++) {
      const c0 = process.cpuUsage();
      once();
      const c1 = process.cpuUsage(c0);
      cpu.push((c1.user + c1.system) / 1000);
    }
    const label = `${file}${sens ? ` + sensitivities of ${free.length}` : ''}`;
    console.log(`${label}: median ${median(cpu).toFixed(2)} ms CPU (min ${Math.min(...cpu).toFixed(2)}) for ${jobs.length} experiment(s); rhs ${totals.rhs}, steps ${totals.steps} (${totals.rejected} rejected), ${totals.segments} segments`);
  }
}

const isMain = process.argv[1] && import.meta.url.endsWith(process.argv[1].replace(/.*\//, ''));
if (isMain && process.argv[2] === 'demo') {
  for (const file of ['models/flywheel.yaml', 'models/heated-block.yaml', 'models/shaker-suspension.yaml', 'test/fixtures/models/two-mass.yaml']) benchModel(file, 11);
} else if (isMain) {
  bench('4 states, 10,000 samples, multisine input (linear interpolation), hand-written model', {}, 'multisine', 20, 'hand');
  bench('4 states, 10,000 samples, multisine input (linear interpolation)', {});
  bench('  the same with sensitivities for 6 parameters', { sensitivitySlots: [0, 1, 2, 3, 4, 5] });
  bench('4 states, 10,000 samples, binary input (hold, ~100 switches)', {}, 'binary');
  bench('  the same with sensitivities for 6 parameters', { sensitivitySlots: [0, 1, 2, 3, 4, 5] }, 'binary');
}
