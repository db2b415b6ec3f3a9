/**
 * Test fixtures (test/fixtures/models/): the reference cases that scripts/scipy_reference.py
 * integrates independently, and the 4-state linear model with a 10,000-sample log for the bench.
 * Their parameters are written as fixed values (or free starts) in the model files, so that
 * `rigcal simulate` runs them at the true values.
 */
import { holdAt, holdJumps, integrateRk4 } from './integrate.js';
import { simulateBlock } from './heated-block.js';
import { simulateMotor, flywheelTruth } from './flywheel.js';
import { simulateMount } from './shaker.js';
import type { SeededRandom as Rng } from '../../src/util/random.js';
import { noisy, randomRows, type ScenarioFile } from './scenario.js';
import { chirp, lowPassNoise, prbs, roundTo, sampleTimes, steps } from './signals.js';

const DIR = 'test/fixtures/models';
const RPM_PER_RAD_S = 60 / (2 * Math.PI);

export const twoMassTruth = { m1: 1, m2: 0.5, k1: 200, k2: 100, c1: 0.5, c2: 0.3 };

export function twoMassFile(rng: Rng): ScenarioFile {
  const p = twoMassTruth;
  const t = sampleTimes(10000, 1e-3);
  const F = prbs(t, 0.05, -1, 1, 0x0d3);
  const [x1, , x2] = integrateRk4({
    rhs: (_t, x, dx, tSeg) => {
      const f = holdAt(t, F, tSeg);
      const spring2 = p.k2 * (x[2] - x[0]) + p.c2 * (x[3] - x[1]);
      dx[0] = x[1];
      dx[1] = (f - p.k1 * x[0] - p.c1 * x[1] + spring2) / p.m1;
      dx[2] = x[3];
      dx[3] = -spring2 / p.m2;
    },
    x0: [0, 0, 0, 0],
    start: 0,
    sampleTimes: t,
    breakpoints: holdJumps(t, F),
    hmax: 1e-4,
  });
  return {
    path: `${DIR}/two-mass-10k.csv`,
    comment: ['4-state linear two-mass chain, PRBS force +-1 N (bit 0.05 s), 10,000 samples at 1 kHz; noise 1e-5 m'],
    columns: [
      { name: 't', values: t },
      { name: 'force', values: F },
      { name: 'x1', values: noisy(x1, 1e-5, rng) },
      { name: 'x2', values: noisy(x2, 1e-5, rng) },
    ],
  };
}

/** ref-motor: hold voltage, speed in rpm, `set` of J, time scales 1 ms and 0.9 s, a start before the first sample. */
function refMotorFiles(rng: Rng): ScenarioFile[] {
  const t1 = sampleTimes(2000, 1e-3);
  const v1 = steps(t1, [0.05, 1.0], [12, -6]);
  const a = simulateMotor(flywheelTruth, t1, v1);
  const t2 = sampleTimes(2000, 1e-3, 0.01);
  const v2 = steps(t2, [0, 1.2], [9, 0]);
  // Integration of this experiment starts at t = 0 (start: 0), before the first sample at 0.01 s.
  const b = simulateMotorFromZero({ ...flywheelTruth, J: 4.6e-3 }, t2, v2);
  const missing = randomRows(4, 10, 1990, rng);
  const file = (path: string, t: Float64Array, V: Float64Array, r: { i: Float64Array; w: Float64Array }, miss: number[] = []) => ({
    path,
    comment: ['reference case for test/reference: DC motor and flywheel'],
    columns: [
      { name: 't', values: t },
      { name: 'volts', values: V },
      { name: 'amps', values: noisy(r.i, 0.02, rng) },
      { name: 'rpm', values: noisy(r.w.map((w) => w * RPM_PER_RAD_S), 2, rng, miss) },
    ],
  });
  return [file(`${DIR}/ref-motor-steps.csv`, t1, v1, a), file(`${DIR}/ref-motor-disc.csv`, t2, v2, b, missing)];
}

