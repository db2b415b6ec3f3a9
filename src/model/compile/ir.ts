/**
 * The compiler's own expression form: a hash-consed DAG of numeric operations.
 *
 * Why not generate code straight from mathjs trees: identical subexpressions (a define used in
 * three equations, `cosh(w/ws)` appearing in a value and in its derivative) must be computed once,
 * and structural zeros of derivatives must vanish before code is written. Hash-consing gives the
 * first for free (equal subtrees get the same id), folding on construction gives the second.
 *
 * Every node is built from a checked tree or from a derivative rule; nothing here holds user text.
 */
import { FUNCTIONS, type FunctionName } from '../functions/registry.js';

/**
 * What a symbol reads. Slots follow the CompiledModel contract; `d` is a define (an intermediate,
 * resolved to its value before code is emitted), `S` an entry of the sensitivity matrix
 * (index i*q+k), `udot` the time derivative of input i, `h` a placeholder used only while mathjs
 * differentiates (it stands for the node whose id is its index).
 */
export type SymbolKind = 'x' | 'u' | 'p' | 't' | 'd' | 'S' | 'udot' | 'h';

export type ComparisonOp = 'lt' | 'le' | 'gt' | 'ge' | 'eq' | 'ne';

export type IrNode =
  | { op: 'num'; value: number }
  | { op: 'sym'; kind: SymbolKind; index: number }
  | { op: 'neg'; args: [number] }
  | { op: 'add' | 'sub' | 'mul' | 'div' | 'pow'; args: [number, number] }
  | { op: ComparisonOp; args: [number, number] }
  | { op: 'fn'; name: FunctionName; args: number[] }
  | { op: 'cond'; args: [number, number, number] };

/** Thrown when a model would compile into more nodes than any real model needs. */
export class ExpressionTooLarge extends Error {
  constructor(limit: number) {
    super(`the model's expressions and their derivatives exceed ${limit} distinct operations`);
    this.name = 'ExpressionTooLarge';
  }
}

function numberKey(v: number): string {
  return Object.is(v, -0) ? '-0' : String(v);
}

const COMPARE: Record<ComparisonOp, (a: number, b: number) => boolean> = {
  lt: (a, b) => a < b,
  le: (a, b) => a <= b,
  gt: (a, b) => a > b,
  ge: (a, b) => a >= b,
  eq: (a, b) => a === b,
  ne: (a, b) => a !== b,
};

/**
 * A pool of unique nodes. Node ids grow with construction, and a node is always built after its
 * arguments, so increasing id order is a valid evaluation order.
 */
export class ExprPool {
  readonly nodes: IrNode[] = [];
  private readonly index = new Map<string, number>();
  readonly ZERO: number;
  readonly ONE: number;

  /** `maxNodes` bounds memory for hostile or runaway models (a clear error instead of exhaustion). */
  constructor(private readonly maxNodes = 500_000) {
    this.ZERO = this.num(0);
    this.ONE = this.num(1);
  }

  private intern(key: string, node: IrNode): number {
    const found = this.index.get(key);
    if (found !== undefined) return found;
    if (this.nodes.length >= this.maxNodes) throw new ExpressionTooLarge(this.maxNodes);
    const id = this.nodes.length;
    this.nodes.push(node);
    this.index.set(key, id);
    return id;
  }

  node(id: number): IrNode {
    return this.nodes[id]!;
  }

  /** The value of a number node, or undefined. */
  numberOf(id: number): number | undefined {
    const n = this.nodes[id]!;
    return n.op === 'num' ? n.value : undefined;
  }

  isNum(id: number, v: number): boolean {
    const n = this.numberOf(id);
    return n !== undefined && Object.is(n, v);
  }

  num(value: number): number {
    return this.intern(`n${numberKey(value)}`, { op: 'num', value });
  }

  sym(kind: SymbolKind, index: number): number {
    return this.intern(`s${kind}${index}`, { op: 'sym', kind, index });
  }

