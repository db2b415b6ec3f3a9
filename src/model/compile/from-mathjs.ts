/**
 * mathjs tree -> compiler DAG. Only the node types and functions of the allowed list are accepted;
 * anything else is refused here again, so that the compiler never depends on another module's check
 * to stay safe. Symbols are mapped to slots by the caller's resolver; their names never reach code.
 */
import type { MathNode } from 'mathjs';
import { FUNCTIONS, FUNCTION_NAMES, isFunctionName } from '../functions/registry.js';
import type { ComparisonOp, ExprPool } from './ir.js';

/** A refused construct, with words for the user. */
export class UnsupportedExpression extends Error {
  constructor(
    what: string,
    readonly fix: string,
  ) {
    super(what);
    this.name = 'UnsupportedExpression';
  }
}

export interface ConvertOptions {
  /** IR id for a symbol name, or undefined when the name is not known. */
  resolve(name: string): number | undefined;
  /**
   * Accept the reciprocal trigonometric functions that mathjs `derivative` writes into its results
   * (sec, csc, cot, sech, csch, coth). Never set for the user's own expressions.
   */
  derivativeOutput?: boolean;
}

const COMPARISONS: Record<string, ComparisonOp> = {
  smaller: 'lt',
  smallerEq: 'le',
  larger: 'gt',
  largerEq: 'ge',
  equal: 'eq',
  unequal: 'ne',
};

const RECIPROCALS: Record<string, 'cos' | 'sin' | 'tan' | 'cosh' | 'sinh' | 'tanh'> = {
  sec: 'cos',
  csc: 'sin',
  cot: 'tan',
  sech: 'cosh',
  csch: 'sinh',
  coth: 'tanh',
};

const CONSTANTS: Record<string, number> = { pi: Math.PI, e: Math.E };

export function fromMathjs(pool: ExprPool, root: MathNode, options: ConvertOptions): number {
  const convert = (node: MathNode): number => {
    switch (node.type) {
      case 'ConstantNode': {
        const value = (node as unknown as { value: unknown }).value;
        if (typeof value !== 'number') {
          throw new UnsupportedExpression(
            `a constant of type ${typeof value} is not a number`,
            'write plain numbers such as 2.5 or 1e-3',
          );
        }
        return pool.num(value);
      }
      case 'SymbolNode': {
        const name = (node as unknown as { name: string }).name;
        const id = options.resolve(name);
        if (id !== undefined) return id;
        if (Object.prototype.hasOwnProperty.call(CONSTANTS, name)) return pool.num(CONSTANTS[name]!);
        throw new UnsupportedExpression(
          `unknown name ${JSON.stringify(name)}`,
          'declare it as a state, input, parameter or define',
        );
      }
      case 'ParenthesisNode':
        return convert((node as unknown as { content: MathNode }).content);
      case 'ConditionalNode': {
        const c = node as unknown as { condition: MathNode; trueExpr: MathNode; falseExpr: MathNode };
        return pool.cond(convert(c.condition), convert(c.trueExpr), convert(c.falseExpr));
      }
      case 'OperatorNode':
        return convertOperator(node as unknown as { fn: string; op: string; args: MathNode[] });
      case 'FunctionNode':
        return convertCall(pool, node as unknown as CallNode, convert, options);
      default:
        throw new UnsupportedExpression(
          `${node.type} is not part of the model language`,
          'use numbers, names, + - * / ^, comparisons, cond ? a : b and the listed functions',
        );
    }
  };

  const fold = (args: MathNode[], op: (a: number, b: number) => number): number => {
    let acc = convert(args[0]!);
    for (let i = 1; i < args.length; i++) acc = op(acc, convert(args[i]!));
    return acc;
  };

  const convertOperator = (node: { fn: string; op: string; args: MathNode[] }): number => {
    const { fn, args } = node;
    const arity = (n: number) => {
      if (args.length !== n) {
        throw new UnsupportedExpression(`operator ${node.op} with ${args.length} operands`, 'check the expression');
      }
    };
    switch (fn) {
      case 'unaryMinus':
        arity(1);
        return pool.neg(convert(args[0]!));
      case 'unaryPlus':
        arity(1);
        return convert(args[0]!);
      case 'add':
        if (args.length < 2) arity(2);
        return fold(args, (a, b) => pool.add(a, b));
      case 'multiply':
        if (args.length < 2) arity(2);
        return fold(args, (a, b) => pool.mul(a, b));
      case 'subtract':
        arity(2);
        return pool.sub(convert(args[0]!), convert(args[1]!));
      case 'divide':
        arity(2);
        return pool.div(convert(args[0]!), convert(args[1]!));
      case 'pow':
        arity(2);
        return pool.pow(convert(args[0]!), convert(args[1]!));
      default: {
        const cmp = Object.prototype.hasOwnProperty.call(COMPARISONS, fn) ? COMPARISONS[fn] : undefined;
        if (cmp) {
          arity(2);
          return pool.compare(cmp, convert(args[0]!), convert(args[1]!));
        }
        throw new UnsupportedExpression(
          `operator ${JSON.stringify(node.op)} is not part of the model language`,
          'use + - * / ^, unary minus, < <= > >= == != and cond ? a : b',
        );
      }
    }
  };

  return convert(root);
}

interface CallNode {
  fn: { type?: string; name?: string };
  args: MathNode[];
}

/** A call of a registry function (or, in mathjs derivative output, of a reciprocal trigonometric one). */
function convertCall(pool: ExprPool, node: CallNode, convert: (node: MathNode) => number, options: ConvertOptions): number {
  // Only a plain name may be called: `obj.sin(x)` has an accessor as callee, whose `name` would
  // also read "sin".
  const name = node.fn?.type === 'SymbolNode' && typeof node.fn.name === 'string' ? node.fn.name : undefined;
  const args = node.args;
  if (name === undefined) {
    throw new UnsupportedExpression('a computed function call', 'call one of the listed functions by name');
  }
  if (options.derivativeOutput && Object.prototype.hasOwnProperty.call(RECIPROCALS, name)) {
    if (args.length !== 1) throw arityError(name, args.length, '1');
    return pool.div(pool.ONE, pool.call(RECIPROCALS[name]!, [convert(args[0]!)]));
  }
  if (!isFunctionName(name)) {
    throw new UnsupportedExpression(
      `function ${JSON.stringify(name)} is not part of the model language`,
      `use one of: ${FUNCTION_NAMES.join(' ')}`,
    );
  }
  const entry = FUNCTIONS[name];
  const [min, max] = entry.arity;
  if (args.length < min || args.length > max) {
    const expected = max === Infinity ? `at least ${min}` : min === max ? `${min}` : `${min} to ${max}`;
    throw arityError(name, args.length, expected);
  }
  const converted = args.map(convert);
  if (entry.operator === 'pow') return pool.pow(converted[0]!, converted[1]!);
  return pool.call(name, converted);
}

function arityError(name: string, got: number, expected: string): UnsupportedExpression {
  return new UnsupportedExpression(
    `${name}() called with ${got} argument${got === 1 ? '' : 's'}`,
    `${name} takes ${expected} argument${expected === '1' ? '' : 's'}`,
  );
}
