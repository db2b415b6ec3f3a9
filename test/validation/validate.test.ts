/**
 * `validate` on the synthetic spring-mass-damper rig (synthetic-rig.ts): a calibrated model scored on
 * data it was not fitted to. For the right model the held-out residuals are the measurement noise, so
 * the RMSE must come out near the noise level we added (0.5 mm) and the residuals white; the model
 * without damper must score worse.
 */
import { existsSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/run.js';
import { fitModel } from '../../src/estimation/fit/fit-model.js';
import { loadModel } from '../../src/model/load/index.js';
import { writeResults } from '../../src/reports/write-results.js';
import type { ValidationResult } from '../../src/validation/validation-result.js';
import { NOISE_MM, modelText, normalDeviates, writeRigData } from '../comparison/synthetic-rig.js';

async function cli(args: string[], cwd: string): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await runCli(args, { stdout: (s) => (out += s), stderr: (s) => (err += s), stderrIsTTY: false, cwd });
  return { code, out, err };
}

describe('validate on a synthetic rig', () => {
  let dir: string;

  beforeAll(() => {
    dir = writeRigData();
    for (const [file, damper] of [['right.yaml', true], ['no-damper.yaml', false]] as const) {
      writeFileSync(path.join(dir, file), modelText({ name: damper ? 'with-damper' : 'no-damper', damper }));
      const outcome = fitModel(loadModel(path.join(dir, file)));
      writeResults(path.join(dir, `${file}-fit`), outcome, { outputs: ['x'] });
    }
    // A new log: a second record of the held-out chirp under another seed's noise, saved under a new name.
    writeRigData(777, path.join(dir, 'friday'));
  });

  it('scores the validation experiment by default, with RMSE near the noise level and white residuals', async () => {
    const r = await cli(['validate', 'right.yaml', '--params', 'right.yaml-fit/estimates.yaml', '--json', '-o', 'val-right'], dir);
    expect(r.code, r.err).toBe(0);
    const result = JSON.parse(r.out) as ValidationResult;
    expect(result.outputs).toHaveLength(1);
    const o = result.outputs[0];
    expect(o).toMatchObject({ experiment: 'held-out', output: 'x', unit: 'm', samples: 301 });
    // The residual of a right model on new data is the added noise (sigma 0.5 mm): within 15 %
    // (the sample RMSE of 301 normal deviates lies within about +-8 % of sigma at 95 %; estimation
    // error adds a little).
    expect(o.rmse).toBeGreaterThan(0.85 * NOISE_MM * 1e-3);
    expect(o.rmse).toBeLessThan(1.15 * NOISE_MM * 1e-3);
    expect(o.nrmse).toBeCloseTo(Math.sqrt(1 - o.r2), 10);
    expect(o.whiteness?.white).toBe(true);
    // The folder holds the scores and the residuals, nothing half-written.
    expect(readdirSync(path.join(dir, 'val-right')).sort()).toEqual(['report.html', 'residuals.csv', 'validation.json']);
    const saved = JSON.parse(readFileSync(path.join(dir, 'val-right', 'validation.json'), 'utf8')) as ValidationResult;
    expect(saved.outputs[0].rmse).toBe(o.rmse);
    // The report: the reporter's figures for the validation experiment, self-contained.
    const page = readFileSync(path.join(dir, 'val-right', 'report.html'), 'utf8');
    expect(page).toContain('<title>with-damper: validation report</title>');
    expect(page).toContain('Experiment held-out');
    expect((page.match(/<svg/g) ?? []).length).toBeGreaterThanOrEqual(3);
    expect(page).toMatch(/safety-relevant/);
    expect(page).not.toMatch(/(src|href)="https?:/);
  });

  it('prints a table with units and a verdict', async () => {
    const r = await cli(['validate', 'right.yaml', '--params', 'right.yaml-fit/estimates.yaml', '-o', 'val-table'], dir);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toMatch(/held-out\s+x\s+301\s+[0-9.e-]+ m\s+/);
    expect(r.out).toMatch(/held-out\/x: residuals are white/);
  });

  it('scores the model without damper worse, with correlated residuals', async () => {
    const right = JSON.parse((await cli(['validate', 'right.yaml', '--params', 'right.yaml-fit/estimates.yaml', '--json', '-o', 'v1'], dir)).out) as ValidationResult;
    const r = await cli(['validate', 'no-damper.yaml', '--params', 'no-damper.yaml-fit/estimates.yaml', '--json', '-o', 'v2'], dir);
    expect(r.code, r.err).toBe(0);
    const wrong = JSON.parse(r.out) as ValidationResult;
    expect(wrong.outputs[0].nrmse).toBeGreaterThan(2 * right.outputs[0].nrmse);
    expect(wrong.outputs[0].whiteness?.white).toBe(false);
  });

  it('scores a new log given with --data', async () => {
    const r = await cli(['validate', 'right.yaml', '--params', 'right.yaml-fit/estimates.yaml', '--data', 'friday/held-out.csv', '--json', '-o', 'val-new'], dir);
    expect(r.code, r.err).toBe(0);
    const result = JSON.parse(r.out) as ValidationResult;
    expect(result.data[0]).toMatchObject({ experiment: 'held-out-2', source: 'new log', rows: 301 });
    expect(result.outputs[0].rmse).toBeLessThan(1.15 * NOISE_MM * 1e-3);
    // x0 is per experiment: the new log has no estimate of its own and the start value is said.
    expect(result.warnings.join('\n')).toMatch(/x0 is estimated per experiment.*start value 0 m/);
    // A known value for the new log, given with --set, is used and silences the warning.
    const withSet = await cli(['validate', 'right.yaml', '--params', 'right.yaml-fit/estimates.yaml', '--data', 'friday/held-out.csv', '--set', 'x0=0.001', '--json', '-o', 'val-new-set'], dir);
    expect(withSet.code, withSet.err).toBe(0);
    const r2 = JSON.parse(withSet.out) as ValidationResult;
    expect(r2.parameters['x0@held-out-2']).toBe(0.001);
    expect(r2.warnings.join('\n')).not.toMatch(/x0/);
    expect(r2.outputs[0].rmse).toBeGreaterThan(result.outputs[0].rmse); // the log started at 0
  });

  it('reads a new log with its time in another unit given by --time-unit', async () => {
    const csv = readFileSync(path.join(dir, 'friday', 'held-out.csv'), 'utf8')
      .split('\n')
      .map((line) => (/^[0-9]/.test(line) ? line.replace(/^[^,]+/, (t) => String(Math.round(Number(t) * 1000))) : line))
      .join('\n');
    writeFileSync(path.join(dir, 'friday-ms.csv'), csv);
    const s = JSON.parse((await cli(['validate', 'right.yaml', '--params', 'right.yaml-fit/estimates.yaml', '--data', 'friday/held-out.csv', '--json', '-o', 'v-s'], dir)).out) as ValidationResult;
    const r = await cli(['validate', 'right.yaml', '--params', 'right.yaml-fit/estimates.yaml', '--data', 'friday-ms.csv', '--time-unit', 'ms', '--json', '-o', 'v-ms'], dir);
    expect(r.code, r.err).toBe(0);
    const ms = JSON.parse(r.out) as ValidationResult;
    expect(ms.outputs[0].rmse / s.outputs[0].rmse).toBeCloseTo(1, 8);
    const wrong = await cli(['validate', 'right.yaml', '--params', 'right.yaml-fit/estimates.yaml', '--time-unit', 'ms'], dir);
    expect(wrong.code).toBe(2);
  });

  it('scores an experiment of any role with -e, using its own per-experiment estimate', async () => {
    const r = await cli(['validate', 'right.yaml', '--params', 'right.yaml-fit/estimates.yaml', '-e', 'bump', '--json', '-o', 'val-bump'], dir);
    expect(r.code, r.err).toBe(0);
    const result = JSON.parse(r.out) as ValidationResult;
    expect(result.data[0]).toMatchObject({ experiment: 'bump', source: 'fit' });
    expect(result.warnings.join('\n')).not.toMatch(/x0/);
    expect(result.parameters.m).toBe(1.25); // the experiment's `set`, not overridden by the estimates
    expect(result.outputs[0].rmse).toBeLessThan(1.15 * NOISE_MM * 1e-3);
  });

  it('calls a score on a fit experiment in-sample, in the table, validation.json and report.html', async () => {
    // A score on the data the estimates were fitted to measures the fit, not prediction
    // (common practice, no source): it must never be presented as "never fitted".
    const r = await cli(['validate', 'right.yaml', '--params', 'right.yaml-fit/estimates.yaml', '-e', 'bump', '-e', 'held-out', '-o', 'val-in-sample'], dir);
    expect(r.code, r.err).toBe(0);
    const first = r.out.split('\n')[0];
    expect(first).toMatch(/IN-SAMPLE score on bump: the estimates were fitted to these data/);
    expect(first).toMatch(/never fitted to held-out\)/);
    const saved = JSON.parse(readFileSync(path.join(dir, 'val-in-sample', 'validation.json'), 'utf8')) as ValidationResult;
    expect(saved.data.map((d) => [d.experiment, d.inSample])).toEqual([['bump', true], ['held-out', false]]);
    expect(saved.outputs.map((o) => [o.experiment, o.inSample])).toEqual([['bump', true], ['held-out', false]]);
    const page = readFileSync(path.join(dir, 'val-in-sample', 'report.html'), 'utf8');
    expect(page).toMatch(/IN-SAMPLE score on bump/);
    expect(page).toContain('<h2>Fit experiments</h2>');
    // The "not used to estimate" paragraph belongs to held-out only: one validation section.
    expect((page.match(/These logs were not used to estimate the parameters/g) ?? []).length).toBe(1);
    const only = await cli(['validate', 'right.yaml', '--params', 'right.yaml-fit/estimates.yaml', '-e', 'shake', '-o', 'val-shake'], dir);
    expect(only.out).not.toMatch(/never fitted/);
    expect(readFileSync(path.join(dir, 'val-shake', 'report.html'), 'utf8')).not.toMatch(/not used to estimate|not fitted to/);
  });

  it('names a wrong experiment and refuses a foreign output folder', async () => {
    const r = await cli(['validate', 'right.yaml', '--params', 'right.yaml-fit/estimates.yaml', '-e', 'bumpp'], dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/no experiment "bumpp".*bump/s);
    const f = await cli(['validate', 'right.yaml', '--params', 'right.yaml-fit/estimates.yaml', '-o', 'friday'], dir);
    expect(f.code).toBe(2);
    expect(f.err).toMatch(/not a validation folder/);
    expect(existsSync(path.join(dir, 'friday', 'validation.json'))).toBe(false);
  });
});

