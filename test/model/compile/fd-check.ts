/**
 * The generic finite-difference check of a compiled model's sensitivity system (used by several
 * test files): for random z = [x, S] (S zero where the compiler says it is structurally zero) and
 * random udot, every column k of the generated sensitivity right-hand side, outputs and initial
 * values must equal the central difference of the plain functions along
 * (dx = S[:,k], dp = e_slot(k), du_j = -udot_j for the inputs delayed by slot k).
 */
import { expect } from 'vitest';
import type { CompiledModelDetails } from '../../../src/model/compile/index.js';
import { rng } from './helpers.js';

export interface Ranges {
  x: [number, number];
  u: [number, number];
  p: (slot: number) => [number, number];
}

/** Central difference with relative step h; error O(h^2) (any numerical analysis text). */
export function fdCheck(cm: CompiledModelDetails, slots: number[], ranges: Ranges, seed: number, trials = 40, tol = 1e-6) {
  const { nStates: n, nInputs: m, nParams: np, nOutputs: no } = cm;
  const sys = cm.sensitivity(slots);
  const q = slots.length;
  const r = rng(seed);
  const worst = { rhs: 0, outputs: 0, initial: 0 };
  // Error of a central difference: truncation O(h^2) (bounded by tol relative to the value) plus
  // rounding of the two evaluations, about eps |f| / h; the ratio below must stay under 1.
  const eps = Number.EPSILON;
  const err = (a: number, b: number, fa: number, fb: number, h: number) =>
    Math.abs(a - b) / (tol * (1e-3 + Math.abs(b)) + (100 * eps * (Math.abs(fa) + Math.abs(fb))) / (2 * h));
  for (let trial = 0; trial < trials; trial++) {
    const t = r(0, 5);
    const x = Float64Array.from({ length: n }, () => r(...ranges.x));
    const u = Float64Array.from({ length: m }, () => r(...ranges.u));
    const udot = Float64Array.from({ length: m }, () => r(-2, 2));
    const p = Float64Array.from({ length: np }, (_, i) => r(...ranges.p(i)));
    const z = new Float64Array(n * (1 + q));
    z.set(x);
    for (let i = 0; i < n * q; i++) z[n + i] = sys.nonZero[i] ? r(-1, 1) : 0;
    const dz = new Float64Array(n * (1 + q));
    sys.rhs(t, z, u, udot, p, dz);
    const y = new Float64Array(no);
    const dy = new Float64Array(no * q);
    sys.outputs(t, z, u, udot, p, y, dy);

    const f0 = new Float64Array(n);
    cm.rhs(t, x, u, p, f0);
    for (let i = 0; i < n; i++) expect(dz[i]).toBe(f0[i]);
    const y0 = new Float64Array(no);
    cm.outputs(t, x, u, p, y0);
    for (let o = 0; o < no; o++) expect(y[o]).toBe(y0[o]);

    for (let k = 0; k < q; k++) {
      const h = 1e-6 * Math.max(Math.abs(p[slots[k]!]!), 1e-3); // relative step
      const shifted = (sign: number) => {
        const xs = x.map((v, j) => v + sign * h * z[n + j * q + k]!);
        const ps = Float64Array.from(p);
        ps[slots[k]!] = p[slots[k]!]! + sign * h;
        const us = Float64Array.from(u);
        sys.inputsDelayedBy[k]!.forEach((j) => (us[j] = u[j]! - sign * h * udot[j]!));
        return { xs, us, ps };
      };
      const a = shifted(1);
      const b = shifted(-1);
      const fa = new Float64Array(n);
      const fb = new Float64Array(n);
      cm.rhs(t, a.xs, a.us, a.ps, fa);
      cm.rhs(t, b.xs, b.us, b.ps, fb);
      for (let i = 0; i < n; i++) worst.rhs = Math.max(worst.rhs, err(dz[n + i * q + k]!, (fa[i]! - fb[i]!) / (2 * h), fa[i]!, fb[i]!, h));
      const ya = new Float64Array(no);
      const yb = new Float64Array(no);
      cm.outputs(t, a.xs, a.us, a.ps, ya);
      cm.outputs(t, b.xs, b.us, b.ps, yb);
      for (let o = 0; o < no; o++) worst.outputs = Math.max(worst.outputs, err(dy[o * q + k]!, (ya[o]! - yb[o]!) / (2 * h), ya[o]!, yb[o]!, h));
    }
    // Initial values, per experiment.
    for (let e = -1; e < cm.model.experiments.length; e++) {
      const z0 = new Float64Array(n * (1 + q));
      sys.initial(e, p, z0);
      const x0 = new Float64Array(n);
      cm.initial(e, p, x0);
      for (let i = 0; i < n; i++) expect(z0[i]).toBe(x0[i]);
      for (let k = 0; k < q; k++) {
        const h = 1e-6 * Math.max(Math.abs(p[slots[k]!]!), 1e-3);
        const pa = Float64Array.from(p);
        const pb = Float64Array.from(p);
        pa[slots[k]!] = p[slots[k]!]! + h;
        pb[slots[k]!] = p[slots[k]!]! - h;
        const xa = new Float64Array(n);
        const xb = new Float64Array(n);
        cm.initial(e, pa, xa);
        cm.initial(e, pb, xb);
        for (let i = 0; i < n; i++) worst.initial = Math.max(worst.initial, err(z0[n + i * q + k]!, (xa[i]! - xb[i]!) / (2 * h), xa[i]!, xb[i]!, h));
      }
    }
  }
  expect(worst.rhs).toBeLessThan(1);
  expect(worst.outputs).toBeLessThan(1);
  expect(worst.initial).toBeLessThan(1);
  return worst;
}

