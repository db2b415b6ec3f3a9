/**
 * `rigcal check` through the CLI (in-process): the summary of every demo model, and a table of
 * broken and hostile files that must each end with exit 2 and a message naming where the problem
 * is (file with line/column, or key), with nothing executed.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { guardRunsNothing } from '../helpers/runs-nothing.js';
import { rigcal, scratchDir } from './run-cli.js';

guardRunsNothing();

const root = join(import.meta.dirname, '..', '..');
const scratch = scratchDir('check');
afterAll(() => scratch.cleanup());

describe('rigcal check on the demo models', () => {
  it('flywheel: states, parameters with bounds and units, experiments with rows, span, interval and missing samples', async () => {
    const run = await rigcal(['check', join(root, 'models/flywheel.yaml')]);
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    const out = run.stdout;
    expect(out).toMatch(/states \(2\)/);
    expect(out).toMatch(/parameters \(7: 3 fixed, 4 free\)/);
    expect(out).toMatch(/^\s+L\s+free\s+\[1(\.0+)?e-4, 0\.1\]\s+0\.003\s+log\s+H/m);
    expect(out).toMatch(/^\s+J\s+fixed\s+0\.0031\s.*kg\*m\^2\s+set in added-disc: 0\.0046/m);
    // Rows, span and interval of the demo logs (demo-data/TRUTH.md: 6000 samples at 1 kHz, 7 lost).
    expect(out).toMatch(/^\s+steps\s+fit\s+\S+flywheel-steps\.csv\s+6000\s+0 to 5\.999 s\s+0\.001 s\s+0\s/m);
    expect(out).toMatch(/^\s+added-disc\s+fit\s+\S+\s+6000\s.*speed: 7/m);
    expect(out).toMatch(/^\s+prbs-check\s+validation\s+\S+\s+4000\s/m);
    expect(out).toMatch(/speed\s+rad\/s\s+w\s+rpm \(rpm\)\s+0\.21 rad\/s/);
    expect(out).toMatch(/unit checks: passed/);
    expect(out).toMatch(/no problems found/);
  });

  it.each([
    ['heated-block.yaml', /block-prbs\.csv\s+2400\s.*temperature: 5/, /P\s+W\s+heater_W\s+hold\s+parameter lag/],
    ['shaker-suspension.yaml', /shaker-chirp\.csv\s+5000\s+0 to 9\.998 s\s+0\.002 s/, /offset\s+free.*one copy per fit experiment/],
    ['friction-curve.yaml', /friction-sweep\.csv\s+48\s/, /static model \(no states\)/],
    // A log timed in minutes (0.05 min steps): span and interval shown in the model's time unit, s.
    ['../test/fixtures/models/ref-thermal.yaml', /ref-thermal-minutes\.csv\s+600\s+0 to 1797 s\s+3 s\s/, /T0\s+fixed\s+295\.4\s/],
  ])('%s loads with its data and no problem', async (file, dataLine, modelLine) => {
    const run = await rigcal(['check', join(root, 'models', file)]);
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(dataLine);
    expect(run.stdout).toMatch(modelLine);
  });

  it('says when unit checks are skipped because no symbol carries a unit', async () => {
    const dir = join(scratch.dir, 'nounits');
    mkdirSync(dir);
    writeFileSync(join(dir, 'm.yaml'), ['format: 1', 'name: plain', 'states:', '  x: { initial: 1 }', 'parameters:', '  a: { free: [0.1, 10] }', 'equations:', '  x: -a*x', 'outputs:', '  x: {}', ''].join('\n'));
    const run = await rigcal(['check', join(dir, 'm.yaml')]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/unit checks skipped: no symbol carries a unit/);
    expect(run.stdout).toMatch(/none: fit and simulate with data need at least one experiment/);
  });
});

// ---------------------------------------------------------------------------------------------
// Broken and hostile files. A valid base model and log, then one change per case.

const BASE = `format: 1
name: base
states:
  x: { unit: m, initial: 0 }
  v: { unit: m/s, initial: 0 }
inputs:
  F: { unit: N, column: force }
parameters:
  m: { fixed: 1, unit: kg }
  k: { free: [1, 100], start: 10, unit: N/m }
  c: { free: [0.01, 10], start: 0.5, unit: N*s/m }
equations:
  x: v
  v: (F - k*x - c*v)/m
outputs:
  pos: { expr: x, unit: m, column: pos_mm, column_unit: mm }
experiments:
  - name: run1
    file: data.csv
`;

function baseCsv(rows = 50): string {
  const lines = ['# synthetic test log', 't,force,pos_mm'];
  for (let k = 0; k < rows; k++) lines.push(`${k * 0.01},${k < 10 ? 0 : 1},${(k * 0.1).toFixed(3)}`);
  return lines.join('\n') + '\n';
}

interface BrokenCase {
  name: string;
  /** The model text (from BASE), and optionally the log. */
  model: string;
  csv?: string;
  /** Extra arguments after the model path. */
  args?: string[];
  command?: 'check' | 'simulate';
  /** What the message must say (each pattern must match standard error). */
  expect: RegExp[];
}

