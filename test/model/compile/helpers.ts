/**
 * Test helpers: a Model built by hand from a compact description (the loader is not needed to test
 * the compiler), a seeded random generator, and mathjs evaluation of the same trees as a
 * cross-check of the generated code.
 */
import { parse, type MathNode } from 'mathjs';
import type { Expr, Model, ParameterSpec } from '../../../src/model/types.js';

export interface ModelDescription {
  /** State name -> initial value (expression text or number); order kept. */
  states?: Record<string, string | number>;
  /** Input name -> options. */
  inputs?: Record<string, { delay?: number | string }>;
  /** Parameter name -> fixed value, or a free range with start. */
  params?: Record<string, number | { free: [number, number]; start: number }>;
  /** In dependency order. */
  defines?: Record<string, string>;
  equations?: Record<string, string>;
  outputs?: Record<string, string>;
  /** Per experiment: initial overrides. */
  experiments?: { initial?: Record<string, string | number> }[];
}

export function expr(text: string | number, key = 'test'): Expr {
  const s = String(text);
  return { text: s, node: parse(s), where: { file: 'test.yaml', key } };
}

export function makeModel(d: ModelDescription): Model {
  const where = { file: 'test.yaml' };
  const states = Object.entries(d.states ?? {}).map(([name, init]) => ({ name, unit: '', initial: expr(init, `states.${name}`), where }));
  const parameters: ParameterSpec[] = Object.entries(d.params ?? {}).map(([name, v]) =>
    typeof v === 'number'
      ? { kind: 'fixed', name, unit: '', value: v, where }
      : { kind: 'free', name, unit: '', min: v.free[0], max: v.free[1], start: v.start, scale: 'linear', perExperiment: false, where },
  );
  return {
    file: '/tmp/test.yaml',
    fileAsGiven: 'test.yaml',
    sha256: '',
    format: 1,
    name: 'test',
    description: '',
    timeUnit: 's',
    isStatic: states.length === 0,
    states,
    inputs: Object.entries(d.inputs ?? {}).map(([name, o]) => ({
      name,
      unit: '',
      column: name,
      interpolate: 'linear',
      delay: o.delay,
      where,
    })),
    parameters,
    defines: Object.entries(d.defines ?? {}).map(([name, text]) => ({ name, expr: expr(text, `define.${name}`) })),
    equations: Object.entries(d.equations ?? {}).map(([state, text]) => ({ state, expr: expr(text, `equations.${state}`) })),
    outputs: Object.entries(d.outputs ?? {}).map(([name, text]) => ({ name, expr: expr(text, `outputs.${name}`), unit: '', column: name, where })),
    experiments: (d.experiments ?? []).map((e, i) => ({
      name: `e${i}`,
      file: `/tmp/e${i}.csv`,
      fileAsWritten: `e${i}.csv`,
      timeUnit: 's',
      role: 'fit',
      set: {},
      initial: Object.fromEntries(Object.entries(e.initial ?? {}).map(([k, v]) => [k, expr(v)])),
      columns: {},
      where,
    })),
    units: 'off',
    overrides: {},
  };
}

/** Mulberry32: a small seeded generator so that failures reproduce. */
export function rng(seed: number): (lo?: number, hi?: number) => number {
  let a = seed >>> 0;
  return (lo = 0, hi = 1) => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    const r = ((t ^ (t >>> 14)) >>> 0) / 4294967296;
    return lo + (hi - lo) * r;
  };
}

/** mathjs's own evaluation of a tree (the cross-check); booleans become 1/0. */
export function mathjsValue(node: MathNode, scope: Map<string, number>): number {
  const v = node.evaluate(scope) as unknown;
  return typeof v === 'boolean' ? Number(v) : (v as number);
}

