/**
 * Published ODE estimation problems with known optima, fitted through fitModel with every sigma fixed
 * to 1 so that the weighted SSE is the plain sum of squares the sources publish. Fixtures (model
 * files of our own format + data) are in fixtures/ode-benchmarks/, written by make-fixtures.py from
 * the reference collection; sources: COPS 3.0 (E. D. Dolan, J. J. More, T. S. Munson, ANL/MCS-TM-273,
 * 2004) for pinene, gasoil, methanol and marine; NIST Statistical Reference Datasets, nonlinear
 * regression (itl.nist.gov/div898/strd/nls) certified values for BoxBOD and Misra1a.
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { fitModel } from '../../src/estimation/fit/fit-model.js';
import { loadModel } from '../../src/model/load/index.js';

const here = join(dirname(fileURLToPath(import.meta.url)), 'fixtures', 'ode-benchmarks');
interface Expected {
  objective: number;
  parameters: Record<string, number> | null;
  standardDeviations?: Record<string, number> | null;
}
const expected = JSON.parse(readFileSync(join(here, 'expected.json'), 'utf8')).problems as Record<string, Expected>;

/** Relative difference; "4 digits" is checked as a relative difference below 1e-4. */
function rel(a: number, b: number): number {
  return Math.abs(a - b) / Math.abs(b);
}

function fit(name: string, edit?: (m: ReturnType<typeof loadModel>) => void) {
  const model = loadModel(join(here, `${name}.yaml`));
  edit?.(model);
  const outcome = fitModel(model, { maxIterations: 500 });
  const r = outcome.result;
  console.log(`${name}: ${r.status} (${r.message}); objective ${r.statistics.weightedSSE}; ${r.iterations} iterations, ${r.simulations} simulations + ${r.sensitivitySimulations} with sensitivities, ${r.wallSeconds.toFixed(3)} s`);
  return outcome;
}

describe('published ODE estimation problems', () => {
  // Tolerances: the published objectives carry 6 digits (COPS) or 11 (NIST); we require 4 digits
  // (relative 1e-4), as the task asks; marine's COPS value is from a coarse collocation and differs
  // from the exact-ODE optimum by 1.7e-5 (reference collection README).
  for (const name of ['pinene', 'gasoil', 'methanol', 'marine', 'boxbod', 'misra1a']) {
    it(`${name}: published objective and optimum to 4 digits`, () => {
      const e = expected[name];
      const { result, values } = fit(name);
      expect(result.status).toBe('converged');
      expect(rel(result.statistics.weightedSSE, e.objective)).toBeLessThan(1e-4);
      if (e.parameters) {
        for (const [p, v] of Object.entries(e.parameters)) {
          // gasoil's GAMS values carry 4 to 5 digits: compare to half a unit in the 4th digit
          const tol = name === 'gasoil' ? 5e-4 : 1e-4;
          expect(rel(values[p], v), `${name} ${p}: ${values[p]} vs ${v}`).toBeLessThan(tol);
        }
      }
    });
  }

  for (const name of ['boxbod', 'misra1a']) {
    it(`${name}: certified standard deviations to 3 digits when the noise level is estimated`, () => {
      // NIST certifies se with s^2 = RSS/(n - p); with one output and sigma estimated our covariance
      // is s^2 (J^T J)^-1 with the same s^2, whatever sigma weighted the fit.
      const e = expected[name];
      const { result } = fit(name, (m) => {
        m.outputs[0] = { ...m.outputs[0], sigma: undefined };
      });
      for (const [p, sd] of Object.entries(e.standardDeviations!)) {
        const row = result.parameters.find((q) => q.name === p)!;
        expect(rel(row.estimate, e.parameters![p])).toBeLessThan(1e-6);
        expect(rel(row.stdError!, sd), `${name} ${p} se ${row.stdError} vs ${sd}`).toBeLessThan(5e-4);
      }
    });
  }
});
