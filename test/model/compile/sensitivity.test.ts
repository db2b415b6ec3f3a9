/**
 * The generated sensitivity system integrated (fixed-step RK4, tests only) and compared with
 * closed-form solutions of the sensitivity equations, and its structural properties.
 */
import { describe, expect, it } from 'vitest';
import { compileModel } from '../../../src/model/compile/index.js';
import { makeModel, rk4 } from './helpers.js';

const none = new Float64Array(0);

describe('sensitivities against closed forms', () => {
  it('dx/dt = -a x, x(0) = x0: x = x0 e^{-at}, dx/da = -t x0 e^{-at}, dx/dx0 = e^{-at} (closed form)', () => {
    const cm = compileModel(makeModel({ states: { x: 'x0' }, params: { a: 0.7, x0: 2.5 }, equations: { x: '-a * x' }, outputs: { y: 'x' } }));
    const sys = cm.sensitivity([0, 1]);
    const p = Float64Array.of(0.7, 2.5);
    const z0 = new Float64Array(3);
    sys.initial(0, p, z0);
    expect([...z0]).toEqual([2.5, 0, 1]);
    for (const t of [0.5, 1, 3]) {
      const z = rk4((tt, zz, dz) => sys.rhs(tt, zz, none, none, p, dz), z0, 0, t, 2000);
      const e = Math.exp(-0.7 * t);
      expect(z[0]).toBeCloseTo(2.5 * e, 11);
      expect(z[1]).toBeCloseTo(-t * 2.5 * e, 11);
      expect(z[2]).toBeCloseTo(e, 11);
      const y = new Float64Array(1);
      const dy = new Float64Array(2);
      sys.outputs(t, z, none, none, p, y, dy);
      expect(dy[0]).toBeCloseTo(-t * 2.5 * e, 11);
      expect(dy[1]).toBeCloseTo(e, 11);
    }
  });

  it('first-order step response dx/dt = (K u - x)/tau: dx/dK = 1 - e^{-t/tau}, dx/dtau = -K t/tau^2 e^{-t/tau} (closed form)', () => {
    const cm = compileModel(
      makeModel({ states: { x: 0 }, inputs: { u: {} }, params: { K: 3, tau: 0.4 }, equations: { x: '(K * u - x) / tau' }, outputs: { y: '2 * x' } }),
    );
    const sys = cm.sensitivity([1, 0]); // tau first: columns follow the slot list
    const p = Float64Array.of(3, 0.4);
    const u = Float64Array.of(1);
    const z0 = new Float64Array(3);
    sys.initial(0, p, z0);
    const t = 0.9;
    const z = rk4((tt, zz, dz) => sys.rhs(tt, zz, u, Float64Array.of(0), p, dz), z0, 0, t, 4000);
    const e = Math.exp(-t / 0.4);
    expect(z[0]).toBeCloseTo(3 * (1 - e), 10);
    expect(z[1]).toBeCloseTo((-3 * t * e) / 0.4 ** 2, 10);
    expect(z[2]).toBeCloseTo(1 - e, 10);
  });

  it('a delayed input, dx/dt = u(t - d) with u = sin: dx/dd = -sin(d) - sin(t - d) (closed form)', () => {
    // x(t) = integral_0^t sin(s - d) ds = cos(d) - cos(t - d)
    const cm = compileModel(makeModel({ states: { x: 0 }, inputs: { u: { delay: 'd' } }, params: { d: 0.3 }, equations: { x: 'u' }, outputs: { y: 'x' } }));
    const sys = cm.sensitivity([0]);
    expect(sys.delayOfInput).toEqual([0]);
    const p = Float64Array.of(0.3);
    const u = new Float64Array(1);
    const udot = new Float64Array(1);
    const z = rk4(
      (t, zz, dz) => {
        u[0] = Math.sin(t - 0.3); // the simulator passes u and udot at t - d
        udot[0] = Math.cos(t - 0.3);
        sys.rhs(t, zz, u, udot, p, dz);
      },
      new Float64Array(2),
      0,
      2,
      2000,
    );
    expect(z[0]).toBeCloseTo(Math.cos(0.3) - Math.cos(2 - 0.3), 11);
    expect(z[1]).toBeCloseTo(-Math.sin(0.3) - Math.sin(2 - 0.3), 11);
  });

  it('an initial value that is an expression of parameters, overridden per experiment', () => {
    // Experiment 1: x(0) = 2 w0 + 1, so x = (2 w0 + 1) e^{-at} and dx/dw0 = 2 e^{-at} (closed form).
    const cm = compileModel(
      makeModel({
        states: { x: 'w0' },
        params: { a: 0.5, w0: 0.2 },
        equations: { x: '-a * x' },
        outputs: { y: 'x' },
        experiments: [{}, { initial: { x: '2 * w0 + 1' } }],
      }),
    );
    const sys = cm.sensitivity([1]);
    const p = Float64Array.of(0.5, 0.2);
    const z0 = new Float64Array(2);
    sys.initial(1, p, z0);
    expect([...z0]).toEqual([1.4, 2]);
    const z = rk4((t, zz, dz) => sys.rhs(t, zz, none, none, p, dz), z0, 0, 2, 2000);
    expect(z[0]).toBeCloseTo(1.4 * Math.exp(-1), 11);
    expect(z[1]).toBeCloseTo(2 * Math.exp(-1), 11);
    sys.initial(0, p, z0);
    expect([...z0]).toEqual([0.2, 1]);
  });
});