/** Scope for mathjs: states, inputs, parameters, t, then the defines in order. */
export function mathjsScope(model: Model, t: number, x: ArrayLike<number>, u: ArrayLike<number>, p: ArrayLike<number>): Map<string, number> {
  const scope = new Map<string, number>();
  model.states.forEach((s, i) => scope.set(s.name, x[i]!));
  model.inputs.forEach((s, i) => scope.set(s.name, u[i]!));
  model.parameters.forEach((s, i) => scope.set(s.name, p[i]!));
  scope.set('t', t);
  for (const d of model.defines) scope.set(d.name, mathjsValue(d.expr.node, scope));
  return scope;
}

/** Relative closeness with an absolute floor. */
export function close(a: number, b: number, rel: number, abs = rel): boolean {
  if (Number.isNaN(a) || Number.isNaN(b)) return Number.isNaN(a) && Number.isNaN(b);
  return Math.abs(a - b) <= abs + rel * Math.max(Math.abs(a), Math.abs(b));
}

export function linearModel() {
  // A 4-state linear model: two masses, springs and dampers, one force input.
  return makeModel({
    states: { x1: 0, v1: 0, x2: 0, v2: 0 },
    inputs: { F: {} },
    params: { m1: 1, m2: 2, k1: 10, k2: 20, c1: 0.5, c2: 0.3 },
    equations: {
      x1: 'v1',
      v1: '(F - k1*x1 - c1*v1 + k2*(x2 - x1) + c2*(v2 - v1)) / m1',
      x2: 'v2',
      v2: '(-k2*(x2 - x1) - c2*(v2 - v1)) / m2',
    },
    outputs: { pos2: 'x2' },
  });
}

/**
 * Classical fourth-order Runge-Kutta with a fixed step (any numerical analysis text); global error
 * O(h^4). Only for checking sensitivities against closed forms in tests.
 */
export function rk4(f: (t: number, z: Float64Array, dz: Float64Array) => void, z0: Float64Array, t0: number, t1: number, steps: number): Float64Array {
  const n = z0.length;
  const z = Float64Array.from(z0);
  const k1 = new Float64Array(n);
  const k2 = new Float64Array(n);
  const k3 = new Float64Array(n);
  const k4 = new Float64Array(n);
  const tmp = new Float64Array(n);
  const h = (t1 - t0) / steps;
  for (let s = 0; s < steps; s++) {
    const t = t0 + s * h;
    f(t, z, k1);
    for (let i = 0; i < n; i++) tmp[i] = z[i]! + (h / 2) * k1[i]!;
    f(t + h / 2, tmp, k2);
    for (let i = 0; i < n; i++) tmp[i] = z[i]! + (h / 2) * k2[i]!;
    f(t + h / 2, tmp, k3);
    for (let i = 0; i < n; i++) tmp[i] = z[i]! + h * k3[i]!;
    f(t + h, tmp, k4);
    for (let i = 0; i < n; i++) z[i] = z[i]! + (h / 6) * (k1[i]! + 2 * k2[i]! + 2 * k3[i]! + k4[i]!);
  }
  return z;
}

/** The flywheel rig of the model-format example (a scenario of the spec, values from there). */
export function flywheel(): Model {
  // The flywheel model of model-format.md (a scenario of the spec, values from there).
  return makeModel({
    states: { i: 0, w: 'w0' },
    inputs: { V: {} },
    params: {
      R: 1.92,
      J: 3.1e-3,
      L: { free: [1e-4, 1e-1], start: 2e-3 },
      K: { free: [1e-3, 1], start: 0.05 },
      b: { free: [0, 1e-2], start: 5e-3 },
      Tc: { free: [0, 0.2], start: 0.1 },
      ws: 0.5,
      w0: { free: [-5, 5], start: 0 },
    },
    defines: { torque_friction: 'b*w + Tc*tanh(w/ws)' },
    equations: { i: '(V - R*i - K*w) / L', w: '(K*i - torque_friction) / J' },
    outputs: { current: 'i', speed: 'w' },
    experiments: [{}, { initial: { w: '2 * w0 + 1' } }],
  });
}
