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
import type { EstimatesFile } from '../../src/files/estimates-file.js';
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

  it('keeps the user\'s bytes outside the changed spans: comments, alignment, blank lines', () => {
    expect(freezeModelText(MODEL_TEXT, model, estimates, options).edited).toBe('source');
    for (const line of [
      '# Flywheel scenario of our own (test fixture).',
      'name: flywheel-rig   # short name',
      '  R:    { fixed: 1.92, unit: ohm }               # measured on the bench',
      '  J:    { fixed: 3.1e-3, unit: kg*m^2 }',
      '  # the motor constant: unknown',
      '  K:    { fixed: 0.052103847561029384, unit: N*m/A }   # from the data sheet, roughly',
      '  b:\n    fixed: 0.00012345678901234567\n    unit: N*m*s/rad       # viscous friction\n',
      '  w0:   { fixed: 0.25, unit: rad/s }\n\nexperiments:\n',
      '    file: ../demo-data/steps.csv     # relative to this model file\n    set: { w0: -0.3141592653589793 }\n',
      '    set: { J: 3.4e-3, w0: 1.4142135623730951 }     # added disc',
    ]) {
      expect(text).toContain(line);
    }
    // The comments of removed keys go with them (they spoke of bounds that no longer apply).
    expect(text).not.toContain('wide on purpose');
    // Everything after the header is the user's file with only the planned changes.
    const body = text.slice(text.indexOf('# Flywheel scenario'));
    const untouched = MODEL_TEXT.split('\n').filter((l) => !/^\s*(K|b|w0):|^\s*(free|scale):|set:/.test(l));
    for (const l of untouched) expect(body.split('\n')).toContain(l);
  });

  it('splices a new `set` line at a file end without line break', () => {
    const head = MODEL_TEXT.slice(0, MODEL_TEXT.indexOf('  - name: steps'));
    const variant = `${head}  - name: coast-down\n    file: ../demo-data/coast.csv\n    set: { J: 3.4e-3 }\n  - name: steps\n    file: ../demo-data/steps.csv`;
    const m3: Model = { ...model, experiments: [model.experiments[1], model.experiments[0]] };
    const r = freezeModelText(variant, m3, estimates, options);
    expect(r.edited).toBe('source');
    expect(r.text.endsWith('  - name: steps\n    file: ../demo-data/steps.csv\n    set: { w0: -0.3141592653589793 }\n')).toBe(true);
  });

  it('splices into block-style `set`, after nested keys and before a closing comment', () => {
    const variant = MODEL_TEXT.replace('    set: { J: 3.4e-3 }     # added disc', '    set:\n      J: 3.4e-3        # added disc\n    columns:\n      w0: speed_rpm')
      .replace('  - name: steps\n    file: ../demo-data/steps.csv     # relative to this model file', '  - name: steps\n    file: "../demo-data/steps.csv"   # quoted\n    window: [0.5, 20]')
      .trimEnd()
      .concat('\n# the end');
    const m2: Model = { ...model, experiments: [{ ...model.experiments[0], window: [0.5, 20] }, { ...model.experiments[1], columns: { w0: 'speed_rpm' } }, model.experiments[2]] };
    const r = freezeModelText(variant, m2, estimates, { ...options, outputDir: '/rig/handoff/v2' });
    expect(r.edited).toBe('source');
    expect(r.text).toContain('    set:\n      J: 3.4e-3        # added disc\n      w0: 1.4142135623730951\n    columns:');
    expect(r.text).toContain('    file: "../../demo-data/steps.csv"   # quoted\n    window: [0.5, 20]\n    set: { w0: -0.3141592653589793 }\n');
    expect(r.text.endsWith('    role: validation\n# the end')).toBe(true);
    const y = parse(r.text) as any;
    expect(y.experiments[1].set).toEqual({ J: 3.4e-3, w0: W_COAST });
    expect(y.experiments[1].columns).toEqual({ w0: 'speed_rpm' });
  });

  it('keeps Windows line ends', () => {
    const r = freezeModelText(MODEL_TEXT.replace(/\n/g, '\r\n'), model, estimates, options);
    expect(r.edited).toBe('source');
    expect(r.text).not.toMatch(/[^\r]\n/);
    expect(parse(r.text)).toEqual(frozen);
  });

  it('falls back to the Document edit for layouts it cannot splice, with the same content', () => {
    const flow = MODEL_TEXT.replace(/parameters:\n[\s\S]*?\n\nexperiments:/, 'parameters: { R: { fixed: 1.92, unit: ohm }, J: { fixed: 3.1e-3, unit: kg*m^2 }, K: { free: [1e-3, 1], start: 0.05, unit: N*m/A }, b: { free: [1e-6, 1e-2], scale: log, unit: N*m*s/rad }, w0: { free: [-5, 5], start: 0.25, unit: rad/s, per_experiment: true } }\n\nexperiments:');
    expect(flow).not.toBe(MODEL_TEXT);
    const r = freezeModelText(flow, model, estimates, options);
    expect(r.edited).toBe('document');
    expect(parse(r.text)).toEqual(frozen);
    expect(r.text).toContain('# added disc');
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
    // The comment beside the rewritten path survives, at its column.
    expect(other.text).toContain('    file: ../../demo-data/steps.csv     # relative to this model file');
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
