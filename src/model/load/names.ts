/**
 * Rules for the names a model declares (states, inputs, parameters, defines, outputs) and for
 * experiment and model names, which also end up in file and folder names.
 */
import { NAME_PATTERN, PARSER_WORDS } from '../expression-scan.js';
import { isFunctionName } from '../functions/registry.js';
import { LIMITS } from '../limits.js';

/** Names with a meaning in expressions: time and the two constants (model-format.md). */
const RESERVED_SYMBOLS: ReadonlySet<string> = new Set(['t', 'pi', 'e']);

/**
 * Why `name` cannot be declared, or undefined when it can. Names that are properties of every
 * JavaScript object (`constructor`, `toString`...) are refused so that no lookup downstream can
 * ever confuse a user's name with a built-in.
 */
export function nameProblem(name: string): string | undefined {
  if (name.length > LIMITS.nameChars) return `the name is longer than ${LIMITS.nameChars} characters`;
  if (!NAME_PATTERN.test(name)) return `"${name}" is not a valid name: use letters, digits and _, starting with a letter`;
  if (RESERVED_SYMBOLS.has(name)) return `"${name}" is reserved (t is time, pi and e are the constants)`;
  if (PARSER_WORDS.has(name)) return `"${name}" is a reserved word in expressions`;
  if (isFunctionName(name)) return `"${name}" is the name of a function`;
  if (name in Object.prototype || name === 'prototype') return `"${name}" is reserved`;
  return undefined;
}

/**
 * Experiment and model names appear in messages, in `name@experiment` and in output file and
 * folder names, so they must be safe there: letters, digits, `_`, `-`, `.`, no `..`, no slashes.
 */
const LABEL_PATTERN = /^[A-Za-z0-9][A-Za-z0-9_.-]*$/;

export function labelProblem(label: string): string | undefined {
  if (label.length > LIMITS.nameChars) return `"${label.slice(0, 20)}..." is longer than ${LIMITS.nameChars} characters`;
  if (!LABEL_PATTERN.test(label) || label.includes('..')) {
    return `"${label}" is not a valid name: use letters, digits, _, - and . (starting with a letter or digit, no "..")`;
  }
  if (label in Object.prototype || label === 'prototype') return `"${label}" is reserved`;
  return undefined;
}
