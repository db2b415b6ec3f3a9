/**
 * Dimensional checks of a loaded model: the unit of every expression is inferred from the units its
 * symbols declare, and compared with what the place it stands in requires (model-format.md, Units).
 *
 * Values are used exactly as written (no hidden conversion inside equations), so two units agree
 * only when they have the same dimension AND the same SI scale: `mm` where `m` is expected is an
 * error that names the factor 1000. Angles count as dimensionless (rad = 1), so `rad/s` and `1/s`
 * agree, but `deg` is the plain number pi/180 and does not agree with `rad`.
 *
 * The literal 0 agrees with every unit (`max(F, 0)`, `w > 0 ? a : 0`): zero is zero in any unit.
 * Inside an expression every other bare number is dimensionless. A whole right side, output
 * expression or initial value that is only a number (`initial: 20` for a state in degC) is in the
 * unit of the place it stands in.
 */
import { formatSignificant } from '../presentation/numbers.js';
import type { MathNode } from 'mathjs';
import type { ProblemList } from '../errors.js';
import { FUNCTIONS, isFunctionName } from '../model/functions/registry.js';
import type { Expr, Model } from '../model/types.js';
import { dimensionOf, hasOffset, parseUnit, siScale, unitMath } from './registry.js';

export interface Quantity {
  /** Exponents of the SI base dimensions (mathjs order), with angles removed. */
  dims: number[];
  /** SI value of one of this unit (mm -> 1e-3; degC -> 1, offsets ignored). */
  scale: number;
  /** The unit as composed from the declared units, for messages (e.g. `(N*m/A)*A/(kg*m^2)`). */
  text: string;
  /** The literal 0, which agrees with every unit. */
  zero?: boolean;
  /** Set when the value is an absolute reading on an offset scale (degC, degF), e.g. a bare `T`. */
  offsetUnit?: string;
}

const NDIMS = unitMath.Unit.BASE_DIMENSIONS.length;
const SYMBOLS = ['kg', 'm', 's', 'A', 'K', 'cd', 'mol', 'rad', 'bit'];
const TOL = 1e-9;

const DIMENSIONLESS: Quantity = Object.freeze({ dims: new Array<number>(NDIMS).fill(0), scale: 1, text: '1' }) as Quantity;

/** The quantity of a unit string ('' is dimensionless), or undefined for an unknown unit. */
export function quantityOf(unitText: string): Quantity | undefined {
  const u = parseUnit(unitText);
  if (!u) return undefined;
  const q: Quantity = { dims: dimensionOf(u), scale: siScale(u), text: unitText.trim() || '1' };
  // Only a bare offset unit (degC, not degC/s) reads an absolute temperature.
  const parts = (u as unknown as { units: { power: number }[] }).units;
  if (hasOffset(u) && parts.length === 1 && parts[0].power === 1) q.offsetUnit = unitText.trim();
  return q;
}

/** The SI form of a quantity: `kg*m^2/s^2`, with the scale in front when it is not 1 (`0.001 m/s`). */
export function formatSI(q: Quantity): string {
  const num: string[] = [];
  const den: string[] = [];
  q.dims.forEach((p, i) => {
    if (Math.abs(p) < TOL) return;
    const a = Math.abs(p);
    const part = Math.abs(a - 1) < TOL ? SYMBOLS[i] : `${SYMBOLS[i]}^${formatNumber(a)}`;
    (p > 0 ? num : den).push(part);
  });
  let base = num.length ? num.join('*') : '1';
  if (den.length) base += '/' + (den.length > 1 ? `(${den.join('*')})` : den[0]);
  if (Math.abs(q.scale - 1) <= TOL) return base;
  return base === '1' ? formatNumber(q.scale) : `${formatNumber(q.scale)} ${base}`;
}

/** `text = SI form`, or only one of them when they read the same. */
export function describeQuantity(q: Quantity): string {
  if (q.zero) return '0 (any unit)';
  const si = formatSI(q);
  return q.text === si ? si : `${q.text} = ${si}`;
}

function formatNumber(x: number): string {
  return Number.isInteger(x) ? String(x) : formatSignificant(x, 6);
}

export function isPlain(q: Quantity): boolean {
  return q.zero === true || (q.dims.every((p) => Math.abs(p) < TOL) && Math.abs(q.scale - 1) <= TOL * Math.max(1, q.scale));
}

export type Agreement = { ok: true } | { ok: false; sameDimension: boolean; factor: number };

/** Do two quantities agree (same dimension and same SI scale)? `factor` = a.scale / b.scale. */
export function agree(a: Quantity, b: Quantity): Agreement {
  if (a.zero || b.zero) return { ok: true };
  const sameDimension = a.dims.every((p, i) => Math.abs(p - b.dims[i]) < TOL);
  const factor = a.scale / b.scale;
  if (sameDimension && Math.abs(factor - 1) <= 1e-9) return { ok: true };
  return { ok: false, sameDimension, factor };
}

