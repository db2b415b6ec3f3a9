/**
 * A YAML model file, compiled by the model compiler, simulated against a log read from CSV: the
 * whole path from files to numbers, checked against closed forms.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadModel } from '../../src/model/load/index.js';
import { compileModel } from '../../src/model/compile/index.js';
import { loadExperimentData } from '../../src/data/load-experiment.js';
import { parameterVector } from '../../src/simulation/parameters.js';
import { simulateExperiment, simulateSpan } from '../../src/simulation/simulate.js';

function setup(): string {
  const dir = mkdtempSync(join(tmpdir(), 'rigcal-e2e-'));
  // A scenario of our own: a heater block with a delayed, held power command; temperature logged in degC.
  writeFileSync(
    join(dir, 'heater.yaml'),
    `format: 1
name: heater-block
description: Heater block, first-order thermal model (a scenario of our own, for tests).
time_unit: s
states:
  T: { unit: K, initial: T0 }
inputs:
  P: { unit: W, column: power, interpolate: hold, delay: d }
parameters:
  C:  { free: [10, 1000], start: 200, unit: J/K }
  G:  { free: [0.1, 10], start: 2, unit: W/K }
  T0: { fixed: 293.15, unit: K }
  Ta: { fixed: 293.15, unit: K }
  d:  { free: [0, 5], start: 1.5, unit: s }
equations:
  T: (P - G*(T - Ta)) / C
outputs:
  T: { expr: T, unit: K, column: temp_c, column_unit: degC }
experiments:
  - name: step
    file: heater-step.csv
`,
  );
  // Power steps from 0 to 50 W at t = 10 s; 1 s sampling for 400 s (values of our own).
  const rows = ['# heater step test (generated for tests)', 't,power,temp_c'];
  for (let i = 0; i <= 400; i++) rows.push(`${i},${i >= 10 ? 50 : 0},${(20 + (i > 11.5 ? 25 * (1 - Math.exp(-(i - 11.5) / 100)) : 0)).toFixed(4)}`);
  writeFileSync(join(dir, 'heater-step.csv'), rows.join('\n') + '\n');
  return join(dir, 'heater.yaml');
}

describe('model file to simulation', () => {
  it('a delayed hold step into a first-order thermal model matches its closed form, with sensitivities', () => {
    // closed form of a delayed step into a first-order lag: with s = t - 10 - d, tau = C/G,
    // e = exp(-s/tau): T = Ta + (P/G)(1 - e) for s > 0; dT/dC = -(P/G) e s G/C^2;
    // dT/dG = -(P/G^2)(1 - e) + (P/G) e s/C; dT/dd = -(P/G) e/tau.
    const model = loadModel(setup());
    const compiled = compileModel(model);
    const data = loadExperimentData(model, 0);
    expect(data.outputs[0]![0]).toBeCloseTo(293.15, 9); // degC -> K (NIST SP 811: T/K = t/degC + 273.15)
    const p = parameterVector(compiled, 0);
    const slots = ['C', 'G', 'd'].map((n) => compiled.paramSlot.get(n)!);
    const r = simulateExperiment(compiled, data, p, { sensitivitySlots: slots });
    const C = 200, G = 2, d = 1.5, P = 50, tau = C / G;
    expect(r.stats.segments).toBe(2);
    for (let i = 0; i < data.time.length; i++) {
      const s = data.time[i] - 10 - d;
      const e = s > 0 ? Math.exp(-s / tau) : 1;
      const T = 293.15 + (s > 0 ? (P / G) * (1 - e) : 0);
      expect(Math.abs(r.outputs[0][i] - T)).toBeLessThan(1e-7 * T);
      if (s <= 0) continue;
      const dTdC = -(P / G) * e * s * G / (C * C);
      const dTdG = -(P / (G * G)) * (1 - e) + (P / G) * e * s / C;
      const dTdd = -(P / G) * e / tau;
      const S = r.sensitivities!.outputs[0];
      expect(Math.abs(S[i * 3] - dTdC)).toBeLessThan(1e-6 * Math.max(1e-3, Math.abs(dTdC)));
      expect(Math.abs(S[i * 3 + 1] - dTdG)).toBeLessThan(1e-6 * Math.max(1e-1, Math.abs(dTdG)));
      expect(Math.abs(S[i * 3 + 2] - dTdd)).toBeLessThan(1e-6 * Math.max(1e-2, Math.abs(dTdd)));
    }
  });

  it('simulateSpan uses the declared initial values (no experiment)', () => {
    const model = loadModel(setup());
    const compiled = compileModel(model);
    const p = parameterVector(compiled, -1);
    const r = simulateSpan(compiled, p, 100, { P: 20 }, 1);
    // closed form, delay 1.5 s with the first value held before the log starts: the constant input
    // acts from t = 0, so T = Ta + (P/G)(1 - e^{-t/tau})
    for (let i = 0; i < r.time.length; i += 10) {
      const T = 293.15 + 10 * (1 - Math.exp(-r.time[i] / 100));
      expect(Math.abs(r.outputs[0][i] - T)).toBeLessThan(1e-7 * T);
    }
  });

  it('a delayed linear ramp: the compiled sensitivity of the delay uses the input slope', () => {
    // closed form: first-order lag driven by a ramp r(t) = a t delayed by d:
    // with s = t - d > 0, x = K a (s - tau (1 - e^{-s/tau})) and dx/dd = -K a (1 - e^{-s/tau})
    const dir = mkdtempSync(join(tmpdir(), 'rigcal-e2e-ramp-'));
    writeFileSync(join(dir, 'lag.yaml'), `format: 1
name: ramp-lag
description: First-order lag driven by a delayed ramp (a scenario of our own, for tests).
states:
  x: { initial: 0 }
inputs:
  r: { interpolate: linear, delay: d }
parameters:
  K:   { fixed: 2 }
  tau: { fixed: 0.5 }
  d:   { free: [0, 1], start: 0.3 }
equations:
  x: (K*r - x) / tau
outputs:
  x: { expr: x, column: x }
experiments:
  - name: ramp
    file: ramp.csv
`);
    const rows = ['t,r,x'];
    for (let i = 0; i <= 40; i++) rows.push(`${i * 0.1},${(0.1 * i * 1.5).toFixed(12)},0`);
    writeFileSync(join(dir, 'ramp.csv'), rows.join('\n') + '\n');
    const model = loadModel(join(dir, 'lag.yaml'));
    const compiled = compileModel(model);
    const data = loadExperimentData(model, 0);
    const slot = compiled.paramSlot.get('d')!;
    const r = simulateExperiment(compiled, data, parameterVector(compiled, 0), { sensitivitySlots: [slot] });
    for (let i = 0; i < data.time.length; i++) {
      const s = data.time[i] - 0.3;
      const x = s > 0 ? 2 * 1.5 * (s - 0.5 * (1 - Math.exp(-s / 0.5))) : 0;
      const dxdd = s > 0 ? -2 * 1.5 * (1 - Math.exp(-s / 0.5)) : 0;
      expect(Math.abs(r.outputs[0][i] - x)).toBeLessThan(1e-7 * Math.max(1, Math.abs(x)));
      expect(Math.abs(r.sensitivities!.outputs[0][i] - dxdd)).toBeLessThan(1e-7 * Math.max(1, Math.abs(dxdd)));
    }
  });
});