function simulateMotorFromZero(p: typeof flywheelTruth, t: Float64Array, V: Float64Array) {
  const [i, w] = integrateRk4({
    rhs: (_t, x, dx, tSeg) => {
      const v = holdAt(t, V, tSeg);
      dx[0] = (v - p.R * x[0] - p.K * x[1]) / p.L;
      dx[1] = (p.K * x[0] - p.b * x[1] - p.Tc * Math.tanh(x[1] / p.ws)) / p.J;
    },
    x0: [0, 0],
    start: 0,
    sampleTimes: t,
    breakpoints: holdJumps(t, V),
    hmax: 1e-5,
  });
  return { i, w };
}

/** ref-thermal: hold power with a delay (a parameter), ambient and block in degC, one log timed in minutes. */
function refThermalFiles(rng: Rng): ScenarioFile[] {
  const p = { h: 1.6, C: 950, lag: 4.3 };
  const t1 = sampleTimes(1200, 1);
  const P1 = steps(t1, [30, 600], [40, 10]);
  const amb1 = roundTo(t1.map((t) => 22 + 0.3 * Math.sin(t / 700)), 4);
  const T1 = simulateBlock(p, 295.4, t1, P1, amb1.map((c) => c + 273.15));
  const tMin = sampleTimes(600, 0.05);
  const tSec = tMin.map((m) => m * 60);
  const P2 = prbs(tSec, 45, 0, 25, 0x033);
  const amb2 = roundTo(tSec.map((t) => 23 - 0.2 * Math.cos(t / 500)), 4);
  const T2 = simulateBlock(p, 300, tSec, P2, amb2.map((c) => c + 273.15));
  return [
    {
      path: `${DIR}/ref-thermal-steps.csv`,
      comment: ['reference case for test/reference: heated block, time in s'],
      columns: [
        { name: 't', values: t1 },
        { name: 'heater_W', values: P1 },
        { name: 'ambient_C', values: amb1 },
        { name: 'block_C', values: noisy(T1.map((k) => k - 273.15), 0.05, rng) },
      ],
    },
    {
      path: `${DIR}/ref-thermal-minutes.csv`,
      comment: ['reference case for test/reference: heated block, time logged in minutes'],
      columns: [
        { name: 'minutes', values: tMin },
        { name: 'heater_W', values: P2 },
        { name: 'ambient_C', values: amb2 },
        { name: 'block_C', values: noisy(T2.map((k) => k - 273.15), 0.05, rng) },
      ],
    },
  ];
}

/** ref-shaker: linear input, mm output, per-experiment offset, an initial override and a window. */
function refShakerFiles(rng: Rng): ScenarioFile[] {
  const p = { m: 2.5, k: 4000, c: 10 };
  const t1 = sampleTimes(2500, 2e-3);
  const a1 = roundTo(chirp(t1, 1, 15, 5, 2), 6);
  const r1 = simulateMount(p, t1, a1).r;
  const t2 = sampleTimes(2500, 2e-3);
  const a2 = roundTo(lowPassNoise(t2, 0.01, 1.5, rng), 6);
  // Only the window [0.5, 4.5] s is used, starting from r = 2 mm at rest at 0.5 s (the mass was
  // held and released there); outside the window the log shows the mass held still at 2 mm.
  const first = t2.findIndex((t) => t >= 0.5);
  const inWindow = simulateMount(p, t2.subarray(first), a2.subarray(first), 0.002).r;
  const r2 = new Float64Array(t2.length).fill(0.002);
  r2.set(inWindow, first);
  return [
    {
      path: `${DIR}/ref-shaker-chirp.csv`,
      comment: ['reference case for test/reference: shaker mount, chirp; LVDT offset 0.5 mm'],
      columns: [
        { name: 't', values: t1 },
        { name: 'table_acc', values: a1 },
        { name: 'lvdt_mm', values: noisy(r1.map((x) => 1000 * x + 0.5), 0.02, rng) },
      ],
    },
    {
      path: `${DIR}/ref-shaker-random.csv`,
      comment: ['reference case for test/reference: shaker mount, random table acceleration'],
      columns: [
        { name: 't', values: t2 },
        { name: 'table_acc', values: a2 },
        { name: 'lvdt_mm', values: noisy(r2.map((x) => 1000 * x), 0.02, rng) },
      ],
    },
  ];
}

export function fixtureFiles(rng: Rng): ScenarioFile[] {
  return [twoMassFile(rng), ...refMotorFiles(rng), ...refThermalFiles(rng), ...refShakerFiles(rng)];
}