/** Why `actual` does not agree with `expected`, in words, or undefined when they agree. */
export function mismatch(actual: Quantity, expected: Quantity): string | undefined {
  const g = agree(actual, expected);
  if (!g.ok) {
    if (!g.sameDimension) return 'the dimensions differ';
    return `same dimension, but the units differ by a factor ${formatNumber(g.factor)}; values are used as written, so the units must be the same`;
  }
  // An absolute reading on an offset scale (degC) is a different number from the same temperature in K.
  if (!actual.zero && !expected.zero && (actual.offsetUnit ?? '') !== (expected.offsetUnit ?? '')) {
    return `a temperature on an offset scale (${actual.offsetUnit ?? expected.offsetUnit}) is not the same number in ${(actual.offsetUnit ? expected.text : actual.text)}; declare the same unit on both`;
  }
  return undefined;
}

// ---------------------------------------------------------------------------------------------
// Inference over a checked expression tree.

export type UnitEnv = (name: string) => Quantity | undefined;

/** Reports one problem inside an expression. */
export type Reporter = (what: string, fix: string) => void;

const SAME_UNIT_OPS: Record<string, string> = {
  add: '+', subtract: '-', smaller: '<', smallerEq: '<=', larger: '>', largerEq: '>=', equal: '==', unequal: '!=',
};

type N = MathNode & Record<string, unknown>;

/**
 * The unit of a checked expression. Problems inside it (mismatched sides, a unit inside `exp`...)
 * go to `report`, once each; the result is undefined when the unit cannot be told (an unknown
 * symbol, or a mismatch already reported), so that one mistake is not reported again further out.
 */
export function inferQuantity(node: MathNode, env: UnitEnv, report: Reporter): Quantity | undefined {
  const n = node as N;
  switch (node.type) {
    case 'ConstantNode':
      return n.value === 0 ? { ...DIMENSIONLESS, zero: true, text: '0' } : DIMENSIONLESS;
    case 'SymbolNode': {
      const name = String(n.name);
      if (name === 'pi' || name === 'e') return DIMENSIONLESS;
      return env(name);
    }
    case 'ParenthesisNode':
      return inferQuantity(n.content as MathNode, env, report);
    case 'ConditionalNode': {
      inferQuantity(n.condition as MathNode, env, report);
      const a = inferQuantity(n.trueExpr as MathNode, env, report);
      const b = inferQuantity(n.falseExpr as MathNode, env, report);
      if (!a || !b) return undefined;
      return sameUnit(a, b, n.trueExpr as MathNode, n.falseExpr as MathNode, 'the two branches of "? :"', report);
    }
    case 'OperatorNode':
      return inferOperator(n, env, report);
    case 'FunctionNode':
      return inferFunction(n, env, report);
    default:
      return undefined;
  }
}

function inferOperator(n: N, env: UnitEnv, report: Reporter): Quantity | undefined {
  const fn = String(n.fn);
  const args = n.args as MathNode[];
  if (fn === 'unaryMinus' || fn === 'unaryPlus') return inferQuantity(args[0], env, report);
  if (fn === 'pow') return inferPower(args[0], args[1], env, report);
  const a = inferQuantity(args[0], env, report);
  const b = inferQuantity(args[1], env, report);
  if (!a || !b) return undefined;
  if (fn in SAME_UNIT_OPS) {
    const op = SAME_UNIT_OPS[fn];
    const q = sameUnit(a, b, args[0], args[1], `both sides of "${op}"`, report);
    if (!q) return undefined;
    if (fn !== 'add' && fn !== 'subtract') return DIMENSIONLESS;
    // A difference of two offset readings (T - T_amb) is an ordinary temperature difference.
    if (fn === 'subtract' && a.offsetUnit && b.offsetUnit) return { ...q, offsetUnit: undefined };
    return { ...q, offsetUnit: a.offsetUnit ?? b.offsetUnit };
  }
  if (fn === 'multiply') return product(a, b, 1);
  if (fn === 'divide') return product(a, b, -1);
  return undefined;
}

function product(a: Quantity, b: Quantity, sign: 1 | -1): Quantity {
  const dims = a.dims.map((p, i) => p + sign * b.dims[i]);
  const scale = sign === 1 ? a.scale * b.scale : a.scale / b.scale;
  let text: string;
  if (sign === 1) {
    if (a.text === '1') text = b.text;
    else if (b.text === '1') text = a.text;
    else text = `${wrap(a.text, '/ ')}*${wrap(b.text, '/ ')}`;
  } else {
    text = b.text === '1' ? a.text : `${a.text === '1' ? '1' : a.text}/${wrap(b.text, '*/ ')}`;
  }
  const q: Quantity = bounded({ dims, scale, text });
  if (a.zero || (sign === 1 && b.zero)) q.zero = true;
  return q;
}

