/**
 * Broken and hostile model files: each must be refused with a UserError that names the key, the
 * line and (where it matters) the column, says what is wrong, and runs nothing.
 *
 * "Runs nothing" is checked three ways: mathjs's evaluate/compile (module functions and the node
 * method) are replaced by spies that must never be called; a setter trap on globalThis catches any
 * assignment to `rigcalPwned`; and no file appears next to the model.
 */
import { readdirSync } from 'node:fs';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { guardRunsNothing } from '../../helpers/runs-nothing.js';
import { UserError, type Problem } from '../../../src/errors.js';
import { loadModel } from '../../../src/model/load/index.js';
import { cleanTempDirs, problemsOf, spring, SPRING, tempDir } from './helpers.js';

guardRunsNothing();
afterAll(cleanTempDirs);

/** 1-based column of `needle` in line `line` of `text` (computed from the input, not from our output). */
function colOf(text: string, line: number, needle: string): number {
  const l = text.split('\n')[line - 1];
  const i = l.indexOf(needle);
  if (i < 0) throw new Error(`test setup: "${needle}" not on line ${line}`);
  return i + 1;
}

interface Case {
  name: string;
  text: string;
  /** The problem that must be present. */
  key?: string;
  line?: number;
  column?: number;
  /** Words that must all appear in that problem's what + fix. */
  words: string[];
  options?: Parameters<typeof problemsOf>[1];
}

const deepParens = `${'('.repeat(60)}x${')'.repeat(60)}`;
const longSum = `${'x + '.repeat(1100)}x`;
const aliasBomb = `${SPRING}lol0: &a0 [x, x, x, x, x, x, x, x, x, x]\n${Array.from({ length: 60 }, (_, i) => `lol${i + 1}: &a${i + 1} [*a${i}, *a${i}]`).join('\n')}\n`;

