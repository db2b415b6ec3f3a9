/**
 * Synthetic rigs of our own with known true values, written as model files and CSV logs into a
 * temporary folder. Invented scenarios for tests: no real rig was measured.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { normalDeviates as normalGenerator } from '../../../src/util/random.js';

export function tempDir(prefix = 'rigcal-fit-'): string {
  return mkdtempSync(join(tmpdir(), prefix));
}

/** Heated block: C dT/dt = P - (T - Ta)/R, heater power P held in steps, T0 per experiment. */
export const THERMAL_TRUTH = { C: 2000, R: 0.2, 'T0@warm': 310, 'T0@cold': 295, sigma: 0.05 };

export function writeThermalRig(dir: string, seed = 11, options: { sigmaLine?: string } = {}): string {
  const ta = 293.15;
  const { C, R } = THERMAL_TRUTH;
  const noise = normalGenerator(seed);
  const experiments: [string, number, number[]][] = [
    ['warm', THERMAL_TRUTH['T0@warm'], [0, 60, 20, 100]],
    ['cold', THERMAL_TRUTH['T0@cold'], [80, 0, 40, 10]],
  ];
  for (const [name, t0, powers] of experiments) {
    const rows = ['t,heater,temp'];
    let T = t0;
    let tPrev = 0;
    for (let i = 0; i <= 240; i++) {
      const t = i * 5;
      const P = powers[Math.min(3, Math.floor(t / 300))];
      const Pprev = powers[Math.min(3, Math.floor(tPrev / 300))];
      // exact solution over [tPrev, t] with the power held at its value on that interval
      const Tinf = ta + Pprev * R;
      T = Tinf + (T - Tinf) * Math.exp(-(t - tPrev) / (R * C));
      tPrev = t;
      rows.push(`${t},${P},${T + THERMAL_TRUTH.sigma * noise()}`);
    }
    writeFileSync(join(dir, `${name}.csv`), rows.join('\n') + '\n');
  }
  const yaml = `# Synthetic scenario of our own (test data generated in the test, seeded): a heated block.
format: 1
name: thermal-test
time_unit: s
states:
  T: { unit: K, initial: T0 }
inputs:
  P: { unit: W, column: heater, interpolate: hold }
parameters:
  C:  { free: [10, 1e5], start: 800, unit: J/K }
  R:  { free: [1e-3, 10], start: 0.5, unit: K/W }
  Ta: { fixed: 293.15, unit: K }
  T0: { free: [250, 350], start: 300, unit: K, per_experiment: true }
equations:
  T: P/C - (T - Ta)/(R*C)
outputs:
  T: { expr: T, unit: K, column: temp${options.sigmaLine ?? ''} }
experiments:
  - name: warm
    file: warm.csv
  - name: cold
    file: cold.csv
`;
  const file = join(dir, 'thermal.yaml');
  writeFileSync(file, yaml);
  return file;
}

/**
 * Free decay of a mass on a spring with known damping ratio: the motion depends on k/m only, so k and
 * m cannot both be estimated.
 */
export function writeSpringRig(dir: string, seed = 5): string {
  const k = 1000;
  const m = 1;
  const zeta = 0.05;
  const x0 = 0.01;
  const wn = Math.sqrt(k / m);
  const wd = wn * Math.sqrt(1 - zeta * zeta);
  const noise = normalGenerator(seed);
  const rows = ['t,x'];
  for (let i = 0; i <= 200; i++) {
    const t = i * 0.005;
    // underdamped free response from x0 at rest (any vibration handbook)
    const x = x0 * Math.exp(-zeta * wn * t) * (Math.cos(wd * t) + ((zeta * wn) / wd) * Math.sin(wd * t));
    rows.push(`${t},${x + 1e-4 * noise()}`);
  }
  writeFileSync(join(dir, 'decay.csv'), rows.join('\n') + '\n');
  const yaml = `# Synthetic scenario of our own (seeded test data): free decay of a mass on a spring.
format: 1
name: spring-decay
states:
  x: { unit: m, initial: x0 }
  v: { unit: m/s, initial: 0 }
parameters:
  k:    { free: [10, 1e5], start: 1500, unit: N/m }
  m:    { free: [0.1, 100], start: 1.6, unit: kg }
  zeta: { fixed: 0.05 }
  x0:   { fixed: 0.01, unit: m }
equations:
  x: v
  v: -(k/m)*x - 2*zeta*sqrt(k/m)*v
outputs:
  x: { expr: x, unit: m, column: x, sigma: 1e-4 }
experiments:
  - name: decay
    file: decay.csv
`;
  const file = join(dir, 'spring.yaml');
  writeFileSync(file, yaml);
  return file;
}

/** A static saturation curve y = a (1 - exp(-b x)) for coverage tests. */
export const SATURATION_TRUTH = { a: 2, b: 0.5, sigma: 0.05 };
export const SATURATION_X = Array.from({ length: 20 }, (_, i) => 0.25 * (i + 1));

export function writeSaturationRig(dir: string): string {
  const rows = ['x,y', ...SATURATION_X.map((x) => `${x},${SATURATION_TRUTH.a * (1 - Math.exp(-SATURATION_TRUTH.b * x))}`)];
  writeFileSync(join(dir, 'curve.csv'), rows.join('\n') + '\n');
  const yaml = `# Synthetic scenario of our own (static, noise added in the test): a saturation curve.
format: 1
name: saturation
inputs:
  x: { column: x }
parameters:
  a: { free: [0.1, 10], start: 1 }
  b: { free: [0.01, 10], start: 1 }
outputs:
  y: { expr: a*(1 - exp(-b*x)), column: y }
experiments:
  - name: curve
    file: curve.csv
`;
  const file = join(dir, 'saturation.yaml');
  writeFileSync(file, yaml);
  return file;
}
