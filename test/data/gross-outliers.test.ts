/**
 * Gross errors in a log (src/data/gross-outliers.ts, the Hampel identifier: Hampel 1974; Pearson 2002,
 * IEEE Trans. Control Syst. Technol. 10(1)): a logger's over-range marker or one wild cell in an
 * output is left out and named by its line, in an input it is refused with its line, and the
 * signals rigs really log (steps, ramps, transients, noise) are never touched.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse } from 'yaml';
import { afterAll, describe, expect, it } from 'vitest';
import { grossOutliers } from '../../src/data/gross-outliers.js';
import { normalDeviates } from '../../src/util/random.js';
import { rigcal, scratchDir } from '../cli/run-cli.js';
import { writeThermalRig } from '../estimation/helpers/rigs.js';

describe('grossOutliers', () => {
  const noise = normalDeviates(7);
  const n = 2000;
  const signals: Record<string, (i: number) => number> = {
    'steps of 12 V with 0.01 V noise': (i) => (Math.floor(i / 250) % 2 ? 12 : 0) + 0.01 * noise(),
    'a ramp with 1e-6 noise': (i) => 1e-3 * i + 1e-6 * noise(),
    'a fast first-order transient after each step': (i) => 5 * Math.exp(-(i % 400) / 3) + 1e-3 * noise(),
    'a chirp': (i) => Math.sin(2 * Math.PI * (0.001 * i + 1e-6 * i * i)),
    'white noise': () => noise(),
    'a quantised slow signal': (i) => Math.round(100 * Math.sin(i / 300)) / 100,
  };
  for (const [name, f] of Object.entries(signals)) {
    it(`flags nothing in ${name}`, () => {
      const x = Float64Array.from({ length: n }, (_, i) => f(i));
      expect(grossOutliers(x, true)).toEqual([]);
    });
    it(`finds a logger's over-range marker and a wild cell in ${name}`, () => {
      const x = Float64Array.from({ length: n }, (_, i) => f(i));
      const spread = Math.max(...x) - Math.min(...x);
      x[700] = 9.9e37;
      x[1300] = x[1300] + 1e4 * spread;
      expect(grossOutliers(x, true)).toEqual([700, 1300]);
    });
  }
  it('flags nothing in a binary sequence that may switch every sample, nor in a rarely pulsed signal', () => {
    let level = 0;
    const prbs = Float64Array.from({ length: n }, () => (noise() > 0.8 ? (level = 4 - level) : level));
    expect(grossOutliers(prbs, true)).toEqual([]);
    const pulses = Float64Array.from({ length: n }, (_, i) => (i % 97 === 0 ? 5 : 0));
    expect(grossOutliers(pulses, true)).toEqual([]);
    pulses[500] = 9.9e37;
    expect(grossOutliers(pulses, true)).toEqual([500]);
  });
  it('judges rows without order against the column only, for far grosser errors', () => {
    const x = Float64Array.from({ length: 50 }, (_, i) => Math.exp(i / 10));
    expect(grossOutliers(x, false)).toEqual([]);
    x[20] = 9.9e37;
    expect(grossOutliers(x, false)).toEqual([20]);
  });
});

describe('a log with gross errors, through the CLI', () => {
  const { dir, cleanup } = scratchDir('gross');
  afterAll(cleanup);
  const model = writeThermalRig(dir, 11, { sigmaLine: ', sigma: 0.05' });
  const clean = readFileSync(join(dir, 'warm.csv'), 'utf8');
  const withCell = (line: number, column: number, value: string) => {
    const rows = clean.split('\n');
    const cells = rows[line - 1].split(',');
    cells[column] = value;
    rows[line - 1] = cells.join(',');
    writeFileSync(join(dir, 'warm.csv'), rows.join('\n'));
  };
  const estimates = (out: string) => parse(readFileSync(join(dir, out, 'estimates.yaml'), 'utf8')).parameters as Record<string, { value: number; stdError?: number }>;

  it('an over-range marker in an output is left out, named by its line, and the estimates stay within one standard error of the clean fit', async () => {
    writeFileSync(join(dir, 'warm.csv'), clean);
    expect((await rigcal(['fit', model, '-o', join(dir, 'clean'), '--quiet'], dir)).code).toBe(0);
    withCell(101, 2, '9.9e37');
    const run = await rigcal(['fit', model, '-o', join(dir, 'marked')], dir);
    expect(run.code, run.stderr).toBe(0);
    expect(run.stdout).toMatch(/output T in experiment warm: 1 sample was left out as gross errors \(line 101: 9\.9e\+37 K\)/);
    const a = estimates('clean');
    const b = estimates('marked');
    for (const name of ['C', 'R']) expect(Math.abs(a[name].value - b[name].value)).toBeLessThan(a[name].stdError!);
    const check = await rigcal(['check', model], dir);
    expect(check.stdout).toMatch(/line 101/);
  });

  it('one wild cell with the noise level estimated: left out, named, and every parameter determined', async () => {
    const est = writeThermalRig(join(dir), 11);
    withCell(150, 2, '31415');
    const run = await rigcal(['fit', est, '-o', join(dir, 'wild')], dir);
    expect(run.code, run.stderr).toBe(0);
    expect(run.stdout).toMatch(/line 150: 31415 K/);
    expect(run.stdout).not.toMatch(/not determined/);
  });

  it('a gross error in an input is refused with its line (exit 2)', async () => {
    writeFileSync(join(dir, 'warm.csv'), clean);
    withCell(60, 1, '9.9e37');
    const run = await rigcal(['fit', model, '-o', join(dir, 'input'), '--quiet'], dir);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/warm\.csv:60.*input P has 9\.9e\+37 W here, a gross error/);
    writeFileSync(join(dir, 'warm.csv'), clean);
  });
});
