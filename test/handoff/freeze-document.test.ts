/**
 * The YAML rewrite of `freeze`, on a hand-built Model (no loader needed): comments and layout of the
 * user's file survive, free parameters become fixed at full precision, per-experiment values land in
 * each experiment's `set`, relative data paths follow the output's folder, the header carries the
 * cautions and the provenance.
 */
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { freezeModelText } from '../../src/handoff/freeze-document.js';
import type { EstimatesFile } from '../../src/reports/read-estimates.js';
import type { ExperimentSpec, Model, ParameterSpec } from '../../src/model/types.js';

const MODEL_TEXT = `# Flywheel scenario of our own (test fixture).
format: 1
name: flywheel-rig   # short name

parameters:
  R:    { fixed: 1.92, unit: ohm }               # measured on the bench
  J:    { fixed: 3.1e-3, unit: kg*m^2 }
  # the motor constant: unknown
  K:    { free: [1e-3, 1], start: 0.05, unit: N*m/A }   # from the data sheet, roughly
  b:
    free: [1e-6, 1e-2]    # wide on purpose
    scale: log
    unit: N*m*s/rad       # viscous friction
  w0:   { free: [-5, 5], start: 0.25, unit: rad/s, per_experiment: true }

experiments:
  - name: steps
    file: ../demo-data/steps.csv     # relative to this model file
  - name: coast-down
    file: ../demo-data/coast.csv
    set: { J: 3.4e-3 }     # added disc
  - name: check
    file: /data/check.csv
    role: validation
`;

const DIR = '/rig/models';

function fixed(name: string, value: number, unit: string): ParameterSpec {
  return { kind: 'fixed', name, value, unit, where: {} };
}
function free(name: string, min: number, max: number, start: number, unit: string, extra: Partial<ParameterSpec> = {}): ParameterSpec {
  return { kind: 'free', name, min, max, start, unit, scale: 'linear', perExperiment: false, where: {}, ...extra } as ParameterSpec;
}
function experiment(name: string, written: string, role: 'fit' | 'validation' = 'fit', set: Record<string, number> = {}): ExperimentSpec {
  return { name, file: path.resolve(DIR, written), fileAsWritten: written, timeUnit: 's', role, set, initial: {}, columns: {}, where: {} };
}

const model: Model = {
  file: path.join(DIR, 'flywheel.yaml'),
  fileAsGiven: 'models/flywheel.yaml',
  sha256: 'a'.repeat(64),
  format: 1,
  name: 'flywheel-rig',
  description: '',
  timeUnit: 's',
  isStatic: false,
  states: [],
  inputs: [],
  parameters: [
    fixed('R', 1.92, 'ohm'),
    fixed('J', 3.1e-3, 'kg*m^2'),
    free('K', 1e-3, 1, 0.05, 'N*m/A'),
    free('b', 1e-6, 1e-2, 1e-4, 'N*m*s/rad', { scale: 'log' } as Partial<ParameterSpec>),
    free('w0', -5, 5, 0.25, 'rad/s', { perExperiment: true } as Partial<ParameterSpec>),
  ],
  defines: [],
  equations: [],
  outputs: [],
  experiments: [experiment('steps', '../demo-data/steps.csv'), experiment('coast-down', '../demo-data/coast.csv', 'fit', { J: 3.4e-3 }), experiment('check', '/data/check.csv', 'validation')],
  units: 'check',
  overrides: {},
};

// Values with all 17 significant digits: the frozen file must carry them exactly.
const K = 0.052103847561029384;
const B = 1.2345678901234567e-4;
const W_STEPS = -0.31415926535897931;
const W_COAST = 1.4142135623730951;

