/**
 * Expressions from a model file: parsed into a tree and checked against a short allowed list
 * BEFORE anything else touches them. A model file is data from possibly hostile strangers; nothing
 * here evaluates or compiles user text (another layer generates JavaScript from the checked tree).
 *
 * Three gates, in order:
 * 1. a character scan of our own, which refuses every construct outside the allowed list with the
 *    character where it starts, and caps length and parenthesis depth before the (recursive)
 *    mathjs parser sees the text;
 * 2. mathjs `parse` (syntax only: it builds nodes, it runs nothing);
 * 3. a walk of the tree that accepts only the node types and operators listed here and the
 *    functions of the registry (src/model/functions/registry.ts)
 *    (the scan should already have refused the rest; this walk is the guarantee).
 *
 * Implicit multiplication (`2x`, `2 x`, `a b`, `(a)(b)`) is refused: a missing `*` is more often a
 * typo than intent, and mathjs would read `5 kg` as a product with a symbol named kg.
 * Line breaks inside an expression count as spaces (YAML block scalars may keep them).
 */
import type { MathNode } from 'mathjs';
import { parse } from '../util/mathjs.js';
import type { ProblemList, SourceLocation } from '../errors.js';
import { FUNCTIONS, isFunctionName } from './functions/registry.js';
import { LIMITS } from './limits.js';
import { ALLOWED_FUNCTIONS, NAME_PATTERN, scan, type Call, type Issue } from './expression-scan.js';
import { orList } from '../presentation/nearest-names.js';
import type { Expr } from './types.js';


/** mathjs operator functions we accept, with their arity. */
const ALLOWED_OPERATORS: ReadonlyMap<string, number> = new Map([
  ['add', 2], ['subtract', 2], ['multiply', 2], ['divide', 2], ['pow', 2],
  ['unaryMinus', 1], ['unaryPlus', 1],
  ['smaller', 2], ['smallerEq', 2], ['larger', 2], ['largerEq', 2], ['equal', 2], ['unequal', 2],
]);

export interface ExpressionOptions {
  /**
   * File column (1-based) of the expression's first character, when the text stands in the file
   * exactly as written on one line. Problems then point at the offending character's column.
   */
  textColumn?: number;
}

/**
 * Parse and check one expression. Returns the checked expression, or undefined after adding one
 * problem (the first construct refused) to `problems`.
 */
export function parseExpression(
  text: string | number,
  where: SourceLocation,
  problems: ProblemList,
  options: ExpressionOptions = {},
): Expr | undefined {
  if (typeof text === 'number' && !Number.isFinite(text)) {
    problems.add(where, `expected a finite number or an expression, got ${text}`, 'write a finite number such as 0 or 1.5e-3');
    return undefined;
  }
  const source = typeof text === 'number' ? String(text) : text;
  const checked = checkText(source);
  if ('issue' in checked) {
    report(problems, where, source, checked.issue, options);
    return undefined;
  }
  return { text: source, node: checked.node, where };
}

/** All gates for one text: the checked tree, or the first issue. */
function checkText(source: string): { node: MathNode } | { issue: Issue } {
  if (source.trim() === '') return { issue: { what: 'the expression is empty', fix: 'write a number or an expression' } };
  if (source.length > LIMITS.expressionChars) {
    return { issue: { what: `the expression is longer than ${LIMITS.expressionChars} characters`, fix: 'split it into named quantities under `define`' } };
  }
  const scanned = scan(source);
  if (scanned.issue) return { issue: scanned.issue };
  let node: MathNode;
  try {
    node = parse(source.replace(/[\r\n\t]/g, ' '));
  } catch (err) {
    return { issue: parserIssue(err) };
  }
  const issue = checkTree(node, 0, scanned.calls, new Map());
  return issue ? { issue } : { node };
}

function report(problems: ProblemList, where: SourceLocation, text: string, issue: Issue, options: ExpressionOptions): void {
  const at = issue.index !== undefined ? ` (at character ${issue.index + 1})` : '';
  const loc: SourceLocation = { ...where };
  if (issue.index !== undefined && options.textColumn !== undefined) loc.column = options.textColumn + issue.index;
  problems.add(loc, `expression "${shorten(text)}": ${issue.what}${at}`, issue.fix);
}

function shorten(text: string): string {
  const flat = text.replace(/\s+/g, ' ').trim();
  return flat.length > 60 ? `${flat.slice(0, 57)}...` : flat;
}

function parserIssue(err: unknown): Issue {
  if (err instanceof RangeError) {
    return { what: 'the expression is nested too deeply to read', fix: 'split it into named quantities under `define`' };
  }
  const e = err as { message?: string; char?: number };
  const msg = String(e.message ?? err).replace(/\s*\(char \d+\)\s*/, ' ').trim();
  const index = typeof e.char === 'number' && e.char > 0 ? e.char - 1 : undefined;
  return { index, what: `cannot be read: ${msg}`, fix: 'check for a missing operand, operator or parenthesis' };
}

