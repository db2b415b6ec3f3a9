/**
 * `rank` end to end on the synthetic spring-mass-damper rig (data made by an independent RK4 in
 * synthetic-rig.ts, seeded): the right model against one missing the damper term.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/run.js';
import { runRank } from '../../src/verbs/rank.js';
import { rankJson, rankText } from '../../src/comparison/rank-report.js';
import { modelText, normalDeviates, writeRigData } from './synthetic-rig.js';

async function cli(args: string[], cwd: string): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await runCli(args, { stdout: (s) => (out += s), stderr: (s) => (err += s), stderrIsTTY: false, cwd });
  return { code, out, err };
}

interface RankJson {
  models: { name: string; file: string; freeParameters: number; objective: number; aicc: number; bic: number; weight: number; validation: { experiment: string; output: string; nrmse: number }[]; whiteness: { experiment: string; white: boolean | null }[] }[];
  preferred: string;
  reason: string;
  nested?: { smaller: string; larger: string; statistic: number; dof: number; pValue: number }[];
}

describe('rank on a synthetic rig', () => {
  let dir: string;
  let ranking: RankJson;
  let text: string;

  beforeAll(() => {
    dir = writeRigData();
    writeFileSync(path.join(dir, 'right.yaml'), modelText({ name: 'with-damper' }));
    writeFileSync(path.join(dir, 'no-damper.yaml'), modelText({ name: 'no-damper', damper: false }));
    // What `rigcal rank no-damper.yaml right.yaml --nested [--json]` computes and prints (the command
    // is a thin layer over these calls; fitting twice per run, so the library is called once here and
    // the command line is exercised on its refusals below).
    const outcome = runRank({ modelFiles: ['no-damper.yaml', 'right.yaml'], cwd: dir, nested: true });
    ranking = JSON.parse(JSON.stringify(rankJson(outcome))) as RankJson;
    text = rankText(outcome);
  });

  it('prefers the model with the damper, by a wide AICc margin', () => {
    expect(ranking.preferred).toBe('with-damper');
    const [best, other] = ranking.models;
    expect(best.name).toBe('with-damper');
    // 2 parameters + 2 per-experiment initial offsets vs 1 + 2.
    expect(best.freeParameters).toBe(4);
    expect(other.freeParameters).toBe(3);
    expect(other.aicc - best.aicc).toBeGreaterThan(10);
    expect(best.weight).toBeGreaterThan(0.99);
    expect(best.objective).toBeLessThan(other.objective);
    expect(ranking.reason).toMatch(/lowest AICc/);
  });

  it('finds the residuals of the model without damper not white, those of the right one white', () => {
    const wrong = ranking.models.find((m) => m.name === 'no-damper')!;
    expect(wrong.whiteness.some((w) => w.white === false)).toBe(true);
    const right = ranking.models.find((m) => m.name === 'with-damper')!;
    expect(right.whiteness.every((w) => w.white === true)).toBe(true);
  });

  it('scores the right model better on the held-out experiment', () => {
    const nrmse = (name: string) => ranking.models.find((m) => m.name === name)!.validation.find((v) => v.experiment === 'held-out')!.nrmse;
    expect(nrmse('with-damper')).toBeLessThan(nrmse('no-damper'));
    // The right model leaves only the noise: 0.5 mm against a signal of several mm.
    expect(nrmse('with-damper')).toBeLessThan(0.2);
  });

  it('runs the likelihood-ratio test between the nested pair', () => {
    expect(ranking.nested).toHaveLength(1);
    const t = ranking.nested![0];
    expect(t).toMatchObject({ smaller: 'no-damper', larger: 'with-damper', dof: 1 });
    expect(t.pValue).toBeLessThan(1e-6);
  });

  it('prints a table naming the preferred model (the text the command prints without --json)', () => {
    expect(text).toMatch(/^model\s+free\s+k\s+-2 log L\s+AICc/m);
    expect(text).toMatch(/NRMSE held-out\/x/);
    expect(text).toMatch(/preferred: with-damper: lowest AICc/);
    expect(text).toMatch(/no-damper vs with-damper: statistic [0-9.]+, 1 degree of freedom, p [<=] /);
    expect(text).toMatch(/no-damper: .*residuals are correlated/);
  });

  it('refuses candidates fitted to different data or outputs', async () => {
    writeFileSync(path.join(dir, 'fewer.yaml'), modelText({ name: 'fewer', experiments: ['shake', 'held-out'] }));
    const r = await cli(['rank', 'right.yaml', 'fewer.yaml'], dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/fewer\.yaml.*uses other data than right\.yaml.*bump/s);
    writeFileSync(path.join(dir, 'other-out.yaml'), modelText({ name: 'other' }).replace('x: { unit: m, column: x_mm', 'pos: { expr: x, unit: m, column: x_mm'));
    const o = await cli(['rank', 'right.yaml', 'other-out.yaml'], dir);
    expect(o.code).toBe(2);
    expect(o.err).toMatch(/other outputs/);
    const one = await cli(['rank', 'right.yaml'], dir);
    expect(one.code).toBe(2);
  });
});

describe('rank through the command line on static candidates', () => {
  // A calibration curve of our own: y = 2 x + 0.5 x^2 plus seeded noise of 0.01; the straight line
  // misses the curvature. Static models fit in milliseconds, so the command itself runs here.
  let dir: string;
  let model: (name: string, expr: string, extra: string) => string;
  beforeAll(() => {
    dir = mkdtempSync(path.join(tmpdir(), 'rigcal-static-'));
    const noise = normalDeviates(7);
    const rows = ['x,y'];
    for (let i = 0; i < 60; i++) {
      const x = i / 59;
      rows.push(`${x},${2 * x + 0.5 * x * x + 0.01 * noise()}`);
    }
    writeFileSync(path.join(dir, 'curve.csv'), `${rows.join('\n')}\n`);
    model = (name: string, expr: string, extra: string) => `# Synthetic calibration curve of our own (test data).
format: 1
name: ${name}
inputs:
  x: { unit: '' }
parameters:
  a: { free: [-10, 10], start: 1 }
${extra}outputs:
  y: { expr: ${expr}, unit: '' }
experiments:
  - name: sweep
    file: curve.csv
`;
    writeFileSync(path.join(dir, 'line.yaml'), model('line', 'a*x', ''));
    writeFileSync(path.join(dir, 'parabola.yaml'), model('parabola', 'a*x + b*x^2', '  b: { free: [-10, 10], start: 0 }\n'));
  });

  it('prints the ranking as JSON with the documented keys', async () => {
    const r = await cli(['rank', 'line.yaml', 'parabola.yaml', '--json', '--nested'], dir);
    expect(r.code, r.err).toBe(0);
    const j = JSON.parse(r.out) as RankJson;
    expect(j.preferred).toBe('parabola');
    for (const m of j.models) expect(Object.keys(m)).toEqual(expect.arrayContaining(['name', 'file', 'freeParameters', 'objective', 'aicc', 'bic', 'weight', 'validation']));
    expect(j.models.map((m) => m.file).sort()).toEqual(['line.yaml', 'parabola.yaml']);
    expect(j.nested![0]).toMatchObject({ smaller: 'line', larger: 'parabola', dof: 1 });
  });

  it('passes --starts and --seed to every fit and rejects a bad count', async () => {
    const r = await cli(['rank', 'line.yaml', 'parabola.yaml', '--json', '--starts', '3', '--seed', '11'], dir);
    expect(r.code, r.err).toBe(0);
    expect((JSON.parse(r.out) as RankJson).preferred).toBe('parabola');
    const bad = await cli(['rank', 'line.yaml', 'parabola.yaml', '--starts', '0'], dir);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/--starts must be an integer of at least 1/);
  });

  it('exits 3 and names the candidate when a fit stops on its iteration limit', async () => {
    // Exit codes as documented in the README (Commands): 3 = stopped before converging.
    // A curve nonlinear in its parameters: one iteration from a = 1, c = 0 cannot converge.
    writeFileSync(path.join(dir, 'exponential.yaml'), model('exponential', 'a*exp(c*x) - a', '  c: { free: [-10, 10], start: 0.1 }\n'));
    const r = await cli(['rank', 'exponential.yaml', 'line.yaml', '--max-iterations', '1'], dir);
    expect(r.code, r.err).toBe(3);
    expect(r.out).toMatch(/^ {2}exponential: the fit stopped on its iteration limit before converging: .*exit code 3/m);
  });

  it('prints the table by default', async () => {
    const r = await cli(['rank', 'parabola.yaml', 'line.yaml'], dir);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toMatch(/preferred: parabola: lowest AICc/);
  });
});
