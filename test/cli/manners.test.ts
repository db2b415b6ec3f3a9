/**
 * Manners of a command-line tool, on every command: a reader that closes the pipe early (a real
 * child process piped into `head -1`), `-o -` for the one output file of simulate and freeze,
 * `--json` for results and for errors (parsed as JSON, RFC 8259), and `--quiet` (nothing on
 * standard error but error messages).
 */
import { spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { rigcal, scratchDir, type CliRun } from './run-cli.js';

const root = join(import.meta.dirname, '..', '..');
const scratch = scratchDir('manners');
afterAll(() => scratch.cleanup());

const dir = scratch.dir;
const model = 'models/friction-curve.yaml';
const simpler = 'models/friction-no-stribeck.yaml';
const estimates = 'fit/estimates.yaml';

/** Standard output as exactly one JSON document (JSON.parse refuses anything printed beside it). */
function json(run: CliRun): any {
  return JSON.parse(run.stdout);
}

/** A JSON error of our shape: every problem with where (an object), what and how to mend it. */
function expectJsonError(run: CliRun, exitCode: number, kind: string): any {
  expect(run.code, run.stdout + run.stderr).toBe(exitCode);
  const { error } = json(run);
  expect(error.exitCode).toBe(exitCode);
  expect(error.kind).toBe(kind);
  if (kind === 'input') {
    expect(error.problems.length).toBeGreaterThan(0);
    for (const p of error.problems) {
      expect(typeof p.where).toBe('object');
      expect(typeof p.what).toBe('string');
      expect(typeof p.fix).toBe('string');
    }
  }
  return error;
}

beforeAll(async () => {
  // The demo friction model (static: it fits in well under a second) and a simpler candidate without
  // the Stribeck dip, both reading the demo log by the same relative path.
  mkdirSync(join(dir, 'models'));
  mkdirSync(join(dir, 'demo-data'));
  copyFileSync(join(root, 'demo-data/friction-sweep.csv'), join(dir, 'demo-data/friction-sweep.csv'));
  const text = readFileSync(join(root, model), 'utf8');
  writeFileSync(join(dir, model), text);
  const withoutDip = text
    .replace('name: friction-curve', 'name: friction-no-stribeck')
    .replace(/^ *Ts: .*\n/m, '')
    .replace(/^ *vst: .*\n/m, '')
    .replace('sign(v)*(Tc + (Ts - Tc)*exp(-(v/vst)^2)) + b*v', 'sign(v)*Tc + b*v');
  expect(withoutDip).not.toMatch(/vst/);
  writeFileSync(join(dir, simpler), withoutDip);
  const fit = await rigcal(['fit', model, '-o', 'fit', '--quiet'], dir);
  expect(fit.code, fit.stderr).toBe(0);
});

describe('a reader that closes standard output early', () => {
  it('`rigcal simulate MODEL | head -1` ends quietly with 141 (128 + SIGPIPE), no stack trace', () => {
    // The flywheel CSV (16,000 rows, demo-data/TRUTH.md) is far larger than a pipe's buffer (64 KiB on
    // Linux, pipe(7)), so the writer is still writing when head exits: the write fails with EPIPE.
    // 141: a shell reports a command killed by signal n as 128 + n (bash manual, "Exit Status"); SIGPIPE is 13 (signal(7)).
    const script = `"${process.execPath}" --import tsx src/cli/main.ts simulate models/flywheel.yaml 2>"$1" | head -1; echo "\${PIPESTATUS[0]}" >"$2"`;
    const errFile = join(dir, 'pipe-stderr.txt');
    const codeFile = join(dir, 'pipe-code.txt');
    const shell = spawnSync('bash', ['-c', script, 'pipe', errFile, codeFile], { cwd: root, encoding: 'utf8' });
    expect(shell.stdout).toBe('experiment,time,current,speed,current_measured,speed_measured,i_state,w_state\n');
    const stderr = readFileSync(errFile, 'utf8');
    expect(stderr).not.toMatch(/EPIPE|Unhandled|^\s+at /m);
    expect(readFileSync(codeFile, 'utf8').trim()).toBe('141');
  }, 60_000);
});

describe('-o - writes the one output file to standard output', () => {
  it('simulate -o -: the very CSV of -o FILE, nothing else on standard output; the quality table on standard error', async () => {
    const toFile = await rigcal(['simulate', model, '-o', 'sim.csv'], dir);
    expect(toFile.code, toFile.stderr).toBe(0);
    const run = await rigcal(['simulate', model, '-o', '-'], dir);
    expect(run.code, run.stderr).toBe(0);
    expect(run.stdout).toBe(readFileSync(join(dir, 'sim.csv'), 'utf8'));
    expect(run.stderr).toMatch(/^fit quality/);
    // "-" is standard output (POSIX Utility Syntax Guidelines, guideline 13), never a file of that name.
    expect(existsSync(join(dir, '-'))).toBe(false);
  });

  it('freeze -o -: the frozen model (yaml), the parameter table (json, csv), notes on standard error', async () => {
    for (const format of ['yaml', 'json', 'csv']) {
      const file = `frozen-${format}.${format}`;
      const toFile = await rigcal(['freeze', model, '--params', estimates, '-o', file, '--format', format], dir);
      expect(toFile.code, toFile.stderr).toBe(0);
      const run = await rigcal(['freeze', model, '--params', estimates, '-o', '-', '--format', format], dir);
      expect(run.code, run.stderr).toBe(0);
      // The file names its date of writing in a comment; everything else is the same text.
      const undated = (s: string) => s.replace(/\(freeze\) on \S+\./, '(freeze) on DATE.');
      expect(undated(run.stdout), format).toBe(undated(readFileSync(join(dir, file), 'utf8')));
      expect(run.stderr).toMatch(/^Wrote standard output/);
    }
    expect(existsSync(join(dir, '-'))).toBe(false);
    // With -o - the data paths are rewritten for the working folder: saved there, the model checks.
    const yaml = await rigcal(['freeze', model, '--params', estimates, '-o', '-'], dir);
    writeFileSync(join(dir, 'from-stdout.yaml'), yaml.stdout);
    const check = await rigcal(['check', 'from-stdout.yaml'], dir);
    expect(check.code, check.stderr).toBe(0);
  });

  it('-o - with --json is refused: both would be standard output (exit 2)', async () => {
    expectJsonError(await rigcal(['simulate', model, '-o', '-', '--json'], dir), 2, 'input');
    expectJsonError(await rigcal(['freeze', model, '--params', estimates, '-o', '-', '--json'], dir), 2, 'input');
  });
});

describe('--json on every command', () => {
  it('check: the loaded summary as plain data', async () => {
    const s = json(await rigcal(['check', model, '--json'], dir));
    expect(s.model.name).toBe('friction-curve');
    expect(s.model.static).toBe(true);
    expect(s.parameters.map((p: any) => [p.name, p.kind, p.min, p.max])).toEqual([['Tc', 'free', 0, 1], ['Ts', 'free', 0, 1], ['vst', 'free', 0.1, 100], ['b', 'free', 0, 0.1]]);
    // Rows of the log: the data lines of demo-data/friction-sweep.csv (comment and header lines skipped).
    const rows = parse(readFileSync(join(dir, 'demo-data/friction-sweep.csv'), 'utf8'), { comment: '#', skip_empty_lines: true }) as string[][];
    expect(s.experiments).toEqual([expect.objectContaining({ name: 'sweep', read: true, rows: rows.length - 1, outputsLogged: ['torque'], missing: { torque: 0 } })]);
  });

  it('simulate: the fit quality rows; RMSE as the root mean square of measured - simulated in the CSV', async () => {
    const run = await rigcal(['simulate', model, '--params', estimates, '-o', 'sim-json.csv', '--json'], dir);
    expect(run.code, run.stderr).toBe(0);
    const out = json(run);
    expect(out.written).toBe('sim-json.csv');
    const csv = parse(readFileSync(join(dir, 'sim-json.csv'), 'utf8'), { columns: true }) as Record<string, string>[];
    expect(out.rows).toBe(csv.length);
    const rmse = Math.sqrt(csv.reduce((s, r) => s + (Number(r.torque_measured) - Number(r.torque)) ** 2, 0) / csv.length);
    expect(out.quality).toHaveLength(1);
    expect(out.quality[0]).toMatchObject({ experiment: 'sweep', output: 'torque', unit: 'N*m', samples: csv.length, missing: 0 });
    expect(out.quality[0].rmse).toBeCloseTo(rmse, 9);
  });

  it('fit, validate, rank, freeze and report: their results as JSON', async () => {
    const fit = json(await rigcal(['fit', model, '-o', 'fit-json', '--json'], dir));
    expect(fit.status).toBe('converged');
    const validate = json(await rigcal(['validate', model, '--params', estimates, '-e', 'sweep', '-o', 'validate-json', '--json'], dir));
    expect(validate.outputs[0]).toMatchObject({ experiment: 'sweep', output: 'torque' });
    const rank = json(await rigcal(['rank', model, simpler, '--json'], dir));
    expect(rank.models.map((m: any) => m.name).sort()).toEqual(['friction-curve', 'friction-no-stribeck']);
    const freeze = json(await rigcal(['freeze', model, '--params', estimates, '-o', 'frozen.json', '--format', 'json', '--json'], dir));
    expect(freeze).toMatchObject({ output: 'frozen.json', format: 'json', rows: 4, warnings: [] });
    expect(freeze.path).toBe(join(dir, 'frozen.json'));
    const report = json(await rigcal(['report', 'fit', '--json'], dir));
    expect(report.file).toBe(join(dir, 'fit', 'report.html'));
    expect(report.bytes).toBe(readFileSync(report.file).length);
  });

  it('an input error on every command: {"error": {exitCode 2, problems with where, what, fix}} on standard output, exit 2', async () => {
    const runs: [string, string[]][] = [
      ['check', ['check', 'none.yaml']],
      ['simulate', ['simulate', 'none.yaml', '-o', 'x.csv']],
      ['fit', ['fit', 'none.yaml']],
      ['validate', ['validate', 'none.yaml', '--params', estimates]],
      ['rank', ['rank', 'none.yaml', 'neither.yaml']],
      ['freeze', ['freeze', 'none.yaml', '--params', estimates, '-o', 'x.yaml']],
      ['report', ['report', 'no-such-folder']],
    ];
    for (const [name, args] of runs) {
      const run = await rigcal([...args, '--json'], dir);
      const error = expectJsonError(run, 2, 'input');
      expect(JSON.stringify(error.problems), name).toMatch(/none\.yaml|no-such-folder/);
      expect(run.stderr, name).toBe('');
    }
  });

  it('control characters of the input reach the terminal escaped in a JSON error, C1 ones included', async () => {
    // ESC [ and CSI (U+009B) start terminal commands (ECMA-48); JSON.stringify escapes only U+0000-U+001F (ECMA-262).
    const run = await rigcal(['check', 'bad\u001b[31m\u009b2J.yaml', '--json'], dir);
    expect(run.stdout).not.toMatch(/[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/);
    const error = expectJsonError(run, 2, 'input');
    expect(error.problems[0].where.file.endsWith('bad\u001b[31m\u009b2J.yaml')).toBe(true);
  });

  it('a command-line mistake with --json is a JSON error too (exit 2)', async () => {
    const run = await rigcal(['check', model, '--no-such-option', '--json'], dir);
    const error = expectJsonError(run, 2, 'input');
    expect(error.problems[0].what).toMatch(/--no-such-option/);
    expect(run.stderr).toBe('');
  });

  it('a run that fails gives its message and details (exit 1)', async () => {
    // dx/dt = x^2 with x(0) = 1 has the solution 1/(1 - t): it leaves every bound at t = 1.
    writeFileSync(join(dir, 'blowup.yaml'), ['format: 1', 'name: blowup', 'states:', '  x: { initial: 1 }', 'parameters:', '  a: { fixed: 1 }', 'equations:', '  x: a*x^2', 'outputs:', '  x: {}', ''].join('\n'));
    const error = expectJsonError(await rigcal(['simulate', 'blowup.yaml', '--duration', '2', '-o', 'blowup.csv', '--json'], dir), 1, 'failed');
    expect(typeof error.message).toBe('string');
    expect(typeof error.details).toBe('object');
  });
});

describe('--quiet on every command: nothing on standard error but errors', () => {
  it('simulate -o - and freeze -o -: the quality table and the notes are silenced, the result stays', async () => {
    const loud = await rigcal(['simulate', model, '-o', '-'], dir);
    const quiet = await rigcal(['simulate', model, '-o', '-', '--quiet'], dir);
    expect(loud.stderr).not.toBe('');
    expect(quiet.stderr).toBe('');
    expect(quiet.stdout).toBe(loud.stdout);
    const frozen = await rigcal(['freeze', model, '--params', estimates, '-o', '-', '--format', 'csv', '--quiet'], dir);
    expect(frozen.stderr).toBe('');
    expect(frozen.stdout).toMatch(/^name,/);
  });

  it('fit and rank: no progress even when standard error is a terminal', async () => {
    const loud = await rigcal(['fit', model, '-o', 'fit-tty'], dir, true);
    expect(loud.stderr).toMatch(/iteration/);
    const quiet = await rigcal(['fit', model, '-o', 'fit-tty', '--quiet'], dir, true);
    expect(quiet.stderr).toBe('');
    expect(quiet.stdout).toMatch(/Tc/);
    const rankLoud = await rigcal(['rank', model, simpler], dir, true);
    expect(rankLoud.stderr).toMatch(/fitting/);
    const rankQuiet = await rigcal(['rank', model, simpler, '--quiet'], dir, true);
    expect(rankQuiet.stderr).toBe('');
    expect(rankQuiet.stdout).toBe(rankLoud.stdout);
  });

  it('check, validate and report accept it and print their result alone', async () => {
    for (const args of [['check', model], ['validate', model, '--params', estimates, '-e', 'sweep', '-o', 'validate-quiet'], ['report', 'fit']]) {
      const run = await rigcal([...args, '--quiet'], dir, true);
      expect(run.code, run.stderr).toBe(0);
      expect(run.stderr).toBe('');
      expect(run.stdout).not.toBe('');
    }
  });

  it('errors are still printed with --quiet (exit 2)', async () => {
    const run = await rigcal(['check', 'none.yaml', '--quiet'], dir);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/none\.yaml/);
  });
});

it('the scratch folder holds no file named "-"', () => {
  expect(readdirSync(dir)).not.toContain('-');
});
