/**
 * Forward sensitivities against closed forms and against central finite differences of whole
 * simulations at tight tolerance.
 */
import { describe, expect, it } from 'vitest';
import { simulateExperiment } from '../../src/simulation/simulate.js';
import { handData, linspace } from './hand-models.js';
import { firstOrder, secondOrder } from './models.js';
import { twoMassModel, multisineLog } from '../../bench/simulate-bench.js';

function near(actual: number, expected: number, tol: number, scale = 1): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tol * Math.max(scale, Math.abs(expected)));
}

describe('sensitivities', () => {
  it('first order with x0: dx/dK, dx/dtau, dx/dx0 match the closed form', () => {
    // closed form: x = K + (x0 - K) e^{-t/tau}; dx/dK = 1 - e^{-t/tau};
    // dx/dtau = (x0 - K) e^{-t/tau} t / tau^2; dx/dx0 = e^{-t/tau}
    const c = firstOrder({ K: 2, tau: 0.5, x0: 0.4 });
    const t = linspace(0, 4, 81);
    const r = simulateExperiment(c, handData(c, t, [new Float64Array(81).fill(1)]), c.defaultParams(), { sensitivitySlots: [0, 1, 2] });
    const S = r.sensitivities!.outputs[0];
    expect(r.sensitivities!.slots).toEqual([0, 1, 2]);
    for (let i = 0; i < t.length; i++) {
      const e = Math.exp(-t[i] / 0.5);
      near(S[i * 3 + 0], 1 - e, 1e-7);
      near(S[i * 3 + 1], ((0.4 - 2) * e * t[i]) / 0.25, 1e-7);
      near(S[i * 3 + 2], e, 1e-7);
    }
  });

  it('sensitivityErrorControl: off, the steps follow the states alone; on (the default), the sensitivities too', () => {
    // closed form as above: x = K + (x0 - K) e^{-t/tau}, dx/dtau = (x0 - K) e^{-t/tau} t / tau^2
    const c = firstOrder({ K: 2, tau: 0.5, x0: 0.4 });
    const t = linspace(0, 4, 81);
    const data = handData(c, t, [new Float64Array(81).fill(1)]);
    const plain = simulateExperiment(c, data, c.defaultParams());
    const partial = simulateExperiment(c, data, c.defaultParams(), { sensitivitySlots: [0, 1, 2], sensitivityErrorControl: false });
    const byDefault = simulateExperiment(c, data, c.defaultParams(), { sensitivitySlots: [0, 1, 2] });
    const full = simulateExperiment(c, data, c.defaultParams(), { sensitivitySlots: [0, 1, 2], sensitivityErrorControl: true });
    expect(partial.stats.steps).toBe(plain.stats.steps);
    expect(byDefault.stats).toEqual(full.stats);
    for (let i = 0; i < t.length; i++) {
      const e = Math.exp(-t[i] / 0.5);
      near(partial.sensitivities!.outputs[0][i * 3 + 1], ((0.4 - 2) * e * t[i]) / 0.25, 1e-6);
    }
  });

  it('delay of a hold step: the jump condition gives dx/dd = -K/tau e^{-(t - ts - d)/tau}', () => {
    // closed form of a delayed step into a first-order lag: x = K (1 - e^{-(t - ts - d)/tau}) for t > ts + d
    const c = firstOrder({ interpolate: 'hold', delay: 'd', K: 2, tau: 0.5 });
    const t = linspace(0, 4, 401);
    const u = Float64Array.from(t, (v) => (v >= 1 ? 1 : 0));
    const p = c.defaultParams();
    p[3] = 0.35;
    const r = simulateExperiment(c, handData(c, t, [u]), p, { sensitivitySlots: [3, 0] });
    const S = r.sensitivities!.outputs[0];
    for (let i = 0; i < t.length; i++) {
      const s = t[i] - 1.35;
      if (Math.abs(s) < 1e-9) continue; // the sample on the jump itself (measure zero) takes S+
      near(S[i * 2], s > 0 ? (-2 / 0.5) * Math.exp(-s / 0.5) : 0, 1e-7);
      near(S[i * 2 + 1], s > 0 ? 1 - Math.exp(-s / 0.5) : 0, 1e-7);
    }
  });

  it('delay of a linear ramp: the udot term gives dx/dd = K (e^{-(t-d)/tau} - 1)', () => {
    // closed form: x = K((t-d) - tau(1 - e^{-(t-d)/tau})) for t > d, so dx/dd = K(e^{-(t-d)/tau} - 1)
    const c = firstOrder({ interpolate: 'linear', delay: 'd', K: 2, tau: 0.5 });
    const t = linspace(0, 3, 31);
    const p = c.defaultParams();
    p[3] = 0.25;
    const r = simulateExperiment(c, handData(c, t, [t]), p, { sensitivitySlots: [3] });
    const S = r.sensitivities!.outputs[0];
    for (let i = 0; i < t.length; i++) {
      const s = t[i] - 0.25;
      near(S[i], s > 0 ? 2 * (Math.exp(-s / 0.5) - 1) : 0, 1e-7);
    }
  });

  /** Central difference of a whole simulation in parameter slot k, relative step h. */
  function centralDifference(sim: (p: Float64Array) => Float64Array, p: Float64Array, k: number, h: number): Float64Array {
    const step = h * Math.max(Math.abs(p[k]), 1e-3);
    const up = Float64Array.from(p);
    const dn = Float64Array.from(p);
    up[k] += step;
    dn[k] -= step;
    const a = sim(up);
    const b = sim(dn);
    return a.map((v, i) => (v - b[i]) / (2 * step));
  }

  it('second order: dy/dwn and dy/dzeta match central finite differences at rtol 1e-12', () => {
    const c = secondOrder(2 * Math.PI, 0.2);
    const t = linspace(0, 4, 201);
    const data = handData(c, t, [new Float64Array(201).fill(1)]);
    const p = c.defaultParams();
    const r = simulateExperiment(c, data, p, { sensitivitySlots: [0, 1], rtol: 1e-12 });
    const S = r.sensitivities!.outputs[0];
    const sim = (pp: Float64Array) => simulateExperiment(c, data, pp, { rtol: 1e-12 }).outputs[0];
    for (let k = 0; k < 2; k++) {
      const fd = centralDifference(sim, p, k, 1e-5);
      const scale = Math.max(...fd.map(Math.abs));
      for (let i = 0; i < t.length; i++) near(S[i * 2 + k], fd[i], 1e-6, scale);
    }
  });

  it('4-state model with a multisine input: all six parameter sensitivities match finite differences', () => {
    const c = twoMassModel();
    // 2 s at 250 Hz, linear interpolation (steps end on the input's kinks). Difference step 1e-4
    // relative; check to 1e-6 of each sensitivity's peak (common practice, no source).
    const { time, force } = multisineLog(501, 250);
    const data = handData(c, time, [force]);
    const p = c.defaultParams();
    const slots = [0, 1, 2, 3, 4, 5];
    const r = simulateExperiment(c, data, p, { sensitivitySlots: slots, rtol: 1e-11 });
    // Both outputs side by side, so each perturbed simulation serves both.
    const both = (pp: Float64Array) => {
      const o = simulateExperiment(c, data, pp, { rtol: 1e-11 }).outputs;
      const joined = new Float64Array(2 * time.length);
      joined.set(o[0]);
      joined.set(o[1], time.length);
      return joined;
    };
    const fdAll = slots.map((k) => centralDifference(both, p, k, 1e-4));
    for (let out = 0; out < 2; out++) {
      const S = r.sensitivities!.outputs[out];
      for (let k = 0; k < slots.length; k++) {
        const fd = fdAll[k].subarray(out * time.length, (out + 1) * time.length);
        const scale = Math.max(...fd.map(Math.abs));
        let worst = 0;
        for (let i = 0; i < time.length; i++) worst = Math.max(worst, Math.abs(S[i * 6 + k] - fd[i]));
        expect(worst / scale).toBeLessThan(1e-6);
      }
    }
    // the plain simulation inside a sensitivity run is the same trajectory
    const plain = simulateExperiment(c, data, p, { rtol: 1e-11 });
    for (let i = 0; i < time.length; i += 50) near(r.outputs[0][i], plain.outputs[0][i], 1e-8, 1e-3);
  });
});
