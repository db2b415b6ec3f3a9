/**
 * The library's public entry point: the same powers as the CLI, and it never prints or exits.
 * (The architecture rule of this project: results are plain objects; the CLI renders them.)
 */
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it, vi } from 'vitest';
import * as rigcal from '../../src/index.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

afterEach(() => vi.restoreAllMocks());

describe('the library entry point', () => {
  it('loads, simulates and fits a demo model without writing to stdout/stderr or exiting', () => {
    const out = vi.spyOn(process.stdout, 'write');
    const err = vi.spyOn(process.stderr, 'write');
    const log = vi.spyOn(console, 'log');
    const exit = vi.spyOn(process, 'exit').mockImplementation((() => {
      throw new Error('the library called process.exit');
    }) as never);

    const model = rigcal.loadModel(join(root, 'models', 'friction-curve.yaml'));
    const compiled = rigcal.compileModel(model);
    const data = rigcal.loadExperimentData(model, 0);
    const sim = rigcal.simulateExperiment(compiled, data, rigcal.parameterVector(compiled, 0));
    expect(sim.outputs[0]!.length).toBe(data.time.length);

    const { result, values } = rigcal.fitModel(model);
    expect(result.status).toBe('converged');
    for (const p of result.parameters.filter((q) => q.status === 'free')) {
      expect(values[p.name]).toBe(p.estimate);
      expect(p.stdError).toBeGreaterThan(0);
    }
    // A plain object: survives JSON without loss of keys the spec names.
    const json = JSON.parse(JSON.stringify(result));
    for (const key of ['tool', 'version', 'format', 'model', 'status', 'message', 'iterations', 'simulations', 'wallSeconds', 'parameters', 'correlation', 'statistics', 'outputs', 'identifiability', 'warnings']) {
      expect(json).toHaveProperty(key);
    }
    expect(out).not.toHaveBeenCalled();
    expect(err).not.toHaveBeenCalled();
    expect(log).not.toHaveBeenCalled();
    expect(exit).not.toHaveBeenCalled();
  });

  it('reports input mistakes as UserError with located problems, not by printing', () => {
    expect(() => rigcal.loadModel(join(root, 'models', 'no-such-model.yaml'))).toThrow(rigcal.UserError);
  });
});
