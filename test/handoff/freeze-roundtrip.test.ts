/**
 * `freeze` end to end on the synthetic spring-mass-damper rig: fit, write estimates.yaml, freeze,
 * and check that simulating the frozen file reproduces `simulate --params` on every experiment to
 * 1e-9 relative (a per-experiment parameter, a log-scaled parameter and an experiment `set` included),
 * that the user's comments survive, and the refusals (hash mismatch, overwriting inputs or outputs).
 */
import { existsSync, mkdirSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/run.js';
import { loadExperimentData } from '../../src/data/index.js';
import { fitModel } from '../../src/estimation/fit/fit-model.js';
import { runFreeze } from '../../src/verbs/freeze.js';
import { compileModel } from '../../src/model/compile/index.js';
import { loadModel } from '../../src/model/load/index.js';
import { readEstimates } from '../../src/files/estimates-file.js';
import { writeResults } from '../../src/reports/write-results.js';
import { parameterVector, simulateExperiment } from '../../src/simulation/index.js';
import { modelText, writeRigData } from '../comparison/synthetic-rig.js';

function cli(args: string[], cwd: string): { code: Promise<number>; out: string[]; err: string[] } {
  const out: string[] = [];
  const err: string[] = [];
  const code = runCli(args, { stdout: (s) => out.push(s), stderr: (s) => err.push(s), stderrIsTTY: false, cwd });
  return { code, out, err };
}

/** Largest |a - b| over all samples of all series, relative to the largest |a|. */
function maxRelativeDifference(a: Float64Array[], b: Float64Array[]): number {
  let scale = 0;
  let diff = 0;
  a.forEach((s, j) => {
    for (let i = 0; i < s.length; i++) {
      scale = Math.max(scale, Math.abs(s[i]));
      diff = Math.max(diff, Math.abs(s[i] - b[j][i]));
    }
  });
  return diff / scale;
}

describe('freeze on a fitted rig', () => {
  let dir: string;
  let modelFile: string;
  let estimatesFile: string;
  let frozenFile: string;
  let fitted: ReturnType<typeof fitModel>;

  beforeAll(() => {
    dir = writeRigData();
    mkdirSync(path.join(dir, 'models'));
    // Data one folder up from the model, the frozen copy in yet another folder: paths must be rewritten.
    modelFile = path.join(dir, 'models', 'spring-mass.yaml');
    writeFileSync(modelFile, modelText({ dataPrefix: '../' }));
    const outcome = fitModel(loadModel(modelFile));
    fitted = outcome;
    expect(outcome.result.status).toBe('converged');
    writeResults(path.join(dir, 'spring-mass-fit'), outcome, { outputs: ['x'] });
    estimatesFile = path.join(dir, 'spring-mass-fit', 'estimates.yaml');
    frozenFile = path.join(dir, 'handoff', 'v1', 'spring-mass-calibrated.yaml');
    runFreeze({ modelFile, estimatesFile, output: frozenFile, cwd: dir });
  });

  it('reproduces simulate --params on every experiment to 1e-9 relative', () => {
    const original = loadModel(modelFile);
    const frozen = loadModel(frozenFile);
    // The frozen model has nothing left to estimate; k was log-scaled, x0 per experiment.
    expect(frozen.parameters.every((p) => p.kind === 'fixed')).toBe(true);
    expect(original.parameters.find((p) => p.name === 'k')).toMatchObject({ kind: 'free', scale: 'log' });
    const estimates = readEstimates(estimatesFile);
    const estimated = Object.fromEntries(Object.entries(estimates.parameters).filter(([, e]) => e.status === 'estimated').map(([n, e]) => [n, e.value]));
    expect(Object.keys(estimated).sort()).toEqual(['c', 'k', 'x0@bump', 'x0@shake']);
    const c1 = compileModel(original);
    const c2 = compileModel(frozen);
    expect(frozen.experiments.map((e) => e.name)).toEqual(original.experiments.map((e) => e.name));
    for (let i = 0; i < original.experiments.length; i++) {
      const d1 = loadExperimentData(original, i);
      const d2 = loadExperimentData(frozen, i);
      expect(d2.sha256).toBe(d1.sha256); // the rewritten path reaches the same file
      const s1 = simulateExperiment(c1, d1, parameterVector(c1, i, estimated));
      const s2 = simulateExperiment(c2, d2, parameterVector(c2, i, {}));
      expect(maxRelativeDifference(s1.outputs, s2.outputs)).toBeLessThanOrEqual(1e-9);
      expect(maxRelativeDifference(s1.states, s2.states)).toBeLessThanOrEqual(1e-9);
    }
    // The bump experiment's own mass (set) survived next to its per-experiment value.
    expect(frozen.experiments[1].set).toEqual({ m: 1.25, x0: estimates.parameters['x0@bump'].value });
  });

  it('reproduces the fit\'s own simulated series to 1e-9 relative', () => {
    const frozen = loadModel(frozenFile);
    const compiled = compileModel(frozen);
    expect(fitted.residuals.length).toBe(3);
    for (const series of fitted.residuals) {
      const i = frozen.experiments.findIndex((e) => e.name === series.experiment);
      const sim = simulateExperiment(compiled, loadExperimentData(frozen, i), parameterVector(compiled, i, {}));
      expect(maxRelativeDifference([series.simulated], [sim.outputs[0]]), series.experiment).toBeLessThanOrEqual(1e-9);
    }
  });

  it('reproduces `rigcal simulate --params` through the command line', async () => {
    const a = cli(['simulate', modelFile, '--params', estimatesFile, '-o', path.join(dir, 'sim-params.csv')], dir);
    expect(await a.code, a.err.join('')).toBe(0);
    const b = cli(['simulate', frozenFile, '-o', path.join(dir, 'sim-frozen.csv')], dir);
    expect(await b.code, b.err.join('')).toBe(0);
    const ra = parseCsv(readFileSync(path.join(dir, 'sim-params.csv')), { columns: true, comment: '#' }) as Record<string, string>[];
    const rb = parseCsv(readFileSync(path.join(dir, 'sim-frozen.csv')), { columns: true, comment: '#' }) as Record<string, string>[];
    expect(rb.length).toBe(ra.length);
    let scale = 0;
    let diff = 0;
    for (let i = 0; i < ra.length; i++) {
      expect(rb[i].experiment).toBe(ra[i].experiment);
      const x1 = Number(ra[i].x);
      const x2 = Number(rb[i].x);
      scale = Math.max(scale, Math.abs(x1));
      diff = Math.max(diff, Math.abs(x1 - x2));
    }
    expect(diff / scale).toBeLessThanOrEqual(1e-9);
  });

  it('keeps the user\'s comments and adds the cautions and provenance', () => {
    const text = readFileSync(frozenFile, 'utf8');
    expect(text).toContain('# Synthetic test rig of our own');
    expect(text).toContain('# weighed');
    expect(text).toContain('# viscous damper');
    expect(text).toContain('# chirp, never fitted');
    expect(text).toMatch(/# frozen: k = .* N\/m, estimated within \[1, 1000\], standard error .* N\/m, 95 % interval \[/);
    expect(text).toMatch(/# frozen: x0 was estimated per experiment/);
    expect(text).toMatch(/safety-relevant/);
    expect(text).toContain(loadModel(modelFile).sha256);
    expect(text).toContain('file: ../../shake.csv');
  });

  it('refuses estimates of another model version, unless forced', async () => {
    const edited = path.join(dir, 'models', 'edited.yaml');
    writeFileSync(edited, `${modelText({ dataPrefix: '../' })}# an edit\n`);
    const r = cli(['freeze', edited, '--params', estimatesFile, '-o', path.join(dir, 'x.yaml')], dir);
    expect(await r.code).toBe(2);
    const msg = r.err.join('');
    expect(msg).toMatch(/another version of the model/);
    expect(msg).toContain(loadModel(modelFile).sha256);
    expect(msg).toContain(loadModel(edited).sha256);
    expect(msg).toMatch(/--force/);
    expect(existsSync(path.join(dir, 'x.yaml'))).toBe(false);
    const forced = cli(['freeze', edited, '--params', estimatesFile, '-o', path.join(dir, 'x.yaml'), '--force'], dir);
    expect(await forced.code, forced.err.join('')).toBe(0);
    expect(readFileSync(path.join(dir, 'x.yaml'), 'utf8')).toMatch(/^# WARNING \(rigcal freeze --force\)/);
  });

  it('never overwrites the model or the estimates; replaces its own earlier output, and a file of someone else only with --overwrite', async () => {
    const before = readFileSync(modelFile, 'utf8');
    const self = cli(['freeze', modelFile, '--params', estimatesFile, '-o', modelFile, '--overwrite'], dir);
    expect(await self.code).toBe(2);
    expect(self.err.join('')).toMatch(/the model file itself/);
    expect(readFileSync(modelFile, 'utf8')).toBe(before);
    const est = cli(['freeze', modelFile, '--params', estimatesFile, '-o', estimatesFile, '--overwrite'], dir);
    expect(await est.code).toBe(2);
    // Its own earlier output is replaced as a results folder of ours would be.
    const again = cli(['freeze', modelFile, '--params', estimatesFile, '-o', frozenFile], dir);
    expect(await again.code, again.err.join('')).toBe(0);
    // A file it did not write is kept unless --overwrite says otherwise.
    writeFileSync(frozenFile, 'my own notes: keep\n');
    const foreign = cli(['freeze', modelFile, '--params', estimatesFile, '-o', frozenFile], dir);
    expect(await foreign.code).toBe(2);
    expect(foreign.err.join('')).toMatch(/exists already and is not an output of rigcal freeze; it will not be replaced.*--overwrite/s);
    expect(readFileSync(frozenFile, 'utf8')).toBe('my own notes: keep\n');
    const replace = cli(['freeze', modelFile, '--params', estimatesFile, '-o', frozenFile, '--overwrite'], dir);
    expect(await replace.code, replace.err.join('')).toBe(0);
    // Atomic write: no temporary file left beside the output.
    expect(readdirSync(path.dirname(frozenFile))).toEqual([path.basename(frozenFile)]);
  });

  it('writes the parameter table alone as CSV and JSON', async () => {
    const csvOut = path.join(dir, 'params.csv');
    const r = cli(['freeze', modelFile, '--params', estimatesFile, '-o', csvOut, '--format', 'csv'], dir);
    expect(await r.code, r.err.join('')).toBe(0);
    const rows = parseCsv(readFileSync(csvOut), { columns: true }) as Record<string, string>[];
    const estimates = readEstimates(estimatesFile);
    expect(rows.map((x) => x.name).sort()).toEqual(Object.keys(estimates.parameters).sort());
    const k = rows.find((x) => x.name === 'k')!;
    expect(Number(k.value)).toBe(estimates.parameters.k.value);
    expect(k.unit).toBe('N/m');
    expect(Number(k.ci95Low)).toBeLessThan(Number(k.value));
    expect(rows.find((x) => x.name === 'x0@bump')!.experiment).toBe('bump');
    const jsonOut = path.join(dir, 'params.json');
    const j = cli(['freeze', modelFile, '--params', estimatesFile, '-o', jsonOut, '--format', 'json'], dir);
    expect(await j.code, j.err.join('')).toBe(0);
    const table = JSON.parse(readFileSync(jsonOut, 'utf8')) as { name: string; value: number }[];
    expect(table.find((x) => x.name === 'c')!.value).toBe(estimates.parameters.c.value);
  });
});
