/**
 * The functions of the model's expression language (model-format.md, Expressions): one entry per
 * function, the one place that says what a function is. The checker reads the arity, the compiler
 * the code, the constant folding and the derivative rule, the unit checker the unit rule, and the
 * README's table the doc (a test keeps the table equal to this registry).
 *
 * Nothing here imports the compiler or the unit checker, so that each can read the registry
 * without a cycle: unit rules are data that src/units/dimensions.ts interprets, and derivative
 * rules build on `DerivativeBuilder`, which the compiler's expression pool provides.
 */

/**
 * The names, spelt out because the derivative rules' builder calls functions by name (deriving
 * the type from FUNCTIONS would be circular); the type of FUNCTIONS refuses a name without an
 * entry and an entry without a name.
 */
export type FunctionName =
  | 'sin' | 'cos' | 'tan' | 'asin' | 'acos' | 'atan' | 'sinh' | 'cosh' | 'tanh' | 'exp' | 'log' | 'log10'
  | 'sqrt' | 'abs' | 'sign' | 'atan2' | 'pow' | 'min' | 'max' | 'hypot';

/**
 * What a function asks of the units of its arguments, and the unit of its result.
 * - `plain`: the argument must be a plain number (with `angle`: or an angle in rad); the result
 *   is a plain number;
 * - `power`: as the operator ^, a base with a unit needs a constant exponent, the exponent a plain
 *   number;
 * - `agree`: every argument must have the same unit (one argument: any unit), and the result is
 *   a plain number (`plain`), that unit (`same`), that unit as a difference rather than a reading
 *   on an offset scale such as degC (`magnitude`), or its square root (`root`).
 */
export type UnitRule =
  | { args: 'plain'; angle?: boolean }
  | { args: 'power' }
  | { args: 'agree'; result: 'plain' | 'same' | 'magnitude' | 'root' };

/** The operations a derivative rule builds with (the compiler's ExprPool provides them). */
export interface DerivativeBuilder {
  readonly ZERO: number;
  readonly ONE: number;
  add(a: number, b: number): number;
  sub(a: number, b: number): number;
  mul(a: number, b: number): number;
  div(a: number, b: number): number;
  pow(a: number, b: number): number;
  cond(c: number, a: number, b: number): number;
  compare(op: 'le' | 'ge' | 'eq' | 'ne', a: number, b: number): number;
  call(name: FunctionName, args: number[]): number;
}

/** One call being differentiated: its own node, its arguments, and d/ds of an argument. */
export interface DerivativeCall {
  self: number;
  args: readonly number[];
  d(arg: number): number;
}

/**
 * `mathjs`: mathjs `derivative` differentiates the function the way we want (numerics.md);
 * otherwise our own rule, for what mathjs lacks or writes with a NaN at a kink.
 */
export type DerivativeRule = 'mathjs' | ((b: DerivativeBuilder, call: DerivativeCall) => number);

export interface FunctionEntry {
  /** Fewest and most arguments (Infinity: any number). */
  arity: readonly [min: number, max: number];
  /** The JavaScript callee written into generated code. */
  js: string;
  /** The same computation, for folding constant arguments at compile time. */
  evaluate: (...args: number[]) => number;
  units: UnitRule;
  derivative: DerivativeRule;
  /** Set when the function is an operator by another name: compiled and folded as `a ^ b`. */
  operator?: 'pow';
  /** One line for the README's table of functions. */
  doc: string;
}

const PLAIN: UnitRule = { args: 'plain' };
const ANGLE: UnitRule = { args: 'plain', angle: true };

function smooth(js: string, evaluate: (x: number) => number, units: UnitRule, doc: string): FunctionEntry {
  return { arity: [1, 1], js, evaluate, units, derivative: 'mathjs', doc };
}

/**
 * min, max: the derivative of the selected argument, the first one on ties, as a chain of
 * conditionals over the running minimum (maximum) of the arguments so far.
 */
function selectedSlope(name: 'min' | 'max'): DerivativeRule {
  const pick = name === 'min' ? 'le' : 'ge';
  return (b, { args, d }) => {
    let value = args[0]!;
    let slope = d(value);
    for (let i = 1; i < args.length; i++) {
      const next = args[i]!;
      slope = b.cond(b.compare(pick, value, next), slope, d(next));
      value = b.call(name, args.slice(0, i + 1));
    }
    return slope;
  };
}

/**
 * a ^ b with b not a number: b a^(b-1) da + a^b log(a) db, the second term 0 where a = 0 (mathjs
 * writes a^b (da b/a + db log a), which is NaN at a = 0 even when db = 0). A constant exponent is
 * left to mathjs, for the function and the operator alike.
 */
function powerSlope(b: DerivativeBuilder, { self, args, d }: DerivativeCall): number {
  const [base, exponent] = [args[0]!, args[1]!];
  const viaBase = b.mul(b.mul(exponent, b.pow(base, b.sub(exponent, b.ONE))), d(base));
  const dExponent = d(exponent);
  if (dExponent === b.ZERO) return viaBase;
  const logTerm = b.cond(b.compare('eq', base, b.ZERO), b.ZERO, b.mul(self, b.call('log', [base])));
  return b.add(viaBase, b.mul(logTerm, dExponent));
}