const cases: Case[] = [
  {
    name: 'misspelt top-level key names the nearest one',
    text: spring('equations:', 'equation:'),
    key: 'equation', line: 13, column: 1, words: ['unknown key "equation"', '"equations"'],
  },
  {
    name: 'misspelt parameter key',
    text: spring('m: { fixed: 2.5, unit: kg }', 'm: { fxied: 2.5, unit: kg }'),
    key: 'parameters.m.fxied', line: 9, column: 8, words: ['"fxied"', '"fixed"'],
  },
  {
    name: 'misspelt state key',
    text: spring('v: { unit: m/s }', 'v: { unit: m/s, initail: 0 }'),
    key: 'states.v.initail', line: 5, words: ['"initail"', '"initial"'],
  },
  {
    name: 'misspelt experiment key',
    text: `${SPRING}    windw: [0, 1]\n`,
    key: 'experiments[0].windw', line: 21, column: 5, words: ['"windw"', '"window"'],
  },
  {
    name: 'misspelt output key',
    text: spring('pos: { expr: x,', 'pos: { expression: x,'),
    key: 'outputs.pos.expression', line: 17, words: ['"expression"', '"expr"'],
  },
  {
    name: 'undeclared name lists the nearest declared one, at its column',
    text: spring('v: (F - k*x - c*v) / m', 'v: (F - k*x - cc*v) / m'),
    key: 'equations.v', line: 15, column: colOf(spring('v: (F - k*x - c*v) / m', 'v: (F - k*x - cc*v) / m'), 15, 'cc'),
    words: ['"cc"', 'not declared', '"c"'],
  },
  {
    name: 'hostile: property access that would set a global',
    text: spring('v: (F - k*x - c*v) / m', 'v: globalThis.rigcalPwned = 1'),
    key: 'equations.v', line: 15, column: colOf(spring('v: (F - k*x - c*v) / m', 'v: globalThis.rigcalPwned = 1'), 15, '.rigcal'),
    words: ['property access'],
  },
  {
    name: 'hostile: constructor chain to reach Function',
    text: spring('v: (F - k*x - c*v) / m', `v: 'constructor.constructor("globalThis.rigcalPwned=1")()'`),
    key: 'equations.v', line: 15, column: 7, words: ['"constructor"', 'not allowed'],
  },
  {
    name: 'hostile: require and a shell command that would write a file',
    text: spring('v: (F - k*x - c*v) / m', `v: 'require("child_process").execSync("touch pwned")'`),
    key: 'equations.v', line: 15, column: 7, words: ['"require("', 'not allowed'],
  },
  {
    name: 'hostile: import()',
    text: spring('v: (F - k*x - c*v) / m', `v: 'import("fs")'`),
    key: 'equations.v', line: 15, words: ['"import("', 'not allowed'],
  },
  {
    name: 'hostile: the expression library\'s own evaluate',
    text: spring('v: (F - k*x - c*v) / m', `v: 'evaluate("rigcalPwned = 1")'`),
    key: 'equations.v', line: 15, words: ['"evaluate("', 'not allowed'],
  },
  {
    name: 'assignment',
    text: spring('v: (F - k*x - c*v) / m', 'v: rigcalPwned = 1'),
    key: 'equations.v', line: 15, column: colOf(spring('v: (F - k*x - c*v) / m', 'v: rigcalPwned = 1'), 15, '= 1'),
    words: ['assignment'],
  },
  {
    name: 'function definition',
    text: spring('v: (F - k*x - c*v) / m', 'v: g(y) = 2*y'),
    key: 'equations.v', line: 15, words: ['"g("', 'not allowed'],
  },
  {
    name: 'several statements',
    text: spring('v: (F - k*x - c*v) / m', 'v: x; x'),
    key: 'equations.v', line: 15, column: 7, words: ['several statements'],
  },
  {
    name: 'strings',
    text: spring('v: (F - k*x - c*v) / m', `v: '"abc"'`),
    key: 'equations.v', line: 15, column: 7, words: ['strings'],
  },
  {
    name: 'matrix brackets inside an expression',
    text: spring('v: (F - k*x - c*v) / m', 'v: "[1, 2] * x"'),
    key: 'equations.v', line: 15, column: 7, words: ['square brackets'],
  },
  {
    name: 'a YAML list where an expression belongs',
    text: spring('v: (F - k*x - c*v) / m', 'v: [1, 2]'),
    key: 'equations.v', line: 15, column: 6, words: ['number or an expression', 'map or list'],
  },
  {
    name: 'object braces inside an expression',
    text: spring('v: (F - k*x - c*v) / m', 'v: "{a: 1}"'),
    key: 'equations.v', line: 15, words: ['braces'],
  },
  {
    name: 'implicit multiplication is refused with the product to write',
    text: spring('v: (F - k*x - c*v) / m', 'v: 2x'),
    key: 'equations.v', line: 15, column: 7, words: ['implicit multiplication', '2*x'],
  },
  {
    name: 'a unit written inside an expression',
    text: spring('v: (F - k*x - c*v) / m', 'v: F/m - 9.81 m/s^2'),
    key: 'equations.v', line: 15, words: ['implicit multiplication'],
  },
  {
    name: 'non-finite literal',
    text: spring('v: (F - k*x - c*v) / m', 'v: 1e999 * x'),
    key: 'equations.v', line: 15, column: 6, words: ['1e999', 'too large'],
  },
  {
    name: 'nesting deep enough to overflow a recursive parser',
    text: spring('v: (F - k*x - c*v) / m', `v: ${deepParens}`),
    key: 'equations.v', line: 15, words: ['nested more than 40'],
  },
  {
    name: 'over-long expression',
    text: spring('v: (F - k*x - c*v) / m', `v: ${longSum}`),
    key: 'equations.v', line: 15, words: ['longer than 4000 characters'],
  },
  {
    name: 'unknown function names the nearest allowed ones',
    text: spring('v: (F - k*x - c*v) / m', 'v: sinn(x)'),
    key: 'equations.v', line: 15, column: 6, words: ['"sinn("', 'did you mean "sin",'],
  },
  {
    name: 'wrong number of arguments',
    text: spring('v: (F - k*x - c*v) / m', 'v: atan2(x) / m'),
    key: 'equations.v', line: 15, column: 6, words: ['atan2 takes 2 arguments, got 1'],
  },
  {
    name: 'reserved name t',
    text: spring('  m: { fixed: 2.5, unit: kg }', '  m: { fixed: 2.5, unit: kg }\n  t: 3'),
    key: 'parameters.t', line: 10, column: 3, words: ['"t" is reserved'],
  },
  {
    name: 'one namespace: a parameter named like a state',
    text: spring('  m: { fixed: 2.5, unit: kg }', '  m: { fixed: 2.5, unit: kg }\n  x: 3'),
    key: 'parameters.x', line: 10, words: ['"x" is declared twice', 'state'],
  },
  {
    name: 'define cycle names the cycle',
    text: spring('equations:', 'define:\n  a: b + 1\n  b: 2*a\nequations:'),
    key: 'define.a', line: 14, words: ['cycle', 'a -> b -> a'],
  },
  {
    name: 'initial value that uses a state',
    text: spring('v: { unit: m/s }', 'v: { unit: m/s, initial: x }'),
    key: 'states.v.initial', line: 5, column: colOf(spring('v: { unit: m/s }', 'v: { unit: m/s, initial: x }'), 5, 'x }'),
    words: ['initial value of v', 'state x'],
  },
  {
    name: 'bounds in the wrong order',
    text: spring('c: { free: [0, 5]', 'c: { free: [5, 0]'),
    key: 'parameters.c.free', line: 11, words: ['min < max', '[5, 0]'],
  },
  {
    name: 'start outside the bounds',
    text: spring('k: { free: [10, 1000], unit: N/m }', 'k: { free: [10, 1000], start: 5000, unit: N/m }'),
    key: 'parameters.k.start', line: 10, words: ['start of k', 'outside its bounds'],
  },
  {
    name: 'infinite bound without scale: linear',
    text: spring('c: { free: [0, 5]', 'c: { free: [0, .inf]'),
    key: 'parameters.c.free', line: 11, words: ['infinite bound', 'scale: linear'],
  },
  {
    name: 'per_experiment on a fixed parameter',
    text: spring('m: { fixed: 2.5, unit: kg }', 'm: { fixed: 2.5, unit: kg, per_experiment: true }'),
    key: 'parameters.m.per_experiment', line: 9, words: ['only to free parameters', 'm is fixed'],
  },
  {
    name: 'both fixed and free',
    text: spring('m: { fixed: 2.5, unit: kg }', 'm: { fixed: 2.5, free: [1, 3], unit: kg }'),
    key: 'parameters.m', line: 9, words: ['both fixed and free'],
  },
  {
    name: 'an expression where a fixed value belongs',
    text: spring('m: { fixed: 2.5, unit: kg }', 'm: { fixed: 2*1.25, unit: kg }'),
    key: 'parameters.m.fixed', line: 9, words: ['fixed value of m', 'number'],
  },
  {
    name: 'unsupported format version',
    text: spring('format: 1', 'format: 2'),
    key: 'format', line: 1, column: 9, words: ['format 2 is not supported'],
  },
  {
    name: 'format must be the integer 1',
    text: spring('format: 1', 'format: 1.0'),
    key: 'format', line: 1, words: ['whole number'],
  },
  {
    name: 'YAML syntax error: unclosed flow map',
    text: spring('x: { unit: m, initial: x0 }', 'x: { unit: m, initial: x0'),
    line: 5, words: ['YAML'],
  },
  {
    // YAML 1.2.2, section 9.2: `---` starts a new document of the stream.
    name: 'two YAML documents: the `---` line is named',
    text: `${SPRING}---\nformat: 1\n`,
    line: SPRING.split('\n').length, words: ['the file holds 2 YAML documents', 'a model file is one document', `remove the \`---\` line at line ${SPRING.split('\n').length}`],
  },
  {
    name: 'three YAML documents, the first with its own `---`',
    text: `---\n${SPRING}---\nb: 2\n---\nc: 3\n`,
    line: SPRING.split('\n').length + 1, words: ['the file holds 3 YAML documents', `remove the \`---\` line at line ${SPRING.split('\n').length + 1}`],
  },
  {
    // YAML 1.2.2, section 9.1.2: `...` ends a document; whatever follows is another one.
    name: 'a document after `...`',
    text: `${SPRING}...\nb: 2\n`,
    line: SPRING.split('\n').length + 1, words: ['the file holds 2 YAML documents', 'remove the `...` line'],
  },
  {
    name: 'duplicate key',
    text: spring('  m: { fixed: 2.5, unit: kg }', '  m: { fixed: 2.5, unit: kg }\n  m: 3'),
    line: 10, words: ['appears twice'],
  },
  {
    name: 'hostile: a language-specific YAML tag',
    text: spring('m: { fixed: 2.5, unit: kg }', 'm: !!js/function "function () { globalThis.rigcalPwned = 1 }"'),
    line: 9, words: ['tag'],
  },
  {
    name: 'hostile: alias bomb',
    text: aliasBomb,
    words: ['more than 50 YAML aliases'],
  },
  {
    name: 'hostile: __proto__ as a parameter name',
    text: spring('  m: { fixed: 2.5, unit: kg }', '  m: { fixed: 2.5, unit: kg }\n  __proto__: { fixed: 1 }'),
    key: 'parameters.__proto__', line: 10, words: ['"__proto__" is not a valid name'],
  },
  {
    name: 'hostile: constructor as a parameter name',
    text: spring('  m: { fixed: 2.5, unit: kg }', '  m: { fixed: 2.5, unit: kg }\n  constructor: 1'),
    key: 'parameters.constructor', line: 10, words: ['"constructor" is reserved'],
  },
  {
    name: 'hostile: experiment name that climbs out of the results folder',
    text: spring('- name: steps', '- name: ../../etc/cron.d/x'),
    key: 'experiments[0].name', line: 19, words: ['not a valid name', '..'],
  },
  {
    name: 'hostile: model name with a path',
    text: spring('name: spring-mass', 'name: /tmp/evil'),
    key: 'name', line: 2, column: 7, words: ['model name', 'not a valid name'],
  },
  {
    name: 'output in mm from an expression in m names the factor',
    text: spring('pos: { expr: x, unit: m,', 'pos: { expr: x, unit: mm,'),
    key: 'outputs.pos.expr', line: 17, words: ['output pos', 'expected mm', 'factor 1000'],
  },
  {
    name: 'equation with the wrong unit shows both units',
    text: spring('v: (F - k*x - c*v) / m', 'v: (F - k*x - c*v)'),
    key: 'equations.v', line: 15, words: ['equation for v: right side is N', 'expected m/s / s'],
  },
  {
    name: 'both sides of + must agree',
    text: spring('v: (F - k*x - c*v) / m', 'v: (F - k*x - c*v) / m + x'),
    key: 'equations.v', line: 15, words: ['both sides of "+"', 'dimensions differ'],
  },
  {
    name: 'sin of a length',
    text: spring('v: (F - k*x - c*v) / m', 'v: (F - k*x - c*v) / m * (1 + sin(x))'),
    key: 'equations.v', line: 15, words: ['argument of sin', 'x', 'm'],
  },
  {
    name: 'a length raised to a parameter',
    text: spring('v: (F - k*x - c*v) / m', 'v: (F - k*x^n - c*v) / m').replace('parameters:\n', 'parameters:\n  n: 1.2\n'),
    key: 'equations.v', line: 16, words: ['x has the unit m', 'constant power, not to n'],
  },
  {
    name: 'unknown unit string',
    text: spring('unit: N/m }', 'unit: kgs }'),
    key: 'parameters.k.unit', line: 10, words: ['"kgs" is not a known unit'],
  },
  {
    name: 'column unit that cannot convert into the unit',
    text: spring('column: position }', 'column: position, column_unit: rpm }'),
    key: 'outputs.pos.column_unit', line: 17, words: ['cannot convert rpm'],
  },
  {
    name: 'set on a free parameter',
    text: `${SPRING}    set: { k: 100 }\n`,
    key: 'experiments[0].set.k', line: 21, words: ['k, which is free', 'fixed parameters only'],
  },
  {
    name: 'columns renames something that is not an input or output',
    text: `${SPRING}    columns: { postion: p }\n`,
    key: 'experiments[0].columns.postion', line: 21, words: ['"postion"', '"pos"'],
  },
  {
    name: 'static model that uses time',
    text: 'format: 1\nname: curve\nparameters:\n  a: { free: [0, 1] }\noutputs:\n  y: { expr: a*t }\n',
    key: 'outputs.y.expr', line: 6, words: ['time t', 'static'],
  },
  {
    name: 'equations without states',
    text: 'format: 1\nname: curve\nparameters:\n  a: 1\nequations:\n  x: a\n',
    key: 'equations', line: 5, words: ['equations but no states'],
  },
  {
    name: 'state without an equation',
    text: spring('  v: (F - k*x - c*v) / m\n', ''),
    key: 'states.v', line: 5, words: ['state v has no equation'],
  },
  {
    name: 'units: an unknown choice',
    text: `${SPRING}units: of\n`,
    key: 'units', line: 21, words: ['"check" or "off"', '"off"'],
  },
  {
    name: 'interpolate: an unknown choice',
    text: spring('F: { unit: N, column: force }', 'F: { unit: N, column: force, interpolate: holds }'),
    key: 'inputs.F.interpolate', line: 7, words: ['"holds"', '"hold"'],
  },
  {
    name: 'delay that names a state',
    text: spring('F: { unit: N, column: force }', 'F: { unit: N, column: force, delay: x }'),
    key: 'inputs.F.delay', words: ['delay of F', 'state x'],
  },
  {
    name: 'hostile: YAML nested deeper than the parser can follow',
    text: spring('m: { fixed: 2.5, unit: kg }', `m: ${'['.repeat(5000)}${']'.repeat(5000)}`),
    line: 9, words: ['nested too deeply'],
  },
  {
    name: 'hostile: more states than the cap',
    text: `format: 1\nname: many\nstates:\n${Array.from({ length: 501 }, (_, i) => `  s${i}: {}`).join('\n')}\nparameters:\n  a: 1\n`,
    key: 'states', line: 4, words: ['more than 500 states'],
  },
  {
    name: 'model time_unit that is not a time',
    text: spring('name: spring-mass', 'name: spring-mass\ntime_unit: m'),
    key: 'time_unit', line: 3, words: ['time_unit "m" is not a unit of time'],
  },
  {
    name: 'experiment time_unit that is not a time',
    text: `${SPRING}    time_unit: kg\n`,
    key: 'experiments[0].time_unit', line: 21, words: ['"kg" is not a unit of time'],
  },
  {
    name: 'sigma must be above 0',
    text: spring('column: position }', 'column: position, sigma: 0 }'),
    key: 'outputs.pos.sigma', line: 17, words: ['sigma of pos must be above 0'],
  },
  {
    // IEEE 754 binary64: the smallest normal double is 2^-1022, so a sigma of 1e-200 has a square of 0.
    name: 'sigma whose square underflows',
    text: spring('column: position }', 'column: position, sigma: 1e-200 }'),
    key: 'outputs.pos.sigma', line: 17, words: ['sigma of pos is 1e-200', 'not a normal double', '1.5e-154 to 1.3e+154'],
  },
  {
    // IEEE 754 binary64: the largest double is about 1.8e308, so a sigma of 1e160 has an infinite square.
    name: 'sigma whose square overflows',
    text: spring('column: position }', 'column: position, sigma: 1e160 }'),
    key: 'outputs.pos.sigma', line: 17, words: ['sigma of pos is 1e+160', 'not a normal double'],
  },
  {
    name: 'window in reverse order',
    text: `${SPRING}    window: [5, 1]\n`,
    key: 'experiments[0].window', line: 21, words: ['from < to', '[5, 1]'],
  },
  {
    name: 'two experiments with the same name',
    text: `${SPRING}  - name: steps\n    file: other.csv\n`,
    key: 'experiments[1]', line: 21, words: ['two experiments are named "steps"', 'line 19'],
  },
  {
    name: 'experiment without a file',
    text: `${SPRING}  - name: second\n`,
    key: 'experiments[1]', line: 21, words: ['experiment 2 has no file'],
  },
  {
    name: 'output without expr whose name is not a state',
    text: spring('pos: { expr: x, unit: m, column: position }', 'pos: { unit: m, column: position }'),
    key: 'outputs.pos', line: 17, words: ['output pos has no expr', 'add expr'],
  },
  {
    name: 'negative delay',
    text: spring('F: { unit: N, column: force }', 'F: { unit: N, column: force, delay: -0.1 }'),
    key: 'inputs.F.delay', line: 7, words: ['number >= 0'],
  },
  {
    name: 'a delay parameter that may go negative',
    text: spring('F: { unit: N, column: force }', 'F: { unit: N, column: force, delay: c }').replace('c: { free: [0, 5], unit: N*s/m }', 'c: { free: [-1, 5], unit: s }').replace('c*v', '0*v'),
    key: 'parameters.c', line: 11, words: ['is a delay', 'cannot be negative'],
  },
  {
    name: 'initial value in an experiment of a static model',
    text: 'format: 1\nname: curve\nparameters:\n  a: { free: [0, 1] }\ninputs:\n  u: {}\noutputs:\n  y: { expr: a*u }\nexperiments:\n  - name: s\n    file: s.csv\n    initial: { y: 1 }\n',
    key: 'experiments[0].initial.y', line: 12, words: ['static model', 'no initial values'],
  },
  {
    name: 'experiment initial value for something that is not a state',
    text: `${SPRING}    initial: { xx: 0 }\n`,
    key: 'experiments[0].initial.xx', line: 21, words: ['"xx", which is not a state', '"x"'],
  },
  {
    name: 'experiment initial value that uses an input',
    text: `${SPRING}    initial: { x: F }\n`,
    key: 'experiments[0].initial.x', line: 21, words: ['initial value of x in experiment steps uses the input F'],
  },
  {
    name: 'set with a value that is not a number',
    text: `${SPRING}    set: { m: heavy }\n`,
    key: 'experiments[0].set.m', line: 21, words: ['value of m in experiment steps must be a number'],
  },
  {
    name: 'a required key is missing',
    text: spring('name: spring-mass\n', ''),
    key: 'name', line: 1, words: ['no name'],
  },
  {
    name: 'override naming an unknown parameter lists the nearest',
    text: SPRING,
    options: { overrides: { kk: 1 } },
    key: '--set kk=1', words: ['"kk"', 'not a parameter', '"k"'],
  },
  {
    name: 'override for an unknown experiment',
    text: SPRING,
    options: { overrides: { 'x0@step': 0.001 } },
    key: '--set x0@step=0.001', words: ['no experiment "step"', '"steps"'],
  },
];

