/**
 * `freeze` treats the estimates file as untrusted input: whatever it holds ends up in comments only,
 * never as YAML content of the calibrated model, even on the `--force` path whose warning quotes the
 * recorded hash. No fit needed: the estimates are written by hand.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { prepareFreeze } from '../../src/verbs/freeze.js';
import { modelText, writeRigData } from '../comparison/synthetic-rig.js';

describe('freeze with a hostile estimates file', () => {
  it('keeps injected line breaks out of the YAML content', () => {
    const dir = writeRigData();
    mkdirSync(path.join(dir, 'm'));
    writeFileSync(path.join(dir, 'm', 'rig.yaml'), modelText({ dataPrefix: '../' }));
    // A "hash" that would start YAML content if it were pasted into the file as it is.
    writeFileSync(
      path.join(dir, 'est.yaml'),
      `tool: rigcal
version: "0.1.0\\nversion_injected: 1"
model: { name: spring-mass, file: rig.yaml, sha256: "abc\\nformat: 2\\ninjected: true" }
fit: { status: converged, message: "ok", date: "2026\\rparameters: {}" }
data: [ { experiment: "shake\\n- name: x", role: fit, file: "a.csv\\u2028b: 1", sha256: "x\\ny: 2" } ]
parameters:
  k: { value: 40.5, unit: N/m, status: estimated, stdError: 0.1, ci95: [40.3, 40.7], atBound: false }
  c: { value: 0.75, unit: N*s/m, status: estimated, stdError: 0.01, ci95: [0.73, 0.77], atBound: false }
  x0@shake: { value: -0.01, unit: m, status: estimated, experiment: shake }
  x0@bump: { value: 0.02, unit: m, status: estimated, experiment: bump }
`,
    );
    expect(() => prepareFreeze({ modelFile: 'm/rig.yaml', estimatesFile: 'est.yaml', output: 'out.yaml', cwd: dir })).toThrow(/another version of the model/);
    const { text, outcome } = prepareFreeze({ modelFile: 'm/rig.yaml', estimatesFile: 'est.yaml', output: 'out.yaml', cwd: dir, force: true });
    expect(outcome.hashMismatch?.estimates).toBe('(not a SHA-256)');
    const y = parse(text) as Record<string, any>;
    expect(Object.keys(y)).toEqual(['format', 'name', 'states', 'inputs', 'parameters', 'equations', 'outputs', 'experiments']);
    expect(y.format).toBe(1);
    expect(y.parameters.k).toEqual({ fixed: 40.5, unit: 'N/m' });
    expect(y.experiments.map((e: { name: string }) => e.name)).toEqual(['shake', 'bump', 'held-out']);
    expect(text).toMatch(/^# WARNING \(rigcal freeze --force\)/);
  });
});
