/**
 * Valid model files: every key, shorthand and default of the model format (shared spec
 * model-format.md) lands in the loaded Model as the spec says.
 */
import { createHash } from 'node:crypto';
import { mkdirSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { UserError } from '../../../src/errors.js';
import { loadModel, parseOverrides } from '../../../src/model/load/index.js';
import type { FreeParameterSpec, Model, ParameterSpec } from '../../../src/model/types.js';
import { cleanTempDirs, loadText, problemsOf, SPRING, spring, tempDir, writeModel } from './helpers.js';

afterAll(cleanTempDirs);

/** The whole example of model-format.md (a scenario of our own). */
const FLYWHEEL = `format: 1
name: flywheel-rig
description: >
  DC motor driving a steel flywheel through a stiff coupling. Armature resistance and
  flywheel inertia were measured on the bench; friction and the motor constant are unknown.

time_unit: s                  # unit of time in the equations; default s

states:                       # one entry per state: unit and initial value
  i: { unit: A, initial: 0 }
  w: { unit: rad/s, initial: w0 }      # an initial value may be an expression of parameters

inputs:                       # signals read from each experiment's log, interpolated in time
  V: { unit: V, column: volts, interpolate: linear }    # linear (default) | hold

parameters:
  R:    { fixed: 1.92, unit: ohm }               # measured: a fixed parameter
  J:    { fixed: 3.1e-3, unit: kg*m^2 }
  L:    { free: [1e-4, 1e-1], start: 2e-3, unit: H }   # free: estimated within bounds
  K:    { free: [1e-3, 1], start: 0.05, unit: N*m/A }
  b:    { free: [0, 1e-2], unit: N*m*s/rad }
  Tc:   { free: [0, 0.2], unit: N*m }
  ws:   { fixed: 0.5, unit: rad/s }              # smoothing speed of the friction sign
  w0:   { free: [-5, 5], start: 0, unit: rad/s, per_experiment: true }

define:                       # named intermediate quantities, usable in equations and outputs
  torque_friction: b*w + Tc*tanh(w/ws)

equations:                    # time derivative of each state, d(state)/dt
  i: (V - R*i - K*w) / L
  w: (K*i - torque_friction) / J

outputs:                      # what was measured
  current: { expr: i, unit: A, column: amps }
  speed:   { expr: w, unit: rad/s, column: rpm, column_unit: rpm, sigma: 0.5 }

experiments:
  - name: steps-12V
    file: ../demo-data/flywheel-steps.csv     # relative to this model file
    time: t                                    # time column; default "t", else "time"
    time_unit: s                               # unit of the time column; default s
  - name: coast-down
    file: ../demo-data/flywheel-coast.csv
    window: [0.5, 20]                          # only this time span is used
    set: { J: 3.4e-3 }                         # a fixed value that differs in this test (added disc)
  - name: prbs-check
    file: ../demo-data/flywheel-prbs.csv
    role: validation                           # fit (default) | validation: never fitted, only scored
`;

function param(m: Model, name: string): ParameterSpec {
  const p = m.parameters.find((x) => x.name === name);
  if (!p) throw new Error(`no parameter ${name}`);
  return p;
}
function free(m: Model, name: string): FreeParameterSpec {
  const p = param(m, name);
  if (p.kind !== 'free') throw new Error(`${name} is not free`);
  return p;
}

describe('the example of the model format', () => {
  const dir = join(tempDir(), 'models');
  mkdirSync(dir);
  const file = writeModel(FLYWHEEL, dir, 'flywheel.yaml');
  const m = loadModel(file);

  it('reads the top level', () => {
    expect(m.format).toBe(1);
    expect(m.name).toBe('flywheel-rig');
    // A folded block joins lines with spaces (YAML 1.2, 8.1.3).
    expect(m.description).toBe('DC motor driving a steel flywheel through a stiff coupling. Armature resistance and flywheel inertia were measured on the bench; friction and the motor constant are unknown.\n');
    expect(m.timeUnit).toBe('s');
    expect(m.isStatic).toBe(false);
    expect(m.units).toBe('check');
    expect(m.unitCheck).toBe('checked');
    expect(m.file).toBe(resolve(file));
    expect(m.fileAsGiven).toBe(file);
    expect(m.sha256).toBe(createHash('sha256').update(readFileSync(file)).digest('hex'));
    expect(m.overrides).toEqual({});
  });

  it('reads states, inputs and equations in file order', () => {
    expect(m.states.map((s) => [s.name, s.unit, s.initial.text])).toEqual([['i', 'A', '0'], ['w', 'rad/s', 'w0']]);
    expect(m.inputs).toHaveLength(1);
    expect(m.inputs[0]).toMatchObject({ name: 'V', unit: 'V', column: 'volts', interpolate: 'linear' });
    expect(m.inputs[0].delay).toBeUndefined();
    expect(m.inputs[0].columnUnit).toBeUndefined();
    expect(m.equations.map((e) => [e.state, e.expr.text])).toEqual([['i', '(V - R*i - K*w) / L'], ['w', '(K*i - torque_friction) / J']]);
    expect(m.defines.map((d) => d.name)).toEqual(['torque_friction']);
  });

  it('reads fixed and free parameters with the defaults of the spec', () => {
    expect(param(m, 'R')).toMatchObject({ kind: 'fixed', value: 1.92, unit: 'ohm' });
    expect(param(m, 'J')).toMatchObject({ kind: 'fixed', value: 3.1e-3, unit: 'kg*m^2' });
    // Given start; the range spans three decades, so the optimiser works in log coordinates.
    expect(free(m, 'L')).toMatchObject({ min: 1e-4, max: 1e-1, start: 2e-3, scale: 'log', perExperiment: false });
    expect(free(m, 'K')).toMatchObject({ start: 0.05, scale: 'log' });
    // min = 0: linear, start at the midpoint.
    expect(free(m, 'b')).toMatchObject({ start: 0.005, scale: 'linear' });
    expect(free(m, 'Tc')).toMatchObject({ start: 0.1, scale: 'linear' });
    expect(free(m, 'w0')).toMatchObject({ min: -5, max: 5, start: 0, scale: 'linear', perExperiment: true });
  });

  it('reads outputs', () => {
    expect(m.outputs.map((o) => [o.name, o.expr.text, o.unit, o.column, o.columnUnit, o.sigma])).toEqual([
      ['current', 'i', 'A', 'amps', undefined, undefined],
      ['speed', 'w', 'rad/s', 'rpm', 'rpm', 0.5],
    ]);
  });

  it('reads experiments, resolving files against the model file', () => {
    expect(m.experiments.map((e) => e.name)).toEqual(['steps-12V', 'coast-down', 'prbs-check']);
    const [a, b, c] = m.experiments;
    expect(a.file).toBe(resolve(dirname(file), '../demo-data/flywheel-steps.csv'));
    expect(a.fileAsWritten).toBe('../demo-data/flywheel-steps.csv');
    expect(a).toMatchObject({ time: 't', timeUnit: 's', role: 'fit', set: {}, initial: {}, columns: {} });
    expect(a.window).toBeUndefined();
    expect(a.start).toBeUndefined();
    expect(b).toMatchObject({ window: [0.5, 20], set: { J: 3.4e-3 }, role: 'fit' });
    expect(b.time).toBeUndefined();
    expect(c.role).toBe('validation');
  });

  it('keeps where each item is written', () => {
    const lines = FLYWHEEL.split('\n');
    const kLine = lines.findIndex((l) => l.startsWith('  K:')) + 1;
    expect(param(m, 'K').where).toEqual({ file, line: kLine, column: 3, key: 'parameters.K' });
    const eq = m.equations[1].expr.where;
    expect(eq.key).toBe('equations.w');
    expect(eq.line).toBe(lines.findIndex((l) => l.startsWith('  w: (K*i')) + 1);
    expect(eq.column).toBe(6);
  });
});

describe('parameter shorthands and defaults', () => {
  const m = loadText(`format: 1
name: shorthands
parameters:
  m: 2.5
  J: "3.1e-3 kg*m^2"
  g: { fixed: "9.81 m/s^2" }
  wide: { free: [1e-4, 1e-1] }
  decade2: { free: [1, 100] }
  around0: { free: [-1, 1] }
  from0: { free: [0, 1000] }
  forcedlog: { free: [1, 10], scale: log }
  open: { free: [0, .inf], scale: linear, start: 1 }
  both: { free: [-.inf, .inf], scale: linear, start: -2, unit: N }
outputs:
  y: { expr: m*g, unit: m/s^2 }
`);

  it('m: 2.5 and m: "2.5 kg" are fixed values', () => {
    expect(param(m, 'm')).toMatchObject({ kind: 'fixed', value: 2.5, unit: '' });
    expect(param(m, 'J')).toMatchObject({ kind: 'fixed', value: 3.1e-3, unit: 'kg*m^2' });
    expect(param(m, 'g')).toMatchObject({ kind: 'fixed', value: 9.81, unit: 'm/s^2' });
  });

  it('start is the geometric mean over more than two decades, else the midpoint', () => {
    expect(free(m, 'wide').start).toBeCloseTo(Math.sqrt(1e-4 * 1e-1), 15);
    expect(free(m, 'wide').scale).toBe('log');
    // max/min = 100 exactly is not "more than 100".
    expect(free(m, 'decade2')).toMatchObject({ start: 50.5, scale: 'linear' });
    expect(free(m, 'around0')).toMatchObject({ start: 0, scale: 'linear' });
    expect(free(m, 'from0')).toMatchObject({ start: 500, scale: 'linear' });
    expect(free(m, 'forcedlog')).toMatchObject({ start: 5.5, scale: 'log' });
  });

  it('infinite bounds with scale: linear', () => {
    expect(free(m, 'open')).toMatchObject({ min: 0, max: Infinity, start: 1, scale: 'linear' });
    expect(free(m, 'both')).toMatchObject({ min: -Infinity, max: Infinity, start: -2, unit: 'N' });
  });

  it('a model whose symbols carry no unit at all skips the unit check and says so', () => {
    const bare = loadText('format: 1\nname: bare\nparameters:\n  a: { free: [0, 1] }\ninputs:\n  u: {}\noutputs:\n  y: { expr: a*u + 1 }\n');
    expect(bare.unitCheck).toBe('no-units');
    expect(bare.isStatic).toBe(true);
  });

  it('a sigma whose square is a normal double is kept, however small or large (IEEE 754 binary64)', () => {
    for (const sigma of [1e-150, 2e-154, 1e150]) {
      const m = loadText(`format: 1\nname: tiny\nparameters:\n  a: { free: [0, 1] }\ninputs:\n  u: {}\noutputs:\n  y: { expr: a*u, sigma: ${sigma} }\n`);
      expect(m.outputs[0].sigma).toBe(sigma);
    }
  });
});

describe('defaults of inputs, outputs and experiments', () => {
  const dir = tempDir();
  const file = writeModel(`format: 1
name: defaults
time_unit: ms
states:
  x: { unit: m }
  v: { unit: m/ms, initial: v0 }
  n:
inputs:
  F: { unit: N }
  G: { unit: N, column: g_raw, column_unit: lbf, interpolate: hold, delay: 2.5 }
  H: { unit: N, delay: tau }
parameters:
  m: { fixed: 2, unit: kg }
  k: { free: [1e-3, 1], unit: N/m }
  v0: { fixed: 0, unit: m/ms }
  xi: { fixed: 0.001, unit: m }
  tau: { free: [0, 10], unit: ms }
  r: { fixed: 1e-3, unit: 1/ms }
  per_ms2: { fixed: 1e-6, unit: s^2/ms^2 }
define:
  accel: force / m * per_ms2
  force: F + G + H - k*x
equations:
  x: v
  v: accel
  n: r
outputs:
  x: { column_unit: mm }
  accel: { unit: m/ms^2 }
  speed: { expr: v, unit: m/ms }
experiments:
  - file: logs/run-01.csv
  - name: second
    file: logs/run-02.csv
    time: time_ms
    time_unit: ms
    window: [10, .inf]
    start: 0
    initial: { x: 2*xi }
    columns: { F: force_N, speed: v_meas }
`, dir);
  const m = loadModel(file);

  it('states: initial defaults to 0; a state may have no unit at all', () => {
    expect(m.states.map((s) => [s.name, s.unit, s.initial.text])).toEqual([['x', 'm', '0'], ['v', 'm/ms', 'v0'], ['n', '', '0']]);
    expect(m.timeUnit).toBe('ms');
    expect(m.unitCheck).toBe('checked');
  });

  it('inputs: column defaults to the name, interpolate to linear; delays as numbers or parameters', () => {
    expect(m.inputs[0]).toMatchObject({ name: 'F', column: 'F', interpolate: 'linear' });
    expect(m.inputs[0].delay).toBeUndefined();
    expect(m.inputs[1]).toMatchObject({ column: 'g_raw', columnUnit: 'lbf', interpolate: 'hold', delay: 2.5 });
    expect(m.inputs[2].delay).toBe('tau');
  });

  it('defines come in dependency order', () => {
    expect(m.defines.map((d) => d.name)).toEqual(['force', 'accel']);
  });

  it('outputs: expr defaults to a state or define of the same name, unit to the state\'s, column to the name', () => {
    const [x, accel, speed] = m.outputs;
    expect([x.expr.text, x.unit, x.column, x.columnUnit]).toEqual(['x', 'm', 'x', 'mm']);
    expect([accel.expr.text, accel.column]).toEqual(['accel', 'accel']);
    expect(speed.expr.text).toBe('v');
  });

  it('experiments: name from the file, time and window defaults; start, initial and columns as written', () => {
    const [a, b] = m.experiments;
    expect(a).toMatchObject({ name: 'run-01', fileAsWritten: 'logs/run-01.csv', timeUnit: 's', role: 'fit', set: {}, initial: {}, columns: {} });
    expect(a.file).toBe(join(dir, 'logs', 'run-01.csv'));
    expect(a.time).toBeUndefined();
    expect(b).toMatchObject({ name: 'second', time: 'time_ms', timeUnit: 'ms', window: [10, Infinity], start: 0, columns: { F: 'force_N', speed: 'v_meas' } });
    expect(b.initial.x.text).toBe('2*xi');
    expect(b.initial.x.where.key).toBe('experiments[1].initial.x');
  });
});

describe('static models and unit modes', () => {
  it('a model without states is static', () => {
    const m = loadText(`format: 1
name: friction-curve
inputs:
  w: { unit: rad/s }
parameters:
  Tc: { free: [0, 1], unit: N*m }
  b: { free: [0, 1], unit: N*m*s/rad }
  ws: { fixed: 0.3, unit: rad/s }
outputs:
  torque: { expr: Tc*tanh(w/ws) + b*w, unit: N*m }
experiments:
  - name: sweep
    file: sweep.csv
`);
    expect(m.isStatic).toBe(true);
    expect(m.states).toEqual([]);
    expect(m.equations).toEqual([]);
    expect(m.unitCheck).toBe('checked');
  });

  it('units: off accepts units as labels and skips the checks', () => {
    const m = loadText(spring('unit: N/m }', 'unit: counts }').replace('v: (F - k*x - c*v) / m', 'v: F - k*x') + 'units: off\n');
    expect(m.units).toBe('off');
    expect(m.unitCheck).toBe('off');
    expect(param(m, 'k').unit).toBe('counts');
  });

  it('a file with CRLF line ends and a byte-order mark loads the same', () => {
    const crlf = loadModel(writeModel(`\ufeff${SPRING.replace(/\n/g, '\r\n')}`));
    const plain = loadText(SPRING);
    expect(crlf.parameters.map((p) => [p.name, p.kind])).toEqual(plain.parameters.map((p) => [p.name, p.kind]));
    expect(crlf.equations[1].expr.where.line).toBe(15);
  });

  it('YAML anchors and aliases may repeat a value', () => {
    const m = loadText(spring('x: { unit: m, initial: x0 }', 'x: { unit: &len m, initial: x0 }').replace('pos: { expr: x, unit: m,', 'pos: { expr: x, unit: *len,'));
    expect(m.outputs[0].unit).toBe('m');
  });
});

describe('overrides (--set)', () => {
  it('parses name=value and name@experiment=value', () => {
    expect(parseOverrides(['m=3', 'x0@steps=-1e-3', ' k = 250 '])).toEqual({ m: 3, 'x0@steps': -1e-3, k: 250 });
  });

  it('names every bad pair', () => {
    let err: unknown;
    try {
      parseOverrides(['m', 'k=abc', '1x=2', 'c=1', 'c=2', 'x0@=1', 'k=0x10', 'k=Infinity']);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(UserError);
    const keys = (err as UserError).problems.map((p) => p.where.key);
    expect(keys).toEqual(['--set m', '--set k=abc', '--set 1x=2', '--set c=2', '--set x0@=1', '--set k=0x10', '--set k=Infinity']);
  });

  it('apply to fixed values and free starts; name@experiment stays in model.overrides', () => {
    const m = loadText(SPRING, { overrides: { m: 3, k: 250, 'x0@steps': 0.002 } });
    expect(param(m, 'm')).toMatchObject({ kind: 'fixed', value: 3 });
    expect(free(m, 'k').start).toBe(250);
    expect(free(m, 'x0').start).toBe(0);
    expect(m.overrides).toEqual({ m: 3, k: 250, 'x0@steps': 0.002 });
  });

  it('are checked against bounds, kinds and experiments', () => {
    // m@steps (a fixed value for one experiment, like its `set`) is allowed; c@steps is not, since
    // c is estimated once for all experiments.
    const { problems } = problemsOf(SPRING, { overrides: { k: 5000, 'm@steps': 1, 'c@steps': 1, x: 1 } });
    expect(problems.map((p) => p.where.key)).toEqual(['--set k=5000', '--set c@steps=1', '--set x=1']);
    expect(problems[0].what).toContain('outside its bounds');
    expect(problems[1].what).toContain('takes no value per experiment');
    expect(problems[2].what).toContain('state');
  });
});

describe('speed', () => {
  it('loads a typical model in well under 20 ms of CPU time once warm', () => {
    const file = writeModel(FLYWHEEL);
    for (let i = 0; i < 3; i++) loadModel(file);
    const times: number[] = [];
    for (let i = 0; i < 9; i++) {
      const c0 = process.cpuUsage();
      loadModel(file);
      const c = process.cpuUsage(c0);
      times.push((c.user + c.system) / 1000);
    }
    times.sort((a, b) => a - b);
    // The median, in CPU time so that other work on a shared machine does not count.
    expect(times[4]).toBeLessThan(20);
  });
});
