import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';
import { UserError } from '../../src/errors.js';
import { readEstimates } from '../../src/files/estimates-file.js';
import { renderEstimatesYaml } from '../../src/reports/estimates-yaml.js';
import { renderResidualsCsv } from '../../src/reports/residuals-csv.js';
import { formatNumber } from '../../src/presentation/numbers.js';
import { renderFitSummary } from '../../src/reports/summary-table.js';
import { writeResults } from '../../src/reports/write-results.js';
import { sampleOutcome } from './helpers/sample-fit.js';

const tmp = () => mkdtempSync(join(tmpdir(), 'rigcal-results-'));

describe('estimates.yaml', () => {
  it('round-trips every value bit for bit and carries the cautions and provenance', () => {
    const o = sampleOutcome();
    const text = renderEstimatesYaml(o.result);
    expect(text).toMatch(/operating range/);
    expect(text).toMatch(/safety-relevant/);
    expect(text).toMatch(/local codes and licensed/);
    const dir = tmp();
    const file = join(dir, 'estimates.yaml');
    writeFileSync(file, text);
    const back = readEstimates(file);
    for (const [k, v] of Object.entries(o.values)) expect(Object.is(back.values[k], v)).toBe(true);
    expect(back.parameters['w0@steps'].experiment).toBe('steps');
    expect(back.parameters['w0@steps'].stdError).toBeNull();
    expect(back.parameters.Tc.atBound).toBe('lower');
    expect(back.parameters.R.status).toBe('fixed');
    expect(back.model.sha256).toBe('ab'.repeat(32));
    expect(back.data.map((d) => d.experiment)).toEqual(['steps', 'check']);
    expect(back.noise.speed).toEqual({ sigma: 0.49, unit: 'rad/s', estimated: true });
    const plain = parse(text);
    expect(plain.fit.status).toBe('converged');
    expect(plain.parameters.K.ci95).toEqual([0.29, 0.31]);
  });

  it('names the file, line and key of a bad entry', () => {
    const dir = tmp();
    const file = join(dir, 'bad.yaml');
    writeFileSync(file, 'tool: rigcal\nparameters:\n  K: { value: abc }\n  L: { value: 2 }\n');
    try {
      readEstimates(file);
      expect.unreachable();
    } catch (err) {
      expect(err).toBeInstanceOf(UserError);
      const p = (err as UserError).problems[0];
      expect(p.where.file).toBe(file);
      expect(p.where.key).toBe('parameters.K.value');
      expect(p.where.line).toBe(3);
    }
    writeFileSync(file, 'something: else\n');
    expect(() => readEstimates(file)).toThrow(/not an estimates file/);
    expect(() => readEstimates(join(dir, 'missing.yaml'))).toThrow(UserError);
    writeFileSync(file, 'tool: rigcal\nparameters: [\n');
    expect(() => readEstimates(file)).toThrow(/not valid YAML/);
  });
});

describe('residuals.csv', () => {
  it('has the documented columns and empty cells where missing or not logged', () => {
    const o = sampleOutcome();
    const csv = renderResidualsCsv(o.residuals, ['speed', 'current']).trim().split('\n');
    expect(csv[0]).toBe('experiment,role,time,speed_measured,speed_simulated,speed_residual,current_measured,current_simulated,current_residual');
    expect(csv[1]).toBe('steps,fit,0,1,1.5,-0.5,,,');
    expect(csv[2]).toBe('steps,fit,0.1,,2,,,,');
    expect(csv[4]).toBe('steps,fit,0.3,4,4.25,-0.25,,,');
    expect(csv[5]).toBe('check,validation,0,0,0.5,-0.5,,,');
    expect(csv).toHaveLength(7);
  });
});

