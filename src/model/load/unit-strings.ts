/**
 * Unit strings in the model file: known to the unit registry, time units where a time unit is
 * needed, and column units convertible into the unit they are read into.
 */
import { unitConverter } from '../../units/convert.js';
import { parseUnit, sameDimension } from '../../units/registry.js';
import type { LoadState } from './load-state.js';

const SECOND = parseUnit('s')!;

export function checkUnitStrings(st: LoadState, unitsChecked: boolean): void {
  const { problems } = st.ctx;
  for (const ref of st.units) {
    const u = parseUnit(ref.text);
    if (ref.kind === 'symbol') {
      // With `units: off` a unit is only a label for reports, so an unknown one is accepted.
      if (!u && unitsChecked) {
        problems.add(ref.where, `${ref.label} "${ref.text}" is not a known unit`,
          'use SI and engineering units such as m, mm, kg, N*m, rad/s, rpm, degC, bar, psi, lbf, in; or set units: off to use units as labels only');
      }
      continue;
    }
    if (!u) {
      problems.add(ref.where, `${ref.label} "${ref.text}" is not a known unit`, 'use a unit such as s, ms, min, mm, deg, rpm or degC');
      continue;
    }
    if (ref.kind === 'time') {
      if (!sameDimension(u, SECOND)) problems.add(ref.where, `${ref.label} "${ref.text}" is not a unit of time`, 'use s, ms, us, min or h');
      continue;
    }
    const into = ref.into ?? '';
    const conv = unitConverter(ref.text, into);
    if (!conv.ok) {
      problems.add(ref.where, `${ref.label}: ${conv.reason}`,
        into ? `give a column unit of the same kind as ${into}` : 'declare the unit the values are read into (unit: ...) as well');
    }
  }
}

/** The model's time_unit must be a known unit of time. */
export function timeUnitProblem(text: string): string | undefined {
  const u = parseUnit(text);
  if (!u) return `time_unit "${text}" is not a known unit`;
  if (!sameDimension(u, SECOND)) return `time_unit "${text}" is not a unit of time`;
  return undefined;
}