/**
 * Characters of a composed unit text kept for messages. Composed texts nest: a chain of defines
 * that each multiply the one before by itself doubles the text at every link (28 links made 789 MB
 * and ended the check with "Invalid string length"). Past this size the SI form stands for it,
 * which is as short as the model has base dimensions.
 */
const COMPOSED_TEXT_CHARS = 200;

function bounded(q: Quantity): Quantity {
  return q.text.length <= COMPOSED_TEXT_CHARS ? q : { ...q, text: formatSI({ ...q, text: '' }) };
}

function wrap(text: string, chars: string): string {
  return [...chars].some((c) => text.includes(c)) ? `(${text})` : text;
}

function inferPower(baseNode: MathNode, expNode: MathNode, env: UnitEnv, report: Reporter): Quantity | undefined {
  const base = inferQuantity(baseNode, env, report);
  const exp = inferQuantity(expNode, env, report);
  if (exp && !isPlain(exp)) {
    report(`the exponent ${expNode.toString()} must be a plain number, but its unit is ${describeQuantity(exp)}`,
      'divide it by a quantity of the same unit to make it dimensionless');
    return undefined;
  }
  if (!base) return undefined;
  if (isPlain(base)) return base.zero ? base : DIMENSIONLESS;
  const k = constantValue(expNode);
  if (k === undefined) {
    report(`${baseNode.toString()} has the unit ${describeQuantity(base)}, so it can only be raised to a constant power, not to ${expNode.toString()}`,
      'use a constant exponent, or make the base dimensionless first (divide by a reference value)');
    return undefined;
  }
  return bounded({
    dims: base.dims.map((p) => p * k),
    scale: Math.pow(base.scale, k),
    text: `${wrap(base.text, '*/^ ')}^${formatNumber(k)}`,
  });
}

/** The unit of a function call, by the unit rule of the function's registry entry. */
function inferFunction(n: N, env: UnitEnv, report: Reporter): Quantity | undefined {
  const name = String((n.fn as N).name);
  const args = n.args as MathNode[];
  const rule = isFunctionName(name) ? FUNCTIONS[name].units : undefined;
  if (rule?.args === 'power') return inferPower(args[0], args[1], env, report);
  const qs = args.map((a) => inferQuantity(a, env, report));
  if (!rule) return undefined;
  if (rule.args === 'plain') {
    const q = qs[0];
    if (q && !isPlain(q)) {
      const angle = q.dims.every((p) => Math.abs(p) < TOL);
      report(`the argument of ${name}, ${args[0].toString()}, must be a plain number${rule.angle ? ' or an angle in rad' : ''}, but its unit is ${describeQuantity(q)}`,
        angle ? 'declare angles in rad (convert logged degrees with column_unit: deg)' : 'divide the argument by a reference quantity of the same unit');
    }
    return DIMENSIONLESS;
  }
  if (qs.some((q) => !q)) return undefined;
  const known = qs as Quantity[];
  let acc: Quantity | undefined = known[0];
  for (let i = 1; i < known.length && acc; i++) {
    acc = sameUnit(acc, known[i], args[0], args[i], `the arguments of ${name}`, report);
  }
  if (!acc) return undefined;
  switch (rule.result) {
    case 'plain':
      return DIMENSIONLESS;
    case 'same':
      return acc;
    case 'magnitude':
      return { ...acc, offsetUnit: undefined };
    case 'root':
      if (acc.zero) return acc;
      return bounded({ dims: acc.dims.map((p) => p / 2), scale: Math.sqrt(acc.scale), text: `(${acc.text})^0.5` });
  }
}

/** a and b must agree; returns the one that is not the literal 0, or undefined after a report. */
function sameUnit(a: Quantity, b: Quantity, an: MathNode, bn: MathNode, what: string, report: Reporter): Quantity | undefined {
  const g = agree(a, b);
  if (g.ok) return a.zero ? b : a;
  const why = g.sameDimension
    ? `they differ by a factor ${formatNumber(g.factor)} (values are used as written)`
    : 'the dimensions differ';
  report(`${what} must have the same unit: ${an.toString()} is ${describeQuantity(a)}, ${bn.toString()} is ${describeQuantity(b)}; ${why}`,
    g.sameDimension ? 'declare the same unit for both (e.g. both m, not m and mm)' : 'check the units declared for the symbols involved');
  return undefined;
}