const edit = (from: string, to: string) => {
  if (!BASE.includes(from)) throw new Error(`test setup: "${from}" not in BASE`);
  return BASE.replace(from, to);
};
// A file:line:column, a (key), a line number, or the file itself for whole-file problems (size, absent).
const LOC = /(:\d+:\d+|\([^)]+\)|line \d+|\.(yaml|csv):)/;

const cases: BrokenCase[] = [
  { name: 'unknown top-level key names the nearest known key', model: edit('equations:', 'equation:'), expect: [/equations/] },
  { name: 'unknown key inside a parameter', model: edit('start: 10,', 'strat: 10,'), expect: [/strat/, /start/] },
  { name: 'undeclared name in an equation lists the nearest declared names', model: edit('(F - k*x', '(F - kk*x'), expect: [/kk/] },
  { name: 'state without an equation', model: edit('  x: v\n', ''), expect: [/\bx\b/] },
  { name: 'name declared twice across namespaces', model: edit('  c: { free', '  x: { free'), expect: [/\bx\b/] },
  { name: 'reserved name t as a parameter', model: edit('  c: { free', '  t: { free').replace('c*v', 't*v'), expect: [/\bt\b/] },
  { name: 'bounds in the wrong order', model: edit('[1, 100]', '[100, 1]'), expect: [/parameters\.k/] },
  { name: 'start outside the bounds', model: edit('start: 10,', 'start: 1000,'), expect: [/start/] },
  { name: 'fixed and free both given', model: edit('{ fixed: 1, unit: kg }', '{ fixed: 1, free: [0, 2], unit: kg }'), expect: [/parameters\.m/] },
  { name: 'unit mismatch in an equation shows both units', model: edit('  x: v\n', '  x: v*m\n'), expect: [/equation/, /\bx\b/] },
  { name: 'unknown unit', model: edit('unit: N/m }', 'unit: newtonz/m }'), expect: [/newtonz/] },
  { name: 'define cycle names the cycle', model: edit('equations:', 'define:\n  a1: a2 + 1\n  a2: a1 * 2\nequations:'), expect: [/a1/, /a2/] },
  { name: 'format other than 1', model: edit('format: 1', 'format: 2'), expect: [/format/] },
  { name: 'YAML syntax error names line and column', model: edit('  x: v\n', '  x: [v\n'), expect: [/:\d+:\d+/] },
  { name: 'a list instead of a map at the top', model: '- format: 1\n- name: x\n', expect: [/map|mapping/i] },
  { name: 'unknown experiment role', model: edit('    file: data.csv', '    file: data.csv\n    role: tuning'), expect: [/role/] },
  { name: 'window in reverse order', model: edit('    file: data.csv', '    file: data.csv\n    window: [0.4, 0.1]'), expect: [/window/] },
  { name: 'start after the first sample', model: edit('    file: data.csv', '    file: data.csv\n    start: 0.2'), expect: [/start/] },
  // Hostile: code in expressions, YAML tricks, sizes.
  { name: 'function not on the allowed list (eval)', model: edit('(F - k*x', '(eval(F) - k*x'), expect: [/eval/] },
  { name: 'import() is refused', model: edit('(F - k*x', '(import(F) - k*x'), expect: [/import/] },
  { name: 'property access is refused', model: edit('(F - k*x', '(F.constructor - k*x'), expect: [/equations\.v|:\d+:\d+/] },
  { name: 'assignment is refused (and nothing is assigned)', model: edit('(F - k*x', '(rigcalPwned = 1) + (F - k*x'), expect: [/equations\.v|:\d+:\d+/] },
  { name: 'string literal is refused', model: edit('(F - k*x', '("process.exit(3)") + (F - k*x'), expect: [/equations\.v|:\d+:\d+/] },
  { name: 'user-defined function is refused', model: edit('  x: v\n', '  x: f(y) = y\n'), expect: [/equations\.x|:\d+:\d+/] },
  { name: 'custom YAML tag (js function) is refused', model: edit('initial: 0 }', 'initial: !!js/function "function(){ return 1 }" }'), expect: [/tag|js\/function/i] },
  { name: 'alias bomb is refused', model: edit('format: 1', 'format: 1\nbomb0: &a0 [x,x,x,x,x,x,x,x,x,x]\nbomb1: &a1 [*a0,*a0,*a0,*a0,*a0,*a0,*a0,*a0,*a0,*a0]\nbomb2: &a2 [*a1,*a1,*a1,*a1,*a1,*a1,*a1,*a1,*a1,*a1]\nbomb3: &a3 [*a2,*a2,*a2,*a2,*a2,*a2,*a2,*a2,*a2,*a2]\nbomb4: &a4 [*a3,*a3,*a3,*a3,*a3,*a3,*a3,*a3,*a3,*a3]\nbomb5: &a5 [*a4,*a4,*a4,*a4,*a4,*a4,*a4,*a4,*a4,*a4]\nbomb6: &a6 [*a5,*a5,*a5,*a5,*a5,*a5,*a5,*a5,*a5,*a5]'), expect: [/alias|bomb/i] },
  { name: 'a huge model file is refused with its size', model: BASE + `# ${'x'.repeat(3 * 1024 * 1024)}\n`, expect: [/3\.0 MiB/, /1 MiB/] },
  { name: 'deeply nested expression is refused, not a stack overflow', model: edit('(F - k*x', `${'('.repeat(20000)}F${')'.repeat(20000)} + (F - k*x`), expect: [/equations\.v|:\d+:\d+|nest|deep|long/i] },
  { name: 'an infinite number is refused', model: edit('{ fixed: 1, unit: kg }', '{ fixed: 1e999, unit: kg }'), expect: [/parameters\.m/] },
  // Data files.
  { name: 'missing data file', model: edit('file: data.csv', 'file: nowhere.csv'), expect: [/nowhere\.csv/] },
  { name: 'time not increasing names the line', model: BASE, csv: baseCsv().replace('\n0.05,', '\n0.03,'), expect: [/data\.csv:8\b/, /0\.03/] },
  { name: 'non-numeric cell names line and column', model: BASE, csv: baseCsv().replace('\n0.05,0,0.500', '\n0.05,zero,0.500'), expect: [/data\.csv:8\b/, /force/, /zero/] },
  { name: 'missing column lists the nearest columns', model: BASE, csv: baseCsv().replace('t,force,pos_mm', 't,forse,pos_mm'), expect: [/force/, /forse/] },
  { name: 'missing value in an input column', model: BASE, csv: baseCsv().replace('\n0.05,0,0.500', '\n0.05,,0.500'), expect: [/data\.csv:8\b/, /force/] },
  // Command line.
  { name: '--set of an unknown parameter (simulate)', model: BASE, command: 'simulate', args: ['--set', 'kk=3'], expect: [/kk/] },
  { name: '-e of an unknown experiment (simulate)', model: BASE, command: 'simulate', args: ['-e', 'run2'], expect: [/run2/, /run1/] },
];

