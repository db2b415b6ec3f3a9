/**
 * Names used in expressions: every one must be declared, and initial values may use only
 * parameters (and defines of parameters only), never states, inputs or time.
 */
import { symbolsOf } from '../expression-check.js';
import type { DefineSpec, Expr, InputSpec } from '../types.js';
import { nameInExpression, undeclaredHint, type LoadState } from './load-state.js';
import { suggestion } from '../../presentation/nearest-names.js';

/** Where an expression stands: what it may read. */
export type ExpressionRole = 'dynamic' | 'initial';

/**
 * Defines whose value changes in time (they read a state, an input, t, or such a define), in
 * dependency order. Defines left out of `ordered` (on a cycle) count as changing.
 */
export function timeVaryingDefines(st: LoadState, ordered: readonly DefineSpec[]): Set<string> {
  const varying = new Set<string>();
  const constant = new Set<string>();
  for (const d of ordered) {
    const uses = [...symbolsOf(d.expr.node)];
    const v = uses.some((s) => {
      if (s === 't') return true;
      const k = st.declared.get(s)?.kind;
      if (k === 'state' || k === 'input') return true;
      if (k === 'define') return !constant.has(s);
      return false;
    });
    (v ? varying : constant).add(d.name);
  }
  for (const [name, decl] of st.declared) if (decl.kind === 'define' && !constant.has(name)) varying.add(name);
  return varying;
}

/** Check the names one expression reads; adds a problem per offending name. */
export function checkNames(st: LoadState, expr: Expr, label: string, role: ExpressionRole, opts: { isStatic: boolean; varying: ReadonlySet<string> }): void {
  const before = st.ctx.problems.items.length;
  for (const name of symbolsOf(expr.node)) {
    const where = nameInExpression(st, expr, name);
    if (name === 'pi' || name === 'e') continue;
    if (name === 't') {
      if (role === 'initial') st.ctx.problems.add(where, `${label} uses the time t`, 'an initial value is a number or an expression of parameters');
      else if (opts.isStatic) st.ctx.problems.add(where, `${label} uses the time t, but the model is static (no states)`, 'a static model relates outputs to inputs row by row; log time as an input if it matters');
      continue;
    }
    const decl = st.declared.get(name);
    if (!decl) {
      st.ctx.problems.add(where, `${label} uses "${name}", which is not declared`, undeclaredHint(st, name));
      continue;
    }
    if (role !== 'initial') continue;
    if (decl.kind === 'state' || decl.kind === 'input') {
      st.ctx.problems.add(where, `${label} uses the ${decl.kind} ${name}`, 'an initial value is a number or an expression of parameters (not of states or inputs)');
    } else if (decl.kind === 'define' && opts.varying.has(name)) {
      st.ctx.problems.add(where, `${label} uses ${name}, a define that depends on states, inputs or time`, 'an initial value may use only parameters and defines of parameters');
    }
  }
  if (st.ctx.problems.items.length > before) st.badNames.add(expr);
}

/** A delay given by name must name a parameter. */
export function checkDelays(st: LoadState, inputs: readonly InputSpec[], parameterNames: readonly string[]): void {
  for (const input of inputs) {
    if (typeof input.delay !== 'string') continue;
    const decl = st.declared.get(input.delay);
    if (decl?.kind === 'parameter') continue;
    const where = { ...input.where, key: `inputs.${input.name}.delay` };
    if (decl) st.ctx.problems.add(where, `the delay of ${input.name} names the ${decl.kind} ${input.delay}; a delay is a number or a parameter`, `declare the delay under parameters`);
    else st.ctx.problems.add(where, `the delay of ${input.name} names "${input.delay}", which is not a parameter`, suggestion(input.delay, parameterNames, 'parameters'));
  }
}
