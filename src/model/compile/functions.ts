/**
 * The fixed table of functions the model language allows (model-format.md, Expressions), with
 * their arity and the JavaScript they become. Generated code calls only what this table names.
 */

export interface FunctionInfo {
  /** Fewest and most arguments (Infinity: any number). */
  minArgs: number;
  maxArgs: number;
  /** The JavaScript callee written into generated code. */
  js: string;
  /** The same computation, for folding constant arguments at compile time. */
  evaluate: (...args: number[]) => number;
}

function fixed(n: number, js: string, evaluate: (...args: number[]) => number): FunctionInfo {
  return { minArgs: n, maxArgs: n, js, evaluate };
}

export const FUNCTIONS = {
  sin: fixed(1, 'Math.sin', Math.sin),
  cos: fixed(1, 'Math.cos', Math.cos),
  tan: fixed(1, 'Math.tan', Math.tan),
  asin: fixed(1, 'Math.asin', Math.asin),
  acos: fixed(1, 'Math.acos', Math.acos),
  atan: fixed(1, 'Math.atan', Math.atan),
  atan2: fixed(2, 'Math.atan2', Math.atan2),
  sinh: fixed(1, 'Math.sinh', Math.sinh),
  cosh: fixed(1, 'Math.cosh', Math.cosh),
  tanh: fixed(1, 'Math.tanh', Math.tanh),
  exp: fixed(1, 'Math.exp', Math.exp),
  /** Natural logarithm (the two-argument form log(x, base) is rewritten as log(x)/log(base)). */
  log: fixed(1, 'Math.log', Math.log),
  log10: fixed(1, 'Math.log10', Math.log10),
  sqrt: fixed(1, 'Math.sqrt', Math.sqrt),
  abs: fixed(1, 'Math.abs', Math.abs),
  sign: fixed(1, 'Math.sign', Math.sign),
  min: { minArgs: 1, maxArgs: Infinity, js: 'Math.min', evaluate: Math.min },
  max: { minArgs: 1, maxArgs: Infinity, js: 'Math.max', evaluate: Math.max },
  hypot: { minArgs: 1, maxArgs: Infinity, js: 'Math.hypot', evaluate: Math.hypot },
} satisfies Record<string, FunctionInfo>;

export type FunctionName = keyof typeof FUNCTIONS;

/**
 * Names accepted in a model's expressions. `pow(a, b)` is the operator `a ^ b` and `log(x, b)`
 * the quotient of logarithms; neither needs a table entry of its own.
 */
export const MODEL_FUNCTIONS: readonly string[] = [...Object.keys(FUNCTIONS), 'pow'];

export function isFunctionName(name: string): name is FunctionName {
  return Object.prototype.hasOwnProperty.call(FUNCTIONS, name);
}
