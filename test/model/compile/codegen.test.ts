/**
 * Generated code against mathjs's own evaluation of the same checked trees (an independent
 * evaluator: the cross-check the compiler is built to agree with), plus the properties of the text
 * itself: round-trip numbers, parenthesised negatives, defines once, only what is needed.
 */
import { describe, expect, it } from 'vitest';
import { compileModel, numberLiteral } from '../../../src/model/compile/index.js';
import { UserError } from '../../../src/errors.js';
import { close, linearModel, makeModel, mathjsScope, mathjsValue, rng } from './helpers.js';

/** Every operator and function of the model language (model-format.md, Expressions). */
const EXPRESSIONS = [
  'x + y', 'x - y', 'x * y', 'x / y', 'x ^ a', '-x', '+x', '(x + y) * a', 'x - -y', '-(x - y)',
  'sin(x)', 'cos(x)', 'tan(x)', 'asin(x)', 'acos(x)', 'atan(x)', 'atan2(y - 0.5, x - 0.5)',
  'sinh(x)', 'cosh(x)', 'tanh(x)', 'exp(x)', 'log(x)', 'log10(x)', 'sqrt(x)', 'abs(x - 0.5)',
  'sign(x - 0.5)', 'min(x, y)', 'max(x, y, a)', 'pow(x, a)', 'hypot(x, y)', 'hypot(x, y, a)',
  'x < y', 'x <= y', 'x > y', 'x >= y', 'x == y', 'x != y', 'x == x', 'x < y ? x : y',
  'x - y ? 1 : 2', '(x > 0.5) * a + (x <= 0.5) * b', '2 ^ x', 'x ^ y ^ a', 'x ^ 2', 'x ^ 3',
  'x ^ -1', 'pi * x', 'e ^ x', 't * x', 'u * a', 'fr * 2', 'fr / (1 + fr)', '1e-300 * x', '-1.5e-7 * x - -2',
  '0.1 + 0.2 * x', '1 / 3 * x', 'x * 0', '0 * x + y', 'cosh(y) ^ 2 - sinh(y) ^ 2',
];

function bigModel() {
  return makeModel({
    states: { x: 'x0', y: '2 * a' },
    inputs: { u: {} },
    params: { a: 1.3, b: { free: [0, 5], start: 0.7 }, x0: 0.25 },
    defines: { fr: 'b * y + a * tanh(y / 0.2)' },
    equations: { x: 'u - a * x + fr', y: 'x * y - sin(t) * b' },
    outputs: Object.fromEntries(EXPRESSIONS.map((e, i) => [`o${i}`, e])),
    experiments: [{}, { initial: { x: 'a + x0 / 2' } }],
  });
}

describe('generated code equals mathjs evaluation of the same tree', () => {
  const model = bigModel();
  const cm = compileModel(model);
  const r = rng(12345);

  it('outputs: every operator and function, 200 random points (relative 1e-12)', () => {
    const y = new Float64Array(cm.nOutputs);
    let compared = 0;
    for (let trial = 0; trial < 200; trial++) {
      // Domain where every function is real (asin, acos, log, sqrt need it).
      const x = Float64Array.of(r(0.05, 0.95), r(0.05, 0.95));
      const u = Float64Array.of(r(-2, 2));
      const p = Float64Array.of(r(0.5, 2), r(0.5, 2), r(0.1, 1));
      const t = r(0, 10);
      cm.outputs(t, x, u, p, y);
      const scope = mathjsScope(model, t, x, u, p);
      model.outputs.forEach((o, i) => {
        const expected = mathjsValue(o.expr.node, scope);
        if (!close(y[i]!, expected, 1e-12, 1e-300)) {
          throw new Error(`${o.expr.text}: generated ${y[i]} vs mathjs ${expected} at x=${x}, p=${p}`);
        }
        compared++;
      });
    }
    expect(compared).toBe(200 * EXPRESSIONS.length);
  });

  it('rhs with a define and explicit time', () => {
    const dx = new Float64Array(2);
    for (let trial = 0; trial < 100; trial++) {
      const x = Float64Array.of(r(-3, 3), r(-3, 3));
      const u = Float64Array.of(r(-2, 2));
      const p = Float64Array.of(r(0.5, 2), r(0.5, 2), r(0.1, 1));
      const t = r(0, 10);
      cm.rhs(t, x, u, p, dx);
      const scope = mathjsScope(model, t, x, u, p);
      model.equations.forEach((e, i) => expect(close(dx[i]!, mathjsValue(e.expr.node, scope), 1e-13)).toBe(true));
    }
  });

  it('initial values per experiment, overrides applied, the states own for other indices', () => {
    const p = Float64Array.of(1.5, 0.3, 0.4);
    const x0 = new Float64Array(2);
    cm.initial(0, p, x0);
    expect([...x0]).toEqual([0.4, 3]);
    cm.initial(1, p, x0);
    expect([...x0]).toEqual([1.5 + 0.4 / 2, 3]);
    cm.initial(-1, p, x0);
    expect([...x0]).toEqual([0.4, 3]);
    // Experiment 0 has no override: it shares the function of the states' own values.
    expect(cm.source.initial.length).toBe(2);
  });

  it('defaultParams: fixed values and free starts in slot order', () => {
    expect([...cm.defaultParams()]).toEqual([1.3, 0.7, 0.25]);
    expect(cm.paramSlot.get('x0')).toBe(2);
  });
});