  neg(a: number): number {
    const na = this.nodes[a]!;
    if (na.op === 'num') return this.num(-na.value);
    if (na.op === 'neg') return na.args[0];
    // -(a - b) is exactly b - a in IEEE arithmetic (up to the sign of a zero result).
    if (na.op === 'sub') return this.sub(na.args[1], na.args[0]);
    return this.intern(`-${a}`, { op: 'neg', args: [a] });
  }

  add(a: number, b: number): number {
    const va = this.numberOf(a);
    const vb = this.numberOf(b);
    if (va !== undefined && vb !== undefined) return this.num(va + vb);
    if (va === 0) return b;
    if (vb === 0) return a;
    const nb = this.nodes[b]!;
    if (nb.op === 'neg') return this.sub(a, nb.args[0]);
    const na = this.nodes[a]!;
    if (na.op === 'neg') return this.sub(b, na.args[0]);
    // a + b === b + a exactly: order the operands so that both spellings share one node.
    const [lo, hi] = a <= b ? [a, b] : [b, a];
    return this.intern(`+${lo},${hi}`, { op: 'add', args: [lo, hi] });
  }

  sub(a: number, b: number): number {
    const va = this.numberOf(a);
    const vb = this.numberOf(b);
    if (va !== undefined && vb !== undefined) return this.num(va - vb);
    if (vb === 0) return a;
    if (va === 0) return this.neg(b);
    if (a === b) return this.ZERO;
    const nb = this.nodes[b]!;
    if (nb.op === 'neg') return this.add(a, nb.args[0]);
    return this.intern(`${a}-${b}`, { op: 'sub', args: [a, b] });
  }

  /**
   * Multiplication by a structural zero gives zero. This is the usual convention of symbolic
   * differentiation (a term that does not depend on the variable contributes nothing), even
   * though 0 * Infinity is NaN in IEEE arithmetic.
   */
  mul(a: number, b: number): number {
    const va = this.numberOf(a);
    const vb = this.numberOf(b);
    if (va !== undefined && vb !== undefined) return this.num(va * vb);
    if (va === 0 || vb === 0) return this.ZERO;
    if (va === 1) return b;
    if (vb === 1) return a;
    if (va === -1) return this.neg(b);
    if (vb === -1) return this.neg(a);
    const na = this.nodes[a]!;
    const nb = this.nodes[b]!;
    // (-a) * b === -(a * b) exactly; pulling signs out lets them cancel or turn + into -.
    if (na.op === 'neg') return this.neg(this.mul(na.args[0], b));
    if (nb.op === 'neg') return this.neg(this.mul(a, nb.args[0]));
    const [lo, hi] = a <= b ? [a, b] : [b, a];
    return this.intern(`*${lo},${hi}`, { op: 'mul', args: [lo, hi] });
  }

  div(a: number, b: number): number {
    const va = this.numberOf(a);
    const vb = this.numberOf(b);
    if (va !== undefined && vb !== undefined) return this.num(va / vb);
    if (va === 0) return this.ZERO; // structural zero, as for mul
    if (vb === 1) return a;
    if (vb === -1) return this.neg(a);
    const na = this.nodes[a]!;
    if (na.op === 'neg') return this.neg(this.div(na.args[0], b));
    return this.intern(`/${a},${b}`, { op: 'div', args: [a, b] });
  }

  pow(a: number, b: number): number {
    const va = this.numberOf(a);
    const vb = this.numberOf(b);
    if (va !== undefined && vb !== undefined) return this.num(Math.pow(va, vb));
    if (vb === 1) return a;
    if (vb === 0) return this.ONE; // Math.pow(anything, 0) is 1, NaN included
    // a*a is exact (one rounding, like pow) and much cheaper than a call.
    if (vb === 2) return this.mul(a, a);
    return this.intern(`^${a},${b}`, { op: 'pow', args: [a, b] });
  }

