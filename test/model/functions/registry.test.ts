/**
 * The registry of expression functions, entry by entry: what adding a function must satisfy.
 * Every entry is held to
 * - central finite differences of its own generated code (derivative rule, at sample points away
 *   from kinks; a central difference has error O(h^2), any numerical analysis text),
 * - mathjs's evaluation of the same call (an independent evaluator) for its code, and its own
 *   `evaluate` (constant folding) against that code, bit for bit,
 * - its unit rule on dimensioned arguments (model-format.md, Units: arguments that must be plain
 *   numbers, arguments that must agree; dimensions of the SI brochure, BIPM 9th edition),
 * - the README's table of functions, which must list exactly the registry's entries and docs.
 */
import { readFileSync } from 'node:fs';
import { parse } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { compileModel } from '../../../src/model/compile/index.js';
import { FUNCTIONS, FUNCTION_NAMES, type FunctionEntry, type FunctionName } from '../../../src/model/functions/registry.js';
import { agree, inferQuantity, isPlain, quantityOf, type Quantity } from '../../../src/units/dimensions.js';
import { close, makeModel } from '../compile/helpers.js';

/**
 * Argument lists inside each function's domain and away from its kinks (abs and sign away from 0,
 * min and max with distinct arguments, hypot away from the origin). A new function needs a line.
 */
const SAMPLES: Record<FunctionName, number[][]> = {
  sin: [[0.3], [-2.1]], cos: [[0.3], [-2.1]], tan: [[0.3], [-1.2]],
  asin: [[0.4], [-0.7]], acos: [[0.4], [-0.7]], atan: [[0.4], [-3]],
  sinh: [[0.5], [-1.5]], cosh: [[0.5], [-1.5]], tanh: [[0.5], [-1.5]],
  exp: [[0.5], [-1.5]], log: [[0.5], [3]], log10: [[0.5], [3]], sqrt: [[0.5], [3]],
  abs: [[0.7], [-1.3]], sign: [[0.7], [-1.3]],
  atan2: [[1, 2], [-0.5, -1.5], [2, -0.3]], pow: [[1.5, 2.5], [0.7, -1.2], [2, 0.5]],
  min: [[1, 2], [2, 1], [3, 1, 2], [1, 3, 0.5, 2]], max: [[1, 2], [2, 1], [3, 1, 2], [1, 3, 0.5, 2]],
  hypot: [[3, 4], [-1, 2], [1, -2, 0.5]],
};
const PARAMS = ['a', 'b', 'c', 'd'];

/** The generated value and gradient of `name(a, b, ...)` at `point`, and the model's plain outputs. */
function compiledCall(name: string, point: number[]) {
  const params = PARAMS.slice(0, point.length);
  const cm = compileModel(makeModel({ params: Object.fromEntries(params.map((p) => [p, 0])), outputs: { y: `${name}(${params.join(', ')})` } }));
  const slots = params.map((_, i) => i);
  const sys = cm.sensitivity(slots);
  const none = new Float64Array(0);
  const value = (p: number[]) => {
    const y = new Float64Array(1);
    cm.outputs(0, none, none, Float64Array.from(p), y);
    return y[0]!;
  };
  const y = new Float64Array(1);
  const dy = new Float64Array(point.length);
  sys.outputs(0, none, none, none, Float64Array.from(point), y, dy);
  return { value, y: y[0]!, gradient: [...dy] };
}

describe('every registry entry', () => {
  it('has sample points here', () => {
    expect(Object.keys(SAMPLES).sort()).toEqual([...FUNCTION_NAMES].sort());
  });

  for (const name of FUNCTION_NAMES) {
    const entry = FUNCTIONS[name];
    it(`${name}: derivative rule against central finite differences`, () => {
      for (const point of SAMPLES[name]) {
        expect(point.length).toBeGreaterThanOrEqual(entry.arity[0]);
        expect(point.length).toBeLessThanOrEqual(entry.arity[1]);
        const { value, gradient } = compiledCall(name, point);
        point.forEach((x, i) => {
          const h = 1e-6 * Math.max(Math.abs(x), 1);
          const shifted = (s: number) => value(point.map((v, j) => (j === i ? v + s * h : v)));
          const fd = (shifted(1) - shifted(-1)) / (2 * h);
          if (!close(gradient[i]!, fd, 1e-7, 1e-8)) throw new Error(`${name}(${point}): d/d arg ${i} is ${gradient[i]}, finite difference ${fd}`);
        });
      }
    });

    it(`${name}: generated code equals mathjs evaluation, and its constant folding equals the code`, () => {
      for (const point of SAMPLES[name]) {
        const { y } = compiledCall(name, point);
        const scope = new Map(point.map((v, i) => [PARAMS[i]!, v]));
        expect(close(y, parse(`${name}(${PARAMS.slice(0, point.length).join(', ')})`).evaluate(scope) as number, 1e-14, 0)).toBe(true);
        // All arguments constant: the compiler folds the call with `evaluate`, and writes a literal.
        const folded = compileModel(makeModel({ outputs: { y: `${name}(${point.join(', ')})` } }));
        const out = new Float64Array(1);
        folded.outputs(0, new Float64Array(0), new Float64Array(0), new Float64Array(0), out);
        expect(folded.source.outputs).not.toMatch(/Math\./);
        expect(out[0]).toBe(entry.evaluate(...point));
        expect(out[0]).toBe(y);
      }
    });

    it(`${name}: unit rule on dimensioned arguments`, () => checkUnitRule(name, entry));
  }
});