describe('the text of the generated code', () => {
  it('numbers are printed so that they read back to the same double', () => {
    const r = rng(7);
    const bits = new Float64Array(1);
    const words = new Uint32Array(bits.buffer);
    const values = [0.1, 1 / 3, -2.5e-300, 5e-324, -5e-324, 1.7976931348623157e308, -0, 0, 123456789012345680000, 2 ** -1074];
    for (let i = 0; i < 500; i++) {
      words[0] = Math.floor(r(0, 2 ** 32));
      words[1] = Math.floor(r(0, 2 ** 32));
      if (Number.isFinite(bits[0]!)) values.push(bits[0]!);
    }
    for (const v of values) {
      const back = new Function(`return ${numberLiteral(v)};`)() as number;
      expect(Object.is(back, v)).toBe(true);
      if (v < 0 || Object.is(v, -0)) expect(numberLiteral(v).startsWith('(-')).toBe(true);
    }
  });

  it('generated functions allocate nothing: no objects, arrays, closures or calls outside Math', () => {
    const cm = compileModel(bigModel());
    const sys = cm.sensitivity([0, 1, 2]);
    for (const src of [cm.source.rhs, cm.source.outputs, ...cm.source.initial, sys.source.rhs, sys.source.outputs, ...sys.source.initial]) {
      expect(src).not.toMatch(/\bnew\b|\{|=>|\bfunction\b|\.\.\./);
      // Every '[' is an indexed read or write of one of our arrays.
      expect(src.replace(/\b(x|u|p|z|udot|dx|dz|y|dy|x0|z0)\[\d+\]/g, '')).not.toContain('[');
      // Every call is to Math.
      expect(src.replace(/Math\.[a-z0-9]+\(/g, '')).not.toMatch(/[A-Za-z0-9_$]\(/);
    }
  });

  it('negative constants are parenthesised (x - (-1.5) must not become x--1.5)', () => {
    const cm = compileModel(makeModel({ states: { x: 0 }, params: { k: 1 }, equations: { x: 'x - (-1.5) * k' } }));
    expect(cm.source.rhs).toContain('(-1.5)');
    const dx = new Float64Array(1);
    cm.rhs(0, Float64Array.of(2), new Float64Array(0), Float64Array.of(2), dx);
    expect(dx[0]).toBe(5);
  });

  it('a define used three times is computed once; a define not needed is not computed', () => {
    const model = makeModel({
      states: { i: 0, w: 0 },
      inputs: { V: {} },
      params: { R: 1.92, J: 3.1e-3, L: 2e-3, K: 0.05, b: 1e-3, Tc: 0.02, ws: 0.5 },
      defines: { tf: 'b*w + Tc*tanh(w/ws)', unused_in_rhs: 'exp(w)' },
      equations: { i: '(V - R*i - K*w) / L', w: '(K*i - tf) / J + 0 * tf * tf' },
      outputs: { friction: 'tf + unused_in_rhs' },
    });
    const cm = compileModel(model);
    expect(cm.source.rhs.match(/Math\.tanh/g)?.length).toBe(1);
    expect(cm.source.rhs).not.toContain('Math.exp');
    expect(cm.source.outputs).toContain('Math.exp');
  });

  it('a 4-state linear model becomes trivial code: reads, products, sums, writes', () => {
    const cm = compileModel(linearModel());
    const body = cm.source.rhs;
    expect(body).not.toMatch(/Math\.|\?|function|=>/);
    const lines = body.split('\n').filter((l) => l !== '"use strict";');
    // Only locals, array reads and the four arithmetic operators.
    for (const l of lines) expect(l).toMatch(/^(const v\d+=|dx\[\d\]=)[-+*/()v0-9xup\[\]]+;$/);
    // One local per array read (4 states, 1 input, 6 parameters), one write per state, and a local
    // only for the two differences used twice, x2 - x1 and v2 - v1 (each spring/damper force).
    const reads = lines.filter((l) => /^const v\d+=(x|u|p)\[\d+\];$/.test(l)).length;
    expect(reads).toBe(11);
    expect(lines.filter((l) => l.startsWith('dx[')).length).toBe(4);
    expect(lines.length).toBe(reads + 4 + 2);
  });

  it('a model with structural facts reports which inputs, states and parameters each function reads', () => {
    const cm = compileModel(
      makeModel({
        states: { x: 'x0', v: 0 },
        inputs: { F: { delay: 'td' }, G: { delay: 0.1 }, H: {} },
        params: { m: 2, k: 3, x0: 1, td: 0.01 },
        equations: { x: 'v', v: '(F - k*x) / m' },
        outputs: { pos: 'x + H' },
      }),
    );
    expect(cm.structure.rhsInputs).toEqual([0]);
    expect(cm.structure.outputInputs).toEqual([2]);
    expect(cm.structure.outputStates).toEqual([0]);
    expect(cm.structure.rhsParams).toEqual([0, 1]);
    expect(cm.structure.initialParams).toEqual([2]);
    expect(cm.structure.rhsReadsTime).toBe(false);
    expect(cm.structure.delayParamSlot).toEqual([3, -1, -1]);
    expect(cm.structure.delayValue).toEqual([NaN, 0.1, 0]);
  });
});

describe('what the compiler refuses (the loader should have already)', () => {
  const base = { states: { x: 0 }, params: { a: 1 } };
  const refuse = (equation: string, pattern: RegExp) => {
    try {
      compileModel(makeModel({ ...base, equations: { x: equation } }));
    } catch (err) {
      expect(err).toBeInstanceOf(UserError);
      const problem = (err as UserError).problems[0]!;
      expect(problem.where.key).toBe('equations.x');
      expect(problem.what).toMatch(pattern);
      return;
    }
    throw new Error(`compiled: ${equation}`);
  };
  it('unknown names, functions, node types, strings and arities', () => {
    refuse('a * q', /unknown name "q"/);
    refuse('evaluate(a)', /function "evaluate"/);
    refuse('a.b', /not part of the model language/);
    refuse('a.sin(x)', /computed function call/);
    refuse('Math.sin(x)', /computed function call/);
    refuse('[1, 2]', /ArrayNode/);
    refuse('"text"', /constant of type string/);
    refuse('f(x) = 1', /FunctionAssignmentNode/);
    refuse('sin(x, a)', /sin\(\) called with 2 arguments/);
    // The compiler's arities are the checker's (one registry): no one-argument min, max or hypot
    // and no log(x, base) behind the checker's back.
    refuse('min(x)', /min\(\) called with 1 argument in/);
    refuse('hypot(a)', /hypot\(\) called with 1 argument in/);
    refuse('log(x, 2)', /log\(\) called with 2 arguments/);
    refuse('x and a', /operator "and"/);
    refuse('x!', /operator "!"/);
  });
  it('initial values that read a state, directly or through a define', () => {
    expect(() => compileModel(makeModel({ states: { x: 'x', y: 0 }, params: { a: 1 }, equations: { x: '1', y: '1' } }))).toThrow(
      /cannot use the state "x"/,
    );
    expect(() =>
      compileModel(makeModel({ states: { x: 'd', y: 0 }, params: { a: 1 }, defines: { d: 'y * a' }, equations: { x: '1', y: '1' } })),
    ).toThrow(/depends on a state, an input or time/);
  });
  it('a model too large to compile is a UserError, also when only its sensitivity system is too large', () => {
    expect(() => compileModel(bigModel(), { maxNodes: 50 })).toThrow(/too large to compile/);
    const cm = compileModel(linearModel(), { maxNodes: 150 });
    expect(() => cm.sensitivity([0, 1, 2, 3, 4, 5])).toThrow(UserError);
  });

  it('a define that uses a later define', () => {
    expect(() => compileModel(makeModel({ ...base, defines: { d1: 'd2', d2: 'a' }, equations: { x: 'd1' } }))).toThrow(/used before/);
  });
});