describe('structure of the sensitivity system', () => {
  const decoupled = () =>
    compileModel(
      makeModel({
        states: { x1: 1, x2: 1, x3: 'c' },
        params: { a: 1, b: 2, c: 3 },
        equations: { x1: '-a * x1', x2: '-b * x2 + x1', x3: '-x3' },
        outputs: { y: 'x2 + x3' },
      }),
    );

  it('entries of S that stay zero are found and written as 0; everything is written', () => {
    const sys = decoupled().sensitivity([0, 1, 2]);
    // x1 depends on a only; x2 on a (through x1) and b; x3 on c (initial value) only.
    expect(sys.nonZero).toEqual([true, false, false, true, true, false, false, false, true]);
    const z = Float64Array.of(1, 2, 3, 0.1, 0, 0, 0.2, 0.3, 0, 0, 0, 0.4);
    const dz = new Float64Array(12).fill(NaN);
    sys.rhs(0, z, none, none, Float64Array.of(1, 2, 3), dz);
    expect(dz.every((v) => Number.isFinite(v))).toBe(true);
    expect([...dz.slice(3)]).toEqual([-1 * 0.1 - 1, 0, 0, -2 * 0.2 + 0.1, -2 * 0.3 - 2, 0, 0, 0, -0.4]);
    const z0 = new Float64Array(12).fill(NaN);
    sys.initial(0, Float64Array.of(1, 2, 3), z0);
    expect([...z0]).toEqual([1, 1, 3, 0, 0, 0, 0, 0, 0, 0, 0, 1]);
    const y = new Float64Array(1);
    const dy = new Float64Array(3).fill(NaN);
    sys.outputs(0, z, none, none, Float64Array.of(1, 2, 3), y, dy);
    expect([...dy]).toEqual([0.2, 0.3, 0.4]);
  });

  it('shares work: a define and its derivative are computed once for all columns', () => {
    const cm = compileModel(
      makeModel({
        states: { i: 0, w: 'w0' },
        inputs: { V: {} },
        params: { R: 1.92, J: 3.1e-3, L: 2e-3, K: 0.05, b: 5e-3, Tc: 0.1, ws: 0.5, w0: 1 },
        defines: { torque_friction: 'b*w + Tc*tanh(w/ws)' },
        equations: { i: '(V - R*i - K*w) / L', w: '(K*i - torque_friction) / J' },
        outputs: { speed: 'w', friction: 'torque_friction' },
      }),
    );
    const src = cm.sensitivity([2, 3, 4, 5, 6, 7]).source;
    // tanh for the value, cosh for its derivative (mathjs: sech^2), once each for six columns.
    for (const body of [src.rhs, src.outputs]) {
      expect(body.match(/Math\.tanh/g)?.length).toBe(1);
      expect(body.match(/Math\.cosh/g)?.length).toBe(1);
    }
  });

  it('is compiled once per slot list and validates the slots', () => {
    const cm = decoupled();
    expect(cm.sensitivity([0, 2])).toBe(cm.sensitivity([0, 2]));
    expect(cm.sensitivity([2, 0])).not.toBe(cm.sensitivity([0, 2]));
    expect(() => cm.sensitivity([3])).toThrow(RangeError);
    expect(() => cm.sensitivity([1, 1])).toThrow(RangeError);
    expect(cm.sensitivity([]).q).toBe(0);
  });

  it('a static model: outputs and their sensitivities with no states', () => {
    const cm = compileModel(makeModel({ inputs: { v: {} }, params: { c0: 1, c1: 2 }, outputs: { F: 'c0 + c1 * v ^ 2' } }));
    expect(cm.nStates).toBe(0);
    const sys = cm.sensitivity([0, 1]);
    const y = new Float64Array(1);
    const dy = new Float64Array(2);
    sys.outputs(0, none, Float64Array.of(3), none, Float64Array.of(1, 2), y, dy);
    expect(y[0]).toBe(19);
    expect([...dy]).toEqual([1, 9]);
  });
});
