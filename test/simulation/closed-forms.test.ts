/**
 * The simulator against closed-form responses (closed form / any control or vibration handbook).
 */
import { describe, expect, it } from 'vitest';
import { RunFailure } from '../../src/errors.js';
import { stiffnessWarning } from '../../src/simulation/stiffness.js';
import { simulateExperiment, simulateSpan, trySimulateExperiment } from '../../src/simulation/simulate.js';
import { handData, handModel, linspace } from './hand-models.js';
import { firstOrder, rlInertia, secondOrder } from './models.js';

/**
 * |actual - expected| <= tol * max(1, |expected|). With the default rtol 1e-8 per step, the global
 * error stays within about 1e-7 of the solution's size (common practice, no source).
 */
function expectNear(actual: number, expected: number, tol = 1e-7): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tol * Math.max(1, Math.abs(expected)));
}

/** Vertex of the parabola through three equally spaced samples (peak refinement). */
function refinePeak(t: Float64Array, y: Float64Array, i: number): { t: number; y: number } {
  const h = t[i + 1] - t[i];
  const a = y[i - 1], b = y[i], c = y[i + 1];
  const d = (a - c) / (2 * (a - 2 * b + c));
  return { t: t[i] + d * h, y: b - ((a - c) * d) / 4 };
}