describe('results folder', () => {
  it('writes the three files, replaces a previous folder of ours as a whole', async () => {
    const dir = tmp();
    const out = join(dir, 'demo-rig-fit');
    await writeResults(out, sampleOutcome(), { outputs: ['speed'] });
    expect(readdirSync(out).sort()).toEqual(['estimates.yaml', 'fit.json', 'residuals.csv']);
    const fit = JSON.parse(readFileSync(join(out, 'fit.json'), 'utf8'));
    expect(fit.tool).toBe('rigcal');
    expect(fit.statistics.aicc).toBeNull(); // Infinity is not JSON
    const o2 = sampleOutcome();
    o2.result.iterations = 99;
    await writeResults(out, o2, { outputs: ['speed'] });
    expect(JSON.parse(readFileSync(join(out, 'fit.json'), 'utf8')).iterations).toBe(99);
    expect(readdirSync(dir)).toEqual(['demo-rig-fit']); // no temporary or old copies left
  });

  it('an error mid-write leaves no folder, or the old folder intact', async () => {
    const dir = tmp();
    const out = join(dir, 'r');
    const boom = () => {
      throw new Error('disk full (simulated)');
    };
    await expect(writeResults(out, sampleOutcome(), { outputs: ['speed'], extraFiles: { 'zz.txt': boom } })).rejects.toThrow(/disk full/);
    expect(existsSync(out)).toBe(false);
    expect(readdirSync(dir)).toEqual([]);
    await writeResults(out, sampleOutcome(), { outputs: ['speed'] });
    const before = readFileSync(join(out, 'fit.json'), 'utf8');
    const o2 = sampleOutcome();
    o2.result.iterations = 1234;
    await expect(writeResults(out, o2, { outputs: ['speed'], extraFiles: { 'zz.txt': boom } })).rejects.toThrow(/disk full/);
    expect(readFileSync(join(out, 'fit.json'), 'utf8')).toBe(before);
    expect(readdirSync(dir)).toEqual(['r']);
  });

  it('refuses to replace a folder that is not ours', async () => {
    const dir = tmp();
    const foreign = join(dir, 'mine');
    mkdirSync(foreign);
    writeFileSync(join(foreign, 'notes.txt'), 'precious');
    await expect(writeResults(foreign, sampleOutcome(), { outputs: ['speed'] })).rejects.toThrow(UserError);
    expect(readFileSync(join(foreign, 'notes.txt'), 'utf8')).toBe('precious');
    // ours, but with a file we did not write: also refused (replacing would delete it)
    const ours = join(dir, 'ours');
    await writeResults(ours, sampleOutcome(), { outputs: ['speed'] });
    writeFileSync(join(ours, '.report.html.tmp-123-abcd'), 'left by an interrupted report');
    await writeResults(ours, sampleOutcome(), { outputs: ['speed'] });
    expect(readdirSync(ours).sort()).toEqual(['estimates.yaml', 'fit.json', 'residuals.csv']);
    writeFileSync(join(ours, 'notes.txt'), 'precious');
    await expect(writeResults(ours, sampleOutcome(), { outputs: ['speed'] })).rejects.toThrow(/did not write/);
    const file = join(dir, 'plain-file');
    writeFileSync(file, 'x');
    await expect(writeResults(file, sampleOutcome(), { outputs: ['speed'] })).rejects.toThrow(/not a folder/);
  });
});

describe('summary table', () => {
  it('lists parameters with units, flags, output quality, warnings and the folder', () => {
    const text = renderFitSummary(sampleOutcome().result, '/tmp/x');
    const lines = text.split('\n');
    const k = lines.find((l) => l.startsWith('K '))!;
    expect(k).toMatch(/0\.3\s+N\*m\/A\s+1\.235e-4\s+\[0\.29, 0\.31\]/);
    expect(lines.find((l) => l.startsWith('Tc '))).toMatch(/at lower bound, interval unreliable/);
    expect(lines.find((l) => l.startsWith('w0@steps'))).toMatch(/not determined/);
    expect(lines.find((l) => l.startsWith('R '))).toMatch(/fixed/);
    expect(text).toMatch(/0\.49 rad\/s \(estimated\)/);
    expect(text).toMatch(/warnings:\n {2}- Tc is at its lower bound/);
    expect(lines.filter((l) => l).pop()).toBe('results: /tmp/x');
  });

  it('rounds numbers for reading without trailing zeros', () => {
    expect(formatNumber(3.5e-4, 6)).toBe('3.5e-4');
    expect(formatNumber(3.50554e-4, 6)).toBe('3.50554e-4');
    expect(formatNumber(293.15, 6)).toBe('293.15');
    expect(formatNumber(2.5e7)).toBe('2.5e7');
    expect(formatNumber(null)).toBe('-');
    expect(formatNumber(0)).toBe('0');
  });
});

describe('default results folder', () => {
  it('is <model name>-fit below the working folder and never leaves it', async () => {
    const { defaultResultsFolder } = await import('../../src/files/results-folder.js');
    expect(defaultResultsFolder('/work/x', 'rig')).toBe('/work/x/rig-fit');
    expect(() => defaultResultsFolder('/work/x', '../evil')).toThrow(UserError);
    expect(() => defaultResultsFolder('/work/x', 'a/b')).toThrow(UserError);
    expect(() => defaultResultsFolder('/work/x', '.hidden')).toThrow(UserError);
  });
});
