/**
 * Acceptance: model ranking and hand-off through the command line, on a flywheel with Coulomb
 * friction (helpers/friction-rig.ts; the damper case is covered in test/comparison). The right model
 * and one missing the Coulomb term:
 * - `rank --json` prefers the right one (`preferred` = its `name`);
 * - the wrong one's fit.json outputs (whiteness, verdict) and report.html say its residuals are not white;
 * - `validate` on the held-out experiment scores the right one higher (lower NRMSE);
 * - `freeze` then `simulate` equals `simulate --params` on every experiment to 1e-9 relative.
 */
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FRICTION_TRUTH, frictionModel, writeFrictionData } from './helpers/friction-rig.js';
import { cli, hasNoNaN, readTable, tempDir, type FitJson, removeTempDirs } from './helpers/rig-kit.js';

afterAll(removeTempDirs);

interface RankJson {
  models: { name: string; file: string; freeParameters: number; objective: number; aicc: number; weight: number; validation: { experiment: string; output: string; nrmse: number }[]; whiteness: { experiment: string; white: boolean | null }[] }[];
  preferred: string;
  reason: string;
}

interface ValidationJson {
  outputs: { experiment: string; output: string; nrmse: number; rmse: number; whiteness?: { white: boolean }; verdict: string }[];
}

describe('ranking and hand-off on a flywheel with Coulomb friction', () => {
  const dir = tempDir('friction');
  const fits: Record<string, FitJson> = {};

  beforeAll(async () => {
    writeFrictionData(dir);
    writeFileSync(join(dir, 'right.yaml'), frictionModel(true));
    writeFileSync(join(dir, 'wrong.yaml'), frictionModel(false));
    for (const m of ['right', 'wrong']) {
      const run = await cli(['fit', `${m}.yaml`, '-o', `${m}-fit`, '--json', '--quiet'], dir);
      expect(run.code, run.err).toBe(0);
      expect(hasNoNaN(run.out)).toBe(true);
      fits[m] = JSON.parse(run.out) as FitJson;
    }
  }, 60_000);

  it('the right model recovers the truth within 4 standard errors', () => {
    const f = fits.right;
    expect(f.status).toBe('converged');
    for (const p of f.parameters.filter((q) => q.status === 'free')) {
      const truth = FRICTION_TRUTH[p.name as keyof typeof FRICTION_TRUTH];
      expect(Math.abs(p.estimate - truth) / p.stdError!, p.name).toBeLessThan(4);
    }
  });

  it('rank --json prefers the right model, by name', async () => {
    const run = await cli(['rank', 'wrong.yaml', 'right.yaml', '--json', '--quiet'], dir);
    expect(run.code, run.err).toBe(0);
    const r = JSON.parse(run.out) as RankJson;
    expect(r.preferred).toBe('flywheel-friction');
    expect(r.models[0].name).toBe('flywheel-friction');
    const right = r.models.find((m) => m.name === 'flywheel-friction')!;
    const wrong = r.models.find((m) => m.name === 'flywheel-viscous')!;
    expect(right.file).toBe('right.yaml');
    // AICc difference > 10: "essentially no support" for the worse model (Burnham & Anderson 2002, sec. 2.6).
    expect(wrong.aicc - right.aicc).toBeGreaterThan(10);
    expect(right.freeParameters).toBe(wrong.freeParameters + 1);
    // rank fits the same way fit does: its objective (-2 log L) is the fit's own log-likelihood.
    expect(Math.abs(right.objective / (-2 * fits.right.statistics.logLikelihood) - 1)).toBeLessThan(1e-6);
  }, 60_000);

  it('the wrong model\'s fit.json and report.html say its residuals are not white; the right one\'s are white', () => {
    const wrongFit = fits.wrong.outputs.filter((o) => o.role === 'fit');
    expect(wrongFit.length).toBe(2);
    expect(wrongFit.some((o) => o.whiteness?.white === false)).toBe(true);
    for (const o of wrongFit.filter((x) => x.whiteness?.white === false)) expect(o.verdict).toMatch(/correlated/);
    for (const o of fits.right.outputs.filter((x) => x.role === 'fit')) {
      expect(o.whiteness?.white, `${o.experiment}: ${o.verdict}`).toBe(true);
      expect(o.verdict).toMatch(/residuals are white/);
    }
    const html = readFileSync(join(dir, 'wrong-fit', 'report.html'), 'utf8');
    expect(html).toMatch(/class="verdict correlated"[^>]*>[^<]*residuals are (weakly )?correlated/);
    const good = readFileSync(join(dir, 'right-fit', 'report.html'), 'utf8');
    expect(good).not.toMatch(/class="verdict correlated"/);
  });

  it('validate on the held-out experiment scores the right model higher (lower NRMSE)', async () => {
    const score = async (m: string) => {
      const run = await cli(['validate', `${m}.yaml`, '--params', `${m}-fit/estimates.yaml`, '-o', `${m}-validate`, '--json'], dir);
      expect(run.code, run.err).toBe(0);
      const v = JSON.parse(run.out) as ValidationJson;
      return v.outputs.find((o) => o.experiment === 'held-out' && o.output === 'speed')!;
    };
    const right = await score('right');
    const wrong = await score('wrong');
    expect(right.nrmse).toBeLessThan(wrong.nrmse);
    // The right model leaves only the 1 rpm = 0.1047 rad/s noise (NIST SP 811 rpm factor), within 15 %.
    expect(right.rmse / (2 * Math.PI / 60)).toBeGreaterThan(0.85);
    expect(right.rmse / (2 * Math.PI / 60)).toBeLessThan(1.15);
    expect(wrong.whiteness?.white).toBe(false);
  }, 60_000);

  it('freeze then simulate equals simulate --params on every experiment to 1e-9 relative', async () => {
    mkdirSync(join(dir, 'handoff'));
    const fr = await cli(['freeze', 'right.yaml', '--params', 'right-fit/estimates.yaml', '-o', 'handoff/flywheel-calibrated.yaml'], dir);
    expect(fr.code, fr.err).toBe(0);
    expect(existsSync(join(dir, 'handoff', 'flywheel-calibrated.yaml'))).toBe(true);
    const a = await cli(['simulate', 'handoff/flywheel-calibrated.yaml', '-o', 'frozen.csv'], dir);
    expect(a.code, a.err).toBe(0);
    const b = await cli(['simulate', 'right.yaml', '--params', 'right-fit/estimates.yaml', '-o', 'params.csv'], dir);
    expect(b.code, b.err).toBe(0);
    const ra = readTable(join(dir, 'frozen.csv'));
    const rb = readTable(join(dir, 'params.csv'));
    expect(ra.length).toBe(rb.length);
    expect(new Set(ra.map((r) => r.experiment))).toEqual(new Set(['spin-up', 'reversals', 'held-out']));
    let worst = 0;
    for (let i = 0; i < ra.length; i++) {
      expect(ra[i].experiment).toBe(rb[i].experiment);
      for (const col of ['time', 'speed', 'w_state']) {
        const x = Number(ra[i][col]);
        const y = Number(rb[i][col]);
        worst = Math.max(worst, Math.abs(x - y) / Math.max(Math.abs(y), 1e-300));
      }
    }
    expect(worst).toBeLessThan(1e-9);
    // And the frozen model has nothing left to estimate.
    const frozen = readFileSync(join(dir, 'handoff', 'flywheel-calibrated.yaml'), 'utf8');
    expect(frozen).not.toMatch(/\bfree:/);
  }, 60_000);
});
