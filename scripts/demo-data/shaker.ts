/**
 * Spring-damper mount on a shaker (models/shaker-suspension.yaml): base-excited mass in relative
 * coordinates, table acceleration as a linear input, LVDT displacement logged in mm with a zero
 * offset of its own in each test.
 */
import { integrateRk4, linearAt } from './integrate.js';
import type { SeededRandom as Rng } from '../../src/util/random.js';
import { noisy, type ScenarioOutput } from './scenario.js';
import { chirp, lowPassNoise, roundTo, sampleTimes } from './signals.js';

export interface MountParams { m: number; k: number; c: number }
export const shakerTruth: MountParams = { m: 2.5, k: 4000, c: 10 };
const LVDT_NOISE_MM = 0.02;

/** Relative displacement (m) of the mass for the table acceleration `acc` (m/s^2, linear). */
export function simulateMount(p: MountParams, times: Float64Array, acc: Float64Array, r0 = 0, v0 = 0): { r: Float64Array; v: Float64Array } {
  const [r, v] = integrateRk4({
    rhs: (t, x, dx) => {
      dx[0] = x[1];
      dx[1] = -(p.k * x[0] + p.c * x[1]) / p.m - linearAt(times, acc, t);
    },
    x0: [r0, v0],
    start: times[0],
    sampleTimes: times,
    breakpoints: [],
    // The natural period is 0.16 s: 1e-4 s steps keep RK4's error far below the LVDT noise.
    hmax: 1e-4,
  });
  return { r, v };
}

function shakerFile(path: string, comment: string[], t: Float64Array, acc: Float64Array, offsetM: number, r0: number, rng: Rng) {
  const { r } = simulateMount(shakerTruth, t, acc, r0);
  return {
    path,
    comment,
    columns: [
      { name: 't', values: t },
      { name: 'table_acc', values: acc },
      { name: 'lvdt_mm', values: noisy(r.map((x) => 1000 * (x + offsetM)), LVDT_NOISE_MM, rng), digits: 6 },
    ],
  };
}

export function shakerScenario(rng: Rng): ScenarioOutput {
  const tChirp = sampleTimes(5000, 2e-3);
  const aChirp = roundTo(chirp(tChirp, 1, 20, 10, 2), 6);
  const tRandom = sampleTimes(4000, 2e-3);
  const aRandom = roundTo(lowPassNoise(tRandom, 0.01, 1.5, rng), 6);
  const tPluck = sampleTimes(1500, 2e-3);
  const aPluck = roundTo(lowPassNoise(tPluck, 0.002, 0.01, rng), 4);
  const offsets = { chirp: 3.5e-4, random: -8.0e-4, pluck: 0 };
  const files = [
    shakerFile('demo-data/shaker-chirp.csv', ['linear chirp 1 -> 20 Hz over 10 s, 2 m/s^2, 500 Hz logging; LVDT zero offset +0.35 mm'], tChirp, aChirp, offsets.chirp, 0, rng),
    shakerFile('demo-data/shaker-random.csv', ['band-limited random table acceleration (1.5 m/s^2 rms), 500 Hz; LVDT zero offset -0.8 mm'], tRandom, aRandom, offsets.random, 0, rng),
    shakerFile('demo-data/shaker-pluck.csv', ['pluck test: mass held 4 mm off and released at t = 0, table at rest (validation)'], tPluck, aPluck, offsets.pluck, 0.004, rng),
  ];
  const noise = { lvdt_mm: `${LVDT_NOISE_MM} mm` };
  return {
    files,
    truth: {
      model: 'models/shaker-suspension.yaml',
      parameters: { m: '2.5 kg', k: '4000 N/m', c: '10 N*s/m' },
      experiments: {
        chirp: { file: files[0].path, samples: tChirp.length, noise, missing: {}, values: { offset: '3.5e-4 m' } },
        random: { file: files[1].path, samples: tRandom.length, noise, missing: {}, values: { offset: '-8.0e-4 m' } },
        pluck: { file: files[2].path, samples: tPluck.length, noise, missing: {}, values: { offset: '0 m', 'initial r': '0.004 m' } },
      },
      notes: 'Natural frequency sqrt(k/m) = 40 rad/s (6.37 Hz), damping ratio c/(2*sqrt(k*m)) = 0.05.',
    },
  };
}
