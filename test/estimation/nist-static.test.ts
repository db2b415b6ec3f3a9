/**
 * The whole pipeline (loader, compiler, static evaluation with sensitivities, solver, noise-level
 * estimation, uncertainty) on the 27 NIST StRD nonlinear regression problems written as static model
 * files by the solver's fixture script (test/fixtures/nist/models). Source of the certified values:
 * NIST Statistical Reference Datasets, Nonlinear Regression (itl.nist.gov/div898/strd/nls).
 * From NIST start 2: every parameter to 6 significant digits (LRE >= 6) and every standard error to
 * 3 (LRE >= 3); the noise level is estimated, so s^2 = RSS/(n - p) as NIST's standard deviations assume.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { fitModel } from '../../src/estimation/fit/fit-model.js';
import { loadModel } from '../../src/model/load/index.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', 'fixtures', 'nist');
const sets = readdirSync(root).filter((f) => f.endsWith('.json')).map((f) => f.replace(/\.json$/, '')).sort();

/** Log relative error (McCullough 1998): digits of agreement with the certified value. */
function lre(x: number, c: number): number {
  if (x === c) return 15;
  return -Math.log10(Math.abs(x - c) / Math.abs(c));
}

describe('NIST StRD through fitModel (static models, start 2)', () => {
  it('has the 27 sets', () => expect(sets).toHaveLength(27));
  const rows: string[] = [];
  for (const name of sets) {
    it(`${name}: parameters to 6 digits, standard errors to 3`, () => {
      const ref = JSON.parse(readFileSync(join(root, `${name}.json`), 'utf8'));
      const model = loadModel(join(root, 'models', `${name}.yaml`));
      (ref.parameters as string[]).forEach((p, i) => {
        const spec = model.parameters.find((q) => q.name === p)!;
        if (spec.kind === 'free') spec.start = ref.start2[i];
      });
      const out = fitModel(model, { maxIterations: 1000 });
      const r = out.result;
      const est = (ref.parameters as string[]).map((p, i) => lre(out.values[p], ref.certified[i]));
      const se = (ref.parameters as string[]).map((p, i) => lre(r.parameters.find((q) => q.name === p)!.stdError!, ref.certifiedStdDev[i]));
      rows.push(`${name}: min LRE estimate ${Math.min(...est).toFixed(1)}, se ${Math.min(...se).toFixed(1)}; ${r.iterations} iterations, ${r.wallSeconds.toFixed(3)} s`);
      console.log(rows[rows.length - 1]);
      expect(r.status).toBe('converged');
      expect(Math.min(...est)).toBeGreaterThanOrEqual(6);
      // Lanczos1: the certified RSS (1.4e-25) cannot be reproduced in double precision (note in the
      // shared NIST reference README: compare parameters, not the RSS). Its residuals, about 1e-13, carry
      // round-off of a few 1e-16 from evaluating the model, so the RSS comes out a few tenths of a percent
      // off, and the standard errors, which scale with sqrt(RSS), to 2.5-3.3 digits depending on the last
      // bits of the optimum (measured: 2.93 through the CLI, every parameter alike, i.e. the RSS factor).
      expect(Math.min(...se)).toBeGreaterThanOrEqual(name === 'Lanczos1' ? 2 : 3);
    });
  }
});
