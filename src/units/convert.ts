/**
 * Conversion of logged values into the model's units (column_unit -> unit), including offset
 * units (degC, degF), through the unit registry.
 */
import { describeDimension, hasOffset, parseUnit, sameDimension, siScale, unitMath } from './registry.js';

export type Converter = (value: number) => number;

export type ConverterResult =
  | { ok: true; convert: Converter; factor: number; offset: number }
  | { ok: false; reason: string };

/**
 * A converter from `from` into `to`: value_to = factor * value_from + offset (exact for affine
 * units such as degC -> K). Fails, with a reason in words, when either unit is unknown or their
 * dimensions differ.
 */
export function unitConverter(from: string, to: string): ConverterResult {
  const a = parseUnit(from);
  if (!a) return { ok: false, reason: `unknown unit "${from}"` };
  const b = parseUnit(to);
  if (!b) return { ok: false, reason: `unknown unit "${to}"` };
  if (!sameDimension(a, b)) {
    return { ok: false, reason: `cannot convert ${from || '1'} (${describeDimension(a)}) into ${to || '1'} (${describeDimension(b)})` };
  }
  if (from.trim() === to.trim()) return { ok: true, convert: (v) => v, factor: 1, offset: 0 };
  // Ratio of SI scales: exact to rounding for every ordinary unit.
  const factor = siScale(a) / siScale(b);
  if (!hasOffset(a) && !hasOffset(b)) return { ok: true, convert: (v) => factor * v, factor, offset: 0 };
  // Affine units (degC, degF): mathjs applies the offsets; the zero point gives ours.
  const offset = unitMath.unit(0, from.trim()).toNumber(to.trim());
  return { ok: true, convert: (v) => factor * v + offset, factor, offset };
}
