/**
 * A hand-made rig for testing the estimation layer on its own: one state x' = -k x, x(0) = A, one
 * output y = x + c, solved in closed form (x = A exp(-k t)) with exact output sensitivities.
 * Invented for tests; nothing here is measured.
 */
import type { CompiledModel } from '../../../src/model/compiled-types.js';
import type { ExperimentData } from '../../../src/data/types.js';
import type { Model, ParameterSpec } from '../../../src/model/types.js';
import { simulationFailed } from '../../../src/simulation/outcome.js';
import type { SimulationOptions, SimulationOutcome, SimulationResult } from '../../../src/simulation/types.js';
import type { SimulatorFns } from '../../../src/estimation/problem.js';

export const SLOTS = { k: 0, A: 1, c: 2 } as const;

export function decayModel(params: ParameterSpec[], experiments: string[], sigma?: number): Model {
  return {
    file: '/virtual/decay.yaml',
    fileAsGiven: 'decay.yaml',
    sha256: '0'.repeat(64),
    format: 1,
    name: 'decay',
    description: '',
    timeUnit: 's',
    isStatic: false,
    states: [],
    inputs: [],
    parameters: params,
    defines: [],
    equations: [],
    outputs: [{ name: 'y', unit: 'V', column: 'y', sigma, where: {}, expr: {} as never }],
    experiments: experiments.map((name) => ({ name, file: `/virtual/${name}.csv`, fileAsWritten: `${name}.csv`, timeUnit: 's', role: 'fit', set: {}, initial: {}, columns: {}, where: {} })),
    units: 'off',
    overrides: {},
  } as Model;
}

export function decayCompiled(model: Model): CompiledModel {
  const slot = new Map<string, number>(Object.entries(SLOTS));
  return {
    model,
    nStates: 1,
    nInputs: 0,
    nParams: 3,
    nOutputs: 1,
    paramSlot: slot,
    defaultParams() {
      const p = new Float64Array(3);
      for (const s of model.parameters) p[slot.get(s.name)!] = s.kind === 'fixed' ? s.value : s.start;
      return p;
    },
    rhs: () => undefined,
    outputs: () => undefined,
    initial: () => undefined,
    sensitivity: () => {
      throw new Error('not used');
    },
  };
}

export function decayData(model: Model, index: number, time: number[], y: number[]): ExperimentData {
  return {
    experiment: model.experiments[index],
    index,
    sha256: '1'.repeat(64),
    time: Float64Array.from(time),
    timeToColumnUnit: 1,
    start: 0,
    inputs: [],
    outputs: [Float64Array.from(y)],
    missing: [y.filter((v) => Number.isNaN(v)).length],
    lines: Int32Array.from(time.map((_, i) => i + 2)),
    outliers: [],
  };
}

/** Closed-form simulator with exact sensitivities; fails like a diverging integration when k < 0. */
export const decaySimulator: SimulatorFns = {
  parameterVector(compiled, experimentIndex, values) {
    const p = compiled.defaultParams();
    const exp = compiled.model.experiments[experimentIndex];
    for (const [k, v] of Object.entries(exp.set)) p[compiled.paramSlot.get(k)!] = v;
    for (const [k, v] of Object.entries({ ...compiled.model.overrides, ...(values ?? {}) })) {
      const [name, e] = k.split('@');
      if (e === undefined || e === exp.name) p[compiled.paramSlot.get(name)!] = v;
    }
    return p;
  },
  trySimulateExperiment(_compiled, data, p, options?: SimulationOptions): SimulationOutcome {
    const [k, A, c] = [p[0], p[1], p[2]];
    if (k < 0) return simulationFailed('state grows without bound', { k });
    const n = data.time.length;
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    const slots = options?.sensitivitySlots;
    const q = slots?.length ?? 0;
    const dy = new Float64Array(n * q);
    for (let i = 0; i < n; i++) {
      const t = data.time[i];
      const e = Math.exp(-k * t);
      x[i] = A * e;
      y[i] = x[i] + c;
      slots?.forEach((s, j) => {
        dy[i * q + j] = s === 0 ? -t * A * e : s === 1 ? e : 1;
      });
    }
    return {
      ok: true,
      result: {
        experiment: data.experiment.name,
        time: data.time,
        states: [x],
        outputs: [y],
        sensitivities: slots ? { slots, outputs: [dy] } : undefined,
        stats: { rhsEvaluations: 0, steps: 0, rejectedSteps: 0, segments: 1 },
      },
    };
  },
};