const estimates: EstimatesFile = {
  file: 'fit/estimates.yaml',
  version: '0.1.0',
  model: { name: 'flywheel-rig', file: 'flywheel.yaml', sha256: 'a'.repeat(64) },
  fit: { status: 'converged', message: 'relative cost change below 1e-10', date: '2026-11-30T10:00:00.000Z' },
  data: [
    { experiment: 'steps', role: 'fit', file: '../demo-data/steps.csv', sha256: 'b'.repeat(64) },
    { experiment: 'coast-down', role: 'fit', file: '../demo-data/coast.csv', sha256: 'c'.repeat(64) },
  ],
  values: {},
  parameters: {
    R: { value: 1.92, unit: 'ohm', status: 'fixed' },
    J: { value: 3.1e-3, unit: 'kg*m^2', status: 'fixed' },
    K: { value: K, unit: 'N*m/A', status: 'estimated', stdError: 3.1e-4, ci95: [0.0515, 0.0527], atBound: false },
    b: { value: B, unit: 'N*m*s/rad', status: 'estimated', stdError: null, ci95: null, atBound: 'lower' },
    'w0@steps': { value: W_STEPS, unit: 'rad/s', status: 'estimated', experiment: 'steps', stdError: 0.01, ci95: [-0.33, -0.29] },
    'w0@coast-down': { value: W_COAST, unit: 'rad/s', status: 'estimated', experiment: 'coast-down', stdError: 0.02, ci95: [1.37, 1.45] },
  },
  noise: {},
};

const options = { outputDir: DIR, estimatesLabel: 'fit/estimates.yaml', estimatesSha256: 'd'.repeat(64), date: '2026-12-01T00:00:00.000Z', toolVersion: '0.1.0' };

