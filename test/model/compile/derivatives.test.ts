/**
 * Symbolic derivatives against central finite differences, and the one-sided rules for the
 * non-smooth functions (model-format.md, Expressions: d abs(x) = sign(x) dx, d sign(x) = 0).
 *
 * The finite-difference check is generic: for random z = [x, S] (S zero where the compiler says it
 * is structurally zero) and random udot, every column k of the generated sensitivity right-hand
 * side must equal the directional derivative of the plain right-hand side along
 * (dx = S[:,k], dp = e_slot(k), du_j = -udot_j for the inputs delayed by slot k).
 */
import { derivative, parse } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { compileModel } from '../../../src/model/compile/index.js';
import { fdCheck } from './fd-check.js';
import { flywheel, linearModel, makeModel } from './helpers.js';

/** Every smooth function and operator, each as an output of a static model. */
const SMOOTH = [
  'a + b', 'a - b', 'a * b', 'a / b', '-a * b', 'a ^ 3', 'a ^ b', 'b ^ a', '2 ^ a', 'a ^ -1.5', 'pow(a, b)',
  'sin(a*b)', 'cos(a*b)', 'tan(a)', 'asin(a / 3)', 'acos(a / 3)', 'atan(a*b)', 'atan2(a, b - 1)',
  'sinh(a)', 'cosh(a)', 'tanh(a*b)', 'exp(a*b)', 'log(a*b)', 'log10(a*b)', 'log(a) / log(b)', 'sqrt(a*b)',
  'hypot(a, b)', 'hypot(a, b, 2)', 'a * u', 'a ^ a', 'sin(a) ^ 2 + cos(b) ^ 2', 'exp(-a * t)',
];

describe('derivatives against central finite differences', () => {
  it('every smooth function and operator (static model, two parameters and an input)', () => {
    const model = makeModel({
      inputs: { u: {} },
      params: { a: 1, b: 2 },
      outputs: Object.fromEntries(SMOOTH.map((e, i) => [`o${i}`, e])),
    });
    fdCheck(compileModel(model), [0, 1], { x: [0, 0], u: [-1, 1], p: () => [0.6, 2.5] }, 1);
  });

  it('non-smooth functions away from their kinks', () => {
    const model = makeModel({
      params: { a: 1, b: 2 },
      outputs: {
        o1: 'abs(a - 1.5) * b',
        o2: 'sign(a - 1.5) * b',
        o3: 'min(a, b) * a',
        o4: 'max(a, 2 * b, 3) + min(a*b, 4, b)',
        o5: 'a > b ? a ^ 2 : b * a',
        o6: '(a < b) * a + (a >= b) * b ^ 2',
        o7: 'a != b ? sqrt(a) : 0',
      },
    });
    fdCheck(compileModel(model), [0, 1], { x: [0, 0], u: [0, 0], p: () => [0.5, 3] }, 2);
  });

  it('the flywheel model of the spec example: defines, per-experiment initial values, fixed slots skipped', () => {
    const model = flywheel();
    const cm = compileModel(model);
    const free = model.parameters.flatMap((p, i) => (p.kind === 'free' ? [i] : []));
    fdCheck(cm, free, { x: [-20, 20], u: [0, 12], p: (i) => (i === 0 ? [1.5, 2.5] : i === 1 ? [2e-3, 4e-3] : [0.01, 0.1]) }, 3);
    // Only some slots, in a different order.
    fdCheck(cm, [5, 3], { x: [-20, 20], u: [0, 12], p: () => [0.01, 0.1] }, 4);
  });

  it('a delayed input: the delay column carries (df/du)(-udot)', () => {
    const model = makeModel({
      states: { x: 0, v: 'v0' },
      inputs: { F: { delay: 'td' }, G: { delay: 'td' }, H: { delay: 0.2 } },
      params: { m: 2, k: 3, td: 0.05, v0: 1 },
      equations: { x: 'v', v: '(F * G - k * x + H) / m' },
      outputs: { pos: 'x + 0.1 * F', force: 'k * x' },
      experiments: [{ initial: { x: 'v0 ^ 2' } }],
    });
    const cm = compileModel(model);
    const sys = cm.sensitivity([2, 1, 3]);
    expect(sys.delayOfInput).toEqual([0, -1, -1]);
    expect(sys.inputsDelayedBy).toEqual([[0, 1], [], []]);
    fdCheck(cm, [2, 1, 3], { x: [-1, 1], u: [-1, 1], p: () => [0.5, 2] }, 5);
  });

  it('the 4-state linear model, all parameters', () => {
    fdCheck(compileModel(linearModel()), [0, 1, 2, 3, 4, 5], { x: [-1, 1], u: [-1, 1], p: () => [0.5, 20] }, 6);
  });
});

/** Value and derivative of a one-parameter output at a point, from the generated code. */
function slope(text: string, a: number, b = 0): { value: number; da: number; db: number } {
  const cm = compileModel(makeModel({ params: { a: 0, b: 0 }, outputs: { y: text } }));
  const sys = cm.sensitivity([0, 1]);
  const y = new Float64Array(1);
  const dy = new Float64Array(2);
  sys.outputs(0, new Float64Array(0), new Float64Array(0), new Float64Array(0), Float64Array.of(a, b), y, dy);
  return { value: y[0]!, da: dy[0]!, db: dy[1]! };
}