/** The registry, in the order the checker lists the functions in its messages. */
export const FUNCTIONS: Readonly<Record<FunctionName, FunctionEntry>> = {
  sin: smooth('Math.sin', Math.sin, ANGLE, 'sine; the argument is a plain number or an angle in rad'),
  cos: smooth('Math.cos', Math.cos, ANGLE, 'cosine; the argument is a plain number or an angle in rad'),
  tan: smooth('Math.tan', Math.tan, ANGLE, 'tangent; the argument is a plain number or an angle in rad'),
  asin: smooth('Math.asin', Math.asin, PLAIN, 'arcsine, in rad'),
  acos: smooth('Math.acos', Math.acos, PLAIN, 'arccosine, in rad'),
  atan: smooth('Math.atan', Math.atan, PLAIN, 'arctangent, in rad'),
  sinh: smooth('Math.sinh', Math.sinh, PLAIN, 'hyperbolic sine'),
  cosh: smooth('Math.cosh', Math.cosh, PLAIN, 'hyperbolic cosine'),
  tanh: smooth('Math.tanh', Math.tanh, PLAIN, 'hyperbolic tangent: `Tc*tanh(w/ws)` is a smooth Coulomb friction'),
  exp: smooth('Math.exp', Math.exp, PLAIN, 'exponential'),
  log: smooth('Math.log', Math.log, PLAIN, 'natural logarithm'),
  log10: smooth('Math.log10', Math.log10, PLAIN, 'base-10 logarithm'),
  sqrt: smooth('Math.sqrt', Math.sqrt, { args: 'agree', result: 'root' }, 'square root; halves the exponents of the unit (`sqrt(m^2)` is m)'),
  abs: {
    arity: [1, 1], js: 'Math.abs', evaluate: Math.abs, units: { args: 'agree', result: 'magnitude' },
    derivative: (b, { args, d }) => b.mul(b.call('sign', [args[0]!]), d(args[0]!)),
    doc: 'absolute value, in the unit of its argument; `d abs(x) = sign(x) dx` (0 at x = 0)',
  },
  sign: {
    arity: [1, 1], js: 'Math.sign', evaluate: Math.sign, units: { args: 'agree', result: 'plain' },
    derivative: (b) => b.ZERO,
    doc: '-1, 0 or 1 as the argument is negative, zero or positive; derivative 0',
  },
  atan2: {
    arity: [2, 2], js: 'Math.atan2', evaluate: Math.atan2, units: { args: 'agree', result: 'plain' },
    // (x dy - y dx) / (x^2 + y^2) for atan2(y, x).
    derivative: (b, { args: [y, x], d }) =>
      b.div(b.sub(b.mul(x!, d(y!)), b.mul(y!, d(x!))), b.add(b.mul(x!, x!), b.mul(y!, y!))),
    doc: '`atan2(y, x)`: the angle of the point (x, y) in rad, in all four quadrants; y and x in one unit',
  },
  pow: {
    arity: [2, 2], js: 'Math.pow', evaluate: Math.pow, units: { args: 'power' }, operator: 'pow',
    derivative: powerSlope,
    doc: '`pow(x, y)` is `x ^ y`; a base with a unit needs a constant exponent',
  },
  min: {
    arity: [2, Infinity], js: 'Math.min', evaluate: Math.min, units: { args: 'agree', result: 'same' },
    derivative: selectedSlope('min'),
    doc: 'the smallest argument, all in one unit; the derivative is that of the selected argument (the first on ties)',
  },
  max: {
    arity: [2, Infinity], js: 'Math.max', evaluate: Math.max, units: { args: 'agree', result: 'same' },
    derivative: selectedSlope('max'),
    doc: 'the largest argument, all in one unit; the derivative is that of the selected argument (the first on ties)',
  },
  hypot: {
    arity: [2, Infinity], js: 'Math.hypot', evaluate: Math.hypot, units: { args: 'agree', result: 'magnitude' },
    // sum(a_i da_i) / hypot(a...), 0 where hypot is 0 (like d abs at 0).
    derivative: (b, { self, args, d }) => {
      let num = b.ZERO;
      for (const a of args) num = b.add(num, b.mul(a, d(a)));
      return b.cond(b.compare('ne', self, b.ZERO), b.div(num, self), b.ZERO);
    },
    doc: '`sqrt(x^2 + y^2 + ...)` without overflow, all arguments in one unit; derivative 0 at the origin',
  },
};

/** The function names, in the registry's order. */
export const FUNCTION_NAMES = Object.keys(FUNCTIONS) as readonly FunctionName[];

export function isFunctionName(name: string): name is FunctionName {
  return Object.prototype.hasOwnProperty.call(FUNCTIONS, name);
}
