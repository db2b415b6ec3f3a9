/**
 * Bench rows of whole fits (the library's fit pipeline: starts, solver, noise refits, uncertainty,
 * identifiability, scores, diagnostics; no files written) of every demo model and of the 4-state
 * two-mass chain with 10,000 samples and 3 free parameters, and the same problems solved by
 * ml-levenberg-marquardt with finite-difference Jacobians as a baseline (bench/fd-baseline.ts).
 * Goals: each demo fit under 1 s on 2 cores, the two-mass fit under 1.5 s, and at least 10x less
 * work than the baseline.
 */
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { compileModel } from '../../src/model/compile/index.js';
import { loadModel } from '../../src/model/load/index.js';
import { realCollaborators } from '../../src/estimation/fit/collaborators.js';
import { loadAllData } from '../../src/estimation/fit/fit-model.js';
import { fitLoaded } from '../../src/estimation/fit/fit-model.js';
import type { BenchCase } from '../case.js';
import { BASELINE_COST_MARGIN, BASELINE_MAX_ITERATIONS, baselineSolve, ourSolve } from '../fd-baseline.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

function prepare(modelPath: string) {
  const model = loadModel(join(root, modelPath));
  const compiled = compileModel(model);
  return { model, compiled, data: loadAllData(model) };
}

function fitCase(modelPath: string, label: string, runs = 3): BenchCase {
  return {
    name: `fit ${label}`,
    group: 'fit',
    runs,
    setup() {
      const { model, compiled, data } = prepare(modelPath);
      return () => {
        const { result } = fitLoaded(model, compiled, data, {}, realCollaborators());
        return { note: `${result.status}, ${result.iterations} iterations, ${result.simulations} plain + ${result.sensitivitySimulations} sensitivity simulations` };
      };
    },
  };
}

/**
 * The baseline is slow (up to BASELINE_MAX_ITERATIONS x (p + 2) simulations per experiment), so it
 * runs once, in setup, after rigcal's solver on the same problem (run twice: JIT warm-up); the note
 * carries both timings and the table's time columns of this row measure nothing.
 */
function baselineCase(modelPath: string, label: string): BenchCase {
  return {
    name: `fit ${label}: finite-difference baseline (timed in setup, see note)`,
    group: 'fit',
    runs: 1,
    setup() {
      const { model, compiled, data } = prepare(modelPath);
      ourSolve(model, compiled, data); // warm-up of the JIT
      const ours = ourSolve(model, compiled, data);
      const fd = baselineSolve(model, compiled, data, ours.cost);
      const oursSims = ours.simulations + ours.sensitivitySimulations;
      const fullSeconds = (fd.fullRunSimulations! * fd.seconds) / Math.max(1, fd.simulations);
      const until = fd.reached ? `came within ${BASELINE_COST_MARGIN} of our cost` : `hit the cap of ${BASELINE_MAX_ITERATIONS} iterations at ${(fd.cost / ours.cost).toPrecision(4)}x our cost`;
      const note =
        `baseline ${until} after ~${fd.iterations} iterations, ${fd.simulations} simulations, ${fd.seconds.toFixed(2)} s; ` +
        `rigcal solver ${ours.iterations} iterations, ${ours.simulations} + ${ours.sensitivitySimulations} with sensitivities, ${ours.seconds.toFixed(2)} s; ` +
        `work ratio ${(fd.simulations / oursSims).toFixed(1)}x simulations, ${(fd.seconds / ours.seconds).toFixed(1)}x time; ` +
        `a full baseline run (no convergence test: to the cap) takes ${fd.fullRunSimulations} simulations, ~${fullSeconds.toFixed(1)} s at its measured cost per simulation, ` +
        `${(fd.fullRunSimulations! / oursSims).toFixed(1)}x our simulations, ${(fullSeconds / ours.seconds).toFixed(1)}x our time`;
      return () => ({ note });
    },
  };
}

const demos = readdirSync(join(root, 'models'))
  .filter((f) => f.endsWith('.yaml'))
  .sort()
  .map((f) => ({ path: `models/${f}`, label: f.replace(/\.yaml$/, '') }));
const twoMass = { path: 'test/fixtures/models/two-mass-3free.yaml', label: 'two-mass 4-state, 10,000 samples, 3 free' };

export const cases: BenchCase[] = [
  ...demos.map((d) => fitCase(d.path, d.label)),
  fitCase(twoMass.path, twoMass.label),
  ...[...demos, twoMass].map((d) => baselineCase(d.path, d.label)),
];
