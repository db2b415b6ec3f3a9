/**
 * The compiler on the project's fixture models as the loader reads them (the loader's output is
 * the compiler's real input): every model compiles, its generated code agrees with mathjs
 * evaluation of the same trees, and its sensitivities with central finite differences.
 */
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { compileModel } from '../../../src/model/compile/index.js';
import { loadModel } from '../../../src/model/load/index.js';
import { fdCheck } from './fd-check.js';
import { close, mathjsScope, mathjsValue, rng } from './helpers.js';

const dir = join(import.meta.dirname, '..', '..', 'fixtures', 'models');
const files = readdirSync(dir).filter((f) => f.endsWith('.yaml'));

describe('fixture models through the loader', () => {
  it('there are fixture models to check', () => expect(files.length).toBeGreaterThan(0));

  for (const file of files) {
    it(file, () => {
      const model = loadModel(join(dir, file));
      const cm = compileModel(model);
      const p0 = cm.defaultParams();
      // Parameters near their declared values (within +-20 %), states and inputs moderate.
      const ranges = { x: [-1, 1] as [number, number], u: [-1, 1] as [number, number], p: (i: number) => [0.8 * p0[i]!, 1.2 * p0[i]!] as [number, number] };
      const r = rng(99);
      const dx = new Float64Array(cm.nStates);
      const y = new Float64Array(cm.nOutputs);
      for (let trial = 0; trial < 20; trial++) {
        const x = Float64Array.from({ length: cm.nStates }, () => r(...ranges.x));
        const u = Float64Array.from({ length: cm.nInputs }, () => r(...ranges.u));
        const p = Float64Array.from(p0, (v) => v * r(0.8, 1.2));
        const t = r(0, 10);
        cm.rhs(t, x, u, p, dx);
        cm.outputs(t, x, u, p, y);
        const scope = mathjsScope(model, t, x, u, p);
        model.states.forEach((s, i) => {
          const eq = model.equations.find((e) => e.state === s.name)!;
          expect(close(dx[i]!, mathjsValue(eq.expr.node, scope), 1e-12)).toBe(true);
        });
        model.outputs.forEach((o, i) => expect(close(y[i]!, mathjsValue(o.expr.node, scope), 1e-12)).toBe(true));
      }
      const all = model.parameters.map((_, i) => i);
      fdCheck(cm, all, ranges, 7, 10);
    });
  }
});