describe('closed-form responses', () => {
  it('first-order step response x = K (1 - exp(-t/tau))', () => {
    // closed form / any control or vibration handbook
    const c = firstOrder({ K: 2, tau: 0.5 });
    const t = linspace(0, 5, 501);
    const r = simulateExperiment(c, handData(c, t, [new Float64Array(501).fill(1)]), c.defaultParams());
    for (let i = 0; i < t.length; i++) expectNear(r.outputs[0][i], 2 * (1 - Math.exp(-t[i] / 0.5)));
    expect(r.states[0]).toEqual(r.outputs[0]);
    expect(r.stats.segments).toBe(1);
    // dense output: far fewer steps than samples
    expect(r.stats.steps).toBeLessThan(100);
  });

  it('first-order response from a start before the first sample', () => {
    // closed form: the log starts at 0.8 s but the states are known at 0 s.
    const c = firstOrder({ K: 2, tau: 0.5, x0: 0.3 });
    const t = linspace(0.8, 3, 12);
    const r = simulateExperiment(c, handData(c, t, [new Float64Array(12).fill(1)], 0), c.defaultParams());
    for (let i = 0; i < t.length; i++) expectNear(r.outputs[0][i], 2 + (0.3 - 2) * Math.exp(-t[i] / 0.5));
  });

  const wn = 2 * Math.PI;
  const zeta = 0.1;
  const wd = wn * Math.sqrt(1 - zeta * zeta);
  const stepResponse = (t: number) => 1 - (Math.exp(-zeta * wn * t) / Math.sqrt(1 - zeta * zeta)) * Math.sin(wd * t + Math.acos(zeta));

  it('second-order underdamped step response', () => {
    // closed form / any control or vibration handbook:
    // y = 1 - exp(-zeta wn t)/sqrt(1-zeta^2) sin(wd t + acos zeta)
    const c = secondOrder(wn, zeta);
    const t = linspace(0, 6, 601);
    const r = simulateExperiment(c, handData(c, t, [new Float64Array(601).fill(1)]), c.defaultParams());
    let worst = 0;
    for (let i = 0; i < t.length; i++) worst = Math.max(worst, Math.abs(r.outputs[0][i] - stepResponse(t[i])));
    expect(worst).toBeLessThan(1e-7);
  });

  it('logarithmic decrement and percent overshoot from the simulated peaks', () => {
    // closed form / any control or vibration handbook:
    // delta = ln(x_k / x_{k+1}) = 2 pi zeta / sqrt(1 - zeta^2); overshoot = exp(-zeta pi / sqrt(1 - zeta^2))
    const c = secondOrder(wn, zeta);
    const t = linspace(0, 8, 8001);
    const r = simulateExperiment(c, handData(c, t, [new Float64Array(8001).fill(1)]), c.defaultParams());
    const y = r.outputs[0];
    const peaks: { t: number; y: number }[] = [];
    for (let i = 1; i + 1 < y.length; i++) if (y[i] > y[i - 1] && y[i] >= y[i + 1]) peaks.push(refinePeak(t, y, i));
    expect(peaks.length).toBeGreaterThanOrEqual(5);
    const overshoot = peaks[0].y - 1;
    expect(overshoot).toBeCloseTo(Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta * zeta)), 7);
    expect(peaks[0].t).toBeCloseTo(Math.PI / wd, 5);
    const delta = 2 * Math.PI * zeta / Math.sqrt(1 - zeta * zeta);
    for (let k = 0; k + 1 < 5; k++) expect(Math.log((peaks[k].y - 1) / (peaks[k + 1].y - 1))).toBeCloseTo(delta, 6);
  });

  it('hold input: restart at every change matches the exact piecewise solution', () => {
    // closed form of a first-order lag over each constant piece:
    // x_{k+1} = K u_k + (x_k - K u_k) exp(-(t_{k+1} - t_k)/tau)
    const c = firstOrder({ interpolate: 'hold', K: 1.5, tau: 0.2 });
    const t = linspace(0, 3, 31);
    const u = Float64Array.from(t, (_v, i) => [0, 1, 1, -0.5, 2, 2, 2, 0.3][i % 8]);
    const r = simulateExperiment(c, handData(c, t, [u]), c.defaultParams());
    let x = 0;
    for (let i = 0; i < t.length; i++) {
      expectNear(r.outputs[0][i], x);
      if (i + 1 < t.length) x = 1.5 * u[i] + (x - 1.5 * u[i]) * Math.exp(-(t[i + 1] - t[i]) / 0.2);
    }
    let changes = 0;
    for (let i = 1; i < u.length - 1; i++) if (u[i] !== u[i - 1]) changes++;
    expect(r.stats.segments).toBe(changes + 1);
    // the same data read as linear interpolation gives a visibly different answer
    const lin = firstOrder({ interpolate: 'linear', K: 1.5, tau: 0.2 });
    const rl = simulateExperiment(lin, handData(lin, t, [u]), lin.defaultParams());
    expect(Math.abs(rl.outputs[0][2] - r.outputs[0][2])).toBeGreaterThan(1e-2);
  });

  it('delay on a hold step: x = K (1 - exp(-(t - ts - d)/tau)) after ts + d', () => {
    // closed form of a delayed step into a first-order lag
    const d = 0.35;
    const c = firstOrder({ interpolate: 'hold', delay: 'd', K: 2, tau: 0.5 });
    const t = linspace(0, 4, 401);
    const u = Float64Array.from(t, (v) => (v >= 1 ? 1 : 0));
    const p = c.defaultParams();
    p[3] = d;
    const r = simulateExperiment(c, handData(c, t, [u]), p);
    for (let i = 0; i < t.length; i++) {
      const expected = t[i] >= 1 + d ? 2 * (1 - Math.exp(-(t[i] - 1 - d) / 0.5)) : 0;
      expectNear(r.outputs[0][i], expected);
    }
    expect(r.stats.segments).toBe(2);
  });

  it('delay on a linear ramp, with the first value held before the log starts', () => {
    // closed form of a first-order lag driven by a ramp starting at d: x = K((t-d) - tau(1 - exp(-(t-d)/tau)))
    const d = 0.25;
    const c = firstOrder({ interpolate: 'linear', delay: d, K: 2, tau: 0.5 });
    const t = linspace(0, 3, 31);
    const r = simulateExperiment(c, handData(c, t, [t]), c.defaultParams());
    for (let i = 0; i < t.length; i++) {
      const s = t[i] - d;
      const expected = s > 0 ? 2 * (s - 0.5 * (1 - Math.exp(-s / 0.5))) : 0;
      expectNear(r.outputs[0][i], expected);
    }
  });

  it('linear interpolation of a sampled signal matches the exact piecewise-ramp solution', () => {
    // closed form of a first-order lag on one interval where u = u_k + s (t - t_k):
    // x(t) = K (u(t) - tau s) + (x_k - K (u_k - tau s)) e^{-(t - t_k)/tau}
    const K = 2, tau = 0.05;
    const c = firstOrder({ interpolate: 'linear', K, tau });
    const t = linspace(0, 2, 2001);
    const u = Float64Array.from(t, (v) => Math.sin(2 * Math.PI * 3 * v) + 0.4 * Math.sin(2 * Math.PI * 17 * v));
    const r = simulateExperiment(c, handData(c, t, [u]), c.defaultParams());
    let x = 0;
    for (let i = 0; i < t.length; i++) {
      expectNear(r.outputs[0][i], x, 1e-8);
      if (i + 1 < t.length) {
        const h = t[i + 1] - t[i];
        const slope = (u[i + 1] - u[i]) / h;
        x = K * (u[i + 1] - tau * slope) + (x - K * (u[i] - tau * slope)) * Math.exp(-h / tau);
      }
    }
    // one step per sample interval: steps end on the samples, where the input has its kinks
    expect(r.stats.steps).toBeGreaterThanOrEqual(2000);
    expect(r.stats.rejectedSteps).toBeLessThan(20);
  });

  it('two time scales 1000x apart: an RL circuit driving an inertia', () => {
    // closed form: i = V/R (1 - e^{-a t}), a = R/L; w' + b w = (K V/(R J))(1 - e^{-a t}) with beta = b/J:
    // w = c/beta (1 - e^{-beta t}) + c/(beta - a) (e^{-beta t} - e^{-a t}), c = K V/(R J)
    const L = 1e-3, R = 1, K = 0.5, J = 1, b = 1, V = 12;
    const c = rlInertia(L, R, K, J, b);
    const t = linspace(0, 5, 5001);
    const r = simulateExperiment(c, handData(c, t, [new Float64Array(5001).fill(V)]), c.defaultParams());
    const a = R / L, beta = b / J, cc = (K * V) / (R * J);
    for (let i = 0; i < t.length; i += 7) {
      const w = (cc / beta) * (1 - Math.exp(-beta * t[i])) + (cc / (beta - a)) * (Math.exp(-beta * t[i]) - Math.exp(-a * t[i]));
      expectNear(r.outputs[0][i], w);
      // The fast state sits at the stability limit of the explicit method once its transient is
      // over; there it keeps about 4e-7 relative accuracy at rtol 1e-8 (measured), hence 1e-6.
      expectNear(r.states[0][i], (V / R) * (1 - Math.exp(-a * t[i])), 1e-6);
    }
  });

  it('a stiff model (time constants 1e6 apart) is reported in words as stiff', () => {
    const c = rlInertia(1e-6, 1, 0.5, 1, 1);
    const t = linspace(0, 10, 101);
    let err: unknown;
    try {
      simulateExperiment(c, handData(c, t, [new Float64Array(101).fill(12)]), c.defaultParams(), { maxSteps: 3000 });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(RunFailure);
    const msg = (err as RunFailure).message;
    expect(msg).toMatch(/looks stiff between t=0 and/);
    expect(msg).toMatch(/time constants differ by ~1e6/);
    expect(msg).toContain('exp1');
    expect(msg).toMatch(/L=(1e-6|0\.000001)\b/);
    expect((err as RunFailure).details.stiff).toBe(true);
  });

  it('a solution that escapes to infinity fails naming the time, experiment and parameters', () => {
    // x' = a x^2, x(0) = 1 has x = 1/(1 - a t): infinite at t = 1/a = 1
    const c = handModel({
      states: ['x'],
      params: [{ name: 'a', value: 1 }],
      outputs: ['x'],
      rhs: (_t, x, _u, p, dx) => { dx[0] = p[0] * x[0] * x[0]; },
      outputsFn: (_t, x, _u, _p, y) => { y[0] = x[0]; },
      initial: (_e, _p, x0) => { x0[0] = 1; },
    });
    let err: unknown;
    try {
      simulateExperiment(c, handData(c, linspace(0, 2, 21), []), c.defaultParams(), { maxSteps: 20000 });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(RunFailure);
    const e = err as RunFailure;
    expect(e.message).toContain('exp1');
    expect(e.message).toContain('a=1');
    expect(e.details.time as number).toBeGreaterThan(0.99);
    expect(e.details.time as number).toBeLessThan(1.01);
  });

  it('trySimulateExperiment answers the same failure as a value, without throwing', () => {
    // x' = a x^2, x(0) = 1: x = 1/(1 - a t), infinite at t = 1/a = 0.5 for a = 2
    const c = handModel({
      states: ['x'],
      params: [{ name: 'a', value: 2 }],
      outputs: ['x'],
      rhs: (_t, x, _u, p, dx) => { dx[0] = p[0] * x[0] * x[0]; },
      outputsFn: (_t, x, _u, _p, y) => { y[0] = x[0]; },
      initial: (_e, _p, x0) => { x0[0] = 1; },
    });
    const data = handData(c, linspace(0, 2, 21), []);
    const outcome = trySimulateExperiment(c, data, c.defaultParams(), { maxSteps: 20000 });
    expect(outcome.ok).toBe(false);
    if (outcome.ok) return;
    expect(outcome.failure.details.time as number).toBeGreaterThan(0.495);
    expect(outcome.failure.details.time as number).toBeLessThan(0.505);
    expect(() => simulateExperiment(c, data, c.defaultParams(), { maxSteps: 20000 })).toThrow(new RunFailure(outcome.failure.message, outcome.failure.details));
    // Before the blow-up the same run succeeds and follows the closed form.
    const early = trySimulateExperiment(c, handData(c, linspace(0, 0.25, 6), []), c.defaultParams());
    expect(early.ok).toBe(true);
    if (early.ok) expectNear(early.result.states[0][5], 1 / (1 - 2 * 0.25), 1e-6);
  });

  it('simulateSpan: constant inputs over a duration without data', () => {
    // closed form: first-order step response again
    const c = firstOrder({ K: 3, tau: 0.25 });
    const r = simulateSpan(c, c.defaultParams(), 2, { u: 1 }, 0.01);
    expect(r.time.length).toBe(201);
    expect(r.time[200]).toBeCloseTo(2, 12);
    for (let i = 0; i < r.time.length; i += 10) expectNear(r.outputs[0][i], 3 * (1 - Math.exp(-r.time[i] / 0.25)));
    expect(() => simulateSpan(c, c.defaultParams(), 2, { v: 1 }, 0.01)).toThrow(/"v" is not an input/);
    expect(() => simulateSpan(c, c.defaultParams(), 2, {}, 0.01)).toThrow(/no value for input u/);
    expect(() => simulateSpan(c, c.defaultParams(), -1, { u: 1 }, 0.01)).toThrow(/duration must be a positive/);
  });

  it('a static model is evaluated row by row without time order', () => {
    // y = c0 + c1 * v (a calibration line): exact arithmetic
    const c = handModel({
      states: [],
      inputs: [{ name: 'v' }],
      params: [{ name: 'c0', value: 0.5 }, { name: 'c1', value: 2 }],
      outputs: ['y'],
      rhs: () => {},
      outputsFn: (_t, _x, u, p, y) => { y[0] = p[0] + p[1] * u[0]; },
      gp: (_t, _x, u, _p, J) => { J[0] = 1; J[1] = u[0]; },
    });
    const v = [3, -1, 7, 0];
    const r = simulateExperiment(c, handData(c, [5, 1, 3, 2], [v]), c.defaultParams(), { sensitivitySlots: [1] });
    expect(Array.from(r.outputs[0])).toEqual(v.map((x) => 0.5 + 2 * x));
    expect(Array.from(r.sensitivities!.outputs[0])).toEqual(v);
    expect(r.states).toEqual([]);
  });
});

