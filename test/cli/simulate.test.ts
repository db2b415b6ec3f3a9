/**
 * `rigcal simulate` through the CLI (in-process): the CSV layout of cli-and-results.md, unit
 * conversions of measured columns, the fit quality printed, --set / --params precedence,
 * --duration against a closed form, and the rules for -o (never an input file, whole or nothing).
 */
import { createHash } from 'node:crypto';
import { copyFileSync, existsSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { afterAll, describe, expect, it } from 'vitest';
import { readSimulationCsv } from '../reference/read-csv.js';
import { rigcal, scratchDir } from './run-cli.js';

const root = join(import.meta.dirname, '..', '..');
const models = join(root, 'models');
const scratch = scratchDir('simulate');
afterAll(() => scratch.cleanup());
const sha = (f: string) => createHash('sha256').update(readFileSync(f)).digest('hex');

/** The demo log as written (comment lines skipped), by column. */
function demoColumns(file: string): Record<string, number[]> {
  const rows = parse(readFileSync(join(root, 'demo-data', file), 'utf8'), { comment: '#', skip_empty_lines: true }) as string[][];
  return Object.fromEntries(rows[0].map((h, j) => [h, rows.slice(1).map((r) => (r[j] === '' ? NaN : Number(r[j])))]));
}

/** RMSE of a quality-table row: "<experiment> <role> <output> <samples> <missing> <rmse> <unit> <r2>". */
function qualityRow(text: string, experiment: string, output: string): { samples: number; missing: number; rmse: number; unit: string; r2: number } {
  const line = text.split('\n').find((l) => l.trim().startsWith(`${experiment} `) && l.includes(` ${output} `));
  expect(line, `quality row for ${experiment}/${output} in:\n${text}`).toBeDefined();
  const cells = line!.trim().split(/\s+/);
  return { samples: Number(cells[3]), missing: Number(cells[4]), rmse: Number(cells[5]), unit: cells[6], r2: Number(cells[7]) };
}

const flywheelTruth = ['--set', 'L=1.9e-3', '--set', 'K=0.08', '--set', 'b=2e-4', '--set', 'Tc=0.012'];

describe('rigcal simulate: CSV layout and measured columns', () => {
  const out = join(scratch.dir, 'flywheel.csv');
  let run: Awaited<ReturnType<typeof rigcal>>;

  it('writes experiment, time, outputs, <output>_measured, <state>_state for every experiment', async () => {
    run = await rigcal(['simulate', join(models, 'flywheel.yaml'), ...flywheelTruth, '-o', out]);
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    const { header, byExperiment } = readSimulationCsv(out);
    expect(header).toEqual(['experiment', 'time', 'current', 'speed', 'current_measured', 'speed_measured', 'i_state', 'w_state']);
    // Rows per experiment: demo-data/TRUTH.md (6000, 6000, 4000 samples).
    expect([...byExperiment.keys()]).toEqual(['steps', 'added-disc', 'prbs-check']);
    expect(byExperiment.get('steps')!.time.length).toBe(6000);
    expect(byExperiment.get('added-disc')!.time.length).toBe(6000);
    expect(byExperiment.get('prbs-check')!.time.length).toBe(4000);
  });

  it('converts the rpm column with the NIST SP 811 factor and leaves missing samples empty', () => {
    const cols = readSimulationCsv(out).byExperiment.get('added-disc')!;
    const log = demoColumns('flywheel-added-disc.csv');
    // NIST SP 811 (2008), Appendix B.9: revolution per minute (rpm) -> radian per second: 1.047198 E-01.
    const factor = 1.047198e-1;
    let missing = 0;
    log.rpm.forEach((rpm, i) => {
      if (Number.isNaN(rpm)) {
        missing++;
        expect(Number.isNaN(cols.speed_measured[i])).toBe(true);
      } else expect(cols.speed_measured[i]).toBeCloseTo(rpm * factor, 4);
    });
    // 7 samples removed by the generator (demo-data/TRUTH.md).
    expect(missing).toBe(7);
    expect(cols.time).toEqual(log.t);
    expect(cols.current_measured).toEqual(log.amps);
  });

  it('at the true parameters the residual RMSE equals the injected noise (2 rpm = 0.2094 rad/s, 0.02 A)', () => {
    // Noise levels injected by scripts/make-demo-data.ts (demo-data/TRUTH.md). The RMSE of N
    // Gaussian samples has a relative standard deviation of about 1/sqrt(2N) (0.9 % for 6000), so a
    // 5 % band fails only when the simulation differs from the generator's independent RK4.
    const speed = qualityRow(run.stdout, 'steps', 'speed');
    expect(speed.unit).toBe('rad/s');
    expect(speed.rmse).toBeGreaterThan(0.2094 * 0.95);
    expect(speed.rmse).toBeLessThan(0.2094 * 1.05);
    expect(speed.r2).toBeGreaterThan(0.99);
    const current = qualityRow(run.stdout, 'steps', 'current');
    expect(current.unit).toBe('A');
    expect(current.rmse).toBeGreaterThan(0.02 * 0.95);
    expect(current.rmse).toBeLessThan(0.02 * 1.05);
    const disc = qualityRow(run.stdout, 'added-disc', 'speed');
    expect(disc.missing).toBe(7);
    expect(disc.samples).toBe(6000 - 7);
    expect(disc.rmse).toBeLessThan(0.2094 * 1.05);
  });
});

describe('rigcal simulate: units, delays and per-experiment values end to end', () => {
  it('heated block (degC columns, hold power with a 4.3 s delay): RMSE equals the 0.05 K noise at the true values', async () => {
    const run = await rigcal(['simulate', join(models, 'heated-block.yaml'), '-e', 'power-steps', '--set', 'h=1.6', '--set', 'C=950', '--set', 'lag=4.3', '--set', 'T0=295.4', '-o', join(scratch.dir, 'block.csv')]);
    expect(run.code).toBe(0);
    const q = qualityRow(run.stdout, 'power-steps', 'temperature');
    expect(q.unit).toBe('K');
    expect(q.rmse).toBeGreaterThan(0.05 * 0.93);
    expect(q.rmse).toBeLessThan(0.05 * 1.07);
  });

  it('the delay matters: a wrong delay (0 s instead of 4.3 s) raises the RMSE well above the noise', async () => {
    const run = await rigcal(['simulate', join(models, 'heated-block.yaml'), '-e', 'power-steps', '--set', 'h=1.6', '--set', 'C=950', '--set', 'lag=0', '--set', 'T0=295.4', '-o', join(scratch.dir, 'block0.csv')]);
    expect(run.code).toBe(0);
    expect(qualityRow(run.stdout, 'power-steps', 'temperature').rmse).toBeGreaterThan(0.06);
  });

  it('shaker (mm column, per-experiment offset via name@experiment): RMSE equals the 0.02 mm noise', async () => {
    const run = await rigcal(['simulate', join(models, 'shaker-suspension.yaml'), '-e', 'chirp', '--set', 'k=4000', '--set', 'c=10', '--set', 'offset@chirp=3.5e-4', '-o', join(scratch.dir, 'shaker.csv')]);
    expect(run.code).toBe(0);
    const q = qualityRow(run.stdout, 'chirp', 'lvdt');
    expect(q.unit).toBe('m');
    expect(q.rmse).toBeGreaterThan(2e-5 * 0.95);
    expect(q.rmse).toBeLessThan(2e-5 * 1.05);
  });

  it('a plain --set of a per-experiment parameter applies to the experiment simulated (same as name@experiment)', async () => {
    const plain = join(scratch.dir, 'shaker-plain.csv');
    const run = await rigcal(['simulate', join(models, 'shaker-suspension.yaml'), '-e', 'chirp', '--set', 'k=4000', '--set', 'c=10', '--set', 'offset=3.5e-4', '-o', plain]);
    expect(run.code).toBe(0);
    const a = readSimulationCsv(plain).byExperiment.get('chirp')!;
    const specific = join(scratch.dir, 'shaker-specific.csv');
    expect((await rigcal(['simulate', join(models, 'shaker-suspension.yaml'), '-e', 'chirp', '--set', 'k=4000', '--set', 'c=10', '--set', 'offset@chirp=3.5e-4', '-o', specific])).code).toBe(0);
    const b = readSimulationCsv(specific).byExperiment.get('chirp')!;
    expect(a.lvdt).toEqual(b.lvdt);
    expect(a.lvdt[0]).toBeCloseTo(3.5e-4, 12);
  });

  it('static model (friction curve): one row per log row, RMSE equals the 0.002 N*m noise', async () => {
    const run = await rigcal(['simulate', join(models, 'friction-curve.yaml'), '--set', 'Tc=0.05', '--set', 'Ts=0.08', '--set', 'vst=2', '--set', 'b=4e-4', '-o', join(scratch.dir, 'friction.csv')]);
    expect(run.code).toBe(0);
    const q = qualityRow(run.stdout, 'sweep', 'torque');
    expect(q.samples).toBe(48);
    // 48 samples: the RMSE's relative spread is about 10 %, so a wide band (common practice, no source).
    expect(q.rmse).toBeGreaterThan(0.002 * 0.7);
    expect(q.rmse).toBeLessThan(0.002 * 1.3);
  });
});

describe('rigcal simulate --duration: first-order step response (closed form)', () => {
  it('matches T(t) = Ta + P/h (1 - exp(-t h/C)) + (T0 - Ta) exp(-t h/C)', async () => {
    // Closed form of C dT/dt = P - h (T - Ta) with constant P and Ta (any heat-transfer or control
    // handbook). A constant input is the same at every time, so the delay plays no part.
    const out = join(scratch.dir, 'span.csv');
    const run = await rigcal(['simulate', join(models, 'heated-block.yaml'), '--duration', '3600', '--interval', '10', '--input', 'P=40', '--input', 'Ta=295', '--set', 'h=1.6', '--set', 'C=950', '--set', 'T0=290', '-o', out]);
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    const [cols] = [...readSimulationCsv(out).byExperiment.values()];
    expect(cols.time.length).toBe(361);
    const tau = 950 / 1.6;
    cols.time.forEach((t, i) => {
      const exact = 295 + (40 / 1.6) * (1 - Math.exp(-t / tau)) + (290 - 295) * Math.exp(-t / tau);
      expect(Math.abs(cols.T_state[i] - exact) / exact).toBeLessThan(1e-7);
    });
  });

  it('refuses --duration for a static model, which has no time (exit 2)', async () => {
    const run = await rigcal(['simulate', join(models, 'friction-curve.yaml'), '--duration', '10']);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/static model/);
  });

  it('refuses a non-positive duration and an unknown input (exit 2)', async () => {
    const bad = await rigcal(['simulate', join(models, 'heated-block.yaml'), '--duration', '-5']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--duration/);
    const unknown = await rigcal(['simulate', join(models, 'heated-block.yaml'), '--duration', '10', '--input', 'Q=3']);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/"Q" is not an input/);
  });
});