  compare(op: ComparisonOp, a: number, b: number): number {
    const va = this.numberOf(a);
    const vb = this.numberOf(b);
    if (va !== undefined && vb !== undefined) return COMPARE[op](va, vb) ? this.ONE : this.ZERO;
    return this.intern(`${op}${a},${b}`, { op, args: [a, b] });
  }

  /** `c ? a : b` with the truth of a number: non-zero and not NaN (as mathjs evaluates it). */
  cond(c: number, a: number, b: number): number {
    const vc = this.numberOf(c);
    if (vc !== undefined) return vc ? a : b;
    if (a === b) return a;
    return this.intern(`?${c},${a},${b}`, { op: 'cond', args: [c, a, b] });
  }

  call(name: FunctionName, args: number[]): number {
    const values = args.map((a) => this.numberOf(a));
    if (values.every((v) => v !== undefined)) {
      return this.num(FUNCTIONS[name].evaluate(...(values as number[])));
    }
    return this.intern(`${name}(${args.join(',')})`, { op: 'fn', name, args: [...args] });
  }

  /** The argument ids of a node (empty for numbers and symbols). */
  argsOf(id: number): readonly number[] {
    const n = this.nodes[id]!;
    return n.op === 'num' || n.op === 'sym' ? [] : n.args;
  }

  /**
   * The node with every symbol replaced by `map(symbolNode)` (memoised in `memo`). Used to
   * resolve defines into their values and placeholders into what they stand for.
   */
  substitute(id: number, map: (symId: number) => number | undefined, memo: Map<number, number>): number {
    const done = memo.get(id);
    if (done !== undefined) return done;
    // Iterative post-order walk: long chains of defines must not overflow the call stack.
    const stack: number[] = [id];
    while (stack.length) {
      const top = stack[stack.length - 1]!;
      if (memo.has(top)) {
        stack.pop();
        continue;
      }
      const n = this.nodes[top]!;
      if (n.op === 'num') {
        memo.set(top, top);
        stack.pop();
        continue;
      }
      if (n.op === 'sym') {
        memo.set(top, map(top) ?? top);
        stack.pop();
        continue;
      }
      const pending = n.args.filter((a) => !memo.has(a));
      if (pending.length) {
        stack.push(...pending);
        continue;
      }
      stack.pop();
      memo.set(top, this.rebuild(top, n.args.map((a) => memo.get(a)!)));
    }
    return memo.get(id)!;
  }

  /**
   * The symbol nodes reachable from `roots` (one walk, nothing memoised per node: used on resolved
   * expressions, whose nodes may each reach many symbols).
   */
  symbolsOf(roots: readonly number[]): number[] {
    const seen = new Set<number>();
    const found: number[] = [];
    const stack = [...roots];
    while (stack.length) {
      const id = stack.pop()!;
      if (seen.has(id)) continue;
      seen.add(id);
      const n = this.nodes[id]!;
      if (n.op === 'sym') found.push(id);
      else if (n.op !== 'num') for (const a of n.args) if (!seen.has(a)) stack.push(a);
    }
    return found.sort((a, b) => a - b);
  }

  /** Builds node `id`'s operation again on new arguments (folding applies). */
  rebuild(id: number, args: number[]): number {
    const n = this.nodes[id]!;
    switch (n.op) {
      case 'num':
      case 'sym':
        return id;
      case 'neg':
        return this.neg(args[0]!);
      case 'add':
        return this.add(args[0]!, args[1]!);
      case 'sub':
        return this.sub(args[0]!, args[1]!);
      case 'mul':
        return this.mul(args[0]!, args[1]!);
      case 'div':
        return this.div(args[0]!, args[1]!);
      case 'pow':
        return this.pow(args[0]!, args[1]!);
      case 'fn':
        return this.call(n.name, args);
      case 'cond':
        return this.cond(args[0]!, args[1]!, args[2]!);
      default:
        return this.compare(n.op, args[0]!, args[1]!);
    }
  }
}
