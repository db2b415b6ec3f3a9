/** Bench rows: one simulation of every experiment of each demo model, and of the 4-state 10,000-sample model. */
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadExperimentData } from '../../src/data/load-experiment.js';
import { compileModel } from '../../src/model/compile/index.js';
import { loadModel } from '../../src/model/load/index.js';
import { parameterVector, simulateExperiment } from '../../src/simulation/index.js';
import type { BenchCase } from '../case.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

function simulateAll(modelPath: string, label: string, runs = 10, withSensitivities = false): BenchCase {
  return {
    name: `simulate ${label}${withSensitivities ? ' + sensitivities of every free parameter' : ''}`,
    group: 'simulate',
    runs,
    setup() {
      const model = loadModel(join(root, modelPath));
      const compiled = compileModel(model);
      const jobs = model.experiments.map((_, k) => ({ data: loadExperimentData(model, k), p: parameterVector(compiled, k) }));
      const samples = jobs.reduce((n, j) => n + j.data.time.length, 0);
      // The slots a fit asks sensitivities for: every free parameter (per-experiment copies share a slot).
      const slots = withSensitivities ? model.parameters.filter((q) => q.kind === 'free').map((q) => compiled.paramSlot.get(q.name)!) : undefined;
      return () => {
        let rhsEvaluations = 0;
        let segments = 0;
        for (const { data, p } of jobs) {
          const r = simulateExperiment(compiled, data, p, slots ? { sensitivitySlots: slots } : undefined);
          rhsEvaluations += r.stats.rhsEvaluations;
          segments += r.stats.segments;
        }
        return { rhsEvaluations, note: `${jobs.length} experiment(s), ${samples} samples, ${segments} segments` };
      };
    },
  };
}

export const cases: BenchCase[] = [
  simulateAll('models/flywheel.yaml', 'flywheel (DC motor, L/R 1 ms vs 0.9 s)', 5),
  simulateAll('models/heated-block.yaml', 'heated-block (hold + delay, degC)'),
  simulateAll('models/shaker-suspension.yaml', 'shaker-suspension (chirp, mm)'),
  simulateAll('models/friction-curve.yaml', 'friction-curve (static)'),
  simulateAll('test/fixtures/models/two-mass.yaml', 'two-mass 4-state linear, 10,000 samples', 20),
  simulateAll('models/flywheel.yaml', 'flywheel', 3, true),
  simulateAll('test/fixtures/models/two-mass.yaml', 'two-mass', 10, true),
];
