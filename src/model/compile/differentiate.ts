/**
 * Partial derivatives of compiler expressions.
 *
 * Smooth parts are differentiated by mathjs `derivative` (as numerics.md asks); the constructs it
 * lacks or gets wrong for our purpose use our own rules (model-format.md, Expressions). A
 * function's rule is its entry's in the registry (src/model/functions/registry.ts: abs, sign,
 * min, max, atan2, hypot, and pow, which is also the rule of the operator a ^ b when b is not a
 * number); the rules of the other constructs are here:
 *   c ? a : b   -> c ? da : db           (the taken branch; mathjs has no rule)
 *   comparisons -> 0
 *
 * Each expression is differentiated as a whole by mathjs with every non-smooth or shared
 * subexpression standing in as a placeholder symbol, and the chain rule goes through the
 * placeholders: d E/ds = dE'/ds + sum_h dE'/dh * dh/ds. Shared subexpressions as placeholders keep
 * the work linear in the size of the expression (a tree copy of a DAG can be exponentially large).
 */
import type { MathNode } from 'mathjs';
import { ConstantNode, FunctionNode, OperatorNode, SymbolNode, derivative } from '../../util/mathjs.js';
import { FUNCTIONS, type DerivativeRule, type FunctionName } from '../functions/registry.js';
import { fromMathjs } from './from-mathjs.js';
import type { ExprPool } from './ir.js';

const MATHJS_OPERATOR = {
  add: ['+', 'add'],
  sub: ['-', 'subtract'],
  mul: ['*', 'multiply'],
  div: ['/', 'divide'],
  pow: ['^', 'pow'],
} as const;

const NAME_PATTERN = /^[hs](\d+)$/;

/** The registry's own derivative rule of a function (not one left to mathjs). */
function ownRule(name: FunctionName): Exclude<DerivativeRule, 'mathjs'> {
  const rule = FUNCTIONS[name].derivative;
  if (rule === 'mathjs') throw new Error(`internal: ${name} is differentiated by mathjs`);
  return rule;
}

export class Differentiator {
  private readonly depsMemo = new Map<number, ReadonlySet<number>>();
  private readonly partialMemo = new Map<string, number>();
  /** Per expression: its mathjs form with placeholders, and d/dh results per placeholder. */
  private readonly treeMemo = new Map<number, { tree: MathNode; placeholders: number[]; byPlaceholder: Map<number, number> }>();
  private static readonly EMPTY: ReadonlySet<number> = new Set();

  constructor(readonly pool: ExprPool) {}

  /** The symbol ids node `id` reads (defines count as symbols here: they are not expanded). */
  deps(id: number): ReadonlySet<number> {
    const memo = this.depsMemo.get(id);
    if (memo) return memo;
    // Iterative post-order so that long define chains or deep derivatives cannot overflow the stack.
    const stack = [id];
    while (stack.length) {
      const top = stack[stack.length - 1]!;
      if (this.depsMemo.has(top)) {
        stack.pop();
        continue;
      }
      const n = this.pool.node(top);
      if (n.op === 'num') {
        this.depsMemo.set(top, Differentiator.EMPTY);
        stack.pop();
        continue;
      }
      if (n.op === 'sym') {
        this.depsMemo.set(top, new Set([top]));
        stack.pop();
        continue;
      }
      const pending = n.args.filter((a) => !this.depsMemo.has(a));
      if (pending.length) {
        stack.push(...pending);
        continue;
      }
      stack.pop();
      const sets = n.args.map((a) => this.depsMemo.get(a)!).filter((s) => s.size > 0);
      let result: ReadonlySet<number>;
      if (sets.length === 0) result = Differentiator.EMPTY;
      else if (sets.length === 1) result = sets[0]!;
      else {
        const merged = new Set<number>();
        for (const s of sets) for (const v of s) merged.add(v);
        result = merged;
      }
      this.depsMemo.set(top, result);
    }
    return this.depsMemo.get(id)!;
  }

