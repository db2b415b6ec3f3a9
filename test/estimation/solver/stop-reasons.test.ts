/**
 * The table of stopping reasons (src/estimation/solver/stop-reasons.ts): every code a finish site
 * of the solver can return has an entry and every entry has a finish site; runs end with the
 * status and the message their entry documents; representative problems end with their code.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { SOLVER_DEFAULTS, STOP_REASONS, solveLeastSquares, stopMessage, type LeastSquaresProblem, type SolverResult, type StopReason } from '../../../src/estimation/solver/index.js';
import { NIST_NAMES, loadNist, nistProblem } from './nist-problem.js';

const solverDir = join(dirname(fileURLToPath(import.meta.url)), '../../../src/estimation/solver');

/** The codes named by the solver's finish sites: the string literals in the first argument of each stopWith call. */
function codesAtFinishSites(): Set<string> {
  const codes = new Set<string>();
  for (const file of readdirSync(solverDir).filter((f) => f.endsWith('.ts') && f !== 'stop-reasons.ts')) {
    const text = readFileSync(join(solverDir, file), 'utf8');
    for (const call of text.matchAll(/stopWith\(([^,)]*)/g)) for (const lit of call[1]!.matchAll(/'([a-z-]+)'/g)) codes.add(lit[1]!);
  }
  return codes;
}

/** A result agrees with its table entry: status, and the message from the template at the run's tolerances. */
function expectDocumented(res: SolverResult, details: Parameters<typeof stopMessage>[1]): void {
  const entry = STOP_REASONS[res.reason];
  expect(entry, `no table entry for ${res.reason}`).toBeDefined();
  expect(res.status).toBe(entry.status);
  expect(res.message).toBe(stopMessage(res.reason, details));
}

const defaults = { costTolerance: SOLVER_DEFAULTS.costTolerance, stepTolerance: SOLVER_DEFAULTS.stepTolerance, gradientTolerance: SOLVER_DEFAULTS.gradientTolerance };

/**
 * Misra1a (NIST StRD nonlinear regression, lower difficulty): y = b1 (1 - exp(-b2 x)), with the
 * fixture's x and, here, y computed from the model itself at `truth` (so the residuals vanish there).
 */
function exactMisra1a(truth: readonly number[]): LeastSquaresProblem {
  const x = loadNist('Misra1a').data.x as number[];
  const model = (t: readonly number[], xi: number) => t[0]! * (1 - Math.exp(-t[1]! * xi));
  const y = x.map((xi) => model(truth, xi));
  const residuals = (t: readonly number[]) => x.map((xi, i) => y[i]! - model(t, xi));
  return {
    residuals,
    residualsAndJacobian: (t) => ({ residuals: residuals(t), jacobian: x.map((xi) => [-(1 - Math.exp(-t[1]! * xi)), -t[0]! * xi * Math.exp(-t[1]! * xi)]) }),
  };
}

describe('table of stopping reasons', () => {
  it('has one entry per code a finish site names, and no entry without a finish site', () => {
    const used = codesAtFinishSites();
    expect([...used].sort()).toEqual(Object.keys(STOP_REASONS).sort());
  });

  it('gives every entry a status, a one-line meaning and a message template', () => {
    for (const [code, e] of Object.entries(STOP_REASONS)) {
      expect(['converged', 'stopped', 'failed'], code).toContain(e.status);
      expect(e.meaning.length, code).toBeGreaterThan(10);
      expect(e.meaning, code).not.toContain('\n');
      expect(e.message.length, code).toBeGreaterThan(10);
    }
  });

  it('NIST StRD from start 2 (27 problems): each run ends with its entry\'s status and message', () => {
    for (const name of NIST_NAMES) {
      const f = loadNist(name);
      expectDocumented(solveLeastSquares(nistProblem(f), f.start2), defaults);
    }
  });

  it('zero residuals: Misra1a data from its own model at the NIST certified values, started there', () => {
    const certified = loadNist('Misra1a').certified;
    const res = solveLeastSquares(exactMisra1a(certified), certified);
    expect(res.reason).toBe<StopReason>('zero-residual');
    expectDocumented(res, defaults);
    expect(res.cost).toBe(0);
  });

  it('iteration limit: Misra1a from NIST start 1 with maxIterations 2', () => {
    const f = loadNist('Misra1a');
    const res = solveLeastSquares(nistProblem(f), f.start1, { maxIterations: 2 });
    expect(res.reason).toBe<StopReason>('iterations');
    expectDocumented(res, { maxIterations: 2 });
    expect(res.message).toBe('iteration limit 2 reached before convergence');
  });

  it('failing start: a callback that answers a failure with its words at the start point', () => {
    const base = exactMisra1a(loadNist('Misra1a').certified);
    const failing: LeastSquaresProblem = { ...base, residualsAndJacobian: () => ({ failed: 'the simulation diverged at t=3 s' }) };
    const res = solveLeastSquares(failing, [500, 1e-4]);
    expect(res.reason).toBe<StopReason>('start-failed');
    expectDocumented(res, { why: 'the simulation diverged at t=3 s' });
    expect(res.iterations).toBe(0);
  });

  it('held at bounds: y = 2 x fitted with a in [0, 1] from a = 1 (closed form: the optimum a = 2 lies beyond the bound)', () => {
    const x = [1, 2, 3];
    const residuals = (t: readonly number[]) => x.map((xi) => 2 * xi - t[0]! * xi);
    const res = solveLeastSquares({ lower: [0], upper: [1], residuals, residualsAndJacobian: (t) => ({ residuals: residuals(t), jacobian: x.map((xi) => [-xi]) }) }, [1]);
    expect(res.reason).toBe<StopReason>('held-at-bounds');
    expectDocumented(res, defaults);
  });
});

describe('the README documents every stopping reason', () => {
  it('its table lists exactly the codes of STOP_REASONS, in order, with their status and meaning', () => {
    const readme = readFileSync(join(dirname(fileURLToPath(import.meta.url)), '../../../README.md'), 'utf8');
    const section = readme.slice(readme.indexOf('## Why a fit stopped'));
    const rows = [...section.matchAll(/^\| `([a-z-]+)` \| (\w+) \| (.+) \|$/gm)].map((m) => [m[1], m[2], m[3]]);
    const expected = Object.entries(STOP_REASONS).map(([code, e]) => [code, e.status, e.meaning]);
    expect(rows).toEqual(expected);
  });
});
