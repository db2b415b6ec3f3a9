/**
 * Statistical honesty of the intervals: over 200 noise realisations of a small static model with
 * known truth, the 95 % intervals must contain the truth about 95 % of the time. With 200 trials the
 * count of hits is binomial(200, 0.95): mean 190, sd 3.1, so 184..196 hits (92 %..98 %) is the
 * accepted band (about +-2 sd).
 */
import { describe, expect, it } from 'vitest';
import { realCollaborators } from '../../src/estimation/fit/collaborators.js';
import { loadAllData } from '../../src/estimation/fit/fit-model.js';
import { fitLoaded } from '../../src/estimation/fit/fit-model.js';
import { compileModel } from '../../src/model/compile/index.js';
import { loadModel } from '../../src/model/load/index.js';
import { normalDeviates as normalGenerator } from '../../src/util/random.js';
import { SATURATION_TRUTH, SATURATION_X, tempDir, writeSaturationRig } from './helpers/rigs.js';

describe('coverage of the 95 % intervals', () => {
  it('200 noise realisations: each parameter covered 92 %..98 % of the time (binomial(200, 0.95))', () => {
    const model = loadModel(writeSaturationRig(tempDir()));
    const compiled = compileModel(model);
    const data = loadAllData(model);
    const deps = { ...realCollaborators(), diagnostics: undefined };
    const noise = normalGenerator(20260101);
    const { a, b, sigma } = SATURATION_TRUTH;
    const hits = { a: 0, b: 0 };
    const trials = 200;
    let iterations = 0;
    const t0 = performance.now();
    for (let k = 0; k < trials; k++) {
      const y = Float64Array.from(SATURATION_X, (x) => a * (1 - Math.exp(-b * x)) + sigma * noise());
      const d = [{ ...data[0], outputs: [y] }];
      const out = fitLoaded(model, compiled, d, {}, deps);
      iterations += out.result.iterations;
      for (const name of ['a', 'b'] as const) {
        const p = out.result.parameters.find((q) => q.name === name)!;
        const truth = SATURATION_TRUTH[name];
        if (p.ci95 && p.ci95[0] <= truth && truth <= p.ci95[1]) hits[name]++;
      }
    }
    console.log(`coverage: a ${hits.a}/${trials}, b ${hits.b}/${trials}; ${iterations} iterations in ${((performance.now() - t0) / 1000).toFixed(2)} s`);
    for (const name of ['a', 'b'] as const) {
      expect(hits[name], name).toBeGreaterThanOrEqual(184);
      expect(hits[name], name).toBeLessThanOrEqual(196);
    }
  });
});
