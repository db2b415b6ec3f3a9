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
import { FUNCTIONS, FUNCTION_NAMES, isFunctionName } from './functions/registry.js';
import { LIMITS } from './limits.js';
import { orList, suggestion } from '../presentation/nearest-names.js';
import type { Expr } from './types.js';

/** Letters, digits and `_`, starting with a letter (model-format.md, Names). */
export const NAME_PATTERN = /^[A-Za-z][A-Za-z0-9_]*$/;

/** The registry's function names, as a set for the scan. */
const ALLOWED_FUNCTIONS: ReadonlySet<string> = new Set(FUNCTION_NAMES);

/** mathjs operator functions we accept, with their arity. */
const ALLOWED_OPERATORS: ReadonlyMap<string, number> = new Map([
  ['add', 2], ['subtract', 2], ['multiply', 2], ['divide', 2], ['pow', 2],
  ['unaryMinus', 1], ['unaryPlus', 1],
  ['smaller', 2], ['smallerEq', 2], ['larger', 2], ['largerEq', 2], ['equal', 2], ['unequal', 2],
]);

/** Words the expression parser reads as operators or constants; none is allowed in our expressions. */
export const PARSER_WORDS: ReadonlySet<string> = new Set([
  'mod', 'to', 'in', 'and', 'or', 'xor', 'not', 'true', 'false', 'null', 'undefined', 'NaN',
  'Infinity', 'end',
]);

export interface ExpressionOptions {
  /**
   * File column (1-based) of the expression's first character, when the text stands in the file
   * exactly as written on one line. Problems then point at the offending character's column.
   */
  textColumn?: number;
}

