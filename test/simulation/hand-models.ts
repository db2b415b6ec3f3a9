/**
 * Test models written by hand in TypeScript, implementing the CompiledModel interface the model
 * compiler generates (so the simulator is tested on its own). The sensitivity system is assembled
 * from hand-written Jacobians exactly as numerics.md prescribes:
 * dS/dt = (df/dx) S + df/dp (+ df/du * (-udot) in the column of an input's delay), S(t0) = dx0/dp.
 */
import { parse } from 'mathjs';
import type { CompiledModel, SensitivitySystem, Vec } from '../../src/model/compiled-types.js';
import type { ExperimentSpec, Interpolation, Model } from '../../src/model/types.js';
import type { ExperimentData } from '../../src/data/types.js';

export interface HandSpec {
  name?: string;
  timeUnit?: string;
  states: string[];
  inputs?: { name: string; interpolate?: Interpolation; delay?: number | string; unit?: string }[];
  params: { name: string; value: number; free?: [number, number]; perExperiment?: boolean }[];
  outputs: string[];
  experiments?: Partial<ExperimentSpec>[];
  rhs(t: number, x: Vec, u: Vec, p: Vec, dx: Vec): void;
  outputsFn(t: number, x: Vec, u: Vec, p: Vec, y: Vec): void;
  initial?(experiment: number, p: Vec, x0: Vec): void;
  /** Row-major Jacobians at (t, x, u, p). */
  fx?(t: number, x: Vec, u: Vec, p: Vec, J: Float64Array): void; // n x n
  fp?(t: number, x: Vec, u: Vec, p: Vec, J: Float64Array): void; // n x nP
  fu?(t: number, x: Vec, u: Vec, p: Vec, J: Float64Array): void; // n x nU
  gx?(t: number, x: Vec, u: Vec, p: Vec, J: Float64Array): void; // nY x n
  gp?(t: number, x: Vec, u: Vec, p: Vec, J: Float64Array): void; // nY x nP
  gu?(t: number, x: Vec, u: Vec, p: Vec, J: Float64Array): void; // nY x nU
  x0p?(experiment: number, p: Vec, J: Float64Array): void; // n x nP
}

const zeroExpr = (text = '0') => ({ text, node: parse(text), where: {} });