describe('validate a static model', () => {
  it('scores a calibration curve on a new sweep, lags counted in rows', async () => {
    // A calibration curve of our own: y = 2 x + 0.5 x^2 with seeded noise 0.01; fitted on one sweep,
    // scored on another (different x points and noise).
    const dir = mkdtempSync(path.join(tmpdir(), 'rigcal-static-val-'));
    const noise = normalDeviates(5);
    const sweep = (n: number, offset: number) =>
      ['x,y', ...Array.from({ length: n }, (_, i) => { const x = (i + offset) / n; return `${x},${2 * x + 0.5 * x * x + 0.01 * noise()}`; })].join('\n') + '\n';
    writeFileSync(path.join(dir, 'fit.csv'), sweep(60, 0));
    writeFileSync(path.join(dir, 'new.csv'), sweep(50, 0.5));
    writeFileSync(path.join(dir, 'curve.yaml'), `# Synthetic calibration curve of our own (test data).
format: 1
name: curve
inputs:
  x: { unit: '' }
parameters:
  a: { free: [-10, 10], start: 1 }
  b: { free: [-10, 10], start: 0 }
outputs:
  y: { expr: a*x + b*x^2, unit: '' }
experiments:
  - name: sweep
    file: fit.csv
`);
    writeResults(path.join(dir, 'curve-fit'), fitModel(loadModel(path.join(dir, 'curve.yaml'))), { outputs: ['y'] });
    const r = await cli(['validate', 'curve.yaml', '--params', 'curve-fit/estimates.yaml', '--data', 'new.csv', '--json'], dir);
    expect(r.code, r.err).toBe(0);
    const result = JSON.parse(r.out) as ValidationResult;
    expect(result.isStatic).toBe(true);
    expect(result.outputs[0].samples).toBe(50);
    // Only the noise is left: RMSE about 0.01 (sample RMSE of 50 deviates: within about +-25 %).
    expect(result.outputs[0].rmse).toBeGreaterThan(0.0075);
    expect(result.outputs[0].rmse).toBeLessThan(0.0125);
    expect(result.outputs[0].verdict).not.toMatch(/ s\b/);
    expect(existsSync(path.join(dir, 'curve-validate', 'validation.json'))).toBe(true);
  });
});
