/**
 * Acceptance: the table of hostile input classes (a model file or a log is untrusted) and what
 * rigcal must do with each, through the command line:
 *   1. control characters from the input never reach the terminal raw, in any place text from the
 *      input is printed (check's summary, fit's tables, error messages);
 *   2. every pattern applied to input runs in linear time (a 400 kB cell is answered in under 1 s);
 *   3. unit text composed through a chain of defines stays bounded;
 *   4. a sigma or a logged value whose square is not a normal double is refused with its key or line;
 *   5. a file with several YAML documents is told what is wrong in the file.
 * The terminal sequences are those of ECMA-48 (ESC, BEL, CSI 7-bit and 8-bit, OSC), the OSC 52
 * clipboard write of xterm's control sequences, the C1 controls U+0080-U+009F and the bidi override
 * U+202E of Unicode UAX #9.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cli, normal, removeTempDirs, springStepResponse, tempDir } from './helpers/rig-kit.js';

afterAll(removeTempDirs);

/** Characters that act on a terminal instead of being shown (C0 but line feed, DEL, C1, bidi, separators). */
const ACTS_ON_TERMINAL = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028-\u202e\u2066-\u2069]/;

const HOSTILE: { name: string; text: string; shownAs: string }[] = [
  { name: 'ESC clear-screen', text: 'a\u001b[2Jb', shownAs: '\\u001b[2J' },
  { name: 'BEL', text: 'a\u0007b', shownAs: '\\u0007' },
  { name: 'CSI hidden text', text: 'a\u001b[8mhidden\u001b[0m', shownAs: '\\u001b[8m' },
  { name: 'OSC 52 clipboard write', text: 'a\u001b]52;c;cm0gLXJmIH4=\u0007', shownAs: '\\u001b]52;c;' },
  { name: 'C1 CSI (U+009B)', text: 'a\u009b2J', shownAs: '\\u009b2J' },
  { name: 'C1 NEL and OSC (U+0085, U+009D)', text: 'a\u0085\u009d0;x', shownAs: '\\u0085\\u009d' },
  { name: 'bidi override (U+202E)', text: 'a\u202etxt.exe', shownAs: '\\u202etxt.exe' },
];

/** A YAML double-quoted string holding `text` exactly (every character outside printable ASCII escaped). */
const yamlQuoted = (text: string) =>
  `"${[...text].map((c) => (c === '"' || c === '\\' ? `\\${c}` : c < ' ' || c > '~' ? `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}` : c)).join('')}"`;

interface Place {
  name: string;
  /** The model file and the log, with the hostile text in this place. */
  files: (h: string) => { model: string; csv: string; logName?: string };
}

// A spring, a damper and a mass of our own, driven by a logged force (as in hostile-cli.test.ts).
const model = (o: { description?: string; units?: string; stateUnit?: string; paramUnit?: string; outputUnit?: string; column?: string; inputColumn?: string; file?: string; experiment?: string }) => `format: 1
name: hostile-table
${o.description ? `description: ${o.description}\n` : ''}${o.units ? `units: ${o.units}\n` : ''}states:
  x: { unit: ${o.stateUnit ?? 'm'}, initial: 0 }
  v: { unit: m/s, initial: 0 }
inputs:
  F: { unit: N, column: ${o.inputColumn ?? 'force'} }
parameters:
  m: { fixed: 1, unit: kg }
  k: { free: [1, 100], start: 10, unit: ${o.paramUnit ?? 'N/m'} }
  c: { free: [0.01, 10], start: 0.5, unit: N*s/m }
equations:
  x: v
  v: (F - k*x - c*v)/m
outputs:
  pos: { expr: x, unit: ${o.outputUnit ?? 'm'}, column: ${o.column ?? 'pos'} }
experiments:
  - name: ${o.experiment ?? 'run1'}
    file: ${o.file ?? 'data.csv'}
`;

/** A log of the spring (k = 20 N/m, c = 1 N*s/m) by the reference RK4, with the given header. */
function log(forceColumn = 'force', posColumn = 'pos'): string {
  const { t, force, position } = springStepResponse();
  const e = normal(11);
  const rows = [`t,${forceColumn},${posColumn}`];
  for (let i = 0; i < t.length; i++) rows.push(`${t[i].toFixed(2)},${force[i]},${(position[i] + 5e-5 * e()).toFixed(7)}`);
  return `${rows.join('\n')}\n`;
}

