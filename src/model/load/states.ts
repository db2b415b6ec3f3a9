/** The `states` and `equations` sections: one equation per state, same names. */
import type { EquationSpec, Expr, StateSpec } from '../types.js';
import { declare, readExpression, type LoadState } from './load-state.js';
import { LIMITS } from '../limits.js';
import { suggestion } from '../../presentation/nearest-names.js';
import { parseExpression } from '../expression-check.js';
import { at, byKey, deref, isNullish, mapEntries, readString, sectionEntries, type YNode } from './yaml-source.js';

const STATE_KEYS = ['unit', 'initial'] as const;

export function readStates(st: LoadState, node: YNode, path = 'states'): StateSpec[] {
  const entries = sectionEntries(st.ctx, node, path, 'states', LIMITS.states, 'states');
  if (!entries) return [];
  const out: StateSpec[] = [];
  for (const e of entries) {
    const ok = declare(st, e.key, 'state', e.keyNode, e.path);
    const where = at(st.ctx, e.keyNode, e.path);
    // `x: {}` or `x:` is a dimensionless state starting at 0.
    const fields = isNullish(st.ctx, e.value) ? [] : mapEntries(st.ctx, e.value, e.path, `state ${e.key}`, STATE_KEYS);
    if (!fields) continue;
    const k = byKey(fields);
    let unit = '';
    const unitE = k.get('unit');
    if (unitE) {
      unit = readString(st.ctx, unitE.value, unitE.path, `the unit of ${e.key}`, LIMITS.unitChars) ?? '';
      if (unit) st.units.push({ text: unit, where: at(st.ctx, deref(st.ctx, unitE.value), unitE.path), label: `the unit of state ${e.key}`, kind: 'symbol' });
    }
    const initE = k.get('initial');
    let initial: Expr | undefined;
    if (initE && !isNullish(st.ctx, initE.value)) initial = readExpression(st, initE.value, initE.path, `the initial value of ${e.key}`);
    else initial = parseExpression(0, { ...where, key: `${e.path}.initial` }, st.ctx.problems);
    if (ok && initial) out.push({ name: e.key, unit, initial, where });
  }
  return out;
}

/** Equations aligned with `states`; missing and extra equations are problems. */
export function readEquations(st: LoadState, node: YNode, states: readonly StateSpec[], stateNames: ReadonlySet<string>, path = 'equations'): EquationSpec[] {
  const entries = mapEntries(st.ctx, node, path, 'equations');
  if (!entries) return [];
  const byState = new Map<string, EquationSpec>();
  for (const e of entries) {
    const expr = readExpression(st, e.value, e.path, `the equation for ${e.key}`);
    if (!stateNames.has(e.key)) {
      st.ctx.problems.add(at(st.ctx, e.keyNode, e.path), `there is an equation for "${e.key}", which is not a state`,
        `equations are keyed by state name (d(state)/dt); ${suggestion(e.key, [...stateNames], 'states')}`);
      continue;
    }
    if (expr) byState.set(e.key, { state: e.key, expr });
  }
  const parsedKeys = new Set(entries.map((e) => e.key));
  for (const s of states) {
    if (!parsedKeys.has(s.name)) {
      st.ctx.problems.add({ ...s.where }, `state ${s.name} has no equation`, `add "${s.name}: <d${s.name}/dt>" under equations`);
    }
  }
  return states.map((s) => byState.get(s.name)).filter((x): x is EquationSpec => x !== undefined);
}
