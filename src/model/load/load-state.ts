/**
 * What the section readers share while one model file is loaded: the YAML context, the names
 * declared so far, the unit strings to check, and where each expression's text starts.
 */
import type { SourceLocation } from '../../errors.js';
import { parseExpression } from '../expression-check.js';
import type { Expr } from '../types.js';
import { nameProblem } from './names.js';
import { suggestion } from '../../presentation/nearest-names.js';
import { at, deref, scalarOf, textColumnOf, type LoadContext, type YNode } from './yaml-source.js';

export type SymbolKind = 'state' | 'input' | 'parameter' | 'define';

export interface Declaration {
  kind: SymbolKind;
  where: SourceLocation;
}

/** A unit string to check once everything is read. */
export interface UnitRef {
  text: string;
  where: SourceLocation;
  /** Words for messages, e.g. "unit of parameter K". */
  label: string;
  /** symbol: of a state/input/parameter/output; time: must be a time unit; column: converted into `into`. */
  kind: 'symbol' | 'time' | 'column';
  into?: string;
}

export interface LoadState {
  ctx: LoadContext;
  /** One namespace for states, inputs, parameters and defines (model-format.md, Names). */
  declared: Map<string, Declaration>;
  units: UnitRef[];
  /** File column of each expression's first character, when it maps exactly (for pointing at a name). */
  textColumns: WeakMap<Expr, number>;
  /** Expressions with a name problem: the unit check skips them so one mistake is reported once. */
  badNames: Set<Expr>;
}

export function newLoadState(ctx: LoadContext): LoadState {
  return { ctx, declared: new Map(), units: [], textColumns: new WeakMap(), badNames: new Set() };
}

/** Declare a name in the shared namespace; false (with a problem) when invalid or taken. */
export function declare(st: LoadState, name: string, kind: SymbolKind, keyNode: YNode, path: string): boolean {
  const where = at(st.ctx, keyNode, path);
  const bad = nameProblem(name);
  if (bad) {
    st.ctx.problems.add(where, `${kind} name: ${bad}`, 'rename it (letters, digits and _, starting with a letter; not t, pi, e or a function name)');
    return false;
  }
  const prev = st.declared.get(name);
  if (prev) {
    st.ctx.problems.add(where, `"${name}" is declared twice: as a ${prev.kind} (line ${prev.where.line ?? '?'}) and as a ${kind}`,
      'states, inputs, parameters and defines share one namespace; rename one of them');
    return false;
  }
  st.declared.set(name, { kind, where });
  return true;
}

/** Parse an expression from a YAML value (a number or a text). */
export function readExpression(st: LoadState, node: YNode, path: string, what: string): Expr | undefined {
  const n = deref(st.ctx, node);
  const s = scalarOf(st.ctx, n);
  const where = at(st.ctx, n ?? undefined, path);
  if (!s || (typeof s.value !== 'string' && typeof s.value !== 'number')) {
    const got = s?.value === null || !n ? 'nothing' : typeof s?.value === 'boolean' ? String(s.value) : 'a map or list';
    st.ctx.problems.add(where, `${what} must be a number or an expression, got ${got}`,
      'write e.g. 0, 1.5e-3 or (V - R*i)/L; quote it if it starts with a character YAML treats specially');
    return undefined;
  }
  const text = s.value;
  const textColumn = typeof text === 'string' ? textColumnOf(st.ctx, s, text) : undefined;
  const expr = parseExpression(text, where, st.ctx.problems, { textColumn });
  if (expr && textColumn !== undefined) st.textColumns.set(expr, textColumn);
  return expr;
}

/** A problem about an undeclared or misused name inside an expression, pointing at the name. */
export function nameInExpression(st: LoadState, expr: Expr, name: string): SourceLocation {
  const col = st.textColumns.get(expr);
  if (col === undefined) return expr.where;
  const m = new RegExp(`(?<![A-Za-z0-9_$])${name}(?![A-Za-z0-9_$])`).exec(expr.text);
  return m ? { ...expr.where, column: col + m.index } : expr.where;
}

export function undeclaredHint(st: LoadState, name: string): string {
  const names = [...st.declared.keys()];
  return `declare it under states, inputs, parameters or define, or correct the spelling: ${suggestion(name, names, 'names')}`;
}