  /** d e / d s, where `s` is a symbol node id. Structurally zero results are the pool's ZERO. */
  partial(e: number, s: number): number {
    const pool = this.pool;
    if (e === s) return pool.ONE;
    if (!this.deps(e).has(s)) return pool.ZERO;
    const key = `${e},${s}`;
    const memo = this.partialMemo.get(key);
    if (memo !== undefined) return memo;
    const result = this.isRuleNode(e) ? this.ruleDerivative(e, s) : this.mathjsDerivative(e, s);
    this.partialMemo.set(key, result);
    return result;
  }

  /** True for constructs differentiated by our own rules rather than by mathjs. */
  private isRuleNode(id: number): boolean {
    const n = this.pool.node(id);
    switch (n.op) {
      case 'fn':
        return FUNCTIONS[n.name].derivative !== 'mathjs';
      case 'pow':
        return this.pool.numberOf(n.args[1]) === undefined;
      case 'cond':
      case 'lt':
      case 'le':
      case 'gt':
      case 'ge':
      case 'eq':
      case 'ne':
        return true;
      default:
        return false;
    }
  }

  private ruleDerivative(e: number, s: number): number {
    const pool = this.pool;
    const n = pool.node(e);
    const d = (a: number) => this.partial(a, s);
    switch (n.op) {
      case 'cond':
        return pool.cond(n.args[0], d(n.args[1]), d(n.args[2]));
      case 'pow':
        return ownRule('pow')(pool, { self: e, args: n.args, d });
      case 'fn':
        return ownRule(n.name)(pool, { self: e, args: n.args, d });
      default:
        // Comparisons are piecewise constant.
        return pool.ZERO;
    }
  }

  private mathjsDerivative(e: number, s: number): number {
    const pool = this.pool;
    const entry = this.treeFor(e);
    const back = (m: MathNode) =>
      fromMathjs(pool, m, {
        derivativeOutput: true,
        resolve: (name) => {
          const match = NAME_PATTERN.exec(name);
          return match ? Number(match[1]) : undefined;
        },
      });
    let result = back(derivative(entry.tree, new SymbolNode(`s${s}`), { simplify: false }));
    for (const h of entry.placeholders) {
      if (!this.deps(h).has(s)) continue;
      const dh = this.partial(h, s);
      if (dh === pool.ZERO) continue;
      let outer = entry.byPlaceholder.get(h);
      if (outer === undefined) {
        outer = back(derivative(entry.tree, new SymbolNode(`h${h}`), { simplify: false }));
        entry.byPlaceholder.set(h, outer);
      }
      result = pool.add(result, pool.mul(outer, dh));
    }
    return result;
  }

  /** The mathjs tree of expression `e`, rule nodes and shared subexpressions as placeholders. */
  private treeFor(e: number) {
    const cached = this.treeMemo.get(e);
    if (cached) return cached;
    const pool = this.pool;
    const uses = new Map<number, number>();
    const count = (id: number) => {
      const seen = uses.get(id) ?? 0;
      uses.set(id, seen + 1);
      if (seen === 0 && !(id !== e && this.isRuleNode(id))) for (const a of pool.argsOf(id)) count(a);
    };
    count(e);
    const placeholders: number[] = [];
    const build = (id: number): MathNode => {
      const n = pool.node(id);
      if (n.op === 'num') return new ConstantNode(n.value);
      if (n.op === 'sym') return new SymbolNode(`s${id}`);
      if (id !== e && (this.isRuleNode(id) || (uses.get(id) ?? 0) > 1)) {
        placeholders.push(id);
        return new SymbolNode(`h${id}`);
      }
      switch (n.op) {
        case 'neg':
          return new OperatorNode('-', 'unaryMinus', [build(n.args[0])]);
        case 'add':
        case 'sub':
        case 'mul':
        case 'div':
        case 'pow': {
          const [op, fn] = MATHJS_OPERATOR[n.op];
          return new OperatorNode(op, fn, [build(n.args[0]), build(n.args[1])]);
        }
        case 'fn':
          return new FunctionNode(n.name, n.args.map(build));
        default:
          throw new Error(`internal: ${n.op} reached mathjs`);
      }
    };
    const tree = build(e);
    const entry = { tree, placeholders: [...new Set(placeholders)], byPlaceholder: new Map<number, number>() };
    this.treeMemo.set(e, entry);
    return entry;
  }
}
