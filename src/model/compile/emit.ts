/**
 * Compiler DAG -> JavaScript function text -> function.
 *
 * The text is built only from node kinds, slot indices, numbers printed by the language itself
 * (shortest round-trip form) and the fixed function table: no name or text from the model file is
 * ever written into code. Every array read becomes a local first, so the writes at the end cannot
 * alias the reads, and every node used more than once is computed once into a local.
 */
import { FUNCTIONS } from '../functions/registry.js';
import { ExpressionTooLarge, type ExprPool, type IrNode } from './ir.js';

/** One statement `target[index] = value` at the end of the generated function. */
export interface Assignment {
  target: string;
  index: number;
  node: number;
}

/** How a symbol is read in the generated function, e.g. `x[3]` or `t`. */
export type SymbolReader = (node: Extract<IrNode, { op: 'sym' }>) => string;

/** Largest generated function body accepted (characters): far above any real model. */
const MAX_BODY_CHARS = 16_000_000;

/** Prints a number so that it reads back to the same double; negatives in parentheses. */
export function numberLiteral(v: number): string {
  if (Number.isNaN(v)) return 'NaN';
  if (v === Infinity) return 'Infinity';
  if (v === -Infinity) return '(-Infinity)';
  if (Object.is(v, -0)) return '(-0)';
  const s = String(v);
  return v < 0 ? `(${s})` : s;
}

const MAX_INLINE_CHARS = 400;
const OPERATOR_JS = { add: '+', sub: '-', mul: '*', div: '/' } as const;
const COMPARISON_JS = { lt: '<', le: '<=', gt: '>', ge: '>=', eq: '===', ne: '!==' } as const;

/** The body of a function that performs `assignments`; `reader` says how each symbol is read. */
export function emitBody(pool: ExprPool, assignments: readonly Assignment[], reader: SymbolReader): string {
  // Use counts over the reachable part of the DAG (arrays indexed by node id: pools are small).
  const total = pool.nodes.length;
  const uses = new Int32Array(total);
  const visited = new Uint8Array(total);
  const stack: number[] = [];
  for (const a of assignments) {
    uses[a.node]!++;
    stack.push(a.node);
  }
  const reached: number[] = [];
  while (stack.length) {
    const id = stack.pop()!;
    if (visited[id]) continue;
    visited[id] = 1;
    reached.push(id);
    for (const a of pool.argsOf(id)) {
      uses[a]!++;
      if (!visited[a]) stack.push(a);
    }
  }

  const order = reached.sort((a, b) => a - b); // ids are a topological order
  const text: string[] = new Array<string>(total);
  /** For comparisons that stay inline: the boolean form, used directly as a condition. */
  const boolText = new Map<number, string>();
  const lines: string[] = ['"use strict";'];
  let size = 0;
  let locals = 0;

  for (const id of order) {
    const n = pool.node(id);
    let expr: string;
    let isBool: string | undefined;
    const arg = (k: number) => text[k]!;
    switch (n.op) {
      case 'num':
        text[id] = numberLiteral(n.value);
        continue;
      case 'sym':
        expr = reader(n);
        break;
      case 'neg':
        expr = `(-${arg(n.args[0])})`;
        break;
      case 'add':
      case 'sub':
      case 'mul':
      case 'div':
        expr = `(${arg(n.args[0])}${OPERATOR_JS[n.op]}${arg(n.args[1])})`;
        break;
      case 'pow':
        expr = `Math.pow(${arg(n.args[0])},${arg(n.args[1])})`;
        break;
      case 'fn':
        expr = `${FUNCTIONS[n.name].js}(${n.args.map(arg).join(',')})`;
        break;
      case 'cond': {
        const c = n.args[0];
        const test = boolText.get(c) ?? arg(c);
        expr = `(${test}?${arg(n.args[1])}:${arg(n.args[2])})`;
        break;
      }
      default:
        isBool = `(${arg(n.args[0])}${COMPARISON_JS[n.op]}${arg(n.args[1])})`;
        expr = `(${isBool}?1:0)`;
    }
    // Symbols (array reads) always become locals, 't' is already one; shared nodes too, and long
    // inline texts (so that building the text of deep expressions stays linear).
    const isTime = n.op === 'sym' && expr === 't';
    if (!isTime && (n.op === 'sym' || uses[id]! > 1 || expr.length > MAX_INLINE_CHARS)) {
      const name = `v${locals++}`;
      lines.push(`const ${name}=${expr};`);
      size += expr.length + 12;
      text[id] = name;
    } else {
      text[id] = expr;
      if (isBool) boolText.set(id, isBool);
    }
    if (size > MAX_BODY_CHARS) throw new ExpressionTooLarge(MAX_BODY_CHARS);
  }
  for (const a of assignments) {
    const line = `${a.target}[${a.index}]=${text[a.node]!};`;
    size += line.length;
    lines.push(line);
  }
  if (size > MAX_BODY_CHARS) throw new ExpressionTooLarge(MAX_BODY_CHARS);
  return lines.join('\n');
}

/**
 * Turns generated text into a function. `params` are our own fixed identifiers; the body comes from
 * `emitBody` only.
 */
export function buildFunction<F>(params: readonly string[], body: string): F {
  return new Function(...params, body) as F;
}

/** The initial-value functions of a model: the states' own, and one per experiment. */
export interface InitialFunctions<F> {
  base: F;
  byExperiment: F[];
  /** The distinct bodies, for inspection and tests. */
  bodies: string[];
}

/**
 * One function per distinct list of initial-value nodes (experiments without overrides share the
 * states' own), built from the body `emit` writes for a list, in the order the lists come.
 */
export function initialFunctions<F>(lists: readonly (readonly number[])[], params: readonly string[], emit: (list: readonly number[]) => string): InitialFunctions<F> {
  const bodies: string[] = [];
  const fns: F[] = [];
  const fnOfList = new Map<string, number>();
  const indexOf = lists.map((list) => {
    const key = list.join(',');
    let index = fnOfList.get(key);
    if (index === undefined) {
      const body = emit(list);
      index = fns.length;
      bodies.push(body);
      fns.push(buildFunction<F>(params, body));
      fnOfList.set(key, index);
    }
    return index;
  });
  return { base: fns[indexOf[0]!]!, byExperiment: indexOf.slice(1).map((i) => fns[i]!), bodies };
}
