/** The top-level scalars of a model file: format, name, description, time_unit, units. */
import type { SourceLocation } from '../../errors.js';
import type { Model } from '../types.js';
import { LIMITS } from '../limits.js';
import { labelProblem } from './names.js';
import { timeUnitProblem } from './unit-strings.js';
import { at, deref, isNullish, readChoice, readNumber, readString, type Entry, type LoadContext } from './yaml-source.js';

/** A key the model file must have (present and not empty). */
export function requireKey(ctx: LoadContext, k: ReadonlyMap<string, Entry>, rootWhere: SourceLocation, key: string, fix: string): void {
  if (!k.has(key) || isNullish(ctx, k.get(key)!.value)) ctx.problems.add({ ...rootWhere, key }, `the model file has no ${key}`, fix);
}

export function readHeader(ctx: LoadContext, k: ReadonlyMap<string, Entry>, rootWhere: SourceLocation): Pick<Model, 'name' | 'description' | 'timeUnit' | 'units'> {
  const { problems } = ctx;
  requireKey(ctx, k, rootWhere, 'format', 'add format: 1 as the first line');
  const formatE = k.get('format');
  if (formatE && !isNullish(ctx, formatE.value)) {
    const f = readNumber(ctx, formatE.value, 'format', 'format', { integer: true });
    if (f !== undefined && f !== 1) problems.add(at(ctx, deref(ctx, formatE.value), 'format'), `format ${f} is not supported; this version reads format 1`, 'write format: 1 (and the keys of format 1)');
  }
  requireKey(ctx, k, rootWhere, 'name', 'add name: <short name>; it names the default output folders');
  const nameE = k.get('name');
  let name = nameE && !isNullish(ctx, nameE.value) ? readString(ctx, nameE.value, 'name', 'name') ?? '' : '';
  if (name) {
    const bad = labelProblem(name);
    if (bad) {
      problems.add(at(ctx, deref(ctx, nameE!.value), 'name'), `model name: ${bad}`, 'the name becomes part of output folder names; use e.g. flywheel-rig');
      name = '';
    }
  }
  const descE = k.get('description');
  const description = descE && !isNullish(ctx, descE.value) ? readString(ctx, descE.value, 'description', 'description', LIMITS.textChars) ?? '' : '';
  const timeE = k.get('time_unit');
  let timeUnit = 's';
  if (timeE) {
    const tu = readString(ctx, timeE.value, 'time_unit', 'time_unit', LIMITS.unitChars);
    if (tu !== undefined) {
      const bad = timeUnitProblem(tu);
      if (bad) problems.add(at(ctx, deref(ctx, timeE.value), 'time_unit'), bad, 'use s, ms, min or h');
      else timeUnit = tu;
    }
  }
  const unitsE = k.get('units');
  const units = unitsE ? readChoice(ctx, unitsE.value, 'units', 'units', ['check', 'off'] as const) ?? 'check' : 'check';

  return { name, description, timeUnit, units };
}
