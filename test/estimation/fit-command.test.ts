/** `rigcal fit` run in-process: screen output, --json, results folder, exit codes, simulate --params. */
import { existsSync, mkdirSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/run.js';
import type { CliIO } from '../../src/cli/io.js';
import { tempDir, writeThermalRig } from './helpers/rigs.js';
import { STOP_REASONS, type StopReason } from '../../src/estimation/solver/index.js';

function io(cwd: string, tty = false) {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIO = { stdout: (s) => out.push(s), stderr: (s) => err.push(s), stderrIsTTY: tty, cwd };
  return { io, out: () => out.join(''), err: () => err.join('') };
}

describe('rigcal fit', () => {
  const dir = tempDir();
  const model = writeThermalRig(dir);

  it('prints the summary on stdout, nothing on stderr when not a terminal, and writes the folder', async () => {
    const c = io(dir);
    const code = await runCli(['fit', 'thermal.yaml'], c.io);
    expect(c.err()).toBe('');
    expect(code).toBe(0);
    const folder = join(dir, 'thermal-test-fit');
    expect(readdirSync(folder).sort()).toEqual(expect.arrayContaining(['estimates.yaml', 'fit.json', 'residuals.csv']));
    const text = c.out();
    expect(text).toMatch(/^parameter\s+estimate\s+unit\s+std\. error\s+95 % interval\s+flags/m);
    expect(text).toMatch(/^C\s+\S+\s+J\/K/m);
    expect(text).toMatch(/^T0@warm\s+\S+\s+K/m);
    expect(text).toMatch(/fit quality per output/);
    expect(text.trimEnd().split('\n').pop()).toBe(`results: ${folder}`);
    const csv = readFileSync(join(folder, 'residuals.csv'), 'utf8').split('\n');
    expect(csv[0]).toBe('experiment,role,time,T_measured,T_simulated,T_residual');
    expect(csv).toHaveLength(1 + 2 * 241 + 1);
  });

  it('progress goes to stderr on a terminal (never to stdout), and --quiet silences it', async () => {
    const c = io(dir, true);
    expect(await runCli(['fit', model, '-o', join(dir, 'tty')], c.io)).toBe(0);
    expect(c.err()).toMatch(/iteration \d+, best cost/);
    expect(c.out()).not.toMatch(/iteration \d+, best cost/);
    const q = io(dir, true);
    expect(await runCli(['fit', model, '-o', join(dir, 'tty'), '--quiet'], q.io)).toBe(0);
    expect(q.err()).toBe('');
  });

  it('--json prints fit.json instead of the table', async () => {
    const c = io(dir);
    expect(await runCli(['fit', model, '-o', join(dir, 'j'), '--json'], c.io)).toBe(0);
    const fit = JSON.parse(c.out());
    expect(fit.tool).toBe('rigcal');
    expect(fit.format).toBe(1);
    expect(fit.parameters.map((p: { name: string }) => p.name)).toEqual(['C', 'R', 'Ta', 'T0@warm', 'T0@cold']);
    expect(readFileSync(join(dir, 'j', 'fit.json'), 'utf8')).toBe(c.out());
    // Why it stopped, as a documented code that agrees with the status and the words.
    const entry = STOP_REASONS[fit.stopReason as StopReason];
    expect(entry).toBeDefined();
    expect(entry.status).toBe(fit.status);
    expect(fit.message.startsWith(entry.message.split('{')[0])).toBe(true);
    // The solver's set-up for this ODE fit of two short logs (no relaxed stops: too few degrees of freedom).
    expect(fit.solver.model).toBe('ode');
    expect(fit.solver.degreesOfFreedom).toBe(fit.statistics.dof);
    expect(fit.solver.stepCaps).toBe(fit.parameters.filter((p: { status: string; scale?: string }) => p.status === 'free' && p.scale === 'log').length);
  });

  it('--starts and --seed run a reproducible multistart', async () => {
    const a = io(dir);
    const b = io(dir);
    expect(await runCli(['fit', model, '-o', join(dir, 's1'), '--json', '--starts', '3', '--seed', '7'], a.io)).toBe(0);
    expect(await runCli(['fit', model, '-o', join(dir, 's2'), '--json', '--starts', '3', '--seed', '7'], b.io)).toBe(0);
    const fa = JSON.parse(a.out());
    const fb = JSON.parse(b.out());
    expect(fa.starts.requested).toBe(3);
    expect(fa.starts.distinctOptima).toBeGreaterThanOrEqual(1);
    expect(fa.parameters.map((p: { estimate: number }) => p.estimate)).toEqual(fb.parameters.map((p: { estimate: number }) => p.estimate));
  });

  it('exit 2 for wrong input, with no folder written', async () => {
    const c = io(dir);
    expect(await runCli(['fit', model, '--starts', 'many', '-o', join(dir, 'bad')], c.io)).toBe(2);
    expect(c.err()).toMatch(/--starts/);
    expect(existsSync(join(dir, 'bad'))).toBe(false);
    const d = io(dir);
    expect(await runCli(['fit', join(dir, 'nothing.yaml')], d.io)).toBe(2);
    const e = io(dir);
    expect(await runCli(['fit', model, '--set', 'nope=1', '-o', join(dir, 'bad')], e.io)).toBe(2);
  });

  it('refuses a results folder that is not ours before fitting (exit 2), and --set overrides a fixed value', async () => {
    const foreign = join(dir, 'foreign');
    mkdirSync(foreign);
    writeFileSync(join(foreign, 'thesis.txt'), 'precious');
    const c = io(dir);
    expect(await runCli(['fit', model, '-o', foreign], c.io)).toBe(2);
    expect(c.err()).toMatch(/not a results folder of rigcal/);
    expect(readdirSync(foreign)).toEqual(['thesis.txt']);
    const s = io(dir);
    expect(await runCli(['fit', model, '-o', join(dir, 'set'), '--json', '--set', 'Ta=294', '--set', 'T0@cold=296'], s.io)).toBe(0);
    const fit = JSON.parse(s.out());
    expect(fit.parameters.find((p: { name: string }) => p.name === 'Ta').estimate).toBe(294);
    expect(fit.parameters.find((p: { name: string }) => p.name === 'T0@cold').start).toBe(296);
    expect(fit.provenance.overrides).toEqual({ Ta: 294, 'T0@cold': 296 });
    expect(parse(readFileSync(join(dir, 'set', 'estimates.yaml'), 'utf8')).overrides).toEqual({ Ta: 294, 'T0@cold': 296 });
  });

  it('exit 1 with the reason when the model cannot be simulated at the start values', async () => {
    const d2 = tempDir();
    writeFileSync(join(d2, 'blow.csv'), 't,y\n' + Array.from({ length: 21 }, (_, i) => `${i * 0.25},1`).join('\n') + '\n');
    writeFileSync(
      join(d2, 'blow.yaml'),
      'format: 1\nname: blow-up\nstates:\n  y: { initial: 1 }\nparameters:\n  a: { free: [0.5, 2], start: 1 }\nequations:\n  y: a*y^2\noutputs:\n  y: { expr: y, sigma: 1 }\nexperiments:\n  - name: e\n    file: blow.csv\n',
    );
    const c = io(d2);
    expect(await runCli(['fit', 'blow.yaml'], c.io)).toBe(1);
    expect(c.err()).toMatch(/cannot simulate at the start values/);
    expect(existsSync(join(d2, 'blow-up-fit'))).toBe(false);
  });

  it('exit 3 when the fit stops on its iteration limit: the first line says so, fit.json keeps status "stopped"', async () => {
    // The documented exit codes (README, Commands): 0 converged, 1 ran but failed, 2 input wrong, 3 stopped.
    // One iteration cannot converge from the model's start values (the converged fit above needs several).
    const folder = join(dir, 'one-iteration');
    const c = io(dir);
    expect(await runCli(['fit', model, '-o', folder, '--max-iterations', '1'], c.io)).toBe(3);
    expect(c.out().split('\n')[0]).toMatch(/^fit of thermal-test: STOPPED BEFORE CONVERGING \(iteration limit 1 reached before convergence[;)].*not an optimum \(exit code 3\)/);
    const fit = JSON.parse(readFileSync(join(folder, 'fit.json'), 'utf8'));
    expect(fit.status).toBe('stopped');
    expect(fit.stopReason).toBe('iterations');
    const j = io(dir);
    expect(await runCli(['fit', model, '-o', join(dir, 'one-iteration-json'), '--max-iterations', '1', '--json'], j.io)).toBe(3);
    expect(JSON.parse(j.out()).status).toBe('stopped');
  });

  it('simulate --params reproduces the fitted outputs', async () => {
    const folder = join(dir, 'rt');
    expect(await runCli(['fit', model, '-o', folder, '--quiet'], io(dir).io)).toBe(0);
    const out = join(dir, 'sim.csv');
    const c = io(dir);
    const code = await runCli(['simulate', model, '--params', join(folder, 'estimates.yaml'), '-o', out], c.io);
    expect(code, c.err()).toBe(0);
    const sim = readFileSync(out, 'utf8').trim().split('\n').map((l) => l.split(','));
    const res = readFileSync(join(folder, 'residuals.csv'), 'utf8').trim().split('\n').map((l) => l.split(','));
    const si = sim[0].indexOf('T');
    const ri = res[0].indexOf('T_simulated');
    expect(sim.length).toBe(res.length);
    for (let i = 1; i < res.length; i++) {
      const a = Number(sim[i][si]);
      const b = Number(res[i][ri]);
      expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-9 * Math.abs(b));
    }
  });
});