describe('rigcal simulate --params', () => {
  it('uses estimated values from estimates.yaml, keeps fixed values and `set` from the model, and lets --set win', async () => {
    const est = join(scratch.dir, 'estimates.yaml');
    writeFileSync(est, [
      'tool: rigcal',
      'version: 0.1.0',
      'model: { name: flywheel, file: flywheel.yaml, sha256: "0" }',
      'fit: { status: converged, message: test, date: "2026-01-01" }',
      'parameters:',
      '  L:  { value: 1.9e-3, unit: H, status: estimated }',
      '  K:  { value: 0.08, unit: N*m/A, status: estimated }',
      '  b:  { value: 2.0e-4, unit: N*m*s/rad, status: estimated }',
      '  Tc: { value: 0.5, unit: N*m, status: estimated }',
      '  J:  { value: 1, unit: kg*m^2, status: fixed }',
      '',
    ].join('\n'));
    const out = join(scratch.dir, 'params.csv');
    const run = await rigcal(['simulate', join(models, 'flywheel.yaml'), '-e', 'added-disc', '--params', est, '--set', 'Tc=0.012', '-o', out]);
    expect(run.code).toBe(0);
    // The fitted model file differs (sha256 "0"): a note on standard error, not a failure.
    expect(run.stderr).toMatch(/different version/);
    expect(run.stderr).not.toMatch(/has no estimate/);
    // With J from the experiment's `set` (not the file's fixed J = 1) and Tc from --set, this is the truth.
    const q = qualityRow(run.stdout, 'added-disc', 'speed');
    expect(q.rmse).toBeLessThan(0.2094 * 1.05);
  });

  it('round trip with `fit`: simulating with its estimates.yaml reproduces the fit\'s own residuals', async () => {
    // The static friction demo fits in well under a second; its residuals.csv holds the simulated
    // values at the estimates, which simulate --params must reproduce.
    const dir = join(scratch.dir, 'roundtrip');
    const fit = await rigcal(['fit', join(models, 'friction-curve.yaml'), '-o', dir, '--quiet']);
    expect(fit.code, fit.stderr).toBe(0);
    const out = join(scratch.dir, 'roundtrip.csv');
    const run = await rigcal(['simulate', join(models, 'friction-curve.yaml'), '--params', join(dir, 'estimates.yaml'), '-o', out]);
    expect(run.code, run.stderr).toBe(0);
    expect(run.stderr).toBe('');
    const mine = readSimulationCsv(out).byExperiment.get('sweep')!;
    const residuals = parse(readFileSync(join(dir, 'residuals.csv'), 'utf8'), { columns: true, comment: '#', skip_empty_lines: true }) as Record<string, string>[];
    const simulatedKey = Object.keys(residuals[0]).find((k) => /simulated/.test(k))!;
    expect(residuals.length).toBe(mine.torque.length);
    residuals.forEach((row, i) => expect(mine.torque[i]).toBeCloseTo(Number(row[simulatedKey]), 12));
  });

  it('says which free parameters the estimates file lacks (they run at their start values)', async () => {
    const est = join(scratch.dir, 'partial.yaml');
    writeFileSync(est, ['tool: rigcal', 'model: { name: flywheel, sha256: "0" }', 'fit: { status: stopped }', 'parameters:', '  K: { value: 0.08, status: estimated }', ''].join('\n'));
    const run = await rigcal(['simulate', join(models, 'flywheel.yaml'), '-e', 'steps', '--params', est, '--set', 'Tc=0.012', '-o', join(scratch.dir, 'partial.csv')]);
    expect(run.code).toBe(0);
    expect(run.stderr).toMatch(/has no estimate of L, b; using the start values/);
    expect(run.stderr).toMatch(/status stopped/);
  });

  it('a file that is not an estimates file is an input error (exit 2)', async () => {
    const run = await rigcal(['simulate', join(models, 'flywheel.yaml'), '--params', join(models, 'flywheel.yaml')]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/estimates/);
  });
});

