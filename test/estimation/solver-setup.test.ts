/**
 * solverSetup's regime: the plain record of what the fit poses to the solver must say what the
 * options and the problem actually carry (common practice, no source: a report of the settings
 * must not drift from the settings). Problems: COPS 3.0 pinene (ODE, short log), the flywheel demo
 * (ODE, 24,000 residuals: the long-log regime) and NIST StRD Misra1a as a static model.
 */
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { realCollaborators } from '../../src/estimation/fit/collaborators.js';
import { loadAllData } from '../../src/estimation/fit/fit-model.js';
import { initialNoise } from '../../src/estimation/noise.js';
import { buildProblem } from '../../src/estimation/problem.js';
import { solverSetup } from '../../src/estimation/solver-setup.js';
import { SOLVER_DEFAULTS } from '../../src/estimation/solver/index.js';
import { compileModel } from '../../src/model/compile/index.js';
import { loadModel } from '../../src/model/load/index.js';

const here = dirname(fileURLToPath(import.meta.url));

function setupOf(file: string) {
  const model = loadModel(file);
  const fitData = loadAllData(model).filter((d) => d.experiment.role === 'fit');
  const problem = buildProblem(compileModel(model), fitData, initialNoise(model, fitData).sigmas, realCollaborators().sim);
  return { problem, ...solverSetup(problem) };
}

function expectRegimeMatches(s: ReturnType<typeof setupOf>): void {
  const { problem, lsq, settings, regime } = s;
  expect(regime.model).toBe(problem.compiled.nStates > 0 ? 'ode' : 'static');
  expect(regime.degreesOfFreedom).toBe(problem.nResiduals - problem.entries.length);
  expect(regime.noisyCost).toBe(settings.noisyCost === true);
  expect(regime.speculativeJacobian).toBe(settings.speculativeJacobian === true);
  expect(regime.costTolerance).toBe(settings.costTolerance ?? SOLVER_DEFAULTS.costTolerance);
  expect(regime.costNoiseLimit).toBe(settings.costNoiseLimit);
  expect(regime.stepCaps).toBe(lsq.maxStep ? Array.from(lsq.maxStep).filter((m) => Number.isFinite(m)).length : 0);
  // Plain data: survives JSON unchanged (fit.json prints it).
  expect(JSON.parse(JSON.stringify(regime))).toEqual(regime);
}

describe('solverSetup regime', () => {
  it('COPS pinene (ODE, short log): speculative trials, default stops', () => {
    const s = setupOf(join(here, 'fixtures/ode-benchmarks/pinene.yaml'));
    expectRegimeMatches(s);
    expect(s.regime).toMatchObject({ model: 'ode', relaxedStops: false, noisyCost: false, speculativeJacobian: true });
  });

  it('flywheel demo (ODE, long log): relaxed stops with the noise tests, log-scale steps capped', () => {
    const s = setupOf(join(here, '../../models/flywheel.yaml'));
    expectRegimeMatches(s);
    expect(s.regime).toMatchObject({ model: 'ode', relaxedStops: true, noisyCost: true, speculativeJacobian: true });
    expect(s.regime.stepCaps).toBe(s.problem.entries.filter((e) => e.scale === 'log').length);
    expect(s.regime.stepCaps).toBeGreaterThan(0);
    expect(s.regime.costTolerance).toBeGreaterThan(SOLVER_DEFAULTS.costTolerance);
  });

  it('NIST StRD Misra1a as a static model: the solver as it is', () => {
    const s = setupOf(join(here, '../fixtures/nist/models/Misra1a.yaml'));
    expectRegimeMatches(s);
    expect(s.regime).toMatchObject({ model: 'static', relaxedStops: false, noisyCost: false, speculativeJacobian: false, stepCaps: 0 });
  });
});