describe('broken and hostile model files: exit 2, located message, nothing executed', () => {
  it.each(cases.map((c, i) => [i + 1, c.name, c] as const))('%i. %s', async (i, _name, c) => {
    const dir = join(scratch.dir, `case-${i}`);
    mkdirSync(dir);
    writeFileSync(join(dir, 'model.yaml'), c.model);
    writeFileSync(join(dir, 'data.csv'), c.csv ?? baseCsv());
    const before = Object.keys(globalThis).length;
    const run = await rigcal([c.command ?? 'check', 'model.yaml', ...(c.args ?? [])], dir);
    if (process.env.RIGCAL_SHOW_MESSAGES) process.stdout.write(`--- ${i}. ${_name}\n${run.stderr}`);
    expect(run.code, run.stderr).toBe(2);
    expect(run.stderr).toMatch(/^rigcal: (error|\d+ errors):/);
    expect(run.stderr).not.toMatch(/internal error|\n\s+at /);
    expect(run.stderr).toMatch(LOC);
    for (const re of c.expect) expect(run.stderr).toMatch(re);
    // Nothing ran: no global was created (the mathjs spies and the setter trap are checked after each test).
    expect(Object.keys(globalThis).length).toBe(before);
  });

  it('has more than 20 cases', () => expect(cases.length).toBeGreaterThan(20));
});

