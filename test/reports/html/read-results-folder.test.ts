import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { UserError } from '../../../src/errors.js';
import { renderFitJson } from '../../../src/reports/fit-json.js';
import { renderResidualsCsv } from '../../../src/reports/residuals-csv.js';
import { readResultsFolder } from '../../../src/reports/html/index.js';
import { demoResults } from '../../helpers/demo-results.js';
import { runCli } from '../../../src/cli/run.js';

const dirs: string[] = [];
function tempFolder(): string {
  const d = mkdtempSync(join(tmpdir(), 'rigcal-report-'));
  dirs.push(d);
  return d;
}
afterEach(() => {
  for (const d of dirs.splice(0)) rmSync(d, { recursive: true, force: true });
});

function writeDemoFolder(samples = 400): { dir: string; demo: ReturnType<typeof demoResults> } {
  const demo = demoResults({ samples });
  const dir = tempFolder();
  writeFileSync(join(dir, 'fit.json'), renderFitJson(demo.fit));
  // 'torque' is an output of the model that no experiment logged: its columns stay empty.
  writeFileSync(join(dir, 'residuals.csv'), renderResidualsCsv(demo.series, ['speed', 'torque', 'current']));
  return { dir, demo };
}

function io(cwd: string) {
  const out: string[] = [];
  const err: string[] = [];
  return { out, err, io: { stdout: (s: string) => out.push(s), stderr: (s: string) => err.push(s), stderrIsTTY: false, cwd } };
}

describe('readResultsFolder', () => {
  it('reads back the series that residuals.csv was written from', () => {
    const { dir, demo } = writeDemoFolder();
    const { fit, series } = readResultsFolder(dir);
    expect(fit.model.name).toBe(demo.fit.model.name);
    expect(series.map((s) => `${s.experiment}/${s.output}/${s.role}/${s.unit}`)).toEqual(demo.series.map((s) => `${s.experiment}/${s.output}/${s.role}/${s.unit}`));
    series.forEach((s, k) => {
      const ref = demo.series[k];
      expect(Array.from(s.time)).toEqual(Array.from(ref.time));
      // NaN positions and values survive the round trip (numbers are written with full precision).
      expect(Array.from(s.measured)).toEqual(Array.from(ref.measured));
      expect(Array.from(s.simulated)).toEqual(Array.from(ref.simulated));
    });
  });

  it('names the file in every error', () => {
    const dir = tempFolder();
    expect(() => readResultsFolder(join(dir, 'nope'))).toThrow(UserError);
    try {
      readResultsFolder(dir);
      expect.unreachable();
    } catch (e) {
      expect((e as UserError).problems[0].where.file).toBe(join(dir, 'fit.json'));
    }
    writeFileSync(join(dir, 'fit.json'), '{"tool": "rigcal", ');
    expect(() => readResultsFolder(dir)).toThrow(/not valid JSON/);
    writeFileSync(join(dir, 'fit.json'), '{"tool": "other"}');
    expect(() => readResultsFolder(dir)).toThrow(/not written by rigcal/);
  });

  it('reports a cell that is not a number with its line', () => {
    const { dir } = writeDemoFolder(50);
    const csv = readFileSync(join(dir, 'residuals.csv'), 'utf8').split('\n');
    csv[3] = csv[3].replace(/,[^,]+$/, ',abc').replace(/^([^,]*,[^,]*,[^,]*,)[^,]*/, '$1abc');
    writeFileSync(join(dir, 'residuals.csv'), csv.join('\n'));
    try {
      readResultsFolder(dir);
      expect.unreachable();
    } catch (e) {
      const p = (e as UserError).problems[0];
      expect(p.where).toMatchObject({ file: join(dir, 'residuals.csv'), line: 4 });
      expect(p.what).toBe('"abc" is not a number');
    }
  });
});

describe('readResultsFolder on a damaged residuals.csv', () => {
  const problemOf = (dir: string) => {
    try {
      readResultsFolder(dir);
    } catch (e) {
      return (e as UserError).problems[0]!;
    }
    throw new Error('no error');
  };

  it('names the line of a row with a field too many or too few', () => {
    const { dir } = writeDemoFolder(50);
    const csv = readFileSync(join(dir, 'residuals.csv'), 'utf8').split('\n');
    csv[6] = csv[6] + ',1.5';
    writeFileSync(join(dir, 'residuals.csv'), csv.join('\n'));
    const p = problemOf(dir);
    expect(p.where).toMatchObject({ file: join(dir, 'residuals.csv'), line: 7 });
    expect(p.what).toMatch(/fields on this line/);
  });

  it('names the line where a quoted field never closes', () => {
    const { dir } = writeDemoFolder(50);
    const csv = readFileSync(join(dir, 'residuals.csv'), 'utf8').split('\n');
    csv[4] = '"' + csv[4];
    writeFileSync(join(dir, 'residuals.csv'), csv.join('\n'));
    const p = problemOf(dir);
    expect(p.where).toMatchObject({ file: join(dir, 'residuals.csv'), line: 5 });
    expect(p.what).toMatch(/cannot be read as CSV/);
  });
});

describe('rigcal report DIR', () => {
  it('writes report.html atomically and says where', async () => {
    const { dir } = writeDemoFolder();
    const t = io(dir);
    expect(await runCli(['report', '.'], t.io)).toBe(0);
    expect(t.out.join('')).toMatch(/^wrote .*report\.html \(\d+ KiB in [\d.]+ s\)\n$/);
    expect(readdirSync(dir).sort()).toEqual(['fit.json', 'report.html', 'residuals.csv']);
    const page = readFileSync(join(dir, 'report.html'), 'utf8');
    expect(page).toContain('<h1>demo-motor-rig</h1>');
    expect(page).toContain('Experiment steps-validation');
  });

  it('exits 2 naming the file when the folder is not a results folder', async () => {
    const dir = tempFolder();
    const t = io(dir);
    expect(await runCli(['report', dir], t.io)).toBe(2);
    expect(t.err.join('')).toContain(join(dir, 'fit.json'));
    expect(t.err.join('')).toContain('fix: run `rigcal fit MODEL -o DIR` first');
  });
});