const PLACES: Place[] = [
  { name: 'description', files: (h) => ({ model: model({ description: yamlQuoted(h) }), csv: log() }) },
  { name: 'state unit with units: off', files: (h) => ({ model: model({ units: 'off', stateUnit: yamlQuoted(h) }), csv: log() }) },
  { name: 'parameter unit with units: off', files: (h) => ({ model: model({ units: 'off', paramUnit: yamlQuoted(h) }), csv: log() }) },
  { name: 'output unit with units: off', files: (h) => ({ model: model({ units: 'off', outputUnit: yamlQuoted(h) }), csv: log() }) },
  { name: 'output column name (model and log header)', files: (h) => ({ model: model({ column: yamlQuoted(`pos${h}`) }), csv: log('force', `pos${h}`) }) },
  { name: 'input column name (model and log header)', files: (h) => ({ model: model({ inputColumn: yamlQuoted(`force${h}`) }), csv: log(`force${h}`) }) },
  { name: 'experiment file path', files: (h) => ({ model: model({ file: yamlQuoted(`log${h}.csv`) }), csv: log(), logName: `log${h}.csv` }) },
  { name: 'experiment name (refused: an error message)', files: (h) => ({ model: model({ experiment: yamlQuoted(`run${h}`) }), csv: log() }) },
];

function writeCase(dir: string, place: Place, h: string): void {
  mkdirSync(dir);
  const f = place.files(h);
  writeFileSync(join(dir, 'model.yaml'), f.model);
  writeFileSync(join(dir, f.logName ?? 'data.csv'), f.csv);
}

describe('1. control characters from the input are escaped wherever `check` prints them', () => {
  const root = tempDir('hostile-table');
  const cases = PLACES.flatMap((p) => HOSTILE.map((h) => [`${p.name}: ${h.name}`, p, h] as const));
  it.each(cases)('%s', async (label, place, h) => {
    const dir = join(root, `check-${cases.findIndex((c) => c[0] === label)}`);
    writeCase(dir, place, h.text);
    const run = await cli(['check', 'model.yaml'], dir);
    const shown = run.out + run.err;
    expect(run.code === 0 || run.code === 2, shown.slice(0, 2000)).toBe(true);
    expect(shown).not.toMatch(ACTS_ON_TERMINAL);
    expect(shown).toContain(h.shownAs);
  }, 30_000);
});

describe('1. control characters in units reach `fit`\'s tables escaped', () => {
  const root = tempDir('hostile-fit');
  const fitPlaces = PLACES.filter((p) => p.name.startsWith('parameter unit') || p.name.startsWith('output unit'));
  const cases = fitPlaces.flatMap((p) => HOSTILE.slice(0, 4).concat(HOSTILE.slice(6)).map((h) => [`${p.name}: ${h.name}`, p, h] as const));
  it.each(cases)('%s', async (label, place, h) => {
    const dir = join(root, `fit-${cases.findIndex((c) => c[0] === label)}`);
    writeCase(dir, place, h.text);
    const run = await cli(['fit', 'model.yaml', '-o', 'results'], dir);
    expect(run.code, run.err.slice(0, 2000)).toBe(0);
    expect(run.out).toMatch(/^parameter\s+estimate/m);
    expect(run.out + run.err).not.toMatch(ACTS_ON_TERMINAL);
    expect(run.out).toContain(h.shownAs);
  }, 60_000);
});

/** The log with data row `row` (0-based, after the header) replaced by `text`. */
const withRow = (row: number, text: string) => log().split('\n').map((l, i) => (i === row + 1 ? text : l)).join('\n');