const UNITS: Record<string, string> = { L: 'm', L2: 'm', mm: 'mm', M: 'kg', A: 'm^2', th: 'rad', x: '', T: 'degC' };

function infer(text: string) {
  const reports: string[] = [];
  const result = inferQuantity(parse(text), (n) => (n in UNITS ? quantityOf(UNITS[n]!) : undefined), (what) => reports.push(what));
  return { result, reports };
}

function call(name: string, args: string[]): string {
  return `${name}(${args.join(', ')})`;
}

function sameUnit(q: Quantity | undefined, unit: string): boolean {
  return q !== undefined && agree(q, quantityOf(unit)!).ok;
}

function checkUnitRule(name: FunctionName, entry: FunctionEntry): void {
  const n = entry.arity[0];
  const rule = entry.units;
  if (rule.args === 'plain') {
    const refused = infer(call(name, ['L', ...Array(n - 1).fill('x')]));
    expect(refused.reports).toHaveLength(1);
    expect(refused.reports[0]).toContain(`the argument of ${name}, L, must be a plain number`);
    expect(refused.reports[0]!.includes('or an angle in rad')).toBe(rule.angle === true);
    for (const plain of ['x', 'th']) {
      const accepted = infer(call(name, [plain]));
      expect(accepted.reports).toEqual([]);
      expect(isPlain(accepted.result!)).toBe(true);
    }
    return;
  }
  if (rule.args === 'power') {
    const squared = infer(call(name, ['L', '2']));
    expect(squared.reports).toEqual([]);
    expect(sameUnit(squared.result, 'm^2')).toBe(true);
    expect(infer(call(name, ['L', 'x'])).reports[0]).toContain('can only be raised to a constant power');
    expect(infer(call(name, ['x', 'L'])).reports[0]).toContain('must be a plain number');
    return;
  }
  // Arguments that must agree: all in m is accepted, m with kg or with mm refused.
  const inMetres = infer(call(name, ['L', ...Array(n - 1).fill('L2')]));
  expect(inMetres.reports).toEqual([]);
  if (n >= 2) {
    expect(infer(call(name, ['L', ...Array(n - 1).fill('M')])).reports[0]).toContain(`the arguments of ${name} must have the same unit`);
    expect(infer(call(name, ['L', ...Array(n - 1).fill('mm')])).reports[0]).toContain('differ by a factor 1000');
  } else {
    expect(infer(call(name, ['M'])).reports).toEqual([]);
  }
  const onOffsetScale = infer(call(name, Array(n).fill('T'))).result;
  switch (rule.result) {
    case 'plain':
      expect(isPlain(inMetres.result!)).toBe(true);
      break;
    case 'same':
      expect(sameUnit(inMetres.result, 'm')).toBe(true);
      expect(onOffsetScale?.offsetUnit).toBe('degC');
      break;
    case 'magnitude':
      expect(sameUnit(inMetres.result, 'm')).toBe(true);
      expect(onOffsetScale?.offsetUnit).toBeUndefined();
      expect(sameUnit(onOffsetScale, 'K')).toBe(true);
      break;
    case 'root':
      expect(sameUnit(infer(call(name, ['A'])).result, 'm')).toBe(true);
      break;
  }
}

describe("the README's table of functions", () => {
  it('lists exactly the registry, in its order, with each entry\'s arguments and doc', () => {
    const readme = readFileSync(new URL('../../../README.md', import.meta.url), 'utf8');
    const header = '| Function | Arguments | What it gives |';
    const start = readme.indexOf(header);
    expect(start).toBeGreaterThan(0);
    const rows = readme.slice(start).split('\n').slice(2);
    const table = rows.slice(0, rows.findIndex((r) => !r.startsWith('|')));
    const count = ([min, max]: readonly [number, number]) => (min === max ? `${min}` : max === Infinity ? `${min} or more` : `${min} to ${max}`);
    expect(table).toEqual(FUNCTION_NAMES.map((f) => `| \`${f}\` | ${count(FUNCTIONS[f].arity)} | ${FUNCTIONS[f].doc} |`));
  });
});
