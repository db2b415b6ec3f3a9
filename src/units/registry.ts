/**
 * The unit vocabulary: a private mathjs instance (so that registering units never leaks into other
 * users of mathjs) with the units engineers log that mathjs lacks.
 */
import type { MathJsInstance, Unit } from 'mathjs';
import { all, create } from '../util/mathjs.js';
import { LIMITS } from '../model/limits.js';

export const unitMath: MathJsInstance = create(all, {});

// Revolutions per minute: 1 rpm = 2*pi/60 rad/s (exact by definition of the revolution).
unitMath.createUnit('rpm', { definition: unitMath.unit(2 * Math.PI / 60, 'rad/s') }, { override: true });

/** Index of mathjs's ANGLE base dimension: angles are dimensionless for our checks (rad = 1). */
const ANGLE_INDEX = unitMath.Unit.BASE_DIMENSIONS.indexOf('ANGLE');

/**
 * Parse a unit string ('' means dimensionless). Returns undefined when mathjs does not know it;
 * callers turn that into a Problem naming the key.
 */
export function parseUnit(text: string): Unit | undefined {
  // Bounded before any pattern or parser sees it: a unit string from a log or an option may be huge.
  if (text.length > LIMITS.unitChars) return undefined;
  const s = text.trim();
  // mathjs has no empty unit; a radian stands for "dimensionless" because angles count as 1 here.
  if (s === '' || s === '1') return unitMath.unit('rad');
  // "1/s" style: mathjs reads the leading 1 as a value, so take the reciprocal of the rest.
  const reciprocal = /^1\s*\/\s*(.+)$/.exec(s);
  if (reciprocal) {
    const rest = parseUnit(reciprocal[1].startsWith('(') ? reciprocal[1] : `(${reciprocal[1]})`);
    return rest ? (unitMath.pow(rest, -1) as Unit) : undefined;
  }
  try {
    const u = unitMath.unit(s);
    // A unit string must not carry a number of its own ("2 kg" is a value, not a unit).
    if (u.value !== null && u.value !== undefined) return undefined;
    return u;
  } catch {
    return undefined;
  }
}

/** The dimension exponents of a unit with angles removed (rad counts as dimensionless). */
export function dimensionOf(u: Unit): number[] {
  const dims = [...(u as unknown as { dimensions: number[] }).dimensions];
  if (ANGLE_INDEX >= 0) dims[ANGLE_INDEX] = 0;
  return dims;
}

export function sameDimension(a: Unit, b: Unit): boolean {
  const da = dimensionOf(a);
  const db = dimensionOf(b);
  return da.every((v, i) => Math.abs(v - db[i]) < 1e-12);
}

/** SI value of one of this unit (e.g. mm -> 0.001), ignoring offsets (degC -> 1). */
export function siScale(u: Unit): number {
  const units = (u as unknown as { units: { unit: { value: number }; prefix: { value: number }; power: number }[] }).units;
  let f = 1;
  for (const part of units) f *= Math.pow(part.unit.value * part.prefix.value, part.power);
  return f;
}

/** Offset of an affine unit (degC: 273.15 K), 0 for ordinary units. */
export function hasOffset(u: Unit): boolean {
  const units = (u as unknown as { units: { unit: { offset: number } }[] }).units;
  return units.some((part) => part.unit.offset !== 0);
}

/** Words for a unit's dimension in SI base units, for messages (e.g. "kg*m/s^2"). */
export function describeDimension(u: Unit): string {
  const names = ['kg', 'm', 's', 'A', 'K', 'cd', 'mol', '', 'bit'];
  const dims = dimensionOf(u);
  const num: string[] = [];
  const den: string[] = [];
  dims.forEach((p, i) => {
    if (!p || !names[i]) return;
    const name = names[i];
    const abs = Math.abs(p);
    const part = abs === 1 ? name : `${name}^${+abs.toFixed(6)}`;
    (p > 0 ? num : den).push(part);
  });
  if (!num.length && !den.length) return '1 (dimensionless)';
  return `${num.length ? num.join('*') : '1'}${den.length ? '/' + (den.length > 1 ? `(${den.join('*')})` : den[0]) : ''}`;
}
