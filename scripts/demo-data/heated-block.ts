/**
 * Heated block (models/heated-block.yaml): first-order thermal model with a transport delay on the
 * heater power (hold) and a drifting room temperature (linear). Temperatures are logged in degC.
 */
import { holdAt, holdJumps, integrateRk4, linearAt } from './integrate.js';
import type { SeededRandom as Rng } from '../../src/util/random.js';
import { noisy, randomRows, type ScenarioOutput } from './scenario.js';
import { prbs, roundTo, sampleTimes, steps } from './signals.js';

export interface ThermalParams { h: number; C: number; lag: number }
export const blockTruth: ThermalParams = { h: 1.6, C: 950, lag: 4.3 };
const KELVIN_AT_0C = 273.15;
const TEMP_NOISE_C = 0.05;

/** Block temperature in K at `times` (s), for heater power (W, hold, delayed) and ambient (K, linear). */
export function simulateBlock(p: ThermalParams, T0: number, times: Float64Array, power: Float64Array, ambientK: Float64Array, start = times[0]): Float64Array {
  const [T] = integrateRk4({
    rhs: (t, x, dx, tSeg) => {
      const P = holdAt(times, power, tSeg - p.lag);
      const Ta = linearAt(times, ambientK, t);
      dx[0] = (P - p.h * (x[0] - Ta)) / p.C;
    },
    x0: [T0],
    start,
    sampleTimes: times,
    breakpoints: [...holdJumps(times, power, p.lag), ...times],
    hmax: 0.05,
  });
  return T;
}

/** Room temperature in degC: a slow drift, as logged (0.01 degC resolution). */
function ambientC(times: Float64Array, base: number, rng: Rng): Float64Array {
  const phase = 2 * Math.PI * rng.uniform();
  return roundTo(times.map((t) => base + 0.4 * Math.sin(2 * Math.PI * t / 5400 + phase)), 4);
}

function blockFile(path: string, comment: string[], t: Float64Array, P: Float64Array, T0: number, base: number, rng: Rng, missingRows: number[] = []) {
  const amb = ambientC(t, base, rng);
  const T = simulateBlock(blockTruth, T0, t, P, amb.map((c) => c + KELVIN_AT_0C));
  return {
    path,
    comment,
    columns: [
      { name: 't', values: t },
      { name: 'heater_W', values: P },
      { name: 'ambient_C', values: amb },
      { name: 'block_C', values: noisy(T.map((k) => k - KELVIN_AT_0C), TEMP_NOISE_C, rng, missingRows), digits: 6 },
    ],
  };
}

export function heatedBlockScenario(rng: Rng): ScenarioOutput {
  const tSteps = sampleTimes(3600, 1);
  const pSteps = steps(tSteps, [60, 1800, 2700], [40, 0, 20]);
  const tPrbs = sampleTimes(2400, 1);
  const pPrbs = prbs(tPrbs, 60, 0, 30, 0x0a7);
  const tSoak = sampleTimes(3600, 1);
  const pSoak = steps(tSoak, [120], [15]);
  const T0 = { 'power-steps': 295.4, 'power-prbs': 301.2, 'long-soak': 296.0 };
  const missing = randomRows(5, 10, 2390, rng);
  const files = [
    blockFile('demo-data/block-steps.csv', ['heater power steps 0 -> 40 -> 0 -> 20 W, 1 s logging'], tSteps, pSteps, T0['power-steps'], 22.0, rng),
    blockFile('demo-data/block-prbs.csv', ['PRBS heater power 0/30 W, bit time 60 s, block still warm; a few thermocouple dropouts'], tPrbs, pPrbs, T0['power-prbs'], 23.5, rng, missing),
    blockFile('demo-data/block-soak.csv', ['15 W from 120 s, block at room temperature (validation)'], tSoak, pSoak, T0['long-soak'], 22.8, rng),
  ];
  const noise = { block_C: `${TEMP_NOISE_C} degC` };
  return {
    files,
    truth: {
      model: 'models/heated-block.yaml',
      parameters: { h: '1.6 W/K', C: '950 J/K', lag: '4.3 s' },
      experiments: {
        'power-steps': { file: files[0].path, samples: tSteps.length, noise, missing: { block_C: 0 }, values: { T0: '295.4 K' } },
        'power-prbs': { file: files[1].path, samples: tPrbs.length, noise, missing: { block_C: missing.length }, values: { T0: '301.2 K' } },
        'long-soak': { file: files[2].path, samples: tSoak.length, noise, missing: { block_C: 0 }, values: { 'initial T': '296.0 K' } },
      },
    },
  };
}
