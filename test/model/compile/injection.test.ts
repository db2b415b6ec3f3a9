/**
 * A model file is untrusted: names and text from it must never become code. The generator writes
 * slots (`x[0]`, `p[2]`), numbers and a fixed function table only; these tests feed it names that
 * would run code if they were pasted, and trees that no parser of ours would build.
 */
import { ConstantNode, FunctionNode, OperatorNode, SymbolNode, type MathNode } from 'mathjs';
import { afterEach, describe, expect, it } from 'vitest';
import { UserError } from '../../../src/errors.js';
import { compileModel } from '../../../src/model/compile/index.js';
import { makeModel } from './helpers.js';

const HOSTILE = [
  'x];globalThis.pwned=1;//',
  '__proto__',
  'constructor',
  'toString',
  'Math',
  'p',
  'dx',
  '(function(){globalThis.pwned=1})()',
];

const g = globalThis as { pwned?: unknown };
afterEach(() => {
  delete g.pwned;
});

/** Replaces the placeholder symbols A..H of a parsed tree by hostile names, keeping the tree shape. */
function renamed(node: MathNode, names: Map<string, string>): MathNode {
  return node.transform((n) => (n.type === 'SymbolNode' && names.has((n as SymbolNode).name) ? new SymbolNode(names.get((n as SymbolNode).name)!) : n));
}

describe('names are never pasted into code', () => {
  it('states, inputs, parameters and defines with hostile names compile to slots and run correctly', () => {
    const letters = ['A', 'B', 'C', 'D', 'E', 'F', 'G', 'H'];
    const names = new Map(letters.map((l, i) => [l, HOSTILE[i]!]));
    const base = makeModel({
      states: { A: 'C', B: 1 },
      inputs: { D: {} },
      params: { C: 2, E: 3, F: 4, G: 5 },
      defines: { H: 'E * A + sin(F)' },
      equations: { A: '-E * A + D + H', B: 'G * B - H ^ 2' },
      outputs: { out: 'A + B * F' },
    });
    // Rename every declaration and every symbol in every tree.
    const model = {
      ...base,
      states: base.states.map((s) => ({ ...s, name: names.get(s.name)!, initial: { ...s.initial, node: renamed(s.initial.node, names) } })),
      inputs: base.inputs.map((s) => ({ ...s, name: names.get(s.name)! })),
      parameters: base.parameters.map((s) => ({ ...s, name: names.get(s.name)! })),
      defines: base.defines.map((d) => ({ name: names.get(d.name)!, expr: { ...d.expr, node: renamed(d.expr.node, names) } })),
      equations: base.equations.map((e) => ({ state: names.get(e.state)!, expr: { ...e.expr, node: renamed(e.expr.node, names) } })),
      outputs: base.outputs.map((o) => ({ ...o, expr: { ...o.expr, node: renamed(o.expr.node, names) } })),
    };
    const cm = compileModel(model);
    const sys = cm.sensitivity([0, 1, 2, 3]);
    const sources = [cm.source.rhs, cm.source.outputs, ...cm.source.initial, sys.source.rhs, sys.source.outputs, ...sys.source.initial];
    for (const src of sources) {
      for (const name of ['pwned', '__proto__', 'constructor', 'toString', 'function', 'globalThis', '//']) expect(src).not.toContain(name);
      // Every identifier in the code is one of ours.
      const identifiers = new Set(src.match(/[A-Za-z_$][\w$]*/g));
      for (const id of identifiers) expect(['use', 'strict', 'const', 'Math', 'sin', 'cos', 't', 'x', 'u', 'p', 'dx', 'y', 'x0', 'z', 'udot', 'dz', 'dy', 'z0', 'e']).toContain(id.match(/^v\d+$/) ? 't' : id);
    }
    const x = Float64Array.of(0.5, 2);
    const u = Float64Array.of(0.25);
    const p = Float64Array.of(2, 3, 4, 5);
    const dx = new Float64Array(2);
    cm.rhs(0, x, u, p, dx);
    const h = 3 * 0.5 + Math.sin(4);
    expect(dx[0]).toBeCloseTo(-3 * 0.5 + 0.25 + h, 15);
    expect(dx[1]).toBeCloseTo(5 * 2 - h * h, 14);
    const x0 = new Float64Array(2);
    cm.initial(0, p, x0);
    expect([...x0]).toEqual([2, 1]);
    expect(g.pwned).toBeUndefined();
    expect(cm.paramSlot.get('constructor')).toBe(0);
    expect(cm.paramSlot.get('Math')).toBe(1);
    expect(cm.model.states[1]!.name).toBe('__proto__');
  });

  it('function names, string constants and foreign node types are refused, not run', () => {
    const attempts: MathNode[] = [
      new FunctionNode('constructor', [new ConstantNode(1)]),
      new FunctionNode(new SymbolNode('Function'), [new ConstantNode('globalThis.pwned=1' as unknown as number)]),
      new ConstantNode('1;globalThis.pwned=1' as unknown as number),
      new OperatorNode('+', 'add', [new SymbolNode('a'), new ConstantNode('globalThis.pwned=1' as unknown as number)]),
      new OperatorNode('=' as '+', 'assign' as 'add', [new SymbolNode('a'), new ConstantNode(1)]),
    ];
    for (const node of attempts) {
      const model = makeModel({ states: { s: 0 }, params: { a: 1 }, equations: { s: 'a' } });
      model.equations[0]!.expr = { ...model.equations[0]!.expr, node };
      expect(() => compileModel(model)).toThrow(UserError);
    }
    expect(g.pwned).toBeUndefined();
  });
});