describe('stiffness words on a run that succeeds', () => {
  it('an RL circuit 1e4 faster than its inertia simulates in few steps; the stiffness words when a run crawls', () => {
    // time constants L/R = 1e-4 s and J/b = 1 s. The run no longer crawls at the fast time
    // constant (the interpolant, whose error estimate held the steps there, is built only for
    // steps that contain a sample), so it gets no warning; it took ~29,500 steps before.
    const c = rlInertia(1e-4, 1, 0.5, 1, 1);
    const t = linspace(0, 20, 201);
    const r = simulateExperiment(c, handData(c, t, [new Float64Array(201).fill(12)]), c.defaultParams());
    expect(r.stats.steps).toBeLessThan(5000);
    expect(r.warnings).toBeUndefined();
    // i = V/R within a millisecond, then w = (K V/(R b)) (1 - e^{-t b/J}) up to the fast lag,
    // i.e. 6 (1 - e^{-20}) rad/s at t = 20 s
    expect(Math.abs(r.outputs[0][200] - 6 * (1 - Math.exp(-20)))).toBeLessThan(1e-7 * 6);
    // A run that did crawl (30,000 steps of 20 s / 30,000 near the fast time constant) gets the words.
    const words = stiffnessWarning({ compiled: c, t: 20, x: Float64Array.of(12, 6), u: Float64Array.of(12), p: c.defaultParams() }, { from: 0, to: 20, steps: 30_000 });
    expect(words).toMatch(/looks stiff between t=0 and 20 s: time constants differ by ~1e4/);
    // and a model that is not stiff gets no warning
    const easy = rlInertia(0.5, 1, 0.5, 1, 1);
    expect(simulateExperiment(easy, handData(easy, t, [new Float64Array(201).fill(12)]), easy.defaultParams()).warnings).toBeUndefined();
  });
});
