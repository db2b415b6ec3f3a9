/**
 * The compiler's DAG: equal subexpressions share one node, folding keeps only exact identities
 * (plus the structural-zero convention of symbolic differentiation), and size is bounded.
 */
import { describe, expect, it } from 'vitest';
import { emitBody } from '../../../src/model/compile/emit.js';
import { ExprPool, ExpressionTooLarge } from '../../../src/model/compile/ir.js';

describe('ExprPool', () => {
  it('hash-conses: the same operation on the same arguments is one node; a+b and b+a too', () => {
    const pool = new ExprPool();
    const a = pool.sym('x', 0);
    const b = pool.sym('p', 1);
    expect(pool.add(a, b)).toBe(pool.add(b, a));
    expect(pool.mul(a, b)).toBe(pool.mul(b, a));
    expect(pool.sub(a, b)).not.toBe(pool.sub(b, a));
    expect(pool.call('sin', [a])).toBe(pool.call('sin', [a]));
    expect(pool.num(0)).not.toBe(pool.num(-0));
  });

  it('folds constants with the same arithmetic the generated code would do', () => {
    const pool = new ExprPool();
    expect(pool.numberOf(pool.add(pool.num(0.1), pool.num(0.2)))).toBe(0.1 + 0.2);
    expect(pool.numberOf(pool.call('log', [pool.num(10)]))).toBe(Math.log(10));
    expect(pool.numberOf(pool.pow(pool.num(2), pool.num(0.5)))).toBe(Math.pow(2, 0.5));
    expect(pool.numberOf(pool.compare('lt', pool.num(1), pool.num(2)))).toBe(1);
    expect(pool.cond(pool.num(0), pool.num(1), pool.num(2))).toBe(pool.num(2));
    expect(pool.cond(pool.num(NaN), pool.num(1), pool.num(2))).toBe(pool.num(2)); // NaN is false, as in mathjs
  });

  it('identities: x+0, x*1, x/1, x^1, --x, x-x; x*0 = 0 (structural zero); x^2 = x*x', () => {
    const pool = new ExprPool();
    const x = pool.sym('x', 0);
    expect(pool.add(x, pool.ZERO)).toBe(x);
    expect(pool.mul(x, pool.ONE)).toBe(x);
    expect(pool.div(x, pool.ONE)).toBe(x);
    expect(pool.pow(x, pool.ONE)).toBe(x);
    expect(pool.neg(pool.neg(x))).toBe(x);
    expect(pool.sub(x, x)).toBe(pool.ZERO);
    expect(pool.mul(x, pool.ZERO)).toBe(pool.ZERO);
    expect(pool.pow(x, pool.num(2))).toBe(pool.mul(x, x));
    expect(pool.add(x, pool.neg(pool.sym('p', 0)))).toBe(pool.sub(x, pool.sym('p', 0)));
  });

  it('substitute replaces symbols and folds what becomes constant', () => {
    const pool = new ExprPool();
    const d = pool.sym('d', 0);
    const x = pool.sym('x', 0);
    const e = pool.add(pool.mul(d, x), d);
    const out = pool.substitute(e, (s) => (s === d ? pool.ZERO : undefined), new Map());
    expect(out).toBe(pool.ZERO);
  });

  it('refuses to grow past its node limit with a clear error', () => {
    const pool = new ExprPool(100);
    let e = pool.sym('x', 0);
    expect(() => {
      for (let i = 0; i < 200; i++) e = pool.call('sin', [e]);
    }).toThrow(ExpressionTooLarge);
  });

  it('emits a comparison inline as the condition of a ternary, and shared nodes once', () => {
    const pool = new ExprPool();
    const x = pool.sym('x', 0);
    const s = pool.call('sin', [x]);
    const c = pool.cond(pool.compare('gt', x, pool.ZERO), pool.mul(s, s), pool.neg(s));
    const body = emitBody(pool, [{ target: 'y', index: 0, node: c }], (n) => `${n.kind}[${n.index}]`);
    expect(body.match(/Math\.sin/g)?.length).toBe(1);
    expect(body).toMatch(/\(\(v0>0\)\?\(v1\*v1\):\(-v1\)\)/);
    const f = new Function('x', 'y', body) as (x: Float64Array, y: Float64Array) => void;
    const y = new Float64Array(1);
    f(Float64Array.of(1), y);
    expect(y[0]).toBe(Math.sin(1) ** 2);
    f(Float64Array.of(-1), y);
    expect(y[0]).toBe(-Math.sin(-1));
  });
});