describe('freezeModelText', () => {
  const { text, summary } = freezeModelText(MODEL_TEXT, model, estimates, options);
  const frozen = parse(text) as any;

  it('fixes every free parameter at its estimate, exactly, and keeps the unit', () => {
    expect(frozen.parameters.K).toEqual({ fixed: K, unit: 'N*m/A' });
    expect(frozen.parameters.b).toEqual({ fixed: B, unit: 'N*m*s/rad' });
    expect(frozen.parameters.R).toEqual({ fixed: 1.92, unit: 'ohm' });
    expect(summary.frozen).toEqual(['K', 'b']);
    // No free-only key survives anywhere.
    expect(text).not.toMatch(/\bfree:|\bstart:|\bscale:|per_experiment/);
  });

  it('moves per-experiment estimates into each fitted experiment\'s set, the start value into the parameter', () => {
    expect(frozen.parameters.w0).toEqual({ fixed: 0.25, unit: 'rad/s' });
    expect(frozen.experiments[0].set).toEqual({ w0: W_STEPS });
    expect(frozen.experiments[1].set).toEqual({ J: 3.4e-3, w0: W_COAST });
    expect(frozen.experiments[2].set).toBeUndefined();
    expect(summary.perExperiment).toEqual(['w0']);
    expect(text).toMatch(/# frozen: w0 was estimated per experiment/);
    expect(text).toMatch(/start value\n\s*# 0\.25 rad\/s written here/);
  });

  it('keeps the user\'s comments and layout', () => {
    for (const comment of [
      '# Flywheel scenario of our own (test fixture).',
      'name: flywheel-rig # short name',
      '# measured on the bench',
      '# the motor constant: unknown',
      '# from the data sheet, roughly',
      '# viscous friction',
      '# relative to this model file',
      '# added disc',
    ]) {
      expect(text).toContain(comment);
    }
    // Flow maps stay flow maps, block maps stay block maps.
    expect(text).toMatch(/ {2}K: \{ fixed: 0\.052103847561029384, unit: N\*m\/A \}/);
    expect(text).toMatch(/ {2}b:\n {4}fixed: 0\.00012345678901234567\n/);
  });

  it('comments each frozen parameter with its interval, standard error and provenance', () => {
    expect(text).toMatch(/# frozen: K = 0\.0521038 N\*m\/A, estimated within \[0\.001, 1\], standard error 0\.00031 N\*m\/A, 95 % interval \[0\.0515, 0\.0527\] N\*m\/A/);
    expect(text).toMatch(/# frozen: b = .*standard error and 95 % interval not determined by the data.*at its lower bound: the interval is not reliable/);
    expect(text).toMatch(/# source: fit\/estimates\.yaml \(fit 2026-11-30T10:00:00\.000Z, rigcal 0\.1\.0, model sha256 aaaaaaaaaaaa/);
  });

  it('puts the cautions and the full provenance in a header', () => {
    const header = text.slice(0, text.indexOf('format: 1'));
    expect(header).toMatch(/operating range/);
    expect(header).toMatch(/safety-relevant/);
    expect(header).toMatch(/local codes and licensed engineering/);
    expect(header).toContain(`model sha256 ${'a'.repeat(64)}`);
    expect(header).toContain(`estimates file sha256 ${'d'.repeat(64)}`);
    expect(header).toContain(`steps (fit): ../demo-data/steps.csv, sha256 ${'b'.repeat(64)}`);
    expect(header).toContain('2026-12-01T00:00:00.000Z');
    // The user's own first comment is still there, after ours.
    expect(header).toContain('# Flywheel scenario of our own (test fixture).');
  });

  it('leaves data paths alone when the output sits beside the model', () => {
    expect(frozen.experiments[0].file).toBe('../demo-data/steps.csv');
    expect(summary.movedPaths).toEqual([]);
  });

  it('rewrites relative data paths for an output in another folder, and keeps absolute ones', () => {
    const other = freezeModelText(MODEL_TEXT, model, estimates, { ...options, outputDir: '/rig/handoff/v1' });
    const y = parse(other.text) as any;
    expect(y.experiments[0].file).toBe('../../demo-data/steps.csv');
    expect(path.resolve('/rig/handoff/v1', y.experiments[1].file)).toBe('/rig/demo-data/coast.csv');
    expect(y.experiments[2].file).toBe('/data/check.csv');
    expect(other.summary.movedPaths.map((m) => m.experiment)).toEqual(['steps', 'coast-down']);
    // The comment beside the rewritten path survives.
    expect(other.text).toMatch(/file: \.\.\/\.\.\/demo-data\/steps\.csv # relative to this model file/);
  });

  it('writes a fixed value the fit used when it differs from the model file (a --set at fit time)', () => {
    const e2 = { ...estimates, parameters: { ...estimates.parameters, R: { value: 2.05, unit: 'ohm', status: 'fixed' as const } } };
    const r = freezeModelText(MODEL_TEXT, model, e2, options);
    expect((parse(r.text) as any).parameters.R).toEqual({ fixed: 2.05, unit: 'ohm' });
    expect(r.summary.changedFixed).toEqual(['R']);
  });

  it('refuses estimates that lack a free parameter, naming the key', () => {
    const { K: _dropped, ...rest } = estimates.parameters;
    expect(() => freezeModelText(MODEL_TEXT, model, { ...estimates, parameters: rest }, options)).toThrow(/parameters\.K.*no estimate of K/s);
    const { ['w0@coast-down']: _d2, ...rest2 } = estimates.parameters;
    expect(() => freezeModelText(MODEL_TEXT, model, { ...estimates, parameters: rest2 }, options)).toThrow(/w0@coast-down/);
  });

  it('keeps text from a hostile estimates file inside comments', () => {
    const hostile = {
      ...estimates,
      version: '0.1.0\nevil: 1',
      fit: { ...estimates.fit, date: '2026\r\nparameters: {}\u2028x: 2' },
      data: [{ experiment: 'steps\n- name: injected', role: 'fit', file: 'a.csv\nformat: 2', sha256: 'b'.repeat(64) }],
    };
    const r = freezeModelText(MODEL_TEXT, model, hostile, { ...options, estimatesLabel: 'est\nimates.yaml' });
    const y = parse(r.text) as any;
    expect(Object.keys(y)).toEqual(['format', 'name', 'parameters', 'experiments']);
    expect(y.format).toBe(1);
    expect(y.experiments.map((e: any) => e.name)).toEqual(['steps', 'coast-down', 'check']);
    expect(y.parameters.K).toEqual({ fixed: K, unit: 'N*m/A' });
  });
});
