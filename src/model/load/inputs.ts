/** The `inputs` section: signals read from each experiment's log. */
import type { InputSpec, Interpolation } from '../types.js';
import { declare, type LoadState } from './load-state.js';
import { LIMITS } from '../limits.js';
import {
  at, byKey, deref, describeNode, isNullish, mapEntries, readChoice, readString, scalarOf, sectionEntries, type YNode,
} from './yaml-source.js';

const INPUT_KEYS = ['unit', 'column', 'column_unit', 'interpolate', 'delay'] as const;

export function readInputs(st: LoadState, node: YNode, path = 'inputs'): InputSpec[] {
  const { ctx } = st;
  const entries = sectionEntries(ctx, node, path, 'inputs', LIMITS.inputs, 'inputs');
  if (!entries) return [];
  const out: InputSpec[] = [];
  for (const e of entries) {
    const ok = declare(st, e.key, 'input', e.keyNode, e.path);
    const where = at(ctx, e.keyNode, e.path);
    const fields = isNullish(ctx, e.value) ? [] : mapEntries(ctx, e.value, e.path, `input ${e.key}`, INPUT_KEYS);
    if (!fields) continue;
    const k = byKey(fields);
    const str = (key: string, what: string, max?: number): string | undefined => {
      const f = k.get(key);
      return f ? readString(ctx, f.value, f.path, what, max) : undefined;
    };
    const unit = str('unit', `the unit of ${e.key}`, LIMITS.unitChars) ?? '';
    const column = str('column', `the column of ${e.key}`) ?? e.key;
    const columnUnit = str('column_unit', `the column unit of ${e.key}`, LIMITS.unitChars);
    const interpE = k.get('interpolate');
    const interpolate: Interpolation = interpE
      ? readChoice(ctx, interpE.value, interpE.path, 'interpolate', ['linear', 'hold'] as const) ?? 'linear'
      : 'linear';
    if (unit) st.units.push({ text: unit, where: at(ctx, deref(ctx, k.get('unit')!.value), `${e.path}.unit`), label: `the unit of input ${e.key}`, kind: 'symbol' });
    if (columnUnit) {
      st.units.push({ text: columnUnit, where: at(ctx, deref(ctx, k.get('column_unit')!.value), `${e.path}.column_unit`), label: `the column unit of input ${e.key}`, kind: 'column', into: unit });
    }
    let delay: number | string | undefined;
    const delayE = k.get('delay');
    if (delayE && !isNullish(ctx, delayE.value)) {
      const s = scalarOf(ctx, delayE.value);
      const dWhere = at(ctx, deref(ctx, delayE.value), delayE.path);
      if (s && typeof s.value === 'number' && Number.isFinite(s.value) && s.value >= 0) delay = s.value;
      else if (s && typeof s.value === 'string' && /^[A-Za-z][A-Za-z0-9_]*$/.test(s.value)) delay = s.value;
      else {
        ctx.problems.add(dWhere, `the delay of ${e.key} must be a number >= 0 (in time_unit) or the name of a parameter, got ${describeNode(ctx, delayE.value)}`,
          'write e.g. delay: 0.05, or delay: tau with tau declared under parameters');
      }
    }
    if (ok) out.push({ name: e.key, unit, column, columnUnit: columnUnit || undefined, interpolate, delay, where });
  }
  return out;
}
