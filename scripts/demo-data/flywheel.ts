/**
 * DC motor and flywheel (models/flywheel.yaml): armature L/R = 1 ms, mechanical time constant about
 * 0.9 s. Voltage commands are zero-order hold; speed is logged in rpm, current in A.
 */
import { holdAt, holdJumps, integrateRk4 } from './integrate.js';
import type { SeededRandom as Rng } from '../../src/util/random.js';
import { noisy, randomRows, type ScenarioOutput } from './scenario.js';
import { prbs, sampleTimes, steps } from './signals.js';

export const flywheelTruth = { R: 1.9, J: 3.1e-3, L: 1.9e-3, K: 0.08, b: 2.0e-4, Tc: 0.012, ws: 0.5 };
const RPM_PER_RAD_S = 60 / (2 * Math.PI);
const CURRENT_NOISE_A = 0.02;
const SPEED_NOISE_RPM = 2;

export interface MotorParams { R: number; J: number; L: number; K: number; b: number; Tc: number; ws: number }

/** Current (A) and speed (rad/s) of the motor driven by the hold voltage `volts` at `times`. */
export function simulateMotor(p: MotorParams, times: Float64Array, volts: Float64Array): { i: Float64Array; w: Float64Array } {
  const [i, w] = integrateRk4({
    rhs: (_t, x, dx, tSeg) => {
      const V = holdAt(times, volts, tSeg);
      const friction = p.b * x[1] + p.Tc * Math.tanh(x[1] / p.ws);
      dx[0] = (V - p.R * x[0] - p.K * x[1]) / p.L;
      dx[1] = (p.K * x[0] - friction) / p.J;
    },
    x0: [0, 0],
    start: times[0],
    sampleTimes: times,
    breakpoints: holdJumps(times, volts),
    // 1e-5 s is a hundredth of L/R: RK4's error per step is ~(h*R/L)^5, far below the noise.
    hmax: 1e-5,
  });
  return { i, w };
}

function motorFile(path: string, comment: string[], t: Float64Array, V: Float64Array, p: MotorParams, rng: Rng, missingRows: number[] = []) {
  const { i, w } = simulateMotor(p, t, V);
  const rpm = w.map((v) => v * RPM_PER_RAD_S);
  return {
    path,
    comment,
    columns: [
      { name: 't', values: t },
      { name: 'volts', values: V },
      { name: 'amps', values: noisy(i, CURRENT_NOISE_A, rng), digits: 5 },
      { name: 'rpm', values: noisy(rpm, SPEED_NOISE_RPM, rng, missingRows), digits: 6 },
    ],
  };
}

export function flywheelScenario(rng: Rng): ScenarioOutput {
  const p = flywheelTruth;
  const tSteps = sampleTimes(6000, 1e-3);
  const vSteps = steps(tSteps, [0.2, 2.0, 3.5, 5.0], [12, 6, -6, 0]);
  const tDisc = sampleTimes(6000, 1e-3);
  const vDisc = steps(tDisc, [0.1, 3.0], [9, 0]);
  const discJ = 4.6e-3;
  const tPrbs = sampleTimes(4000, 1e-3);
  const vPrbs = prbs(tPrbs, 0.1, 3, 9, 0x15b);
  const missing = randomRows(7, 100, 5900, rng);

  const files = [
    motorFile('demo-data/flywheel-steps.csv', ['voltage steps 0 -> 12 -> 6 -> -6 -> 0 V, 1 kHz logging'], tSteps, vSteps, p, rng),
    motorFile('demo-data/flywheel-added-disc.csv', ['second steel disc bolted on (J = 4.6e-3 kg*m^2); 9 V step then 0 V, 1 kHz; a few speed samples lost'], tDisc, vDisc, { ...p, J: discJ }, rng, missing),
    motorFile('demo-data/flywheel-prbs.csv', ['PRBS voltage 3/9 V, bit time 0.1 s, 1 kHz logging (validation)'], tPrbs, vPrbs, p, rng),
  ];
  const noise = { amps: `${CURRENT_NOISE_A} A`, rpm: `${SPEED_NOISE_RPM} rpm` };
  return {
    files,
    truth: {
      model: 'models/flywheel.yaml',
      parameters: { R: '1.9 ohm', J: '3.1e-3 kg*m^2', L: '1.9e-3 H', K: '0.08 N*m/A', b: '2.0e-4 N*m*s/rad', Tc: '0.012 N*m', ws: '0.5 rad/s' },
      experiments: {
        steps: { file: files[0].path, samples: tSteps.length, noise, missing: { rpm: 0 } },
        'added-disc': { file: files[1].path, samples: tDisc.length, noise, missing: { rpm: missing.length }, values: { J: `${discJ} kg*m^2` } },
        'prbs-check': { file: files[2].path, samples: tPrbs.length, noise, missing: { rpm: 0 } },
      },
    },
  };
}
