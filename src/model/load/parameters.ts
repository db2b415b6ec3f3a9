/**
 * The `parameters` section: fixed (measured) and free (estimated within bounds) parameters, with
 * the shorthands `m: 2.5` and `m: "2.5 kg"` and the defaults of model-format.md (start, scale).
 */
import type { FreeParameterSpec, ParameterSpec } from '../types.js';
import { declare, type LoadState } from './load-state.js';
import { LIMITS } from '../limits.js';
import {
  at, byKey, deref, describeNode, isNullish, keyPath, mapEntries, readBoolean, readChoice, readNumber, readString, sectionEntries,
  scalarOf, seqItems, type Entry, type YNode,
} from './yaml-source.js';

const PARAMETER_KEYS = ['fixed', 'free', 'start', 'unit', 'per_experiment', 'scale'] as const;

/** A number followed by an optional unit: `2.5`, `2.5 kg`, `-1e-3 N*m/A`. */
const VALUE_WITH_UNIT = /^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$/;

function splitValueAndUnit(text: string): { value: number; unit: string } | undefined {
  const m = VALUE_WITH_UNIT.exec(text);
  if (!m) return undefined;
  const value = Number(m[1]);
  if (!Number.isFinite(value)) return undefined;
  return { value, unit: m[2] };
}

export function readParameters(st: LoadState, node: YNode, path = 'parameters'): ParameterSpec[] {
  const entries = sectionEntries(st.ctx, node, path, 'parameters', LIMITS.parameters, 'parameters');
  if (!entries) return [];
  const out: ParameterSpec[] = [];
  for (const e of entries) {
    const ok = declare(st, e.key, 'parameter', e.keyNode, e.path);
    const p = readParameter(st, e);
    if (ok && p) out.push(p);
  }
  return out;
}

function readParameter(st: LoadState, e: Entry): ParameterSpec | undefined {
  const { ctx } = st;
  const where = at(ctx, e.keyNode, e.path);
  const value = deref(ctx, e.value);
  const scalar = scalarOf(ctx, value);
  if (scalar) {
    // Shorthand: a fixed value, maybe with its unit.
    const fixed = readFixedValue(st, value, e.path, `parameter ${e.key}`);
    if (!fixed) return undefined;
    recordUnit(st, fixed.unit, value, e.path, e.key);
    return { kind: 'fixed', name: e.key, unit: fixed.unit, value: fixed.value, where };
  }
  const entries = mapEntries(ctx, value, e.path, `parameter ${e.key}`, PARAMETER_KEYS);
  if (!entries) return undefined;
  const k = byKey(entries);
  const fixedE = k.get('fixed');
  const freeE = k.get('free');
  let unit = '';
  const unitE = k.get('unit');
  if (unitE) unit = readString(ctx, unitE.value, unitE.path, `the unit of ${e.key}`, LIMITS.unitChars) ?? '';

  if (fixedE && freeE) {
    ctx.problems.add(at(ctx, fixedE.keyNode, e.path), `parameter ${e.key} has both fixed and free`, 'a parameter is either measured (fixed: value) or estimated (free: [min, max]); keep one');
    return undefined;
  }
  if (!fixedE && !freeE) {
    ctx.problems.add(where, `parameter ${e.key} needs either fixed or free`, `write ${e.key}: { fixed: 2.5 } for a measured value or ${e.key}: { free: [0.1, 10] } to estimate it`);
    return undefined;
  }
  if (fixedE) {
    for (const only of ['start', 'scale', 'per_experiment'] as const) {
      const x = k.get(only);
      if (x) ctx.problems.add(at(ctx, x.keyNode, x.path), `"${only}" applies only to free parameters, and ${e.key} is fixed`, `remove ${only}, or make ${e.key} free: [min, max]`);
    }
    const fixed = readFixedValue(st, fixedE.value, fixedE.path, `the fixed value of ${e.key}`);
    if (!fixed) return undefined;
    if (fixed.unit && unitE && fixed.unit !== unit) {
      ctx.problems.add(at(ctx, deref(ctx, fixedE.value), fixedE.path), `the fixed value of ${e.key} says ${fixed.unit} but its unit is ${unit}`,
        'give the unit once, under unit, and the value as a plain number');
      return undefined;
    }
    if (!unitE) unit = fixed.unit;
    recordUnit(st, unit, unitE?.value ?? fixedE.value, unitE?.path ?? fixedE.path, e.key);
    return { kind: 'fixed', name: e.key, unit, value: fixed.value, where };
  }
  recordUnit(st, unit, unitE?.value, unitE?.path ?? e.path, e.key);
  return readFree(st, e, k, unit);
}

