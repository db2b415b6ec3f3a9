/**
 * The allowed list of model-format.md (Expressions), checked directly on parseExpression: what is
 * accepted, what is refused, and where the refusal points.
 */
import { describe, expect, it } from 'vitest';
import { ProblemList } from '../../../src/errors.js';
import { parseExpression, symbolsOf } from '../../../src/model/expression-check.js';
import { FUNCTION_NAMES } from '../../../src/model/functions/registry.js';

const where = { file: 'm.yaml', line: 7, column: 6, key: 'equations.v' };

function accept(text: string | number) {
  const problems = new ProblemList();
  const e = parseExpression(text, where, problems);
  expect(problems.items, `refused: ${String(text)}`).toEqual([]);
  expect(e).toBeDefined();
  return e!;
}

function refuse(text: string | number, textColumn?: number) {
  const problems = new ProblemList();
  const e = parseExpression(text, where, problems, { textColumn });
  expect(e, `accepted: ${String(text)}`).toBeUndefined();
  expect(problems.items).toHaveLength(1);
  const p = problems.items[0];
  expect(p.where.key).toBe('equations.v');
  expect(p.where.line).toBe(7);
  expect(p.fix ?? '').not.toBe('');
  return p;
}

describe('accepted expressions', () => {
  it.each([
    '(V - R*i - K*w) / L',
    'b*w + Tc*tanh(w/ws)',
    '-x^2 + +y',
    'x >= 0 ? a : -a',
    'a < b', 'a <= b', 'a > b', 'a >= b', 'a == b', 'a != b',
    '1e-3 * x', '.5 * x', '2. * x', '1E+3',
    'atan2(y, x) + pow(x, 2) + hypot(a, b, c) + min(a, b) + max(a, b, c)',
    'sin(x)+cos(x)+tan(x)+asin(x)+acos(x)+atan(x)+sinh(x)+cosh(x)+tanh(x)+exp(x)+log(x)+log10(x)+sqrt(x)+abs(x)+sign(x)',
    'pi * e * t',
    'x +\n  y',
  ])('%s', (text) => {
    accept(text);
  });

  it('numbers from YAML become constant expressions', () => {
    expect(accept(0).node.type).toBe('ConstantNode');
    expect(accept(1e-7).text).toBe('1e-7');
    expect(accept(-5).node.type).toBe('OperatorNode');
  });

  it('keeps the text and the location', () => {
    const e = accept('a ? b : c');
    expect(e.text).toBe('a ? b : c');
    expect(e.where).toEqual(where);
    expect(e.node.type).toBe('ConditionalNode');
  });

  it('lists the symbols read, not the function names', () => {
    expect([...symbolsOf(accept('K*sin(w*t) + max(a, pi)').node)].sort()).toEqual(['K', 'a', 'pi', 't', 'w']);
  });

  it('the allowed functions are exactly those of the spec', () => {
    expect([...FUNCTION_NAMES].sort()).toEqual(
      'sin cos tan asin acos atan atan2 sinh cosh tanh exp log log10 sqrt abs sign min max pow hypot'.split(' ').sort(),
    );
  });

  it('accepts 40 levels of parentheses and a sum of 200 terms', () => {
    accept(`${'('.repeat(40)}x${')'.repeat(40)}`);
    accept(Array(200).fill('x').join(' + '));
  });
});

describe('refused constructs name the construct and the character', () => {
  it.each([
    ['a.b', 2, 'property access'],
    ['a[1]', 2, 'square brackets'],
    ['[1, 2]', 1, 'square brackets'],
    ['{a: 1}', 1, 'braces'],
    ['"s"', 1, 'strings'],
    ["x'", 2, 'quotes'],
    ['x = 1', 3, 'assignment'],
    ['x; y', 2, 'several statements'],
    ['1:3', 2, 'range'],
    ['2x', 2, 'implicit multiplication'],
    ['2 x', 3, 'implicit multiplication'],
    ['a b', 3, 'implicit multiplication'],
    ['(a)(b)', 4, 'implicit multiplication'],
    ['(a) b', 5, 'implicit multiplication'],
    ['5 kg', 3, 'implicit multiplication'],
    ['x^2 y', 5, 'implicit multiplication'],
    ['x!', 2, 'factorial'],
    ['x % 2', 3, 'modulus'],
    ['x ** 2', 3, '^, not **'],
    ['a & b', 3, 'bitwise'],
    ['a || b', 3, 'bitwise'],
    ['a << 2', 3, 'bit shift'],
    ['a .* b', 3, 'element-wise'],
    ['0x1F', 1, 'hexadecimal'],
    ['1e999', 1, 'too large'],
    ['true', 1, '"true"'],
    ['NaN * x', 1, '"NaN"'],
    ['Infinity', 1, '"Infinity"'],
    ['a and b', 3, '"and"'],
    ['x mod 2', 3, '"mod"'],
    ['x to m', 3, '"to"'],
    ['x in m', 3, '"in"'],
    ['sin', 1, 'is a function'],
    ['foo(x)', 1, '"foo("'],
    ['import(x)', 1, '"import("'],
    ['constructor', 1, '"constructor"'],
    ['__proto__', 1, '"__proto__"'],
    ['x # note', 3, 'comments'],
    ['x @ y', 3, 'character "@"'],
    ['µ * x', 1, 'character "µ"'],
    ['(x', 1, 'never closed'],
    ['x)', 2, 'without a matching'],
    ['(a, b)', 3, 'comma'],
    ['f(x) = x', 1, '"f("'],
    ['max(x)', 1, 'max takes 2 or more arguments, got 1'],
    ['log(x, 10)', 1, 'log takes 1 argument, got 2'],
    ['sin(x) + sin(x, y)', 10, 'sin takes 1 argument, got 2'],
    ['atan2(y)', 1, 'atan2 takes 2 arguments, got 1'],
  ] as const)('%s', (text, char, words) => {
    const p = refuse(text);
    expect(p.what).toContain(words);
    expect(p.what).toContain(`(at character ${char})`);
  });

  it.each([
    ['a < b < c', 'chained comparison'],
    ['', 'empty'],
    ['   ', 'empty'],
    ['x +', 'cannot be read'],
  ])('%s', (text, words) => {
    expect(refuse(text).what).toContain(words);
  });

  it('refuses non-finite numbers from YAML', () => {
    expect(refuse(Infinity).what).toContain('finite');
    expect(refuse(Number.NaN).what).toContain('finite');
  });

  it('refuses 41 levels of parentheses and an over-long text before parsing', () => {
    expect(refuse(`${'('.repeat(41)}x${')'.repeat(41)}`).what).toContain('nested more than 40 deep');
    expect(refuse(`${'x+'.repeat(2100)}x`).what).toContain('longer than 4000');
    expect(refuse(Array(300).fill('x').join('+')).what).toContain('nested more than 250 levels');
  });

  it('points the column at the offending character when the text maps onto the file', () => {
    expect(refuse('a + b.c', 10).where.column).toBe(10 + 5);
    // Without a mapping the column stays that of the value.
    expect(refuse('a + b.c').where.column).toBe(6);
  });
});