describe('check lists every problem, not only the first', () => {
  it('problems of the model file all come in one run', async () => {
    const dir = join(scratch.dir, 'many-model');
    mkdirSync(dir);
    writeFileSync(join(dir, 'model.yaml'), edit('equations:', 'equation:').replace('[1, 100]', '[100, 1]').replace('unit: N/m }', 'unit: newtonz/m }'));
    writeFileSync(join(dir, 'data.csv'), baseCsv());
    const run = await rigcal(['check', 'model.yaml'], dir);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/^rigcal: \d+ errors:/);
    expect(run.stderr).toMatch(/equations/);
    expect(run.stderr).toMatch(/newtonz/);
    expect(run.stderr).toMatch(/parameters\.k/);
  });

  it('problems of several data files all come in one run, after the summary', async () => {
    const dir = join(scratch.dir, 'many-data');
    mkdirSync(dir);
    writeFileSync(join(dir, 'model.yaml'), BASE + '  - name: run2\n    file: data2.csv\n  - name: run3\n    file: data3.csv\n');
    writeFileSync(join(dir, 'data.csv'), baseCsv().replace('t,force,pos_mm', 't,forse,pos_mm'));
    writeFileSync(join(dir, 'data2.csv'), baseCsv().replace('\n0.05,', '\n0.03,'));
    writeFileSync(join(dir, 'data3.csv'), baseCsv());
    const run = await rigcal(['check', 'model.yaml'], dir);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/^rigcal: \d+ errors:/);
    expect(run.stderr).toMatch(/data\.csv/);
    expect(run.stderr).toMatch(/data2\.csv/);
    expect(run.stderr).not.toMatch(/data3\.csv/);
    // The summary still shows what could be read.
    expect(run.stdout).toMatch(/run3\s+fit\s+data3\.csv\s+50\s/);
    expect(run.stdout).toMatch(/run1\s+fit\s+data\.csv\s+not read/);
  });
});

describe('exit codes', () => {
  it('0 for --help with an example, --version, and a good model', async () => {
    const help = await rigcal(['check', '--help']);
    expect(help.code).toBe(0);
    expect(help.stdout).toMatch(/Example:\n\s+rigcal check /);
    const simHelp = await rigcal(['simulate', '--help']);
    expect(simHelp.code).toBe(0);
    expect(simHelp.stdout).toMatch(/Examples:\n\s+rigcal simulate /);
    expect((await rigcal(['--version'])).code).toBe(0);
  });

  it('2 for a usage mistake (missing argument, unknown option)', async () => {
    expect((await rigcal(['check'])).code).toBe(2);
    expect((await rigcal(['simulate', join(root, 'models/flywheel.yaml'), '--bogus'])).code).toBe(2);
  });
});
