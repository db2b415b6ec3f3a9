/** Static friction curve (models/friction-curve.yaml): steady torque at held speeds, both directions. */
import type { SeededRandom as Rng } from '../../src/util/random.js';
import { noisy, type ScenarioOutput } from './scenario.js';

export const frictionTruth = { Tc: 0.05, Ts: 0.08, vst: 2.0, b: 4e-4 };
const TORQUE_NOISE_NM = 0.002;

export function frictionTorque(v: number, p = frictionTruth): number {
  return Math.sign(v) * (p.Tc + (p.Ts - p.Tc) * Math.exp(-((v / p.vst) ** 2))) + p.b * v;
}

export function frictionScenario(rng: Rng): ScenarioOutput {
  // Speeds denser near zero, where the Stribeck dip lives: 1..300 rpm on a log scale, both signs.
  const magnitudes = Array.from({ length: 24 }, (_, k) => Number((1 * Math.pow(300, k / 23)).toPrecision(3)));
  const rpm = Float64Array.from([...magnitudes.map((m) => -m).reverse(), ...magnitudes]);
  const torque = rpm.map((n) => frictionTorque((n * 2 * Math.PI) / 60));
  const file = {
    path: 'demo-data/friction-sweep.csv',
    comment: ['steady friction torque at held speeds (static test, one row per speed)'],
    columns: [
      { name: 'speed_rpm', values: rpm },
      { name: 'torque_Nm', values: noisy(torque, TORQUE_NOISE_NM, rng), digits: 5 },
    ],
  };
  return {
    files: [file],
    truth: {
      model: 'models/friction-curve.yaml',
      parameters: { Tc: '0.05 N*m', Ts: '0.08 N*m', vst: '2.0 rad/s', b: '4e-4 N*m*s/rad' },
      experiments: { sweep: { file: file.path, samples: rpm.length, noise: { torque_Nm: `${TORQUE_NOISE_NM} N*m` }, missing: {} } },
    },
  };
}
