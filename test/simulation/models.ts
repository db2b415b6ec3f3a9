/** The hand-written models the simulator tests share (closed forms in the tests that use them). */
import { handModel, type HandSpec } from './hand-models.js';

/** First order: x' = (K u - x)/tau, x(0) = x0, y = x. */
export function firstOrder(opts: { interpolate?: 'linear' | 'hold'; delay?: number | string; x0?: number; K?: number; tau?: number } = {}) {
  const params: HandSpec['params'] = [
    { name: 'K', value: opts.K ?? 2, free: [0, 10] },
    { name: 'tau', value: opts.tau ?? 0.5, free: [0.01, 10] },
    { name: 'x0', value: opts.x0 ?? 0, free: [-10, 10] },
    { name: 'd', value: typeof opts.delay === 'number' ? opts.delay : 0.35, free: [0, 1] },
  ];
  return handModel({
    states: ['x'],
    inputs: [{ name: 'u', interpolate: opts.interpolate ?? 'linear', delay: opts.delay }],
    params,
    outputs: ['y'],
    rhs: (_t, x, u, p, dx) => {
      dx[0] = (p[0] * u[0] - x[0]) / p[1];
    },
    outputsFn: (_t, x, _u, _p, y) => {
      y[0] = x[0];
    },
    initial: (_e, p, x0) => {
      x0[0] = p[2];
    },
    fx: (_t, _x, _u, p, J) => {
      J[0] = -1 / p[1];
    },
    fp: (_t, x, u, p, J) => {
      J[0] = u[0] / p[1];
      J[1] = -(p[0] * u[0] - x[0]) / (p[1] * p[1]);
    },
    fu: (_t, _x, _u, p, J) => {
      J[0] = p[0] / p[1];
    },
    gx: (_t, _x, _u, _p, J) => {
      J[0] = 1;
    },
    x0p: (_e, _p, J) => {
      J[2] = 1;
    },
  });
}

/** Second order: x1' = x2, x2' = wn^2 (u - x1) - 2 zeta wn x2; y = x1. */
export function secondOrder(wn: number, zeta: number) {
  return handModel({
    states: ['x1', 'x2'],
    inputs: [{ name: 'u' }],
    params: [
      { name: 'wn', value: wn, free: [0.1, 100] },
      { name: 'zeta', value: zeta, free: [0, 2] },
    ],
    outputs: ['y'],
    rhs: (_t, x, u, p, dx) => {
      dx[0] = x[1];
      dx[1] = p[0] * p[0] * (u[0] - x[0]) - 2 * p[1] * p[0] * x[1];
    },
    outputsFn: (_t, x, _u, _p, y) => {
      y[0] = x[0];
    },
    fx: (_t, _x, _u, p, J) => {
      J[1] = 1;
      J[2] = -p[0] * p[0];
      J[3] = -2 * p[1] * p[0];
    },
    fp: (_t, x, u, p, J) => {
      // row 1 (x2'): d/dwn, d/dzeta
      J[2] = 2 * p[0] * (u[0] - x[0]) - 2 * p[1] * x[1];
      J[3] = -2 * p[0] * x[1];
    },
    gx: (_t, _x, _u, _p, J) => {
      J[0] = 1;
    },
  });
}

/**
 * An RL circuit driving an inertia (no back-EMF): i' = (V - R i)/L, w' = (K i - b w)/J.
 * Electrical time constant L/R, mechanical J/b.
 */
export function rlInertia(L: number, R: number, K: number, J: number, b: number) {
  return handModel({
    states: ['i', 'w'],
    inputs: [{ name: 'V' }],
    params: [
      { name: 'L', value: L },
      { name: 'R', value: R },
      { name: 'K', value: K },
      { name: 'J', value: J },
      { name: 'b', value: b },
    ],
    outputs: ['w'],
    rhs: (_t, x, u, p, dx) => {
      dx[0] = (u[0] - p[1] * x[0]) / p[0];
      dx[1] = (p[2] * x[0] - p[4] * x[1]) / p[3];
    },
    outputsFn: (_t, x, _u, _p, y) => {
      y[0] = x[1];
    },
  });
}