/** The value of an expression made of numbers only (for exponents), or undefined. */
function constantValue(node: MathNode): number | undefined {
  const n = node as N;
  let v: number | undefined;
  switch (node.type) {
    case 'ConstantNode':
      v = typeof n.value === 'number' ? n.value : undefined;
      break;
    case 'SymbolNode':
      v = n.name === 'pi' ? Math.PI : n.name === 'e' ? Math.E : undefined;
      break;
    case 'ParenthesisNode':
      v = constantValue(n.content as MathNode);
      break;
    case 'OperatorNode': {
      const xs = (n.args as MathNode[]).map(constantValue);
      if (xs.some((x) => x === undefined)) return undefined;
      const [a, b] = xs as number[];
      const ops: Record<string, () => number> = {
        unaryMinus: () => -a, unaryPlus: () => a, add: () => a + b, subtract: () => a - b,
        multiply: () => a * b, divide: () => a / b, pow: () => Math.pow(a, b),
      };
      v = ops[String(n.fn)]?.();
      break;
    }
    default:
      v = undefined;
  }
  return v !== undefined && Number.isFinite(v) ? v : undefined;
}

// ---------------------------------------------------------------------------------------------
// The model-level check.

export type UnitCheckOutcome = 'checked' | 'off' | 'no-units';

/**
 * Check every expression of a model against the units of the place it stands in. Adds one problem
 * per mismatch to `problems`. Unknown unit strings are reported elsewhere (the loader); symbols with
 * such units, and expressions in `skip` (already reported for another reason), are skipped here.
 */
export function checkModelUnits(model: Model, problems: ProblemList, options: { skip?: ReadonlySet<Expr> } = {}): UnitCheckOutcome {
  if (model.units === 'off') return 'off';
  const declared = [...model.states, ...model.inputs, ...model.parameters, ...model.outputs].map((s) => s.unit.trim());
  if (declared.every((u) => u === '')) return 'no-units';

  const time = quantityOf(model.timeUnit);
  const symbols = new Map<string, Quantity | undefined>();
  for (const s of [...model.states, ...model.inputs, ...model.parameters]) symbols.set(s.name, quantityOf(s.unit));
  if (time) symbols.set('t', { ...time, text: model.timeUnit });
  const env: UnitEnv = (name) => symbols.get(name);

  const infer = (expr: Expr, label: string): Quantity | undefined =>
    options.skip?.has(expr) ? undefined : inferQuantity(expr.node, env, (what, fix) => problems.add(expr.where, `${label}: ${what}`, fix));

  for (const d of model.defines) symbols.set(d.name, infer(d.expr, `define ${d.name}`));

  const expect = (expr: Expr, label: string, side: string, expected: Quantity | undefined, fix: string): void => {
    if (constantValue(expr.node) !== undefined) return;
    const q = infer(expr, label);
    if (!q || !expected) return;
    const why = mismatch(q, expected);
    if (why) problems.add(expr.where, `${label}${side ? `: ${side}` : ''} is ${describeQuantity(q)}, expected ${describeQuantity(expected)}; ${why}`, fix);
  };

  model.equations.forEach((eq) => {
    const state = model.states.find((s) => s.name === eq.state);
    const su = state ? quantityOf(state.unit) : undefined;
    const expected = su && time ? { ...product(su, time, -1), text: `${su.text} / ${model.timeUnit}` } : undefined;
    expect(eq.expr, `equation for ${eq.state}`, 'right side', expected,
      `d(${eq.state})/dt must have the unit of ${eq.state} divided by time_unit; check the units of the symbols in it`);
  });
  for (const s of model.states) {
    expect(s.initial, `initial value of ${s.name}`, '', quantityOf(s.unit), `give the initial value in the unit of ${s.name} (${s.unit || 'no unit'})`);
  }
  for (const o of model.outputs) {
    expect(o.expr, `output ${o.name}`, 'the expression', quantityOf(o.unit), `declare the output's unit as the unit of its expression, or change the expression`);
  }
  for (const ex of model.experiments) {
    for (const [state, init] of Object.entries(ex.initial)) {
      const s = model.states.find((x) => x.name === state);
      if (s) expect(init, `initial value of ${state} in experiment ${ex.name}`, '', quantityOf(s.unit), `give the initial value in the unit of ${state} (${s.unit || 'no unit'})`);
    }
  }
  for (const input of model.inputs) {
    if (typeof input.delay !== 'string' || !time) continue;
    const p = model.parameters.find((x) => x.name === input.delay);
    const q = p ? quantityOf(p.unit) : undefined;
    if (!q) continue;
    const why = mismatch(q, { ...time, text: model.timeUnit });
    if (why) {
      problems.add({ ...input.where, key: `inputs.${input.name}.delay` },
        `the delay of input ${input.name} is parameter ${p!.name} with unit ${describeQuantity(q)}, expected the time unit ${model.timeUnit}; ${why}`,
        `declare ${p!.name} with unit: ${model.timeUnit}`);
    }
  }
  return 'checked';
}

