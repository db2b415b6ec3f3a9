/** Option values as the commands parse them (light: every command registers at start-up). */
import { UserError } from '../errors.js';

/** A whole number of at least `min` given to `option`, or undefined when the option is absent. */
export function integerOption(text: string | undefined, option: string, min: number): number | undefined {
  if (text === undefined) return undefined;
  const v = Number(text);
  if (!Number.isInteger(v) || v < min) {
    throw new UserError({ where: { key: option }, what: `${option} must be an integer of at least ${min}, not "${text}"`, fix: `e.g. ${option} ${Math.max(min, 8)}` });
  }
  return v;
}