describe('2. a 400 kB cell is answered in under 1 s with its line (every pattern on input is linear)', () => {
  const root = tempDir('hostile-cells');
  const digits = '7'.repeat(400_000);
  // The first run of the CLI in a process loads the model language and the unit library: not the cell's time.
  beforeAll(async () => {
    const dir = join(root, 'warm-up');
    mkdirSync(dir);
    writeFileSync(join(dir, 'model.yaml'), model({}));
    writeFileSync(join(dir, 'data.csv'), log());
    expect((await cli(['check', 'model.yaml'], dir)).code).toBe(0);
  }, 30_000);
  const cells: [string, string, RegExp][] = [
    ['digits and a letter in an output column', `0.40,0,${digits}x`, /data\.csv:22.*"pos".*not a number/],
    ['digits, a point, digits and a dangling exponent', `0.40,0,${digits}.${digits}e`, /data\.csv:22.*not a number/],
    ['a 400 kB number (not finite)', `0.40,0,${digits}`, /data\.csv:22.*not a number/],
    ['digits and a letter in the time column', `${digits}x,0,0`, /data\.csv:22.*time/],
    ['digits and a letter in an input column', `0.40,${digits}x,0`, /data\.csv:22.*force/],
  ];
  it.each(cells)('%s', async (_label, row, message) => {
    const dir = join(root, `cell-${cells.findIndex((c) => c[1] === row)}`);
    mkdirSync(dir);
    writeFileSync(join(dir, 'model.yaml'), model({}));
    writeFileSync(join(dir, 'data.csv'), withRow(20, row));
    const run = await cli(['check', 'model.yaml'], dir);
    expect(run.code, run.err.slice(0, 2000)).toBe(2);
    expect(run.err).toMatch(message);
    expect(run.err.length).toBeLessThan(4000);
    // Common practice, no source: a check answers at once; the quadratic pattern took 40 s on 200 kB.
    expect(run.seconds).toBeLessThan(1);
  }, 30_000);
});

describe('4. a sigma or a logged value whose square is not a normal double: exit 2 with its key or line (IEEE 754 binary64)', () => {
  const root = tempDir('hostile-squares');
  const cases: [string, string, string, RegExp][] = [
    ['sigma: 1e-200 (square underflows to 0)', model({}).replace('column: pos }', 'column: pos, sigma: 1e-200 }'), log(), /model\.yaml:\d+:\d+ \(outputs\.pos\.sigma\): sigma of pos is 1e-200/],
    ['sigma: 1e200 (square overflows)', model({}).replace('column: pos }', 'column: pos, sigma: 1e200 }'), log(), /\(outputs\.pos\.sigma\): sigma of pos is 1e\+200/],
    ['an output value of 1e308', model({}), withRow(40, '0.80,1,1e308'), /data\.csv:42: output pos: column "pos" has 1e308, whose square overflows/],
    ['an output value of -2e154', model({}), withRow(40, '0.80,1,-2e154'), /data\.csv:42: output pos: .*square overflows/],
    ['an input value of 1e200', model({}), withRow(40, '0.80,1e200,0'), /data\.csv:42: input F: column "force" has 1e200, whose square overflows/],
  ];
  it.each(cases)('%s', async (label, modelText, csv, message) => {
    const dir = join(root, `case-${cases.findIndex((c) => c[0] === label)}`);
    mkdirSync(dir);
    writeFileSync(join(dir, 'model.yaml'), modelText);
    writeFileSync(join(dir, 'data.csv'), csv);
    for (const verb of ['check', 'fit']) {
      const run = await cli([verb, 'model.yaml', ...(verb === 'fit' ? ['-o', 'results'] : [])], dir);
      expect(run.code, run.err.slice(0, 2000)).toBe(2);
      expect(run.err).toMatch(message);
      expect(run.err).not.toMatch(/internal error|\n\s+at /);
    }
  }, 30_000);
});

describe('3. unit text composed through a chain of defines stays bounded', () => {
  const root = tempDir('hostile-defines');
  // d1 = x*x, d(i) = d(i-1)*d(i-1): the composed unit text doubles at every link (2^28 factors of m).
  const chain = `define:\n  d1: x*x\n${Array.from({ length: 27 }, (_, i) => `  d${i + 2}: d${i + 1}*d${i + 1}\n`).join('')}`;
  it('28 defines: check answers at once, the mismatch names the key and shows the SI form', async () => {
    const dir = join(root, 'chain');
    mkdirSync(dir);
    writeFileSync(join(dir, 'model.yaml'), model({}).replace('equations:', `${chain}equations:`).replace('expr: x,', 'expr: x + d28,'));
    writeFileSync(join(dir, 'data.csv'), log());
    const run = await cli(['check', 'model.yaml'], dir);
    expect(run.code, run.err.slice(0, 2000)).toBe(2);
    // 2^28 = 268435456 (the exponent of m after 28 squarings).
    expect(run.err).toMatch(/model\.yaml:\d+:\d+ \(outputs\.pos\.expr\): .*d28 is m\^268435456; the dimensions differ/);
    expect(run.err.length).toBeLessThan(4000);
    expect(run.seconds).toBeLessThan(10);
  }, 30_000);
});