// ---------------------------------------------------------------------------------------------
// Gate 3: the tree walk that is the guarantee.

const REFUSED_NODE_WORDS: Record<string, string> = {
  AccessorNode: 'property access or indexing',
  IndexNode: 'indexing',
  ArrayNode: 'an array or matrix',
  ObjectNode: 'an object',
  AssignmentNode: 'an assignment',
  FunctionAssignmentNode: 'a function definition',
  BlockNode: 'several statements',
  RangeNode: 'a range',
  RelationalNode: 'a chained comparison (a < b < c)',
};

function checkTree(node: MathNode, depth: number, calls: Call[], cursor: Map<string, number>): Issue | undefined {
  if (depth > LIMITS.treeDepth) {
    return { what: `the expression is nested more than ${LIMITS.treeDepth} levels deep`, fix: 'split it into named quantities under `define`' };
  }
  const n = node as MathNode & Record<string, unknown>;
  switch (node.type) {
    case 'ConstantNode': {
      const v = n.value;
      if (typeof v !== 'number') return { what: `the constant ${JSON.stringify(v)} is not a number`, fix: 'use only numbers' };
      if (!Number.isFinite(v)) return { what: `the number ${v} is not finite`, fix: 'write a finite number' };
      return undefined;
    }
    case 'SymbolNode': {
      const name = String(n.name);
      if (!NAME_PATTERN.test(name) || name in Object.prototype) {
        return { what: `"${name}" is not a valid name`, fix: 'names use letters, digits and _, starting with a letter' };
      }
      return undefined;
    }
    case 'ParenthesisNode':
      return checkTree(n.content as MathNode, depth + 1, calls, cursor);
    case 'ConditionalNode':
      return checkTree(n.condition as MathNode, depth + 1, calls, cursor)
        ?? checkTree(n.trueExpr as MathNode, depth + 1, calls, cursor)
        ?? checkTree(n.falseExpr as MathNode, depth + 1, calls, cursor);
    case 'OperatorNode': {
      const fn = String(n.fn);
      const args = n.args as MathNode[];
      if (n.implicit) return { what: 'implicit multiplication is not allowed', fix: 'write every product with *' };
      const arity = ALLOWED_OPERATORS.get(fn);
      if (arity === undefined || args.length !== arity) {
        return { what: `the operator "${String(n.op)}" is not allowed`, fix: 'use + - * / ^, comparisons and c ? a : b' };
      }
      for (const a of args) {
        const issue = checkTree(a, depth + 1, calls, cursor);
        if (issue) return issue;
      }
      return undefined;
    }
    case 'FunctionNode': {
      const fnNode = n.fn as MathNode & { name?: string };
      const args = n.args as MathNode[];
      if (fnNode.type !== 'SymbolNode' || !fnNode.name || !isFunctionName(fnNode.name)) {
        return { what: 'this kind of function call is not allowed', fix: `call one of the allowed functions by name: ${[...ALLOWED_FUNCTIONS].join(' ')}` };
      }
      const name = fnNode.name;
      const k = cursor.get(name) ?? 0;
      cursor.set(name, k + 1);
      const index = calls.filter((c) => c.name === name)[k]?.index;
      const [min, max] = FUNCTIONS[name].arity;
      if (args.length < min || args.length > max) {
        const want = min === max ? `${min}` : max === Infinity ? `${min} or more` : `${min} to ${max}`;
        return {
          index,
          what: `${name} takes ${want} argument${min === 1 && max === 1 ? '' : 's'}, got ${args.length}`,
          fix: `write ${name}(${Array.from({ length: min }, (_, i) => ['x', 'y', 'z'][i] ?? 'w').join(', ')})`,
        };
      }
      for (const a of args) {
        const issue = checkTree(a, depth + 1, calls, cursor);
        if (issue) return issue;
      }
      return undefined;
    }
    default: {
      const words = REFUSED_NODE_WORDS[node.type] ?? `a ${node.type}`;
      return { what: `${words} is not allowed in an expression`, fix: `use only numbers, declared names, ${orList(['+ - * / ^', 'comparisons', 'c ? a : b'])} and the allowed functions` };
    }
  }
}

// ---------------------------------------------------------------------------------------------
// Helpers for layers that read checked trees.

/** The children of a checked node, in source order. */
function childrenOf(node: MathNode): MathNode[] {
  const n = node as MathNode & Record<string, unknown>;
  switch (node.type) {
    case 'ParenthesisNode':
      return [n.content as MathNode];
    case 'ConditionalNode':
      return [n.condition as MathNode, n.trueExpr as MathNode, n.falseExpr as MathNode];
    case 'OperatorNode':
    case 'FunctionNode':
      return [...(n.args as MathNode[])];
    default:
      return [];
  }
}

/** Names of the symbols a checked expression reads (function names are not symbols). */
export function symbolsOf(node: MathNode, into: Set<string> = new Set()): Set<string> {
  if (node.type === 'SymbolNode') into.add((node as MathNode & { name: string }).name);
  for (const c of childrenOf(node)) symbolsOf(c, into);
  return into;
}