export function handModel(spec: HandSpec): CompiledModel {
  const n = spec.states.length;
  const inputs = spec.inputs ?? [];
  const nU = inputs.length;
  const nP = spec.params.length;
  const nY = spec.outputs.length;
  const model: Model = {
    file: '/tmp/hand.yaml',
    fileAsGiven: 'hand.yaml',
    sha256: '0'.repeat(64),
    format: 1,
    name: spec.name ?? 'hand',
    description: 'hand-written test model',
    timeUnit: spec.timeUnit ?? 's',
    isStatic: n === 0,
    states: spec.states.map((s) => ({ name: s, unit: '', initial: zeroExpr(), where: {} })),
    inputs: inputs.map((i) => ({ name: i.name, unit: i.unit ?? '', column: i.name, interpolate: i.interpolate ?? 'linear', delay: i.delay, where: {} })),
    parameters: spec.params.map((p) =>
      p.free
        ? { kind: 'free' as const, name: p.name, unit: '', where: {}, min: p.free[0], max: p.free[1], start: p.value, scale: 'linear' as const, perExperiment: p.perExperiment ?? false }
        : { kind: 'fixed' as const, name: p.name, unit: '', where: {}, value: p.value },
    ),
    defines: [],
    equations: spec.states.map((s) => ({ state: s, expr: zeroExpr() })),
    outputs: spec.outputs.map((o) => ({ name: o, expr: zeroExpr(), unit: '', column: o, where: {} })),
    experiments: (spec.experiments ?? [{}]).map((e, i) => ({
      name: `exp${i + 1}`,
      file: '/tmp/none.csv',
      fileAsWritten: 'none.csv',
      timeUnit: 's',
      role: 'fit' as const,
      set: {},
      initial: {},
      columns: {},
      where: {},
      ...e,
    })),
    units: 'off',
    overrides: {},
  };
  const paramSlot = new Map(spec.params.map((p, i) => [p.name, i]));
  const initial = spec.initial ?? ((_e: number, _p: Vec, x0: Vec) => x0.fill(0));
  const cache = new Map<string, SensitivitySystem>();

  const sensitivity = (slots: readonly number[]): SensitivitySystem => {
    const key = slots.join(',');
    const hit = cache.get(key);
    if (hit) return hit;
    const q = slots.length;
    const Jx = new Float64Array(n * n);
    const Jp = new Float64Array(n * nP);
    const Ju = new Float64Array(n * nU);
    const Gx = new Float64Array(nY * n);
    const Gp = new Float64Array(nY * nP);
    const Gu = new Float64Array(nY * nU);
    const X0p = new Float64Array(n * nP);
    const delayOfInput = slots.map((s) => inputs.findIndex((i) => typeof i.delay === 'string' && paramSlot.get(i.delay) === s));
    const x = new Float64Array(n);
    const sys: SensitivitySystem = {
      slots,
      q,
      delayOfInput,
      rhs(t, z, u, udot, p, dz) {
        for (let i = 0; i < n; i++) x[i] = z[i];
        spec.rhs(t, x, u, p, dz);
        Jx.fill(0); Jp.fill(0); Ju.fill(0);
        spec.fx?.(t, x, u, p, Jx);
        spec.fp?.(t, x, u, p, Jp);
        spec.fu?.(t, x, u, p, Ju);
        for (let i = 0; i < n; i++) {
          for (let k = 0; k < q; k++) {
            let s = Jp[i * nP + slots[k]];
            for (let l = 0; l < n; l++) s += Jx[i * n + l] * z[n + l * q + k];
            const j = delayOfInput[k];
            if (j >= 0) s += Ju[i * nU + j] * -udot[j];
            dz[n + i * q + k] = s;
          }
        }
      },
      outputs(t, z, u, udot, p, y, dy) {
        for (let i = 0; i < n; i++) x[i] = z[i];
        spec.outputsFn(t, x, u, p, y);
        Gx.fill(0); Gp.fill(0); Gu.fill(0);
        spec.gx?.(t, x, u, p, Gx);
        spec.gp?.(t, x, u, p, Gp);
        spec.gu?.(t, x, u, p, Gu);
        for (let j = 0; j < nY; j++) {
          for (let k = 0; k < q; k++) {
            let s = Gp[j * nP + slots[k]];
            for (let l = 0; l < n; l++) s += Gx[j * n + l] * z[n + l * q + k];
            const ji = delayOfInput[k];
            if (ji >= 0) s += Gu[j * nU + ji] * -udot[ji];
            dy[j * q + k] = s;
          }
        }
      },
      initial(e, p, z0) {
        const x0 = new Float64Array(n);
        initial(e, p, x0);
        X0p.fill(0);
        spec.x0p?.(e, p, X0p);
        for (let i = 0; i < n; i++) {
          z0[i] = x0[i];
          for (let k = 0; k < q; k++) z0[n + i * q + k] = X0p[i * nP + slots[k]];
        }
      },
    };
    cache.set(key, sys);
    return sys;
  };

  return {
    model,
    nStates: n,
    nInputs: nU,
    nParams: nP,
    nOutputs: nY,
    paramSlot,
    defaultParams: () => Float64Array.from(spec.params.map((p) => p.value)),
    rhs: spec.rhs,
    outputs: spec.outputsFn,
    initial,
    sensitivity,
  };
}

/** In-memory experiment data (no file), for simulator tests. */
export function handData(compiled: CompiledModel, time: ArrayLike<number>, inputs: ArrayLike<number>[], start?: number, index = 0): ExperimentData {
  const t = Float64Array.from(time);
  return {
    experiment: compiled.model.experiments[index] ?? {
      name: 'in-memory', file: '', fileAsWritten: '', timeUnit: compiled.model.timeUnit, role: 'fit', set: {}, initial: {}, columns: {}, where: {},
    },
    index,
    sha256: '',
    time: t,
    timeToColumnUnit: 1,
    start: start ?? t[0],
    inputs: inputs.map((v) => Float64Array.from(v)),
    outputs: compiled.model.outputs.map(() => null),
    missing: compiled.model.outputs.map(() => 0),
    lines: Int32Array.from(t, (_v, i) => i + 2),
    outliers: [],
  };
}

export function linspace(a: number, b: number, count: number): Float64Array {
  return Float64Array.from({ length: count }, (_v, i) => a + ((b - a) * i) / (count - 1));
}
