/** Bench rows: reading and checking a model file (loadModel) and generating its code (compileModel). */
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { compileModel } from '../../src/model/compile/index.js';
import { loadModel } from '../../src/model/load/index.js';
import type { BenchCase } from '../case.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

function loadAndCompile(modelPath: string, label: string): BenchCase {
  return {
    name: `load + compile ${label}`,
    group: 'load',
    runs: 20,
    setup: () => () => {
      const compiled = compileModel(loadModel(join(root, modelPath)));
      return { note: `${compiled.nStates} states, ${compiled.nParams} parameters, ${compiled.nOutputs} outputs` };
    },
  };
}

export const cases: BenchCase[] = [
  loadAndCompile('models/flywheel.yaml', 'flywheel'),
  loadAndCompile('models/heated-block.yaml', 'heated-block'),
  loadAndCompile('models/shaker-suspension.yaml', 'shaker-suspension'),
  loadAndCompile('test/fixtures/models/two-mass.yaml', 'two-mass'),
];
