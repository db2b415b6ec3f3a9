/**
 * rigcal simulate against independent reference solutions: scripts/scipy_reference.py integrates
 * each test model (restated by hand in Python) with scipy.integrate.solve_ivp, Radau, rtol 1e-11,
 * restarted at every hold jump and linear-input kink; the fixtures record the scipy version and
 * the command. The models cover hold inputs, a delay named by a parameter, degC and mm and rpm
 * columns, a log timed in minutes, `set`, a per-experiment parameter given with --set, an initial
 * override, a window, a start before the first sample, and time scales 1000x apart (1 ms and 1 s).
 *
 * Two criteria per experiment and output:
 *  - the sum of squared differences rigcal - scipy is below 0.1 % of the sum of squared measurement
 *    noise (logged - scipy) in the same samples: integration error is invisible next to the noise;
 *  - the largest difference relative to the output's largest magnitude is below 2e-6 at rigcal's
 *    default tolerance (rtol 1e-8 per step; the global error grows over thousands of steps, e.g.
 *    2.7e-4 K on 300 K after 30 min of the thermal case: common practice, no source);
 * and, through the library with rtol 1e-12, below 1e-8: the remaining difference is integration
 * error, not a different reading of holds, delays, units, windows or initial values.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadExperimentData } from '../../src/data/load-experiment.js';
import { compileModel } from '../../src/model/compile/index.js';
import { loadModel, parseOverrides } from '../../src/model/load/index.js';
import { parameterVector, simulateExperiment } from '../../src/simulation/index.js';
import { rigcal, scratchDir } from '../cli/run-cli.js';
import { readSimulationCsv } from './read-csv.js';

interface ReferenceExperiment {
  name: string;
  time: number[];
  set?: string[];
  outputs: Record<string, number[]>;
  states: Record<string, number[]>;
  noise: Record<string, { ssq: number; count: number; rms: number }>;
}
interface ReferenceFile {
  model: string;
  scipy: string;
  command: string;
  experiments: ReferenceExperiment[];
}

const fixtures = join(import.meta.dirname, '..', 'fixtures');
const scratch = scratchDir('reference');
afterAll(() => scratch.cleanup());

function maxRelative(a: number[], ref: number[]): number {
  let scale = 0;
  let worst = 0;
  for (const r of ref) scale = Math.max(scale, Math.abs(r));
  for (let i = 0; i < ref.length; i++) worst = Math.max(worst, Math.abs(a[i] - ref[i]));
  return worst / scale;
}

const cases = ['ref-motor', 'ref-thermal', 'ref-shaker', 'two-mass'];

describe.each(cases)('rigcal simulate vs scipy solve_ivp (Radau, rtol 1e-11): %s', (name) => {
  const ref = JSON.parse(readFileSync(join(fixtures, 'scipy', `${name}.json`), 'utf8')) as ReferenceFile;

  for (const exp of ref.experiments) {
    it(`experiment ${exp.name}: outputs and states match the scipy reference (scipy ${ref.scipy})`, async () => {
      const out = join(scratch.dir, `${name}-${exp.name}.csv`);
      const setArgs = (exp.set ?? []).flatMap((s) => ['--set', s]);
      const run = await rigcal(['simulate', join(fixtures, 'models', ref.model), '-e', exp.name, ...setArgs, '-o', out]);
      expect(run.stderr).toBe('');
      expect(run.code).toBe(0);
      const cols = readSimulationCsv(out).byExperiment.get(exp.name)!;
      expect(cols, 'experiment rows in the CSV').toBeDefined();

      // Same sample times, in the log's own time unit.
      expect(cols.time.length).toBe(exp.time.length);
      expect(maxRelative(cols.time, exp.time)).toBeLessThan(1e-12);

      for (const [output, values] of Object.entries(exp.outputs)) {
        const mine = cols[output];
        let ssd = 0;
        for (let i = 0; i < values.length; i++) ssd += (mine[i] - values[i]) ** 2;
        const noise = exp.noise[output].ssq;
        expect(ssd, `${output}: squared error vs 0.1 % of squared noise`).toBeLessThan(1e-3 * noise);
        expect(maxRelative(mine, values), `${output}: max relative difference`).toBeLessThan(2e-6);
      }
      for (const [state, values] of Object.entries(exp.states)) {
        expect(maxRelative(cols[`${state}_state`], values), `state ${state}`).toBeLessThan(2e-6);
      }
    });
  }
});

describe.each(cases)('library at rtol 1e-12 vs scipy: %s converges to the reference', (name) => {
  const ref = JSON.parse(readFileSync(join(fixtures, 'scipy', `${name}.json`), 'utf8')) as ReferenceFile;
  it.each(ref.experiments.map((e) => [e.name, e] as const))('experiment %s', (_name, exp) => {
    const model = loadModel(join(fixtures, 'models', ref.model), { overrides: parseOverrides(exp.set ?? []) });
    const compiled = compileModel(model);
    const k = model.experiments.findIndex((e) => e.name === exp.name);
    const result = simulateExperiment(compiled, loadExperimentData(model, k), parameterVector(compiled, k), { rtol: 1e-12 });
    model.outputs.forEach((o, j) => {
      expect(maxRelative(Array.from(result.outputs[j]), exp.outputs[o.name]), o.name).toBeLessThan(1e-8);
    });
  });
});