/** A fixed value: a number, or a text "2.5 kg" (value and unit). */
function readFixedValue(st: LoadState, node: YNode, path: string, what: string): { value: number; unit: string } | undefined {
  const s = scalarOf(st.ctx, node);
  if (s && typeof s.value === 'string') {
    const parsed = splitValueAndUnit(s.value);
    if (parsed) return parsed;
    st.ctx.problems.add(at(st.ctx, s, path), `${what} must be a number or a number with a unit such as "2.5 kg", got ${describeNode(st.ctx, s)}`,
      'write a number (a fixed parameter is a measured value; expressions belong under define)');
    return undefined;
  }
  const v = readNumber(st.ctx, node, path, what);
  return v === undefined ? undefined : { value: v, unit: '' };
}

function recordUnit(st: LoadState, unit: string, node: YNode, path: string, name: string): void {
  if (!unit) return;
  st.units.push({ text: unit, where: at(st.ctx, deref(st.ctx, node) ?? undefined, path), label: `the unit of parameter ${name}`, kind: 'symbol' });
}

function readFree(st: LoadState, e: Entry, k: Map<string, Entry>, unit: string): FreeParameterSpec | undefined {
  const { ctx } = st;
  const freeE = k.get('free')!;
  const items = seqItems(ctx, freeE.value, freeE.path, `free (the bounds of ${e.key})`, 'free: [min, max]');
  if (!items) return undefined;
  const freeWhere = at(ctx, deref(ctx, freeE.value), freeE.path);
  if (items.length !== 2) {
    ctx.problems.add(freeWhere, `free must list exactly two bounds [min, max], got ${items.length}`, 'write free: [min, max]; an open side is .inf or -.inf');
    return undefined;
  }
  const min = readNumber(ctx, items[0], keyPath(freeE.path, 0), `the lower bound of ${e.key}`, { infinite: true });
  const max = readNumber(ctx, items[1], keyPath(freeE.path, 1), `the upper bound of ${e.key}`, { infinite: true });
  const scaleE = k.get('scale');
  const scaleGiven = scaleE ? readChoice(ctx, scaleE.value, scaleE.path, 'scale', ['log', 'linear'] as const) : undefined;
  const perE = k.get('per_experiment');
  const perExperiment = perE ? readBoolean(ctx, perE.value, perE.path, 'per_experiment') ?? false : false;
  const startE = k.get('start');
  const startGiven = startE && !isNullish(ctx, startE.value) ? readNumber(ctx, startE.value, startE.path, `the start of ${e.key}`) : undefined;
  if (min === undefined || max === undefined) return undefined;
  if (scaleE && scaleGiven === undefined) return undefined;
  if (startE && startGiven === undefined) return undefined;

  if (!(min < max)) {
    ctx.problems.add(freeWhere, `the bounds of ${e.key} must satisfy min < max, got [${min}, ${max}]`, 'write the smaller bound first; to hold a value constant, use fixed');
    return undefined;
  }
  const infinite = !Number.isFinite(min) || !Number.isFinite(max);
  if (infinite && scaleGiven !== 'linear') {
    ctx.problems.add(freeWhere, `${e.key} has an infinite bound, which needs scale: linear`,
      scaleGiven === 'log' ? 'use finite bounds above 0 with scale: log' : 'add scale: linear (and a start value), or give finite bounds');
    return undefined;
  }
  if (scaleGiven === 'log' && !(min > 0)) {
    ctx.problems.add(at(ctx, deref(ctx, scaleE!.value), scaleE!.path), `scale: log needs a lower bound above 0, but ${e.key} has min = ${min}`,
      'raise the lower bound above 0, or use scale: linear');
    return undefined;
  }
  // Defaults of model-format.md: a range over more than two decades is searched in log coordinates,
  // starting at its geometric mean.
  const wide = min > 0 && Number.isFinite(max) && max / min > 100;
  let start: number;
  if (startGiven !== undefined) {
    if (startGiven < min || startGiven > max) {
      ctx.problems.add(at(ctx, deref(ctx, startE!.value), startE!.path), `the start of ${e.key} (${startGiven}) is outside its bounds [${min}, ${max}]`,
        'give a start within the bounds, or widen the bounds');
      return undefined;
    }
    start = startGiven;
  } else if (infinite) {
    ctx.problems.add(freeWhere, `${e.key} has an infinite bound, so its start cannot default to the middle`, `add start: <first guess> to ${e.key}`);
    return undefined;
  } else {
    start = wide ? Math.sqrt(min * max) : (min + max) / 2;
  }
  return {
    kind: 'free',
    name: e.key,
    unit,
    min,
    max,
    start,
    scale: scaleGiven ?? (wide ? 'log' : 'linear'),
    perExperiment,
    where: at(ctx, e.keyNode, e.path),
  };
}