describe('rigcal simulate -o: never an input file, written whole or not at all', () => {
  it('refuses to overwrite the model file or a data file (exit 2, files unchanged)', async () => {
    const dir = join(scratch.dir, 'protect');
    const { mkdirSync } = await import('node:fs');
    mkdirSync(dir);
    copyFileSync(join(root, 'test/fixtures/models/ref-shaker.yaml'), join(dir, 'm.yaml'));
    copyFileSync(join(root, 'test/fixtures/models/ref-shaker-chirp.csv'), join(dir, 'ref-shaker-chirp.csv'));
    copyFileSync(join(root, 'test/fixtures/models/ref-shaker-random.csv'), join(dir, 'ref-shaker-random.csv'));
    const before = [sha(join(dir, 'm.yaml')), sha(join(dir, 'ref-shaker-chirp.csv'))];
    for (const target of ['m.yaml', 'ref-shaker-chirp.csv', './sub/../m.yaml']) {
      const run = await rigcal(['simulate', 'm.yaml', '-o', target], dir);
      expect(run.code, target).toBe(2);
      expect(run.stderr).toMatch(/never overwrites/);
    }
    expect([sha(join(dir, 'm.yaml')), sha(join(dir, 'ref-shaker-chirp.csv'))]).toEqual(before);
  });

  it('replaces its own earlier CSV, and a file it did not write only with --overwrite', async () => {
    const dir = join(scratch.dir, 'replace');
    const { mkdirSync, writeFileSync, readFileSync } = await import('node:fs');
    mkdirSync(dir);
    for (const f of ['ref-shaker.yaml', 'ref-shaker-chirp.csv', 'ref-shaker-random.csv']) copyFileSync(join(root, 'test/fixtures/models', f), join(dir, f === 'ref-shaker.yaml' ? 'm.yaml' : f));
    expect((await rigcal(['simulate', 'm.yaml', '-o', 'out.csv', '--quiet'], dir)).code).toBe(0);
    const first = readFileSync(join(dir, 'out.csv'), 'utf8');
    // Our own output of this model, even for another selection of experiments: replaced without asking.
    const again = await rigcal(['simulate', 'm.yaml', '-e', 'chirp', '-o', 'out.csv', '--quiet'], dir);
    expect(again.code, again.stderr).toBe(0);
    expect(readFileSync(join(dir, 'out.csv'), 'utf8')).not.toBe(first);
    // Someone else's file: kept, and the message says how to replace it.
    writeFileSync(join(dir, 'notes.csv'), 'experiment,time,my_column\nA,0,1\n');
    const foreign = await rigcal(['simulate', 'm.yaml', '-o', 'notes.csv', '--quiet'], dir);
    expect(foreign.code).toBe(2);
    expect(foreign.stderr).toMatch(/notes\.csv.*exists already and is not a simulation CSV of rigcal for model .*; it will not be replaced/s);
    expect(foreign.stderr).toMatch(/--overwrite/);
    expect(readFileSync(join(dir, 'notes.csv'), 'utf8')).toBe('experiment,time,my_column\nA,0,1\n');
    expect((await rigcal(['simulate', 'm.yaml', '-o', 'notes.csv', '--overwrite', '--quiet'], dir)).code).toBe(0);
    expect(readFileSync(join(dir, 'notes.csv'), 'utf8').split('\n')[0]).toBe(first.split('\n')[0]);
  });

  it('leaves an existing output untouched and no temporary file behind when the simulation fails (exit 1)', async () => {
    const dir = join(scratch.dir, 'failing');
    const { mkdirSync } = await import('node:fs');
    mkdirSync(dir);
    // dx/dt = x^2 with x(0) = 1 has the solution 1/(1 - t): it leaves every bound at t = 1.
    writeFileSync(join(dir, 'blowup.yaml'), [
      'format: 1', 'name: blowup', 'states:', '  x: { initial: 1 }', 'parameters:', '  a: { fixed: 1 }',
      'equations:', '  x: a*x^2', 'outputs:', '  x: {}', '',
    ].join('\n'));
    writeFileSync(join(dir, 'old.csv'), 'previous content\n');
    const run = await rigcal(['simulate', 'blowup.yaml', '--duration', '2', '-o', 'old.csv'], dir);
    expect(run.code).toBe(1);
    expect(run.stderr).toMatch(/^rigcal: failed:/);
    expect(readFileSync(join(dir, 'old.csv'), 'utf8')).toBe('previous content\n');
    expect(readdirSync(dir).sort()).toEqual(['blowup.yaml', 'old.csv']);
  });

  it('a missing output folder is an input error (exit 2), not a crash', async () => {
    const run = await rigcal(['simulate', join(root, 'test/fixtures/models/ref-shaker.yaml'), '-e', 'chirp', '-o', join(scratch.dir, 'no/such/folder/x.csv')]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/does not exist/);
  });

  it('without -o the CSV goes to standard output and the quality table to standard error', async () => {
    const run = await rigcal(['simulate', join(root, 'test/fixtures/models/ref-shaker.yaml'), '-e', 'chirp']);
    expect(run.code).toBe(0);
    expect(run.stdout.split('\n')[0]).toBe('experiment,time,lvdt,lvdt_measured,r_state,v_state');
    expect(run.stdout.trim().split('\n').length).toBe(2501);
    expect(run.stderr).toMatch(/fit quality/);
    expect(existsSync(join(root, 'ref-shaker-simulation.csv'))).toBe(false);
  });

  it('an unknown experiment or parameter on the command line is an input error naming it (exit 2)', async () => {
    const e = await rigcal(['simulate', join(models, 'flywheel.yaml'), '-e', 'stepz']);
    expect(e.code).toBe(2);
    expect(e.stderr).toMatch(/stepz/);
    expect(e.stderr).toMatch(/steps/);
    const s = await rigcal(['simulate', join(models, 'flywheel.yaml'), '--set', 'Kt=0.1']);
    expect(s.code).toBe(2);
    expect(s.stderr).toMatch(/Kt/);
    const bad = await rigcal(['simulate', join(models, 'flywheel.yaml'), '--set', 'K=abc']);
    expect(bad.code).toBe(2);
  });
});