function matches(p: Problem, c: Case): boolean {
  if (c.key !== undefined && p.where.key !== c.key) return false;
  if (c.line !== undefined && p.where.line !== c.line) return false;
  if (c.column !== undefined && p.where.column !== c.column) return false;
  const words = `${p.what} ${p.fix ?? ''}`;
  return c.words.every((w) => words.includes(w));
}

describe('broken and hostile model files', () => {
  it('has at least 25 cases', () => {
    expect(cases.length).toBeGreaterThanOrEqual(25);
  });

  it.each(cases.map((c) => [c.name, c] as const))('%s', (_name, c) => {
    const dir = tempDir();
    const { problems, message, file } = problemsOf(c.text, c.options, dir);
    const hit = problems.find((p) => matches(p, c));
    expect(hit, `no problem matched ${JSON.stringify({ key: c.key, line: c.line, column: c.column, words: c.words })}\n${message}`).toBeDefined();
    // Every problem says where (the file, or the --set pair) and how to mend it.
    for (const p of problems) {
      expect(p.where.file === file || p.where.key?.startsWith('--set')).toBe(true);
      expect(p.fix ?? '').not.toBe('');
    }
    // Nothing was written next to the model.
    expect(readdirSync(dir)).toEqual(['model.yaml']);
  });

  it('reports every problem in a file, not only the first', () => {
    const text = spring('equations:', 'equation:')
      .replace('m: { fixed: 2.5, unit: kg }', 'm: { fxied: 2.5, unit: kg }')
      .replace('c: { free: [0, 5]', 'c: { free: [5, 0]')
      .replace('- name: steps', '- name: ../up');
    const { problems } = problemsOf(text);
    const keys = problems.map((p) => p.where.key);
    expect(keys).toEqual(expect.arrayContaining(['equation', 'parameters.m.fxied', 'parameters.c.free', 'experiments[0].name', 'equations']));
  });

  it('lists at most 200 problems, then says how many more there are', () => {
    const text = spring('parameters:\n', `parameters:\n${Array.from({ length: 300 }, (_, i) => `  p${i}: { fixd: 1 }`).join('\n')}\n`);
    const { problems } = problemsOf(text);
    expect(problems).toHaveLength(201);
    expect(problems[200].what).toMatch(/^\.\.\. and \d+ more problems$/);
  });

  it('refuses an oversized file before parsing it', () => {
    const big = Buffer.alloc(1024 * 1024 + 10, '#');
    const { problems } = problemsOf(big);
    expect(problems).toHaveLength(1);
    expect(problems[0].what).toContain('limited to 1 MiB');
  });

  it('refuses a missing file and a non-UTF-8 file', () => {
    const { problems } = problemsOf(Buffer.from([0x66, 0x6f, 0xff, 0xfe, 0x0a]));
    expect(problems[0].what).toContain('not UTF-8');
    const missing = `${tempDir()}/nowhere.yaml`;
    expect(() => loadModel(missing)).toThrow(UserError);
    expect(() => loadModel(missing)).toThrow(/does not exist/);
  });

  it('refuses an empty file and a file that is not a map', () => {
    expect(problemsOf('').problems[0].what).toContain('empty');
    expect(problemsOf('- a\n- b\n').problems[0].what).toContain('must be a map');
  });
});
