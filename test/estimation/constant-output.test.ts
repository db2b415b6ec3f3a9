/**
 * A rig with an output whose log is constant (a pressure that never moved, 0.1 bar): R^2 and NRMSE
 * are not defined without variance of the measurement (R^2 = 1 - SSE/SST, SST = 0: any statistics
 * handbook), so every table shows n/a, the files store null and a warning says why; RMSE stays.
 * Synthetic scenario of our own (data written by the test).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/run.js';
import { tempDir } from './helpers/rigs.js';

async function cli(args: string[], cwd: string): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await runCli(args, { stdout: (s) => (out += s), stderr: (s) => (err += s), stderrIsTTY: false, cwd });
  return { code, out, err };
}

const WARNING = 'output p in experiment sweep is constant (value 0.1 bar): R^2 and NRMSE are not defined; RMSE still is';

describe('an output whose measurement is constant', () => {
  const dir = tempDir('rigcal-constant-');
  beforeAll(() => {
    const rows = ['x,y,p'];
    // 61 samples: the summed mean of 61 x 0.1 is not 0.1 in doubles, which once gave R^2 near -1e26.
    for (let i = 0; i <= 60; i++) rows.push(`${i / 60},${2 * (i / 60) + 0.01 * Math.sin(7 * i)},0.1`);
    writeFileSync(join(dir, 'log.csv'), `${rows.join('\n')}\n`);
    writeFileSync(
      join(dir, 'rig.yaml'),
      `format: 1\nname: constant-rig\ninputs:\n  x: { unit: '' }\nparameters:\n  a: { free: [-10, 10], start: 1 }\n  c: { free: [-10, 10], start: 0.5, unit: bar }\noutputs:\n  y: { expr: a*x, unit: '' }\n  p: { expr: c, unit: bar, column: p, sigma: 0.01 }\nexperiments:\n  - name: sweep\n    file: log.csv\n`,
    );
  });

  it('fit: n/a in the table and the report, null in fit.json, and a warning that says why', async () => {
    const r = await cli(['fit', 'rig.yaml', '-o', 'fit'], dir);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toMatch(/^sweep\s+fit\s+p\s+61\s+0\.01 bar \(given\)\s+\S+ bar\s+n\/a\s/m);
    expect(r.out).toMatch(/^sweep\s+fit\s+y\s+61\s.*\s0\.99\d+\s/m);
    expect(r.out).toContain(`  - ${WARNING}`);
    const fit = JSON.parse(readFileSync(join(dir, 'fit', 'fit.json'), 'utf8'));
    const p = fit.outputs.find((o: { output: string }) => o.output === 'p');
    expect(p.r2).toBeNull();
    expect(p.nrmse).toBeNull();
    expect(Number.isFinite(p.rmse)).toBe(true);
    expect(fit.warnings).toContain(WARNING);
    const page = readFileSync(join(dir, 'fit', 'report.html'), 'utf8');
    expect(page).toMatch(/<td>sweep<\/td><td>p<\/td>[\s\S]*?<td class="num">n\/a<\/td><td class="num">n\/a<\/td>/);
    // Rebuilt from fit.json (null there), the page still says n/a, not "missing".
    expect((await cli(['report', 'fit'], dir)).code).toBe(0);
    expect(readFileSync(join(dir, 'fit', 'report.html'), 'utf8')).toMatch(/<td>sweep<\/td><td>p<\/td>[\s\S]*?<td class="num">n\/a<\/td><td class="num">n\/a<\/td>/);
  });

  it('validate and simulate say the same', async () => {
    const v = await cli(['validate', 'rig.yaml', '--params', 'fit/estimates.yaml', '-e', 'sweep', '-o', 'val'], dir);
    expect(v.code, v.err).toBe(0);
    expect(v.out).toMatch(/^sweep\s+p\s+61\s+\S+ bar\s+n\/a\s+n\/a\s/m);
    expect(v.out).toContain(`warning: ${WARNING}`);
    const saved = JSON.parse(readFileSync(join(dir, 'val', 'validation.json'), 'utf8'));
    expect(saved.outputs.find((o: { output: string }) => o.output === 'p')).toMatchObject({ r2: null, nrmse: null });
    const s = await cli(['simulate', 'rig.yaml', '--params', 'fit/estimates.yaml', '-o', 'sim.csv'], dir);
    expect(s.code, s.err).toBe(0);
    expect(s.out).toMatch(/sweep\s+fit\s+p\s+61\s+0\s+\S+ bar\s+n\/a/);
    expect(s.out).toContain(`warning: ${WARNING}`);
  });
});
