/**
 * `rank` end to end on the synthetic spring-mass-damper rig (data made by an independent RK4 in
 * synthetic-rig.ts, seeded): the right model against one missing the damper term.
 */
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/run.js';
import { modelText, writeRigData } from './synthetic-rig.js';

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

  beforeAll(async () => {
    dir = writeRigData();
    writeFileSync(path.join(dir, 'right.yaml'), modelText({ name: 'with-damper' }));
    writeFileSync(path.join(dir, 'no-damper.yaml'), modelText({ name: 'no-damper', damper: false }));
    const r = await cli(['rank', 'no-damper.yaml', 'right.yaml', '--json', '--nested'], dir);
    expect(r.code, r.err).toBe(0);
    ranking = JSON.parse(r.out) as RankJson;
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

  it('prints a table naming the preferred model', async () => {
    const r = await cli(['rank', 'right.yaml', 'no-damper.yaml'], dir);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toMatch(/^model\s+free\s+k\s+-2 log L\s+AICc/m);
    expect(r.out).toMatch(/NRMSE held-out\/x/);
    expect(r.out).toMatch(/preferred: with-damper: lowest AICc/);
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