interface Issue {
  /** 0-based index in the text, when known. */
  index?: number;
  what: string;
  fix: string;
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
// Gate 1: character scan.

const NUMBER_AT = /(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?/y;
const NAME_AT = /[A-Za-z_$][A-Za-z0-9_$]*/y;

interface Call {
  name: string;
  index: number;
}

type Prev = 'start' | 'operand' | 'operator' | 'open' | 'comma' | 'callname';

/** Refuses every construct outside the allowed list, with the index where it starts. */
function scan(text: string): { issue?: Issue; calls: Call[] } {
  const calls: Call[] = [];
  const stack: { kind: 'call' | 'group'; index: number }[] = [];
  let openQuestions = 0;
  let prev: Prev = 'start';
  let i = 0;
  const fail = (index: number, what: string, fix: string) => ({ issue: { index, what, fix }, calls });
  const implicit = (index: number, left: string, right: string) =>
    fail(index, `implicit multiplication ("${left}" directly followed by "${right}") is not allowed`, `write the product with *, e.g. ${left}*${right}`);

  while (i < text.length) {
    const c = text[i];
    if (c === ' ' || c === '\t' || c === '\n' || c === '\r') {
      i++;
      continue;
    }
    if (isDigit(c) || (c === '.' && isDigit(text[i + 1]))) {
      NUMBER_AT.lastIndex = i;
      const num = NUMBER_AT.exec(text)![0];
      const after = i + num.length;
      if (prev === 'operand') return implicit(i, lastWord(text, i), num);
      const next = text[after];
      if (next !== undefined && /[A-Za-z_$]/.test(next)) {
        if (num === '0' && /[xXbBoO]/.test(next)) {
          return fail(i, 'hexadecimal, binary and octal numbers are not allowed', 'write the number in decimal');
        }
        NAME_AT.lastIndex = after;
        const name = NAME_AT.exec(text)![0];
        if (/^[eE]$/.test(name) && /[+-]/.test(text[after + 1] ?? '')) {
          return fail(i, `the number "${num}${name}${text[after + 1]}" has no exponent digits`, 'write e.g. 1e-3');
        }
        return implicit(after, num, name);
      }
      if (!Number.isFinite(Number(num))) {
        return fail(i, `the number ${num} is too large (not a finite double)`, 'write a number below 1.7e308 in size');
      }
      prev = 'operand';
      i = after;
      continue;
    }
    if (/[A-Za-z_$]/.test(c)) {
      NAME_AT.lastIndex = i;
      const name = NAME_AT.exec(text)![0];
      if (prev === 'operand') return implicit(i, lastWord(text, i), name);
      const word = wordIssue(name);
      if (word) return fail(i, word.what, word.fix);
      let j = i + name.length;
      while (text[j] === ' ' || text[j] === '\t' || text[j] === '\n' || text[j] === '\r') j++;
      if (text[j] === '(') {
        if (!ALLOWED_FUNCTIONS.has(name)) {
          return fail(i, `"${name}(" calls a function "${name}", which is not allowed`,
            `${suggestion(name, [...ALLOWED_FUNCTIONS], 'functions')} For a product write ${name}*(...)`);
        }
        calls.push({ name, index: i });
        prev = 'callname';
      } else {
        if (ALLOWED_FUNCTIONS.has(name)) return fail(i, `"${name}" is a function`, `call it with an argument: ${name}(x)`);
        prev = 'operand';
      }
      i += name.length;
      continue;
    }
    const two = text.slice(i, i + 2);
    switch (c) {
      case '(':
        if (prev === 'operand') return implicit(i, lastWord(text, i), '(');
        stack.push({ kind: prev === 'callname' ? 'call' : 'group', index: i });
        if (stack.length > LIMITS.parenDepth) {
          return fail(i, `parentheses are nested more than ${LIMITS.parenDepth} deep`, 'split the expression into named quantities under `define`');
        }
        prev = 'open';
        i++;
        continue;
      case ')':
        if (!stack.length) return fail(i, 'there is a ")" without a matching "("', 'remove it or add the missing "("');
        stack.pop();
        prev = 'operand';
        i++;
        continue;
      case ',':
        if (!stack.length || stack[stack.length - 1].kind !== 'call') {
          return fail(i, 'a comma is only allowed between the arguments of a function', 'remove the comma (lists are not allowed)');
        }
        prev = 'comma';
        i++;
        continue;
      case '+':
      case '-':
      case '/':
      case '^':
        prev = 'operator';
        i++;
        continue;
      case '*':
        if (two === '**') return fail(i, 'the power operator is ^, not **', 'write x^2');
        prev = 'operator';
        i++;
        continue;
      case '<':
      case '>':
        if (two === '<<' || two === '>>') return fail(i, `the bit shift "${two}" is not allowed`, 'use arithmetic: x*2^n');
        prev = 'operator';
        i += text[i + 1] === '=' ? 2 : 1;
        continue;
      case '=':
        if (two !== '==') return fail(i, 'assignment "=" is not allowed in an expression', 'to compare, write ==; to name a quantity, use `define`');
        prev = 'operator';
        i += 2;
        continue;
      case '!':
        if (two !== '!=') return fail(i, '"!" (factorial or "not") is not allowed', 'to compare, write !=; otherwise use a conditional c ? a : b');
        prev = 'operator';
        i += 2;
        continue;
      case '?':
        openQuestions++;
        prev = 'operator';
        i++;
        continue;
      case ':':
        if (openQuestions === 0) return fail(i, 'a range ":" is not allowed', 'the only ":" allowed is in a conditional: c ? a : b');
        openQuestions--;
        prev = 'operator';
        i++;
        continue;
      case '.':
        if ('*/^'.includes(text[i + 1] ?? '')) {
          return fail(i, `the element-wise operator "${two}" is not allowed`, `write ${two[1]}`);
        }
        return fail(i, 'property access "." is not allowed', 'use only declared names, numbers, operators and the allowed functions');
      case '"':
      case '`':
        return fail(i, 'strings are not allowed in an expression', 'use only declared names, numbers, operators and the allowed functions');
      case "'":
        return fail(i, 'quotes (strings or transposition) are not allowed in an expression', 'remove the quote');
      case '[':
      case ']':
        return fail(i, 'square brackets (indexing, arrays or matrices) are not allowed', 'use ( ) for grouping; every quantity is a scalar');
      case '{':
      case '}':
        return fail(i, 'braces (objects) are not allowed in an expression', 'use ( ) for grouping');
      case ';':
        return fail(i, 'several statements (";") are not allowed', 'write a single expression; name parts under `define`');
      case '%':
        return fail(i, 'modulus and percent ("%") are not allowed', 'write the arithmetic out, e.g. x/100');
      case '&':
      case '|':
      case '~':
        return fail(i, `the logical or bitwise operator "${c}" is not allowed`, 'use comparisons and conditionals: c ? a : b');
      case '#':
        return fail(i, 'comments ("#") are not allowed inside an expression', 'put the comment after the value, outside any quotes');
      default:
        return fail(i, `the character "${c}" is not allowed in an expression`,
          'use letters, digits, _, spaces, + - * / ^ ( ) , < > = ! ? : and .');
    }
  }
  if (stack.length) {
    const open = stack[stack.length - 1];
    return fail(open.index, 'this "(" is never closed', 'add the missing ")"');
  }
  return { calls };
}

function isDigit(c: string | undefined): boolean {
  return c !== undefined && c >= '0' && c <= '9';
}

/** The token that ends just before `index` (for messages about implicit multiplication). */
function lastWord(text: string, index: number): string {
  const m = /([A-Za-z0-9_.$]+|\))\s*$/.exec(text.slice(0, index));
  return m ? m[1] : text.slice(Math.max(0, index - 1), index);
}

/** Why a name-like word cannot appear in an expression, or undefined when it may. */
function wordIssue(name: string): { what: string; fix: string } | undefined {
  if (PARSER_WORDS.has(name)) {
    const fixes: Record<string, string> = {
      and: 'use nested conditionals: a ? (b ? x : y) : y',
      or: 'use nested conditionals: a ? x : (b ? x : y)',
      xor: 'use nested conditionals',
      not: 'invert the comparison (< becomes >=)',
      mod: 'write the arithmetic out',
      to: 'values are in the declared units; unit conversion is not written in expressions',
      in: 'values are in the declared units; unit conversion is not written in expressions',
      true: 'write 1',
      false: 'write 0',
    };
    return { what: `"${name}" is not allowed in an expression`, fix: fixes[name] ?? 'use only finite numbers, declared names and the allowed functions' };
  }
  if (!NAME_PATTERN.test(name)) {
    return { what: `"${name}" is not a valid name`, fix: 'names use letters, digits and _, starting with a letter' };
  }
  if (name in Object.prototype || name === 'prototype') {
    return { what: `"${name}" is not allowed in an expression`, fix: 'use only declared names' };
  }
  return undefined;
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
export function childrenOf(node: MathNode): MathNode[] {
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