describe('why some rules are ours: what mathjs derivative (15.2) does with them', () => {
  it('has no rule for sign, min, max, atan2, hypot, comparisons or the conditional', () => {
    for (const text of ['sign(a)', 'min(a, b)', 'max(a, b)', 'atan2(a, b)', 'hypot(a, b)', 'a < b', 'a > 1 ? a : 2']) {
      expect(() => derivative(parse(text), 'a', { simplify: false }), text).toThrow();
    }
  });
  it('writes abs(a)/a for abs and a^b (da b/a + db log a) for a variable exponent: NaN at a = 0', () => {
    expect(derivative(parse('abs(a)'), 'a', { simplify: false }).evaluate({ a: 0 })).toBeNaN();
    expect(derivative(parse('a ^ b'), 'b', { simplify: false }).evaluate({ a: 0, b: 2 })).toBeNaN();
  });
});

describe('one-sided rules at the kinks (model-format.md, Expressions)', () => {
  it('d abs(a) = sign(a) da, so 0 at a = 0 where mathjs derivative gives NaN', () => {
    expect(slope('abs(a)', 2).da).toBe(1);
    expect(slope('abs(a)', -2).da).toBe(-1);
    expect(slope('abs(a)', 0).da).toBe(0);
    expect(slope('abs(3 * a)', -1).da).toBe(-3);
    // Why the rule is ours: mathjs writes abs(a)/a.
    expect(derivative(parse('abs(a)'), 'a', { simplify: false }).evaluate({ a: 0 })).toBeNaN();
  });

  it('d sign(a) = 0 everywhere, 0 included (mathjs has no rule)', () => {
    for (const a of [-1, 0, 1]) expect(slope('sign(a) * 5', a).da).toBe(0);
    expect(() => derivative(parse('sign(a)'), 'a')).toThrow();
  });

  it('min and max take the derivative of the selected argument, the first one on ties', () => {
    expect(slope('min(2 * a, 3 * b)', 1, 1)).toMatchObject({ value: 2, da: 2, db: 0 });
    expect(slope('min(2 * a, 3 * b)', 2, 1)).toMatchObject({ value: 3, da: 0, db: 3 });
    expect(slope('min(2 * a, 3 * b)', 1.5, 1)).toMatchObject({ value: 3, da: 2, db: 0 }); // tie
    expect(slope('max(2 * a, 3 * b)', 1.5, 1)).toMatchObject({ value: 3, da: 2, db: 0 }); // tie
    expect(slope('max(2 * a, 3 * b, 7)', 1, 1)).toMatchObject({ value: 7, da: 0, db: 0 });
    expect(slope('max(2 * a, 3 * b, 7)', 1, 5)).toMatchObject({ value: 15, da: 0, db: 3 });
  });

  it('a conditional differentiates the taken branch; comparisons have derivative 0', () => {
    expect(slope('a > 1 ? a ^ 2 : 3 * a', 2)).toMatchObject({ value: 4, da: 4 });
    expect(slope('a > 1 ? a ^ 2 : 3 * a', 0.5)).toMatchObject({ value: 1.5, da: 3 });
    expect(slope('a > 1 ? a ^ 2 : 3 * a', 1)).toMatchObject({ value: 3, da: 3 }); // boundary: false branch
    expect(slope('a - 1 ? 5 * a : 7 * a', 1)).toMatchObject({ value: 7, da: 7 }); // zero condition
    expect(slope('(a < b) + (a == b) + (a >= b)', 1, 1)).toMatchObject({ value: 2, da: 0, db: 0 });
  });

  it('hypot: a_i / hypot per argument, 0 at the origin (like d abs at 0)', () => {
    expect(slope('hypot(a, b)', 3, 4)).toMatchObject({ value: 5, da: 3 / 5, db: 4 / 5 });
    expect(slope('hypot(a, b)', 0, 0)).toMatchObject({ value: 0, da: 0, db: 0 });
    expect(slope('hypot(a, 0)', -2)).toMatchObject({ value: 2, da: -1 });
  });

  it('atan2(y, x): (x dy - y dx) / (x^2 + y^2)', () => {
    expect(slope('atan2(a, b)', 1, 1)).toMatchObject({ da: 0.5, db: -0.5 });
    expect(slope('atan2(a, b)', 0, -2)).toMatchObject({ da: -0.5, db: -0 });
  });

  it('a ^ b with a variable exponent: finite at a = 0, where mathjs writes 0 * log(0) = NaN', () => {
    // d(a^b)/db = a^b log(a) -> 0 as a -> 0+ for b > 0; d/da = b a^(b-1) = 0 at a = 0, b = 2.
    expect(slope('a ^ b', 0, 2)).toMatchObject({ value: 0, da: 0, db: 0 });
    const viaMathjs = derivative(parse('a ^ b'), 'b', { simplify: false }).evaluate({ a: 0, b: 2 });
    expect(Number.isNaN(viaMathjs)).toBe(true);
    // Negative base with an integer exponent: d/da (a^3) = 3 a^2.
    expect(slope('a ^ b', -2, 3).da).toBe(12);
    // And the usual values elsewhere: d/db 2^b = 2^b ln 2.
    expect(slope('a ^ b', 2, 3).db).toBeCloseTo(8 * Math.LN2, 14);
  });
});
