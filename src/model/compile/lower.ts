/**
 * Model -> compiler DAG: every checked expression of the model (defines, equations, outputs,
 * initial values per experiment) as a node of one shared pool, with names mapped to slots.
 *
 * Defines stay symbols in these "raw" nodes so that derivatives can chain through them (each define
 * is differentiated once, however often it is used); `resolve` substitutes their values for code.
 */
import { ProblemList, type SourceLocation } from '../../errors.js';
import type { Expr, Model } from '../types.js';
import { Differentiator } from './differentiate.js';
import { UnsupportedExpression, fromMathjs } from './from-mathjs.js';
import { ExprPool, type SymbolKind } from './ir.js';

export interface LoweredModel {
  pool: ExprPool;
  diff: Differentiator;
  nStates: number;
  nInputs: number;
  nParams: number;
  paramSlot: Map<string, number>;
  /** Raw nodes (defines as symbols). */
  defines: number[];
  equations: number[];
  outputs: number[];
  /** Initial values: the states' own, and per experiment (sharing the states' own where not overridden). */
  initialBase: number[];
  initialByExperiment: number[][];
  /** Symbol id of define m, and the inverse map. */
  defineSym: number[];
  defineOfSym: Map<number, number>;
  /** For each input: the parameter slot of its delay, or -1. */
  delaySlot: number[];
  /** A raw node with every define replaced by its value (memoised). */
  resolve(raw: number): number;
}

/** Where a name from the model file lives. */
interface Binding {
  kind: SymbolKind;
  index: number;
}

export function lowerModel(model: Model, maxNodes?: number): LoweredModel {
  const pool = new ExprPool(maxNodes);
  const problems = new ProblemList();
  const bindings = declareNames(model, problems);
  problems.throwIfAny();
  const paramSlot = new Map<string, number>();
  model.parameters.forEach((p, i) => paramSlot.set(p.name, i));
  const lower = lowerer(pool, bindings, problems);
  const nDefines = model.defines.length;

  const defines = model.defines.map((d, i) => lower(d.expr, EVERYTHING, i, `define ${d.name}`));
  const defineSym = model.defines.map((_, i) => pool.sym('d', i));
  const defineOfSym = new Map<number, number>(defineSym.map((s, i) => [s, i]));
  const equations = lowerEquations(model, lower, pool, problems);
  const outputs = model.outputs.map((o) => lower(o.expr, EVERYTHING, nDefines, `output ${o.name}`));
  const initialBase = model.states.map((s) => lower(s.initial, PARAMETERS_ONLY, nDefines, `the initial value of ${s.name}`));
  const initialByExperiment = lowerExperimentInitials(model, initialBase, lower, problems);
  const delaySlot = delaySlots(model, paramSlot, problems);
  problems.throwIfAny();

  const resolve = defineResolver(pool, defines, defineSym);
  const diff = new Differentiator(pool);
  checkInitials(model, pool, resolve, initialBase, initialByExperiment, problems);
  problems.throwIfAny();

  return {
    pool,
    diff,
    nStates: model.states.length,
    nInputs: model.inputs.length,
    nParams: model.parameters.length,
    paramSlot,
    defines,
    equations,
    outputs,
    initialBase,
    initialByExperiment,
    defineSym,
    defineOfSym,
    delaySlot,
    resolve,
  };
}

const EVERYTHING: ReadonlySet<SymbolKind> = new Set<SymbolKind>(['x', 'u', 'p', 't', 'd']);
const PARAMETERS_ONLY: ReadonlySet<SymbolKind> = new Set<SymbolKind>(['p', 'd']);

/**
 * Converts one expression. `allowed` says which kinds of symbol it may read and `definesBefore`
 * how many defines are visible (a define sees only earlier ones).
 */
type Lower = (expr: Expr, allowed: ReadonlySet<SymbolKind>, definesBefore: number, role: string) => number;

/**
 * One namespace (model-format.md, Names). A Map: names such as `constructor` or `__proto__` are
 * ordinary keys here.
 */
function declareNames(model: Model, problems: ProblemList): Map<string, Binding> {
  const bindings = new Map<string, Binding>();
  const declare = (name: string, binding: Binding, where: SourceLocation) => {
    if (name === 't') {
      problems.add(where, 'the name "t" is reserved for time', 'choose another name');
      return;
    }
    if (bindings.has(name)) {
      problems.add(where, `the name ${JSON.stringify(name)} is declared twice`, 'give every state, input, parameter and define its own name');
      return;
    }
    bindings.set(name, binding);
  };
  model.states.forEach((s, i) => declare(s.name, { kind: 'x', index: i }, s.where));
  model.inputs.forEach((s, i) => declare(s.name, { kind: 'u', index: i }, s.where));
  model.parameters.forEach((s, i) => declare(s.name, { kind: 'p', index: i }, s.where));
  model.defines.forEach((d, i) => declare(d.name, { kind: 'd', index: i }, d.expr.where));
  return bindings;
}

/** An expression that cannot be lowered is a problem at its place, and lowers to zero meanwhile. */
function lowerer(pool: ExprPool, bindings: Map<string, Binding>, problems: ProblemList): Lower {
  const timeSym = pool.sym('t', 0);
  return (expr, allowed, definesBefore, role) => {
    const resolve = (name: string): number | undefined => {
      if (name === 't') {
        if (!allowed.has('t')) throw new UnsupportedExpression(`${role} cannot use time t`, `write ${role} in terms of parameters`);
        return timeSym;
      }
      const b = bindings.get(name);
      if (!b) return undefined;
      if (b.kind === 'd' && b.index >= definesBefore) {
        throw new UnsupportedExpression(`define ${JSON.stringify(name)} is used before it is computed`, 'order the defines so that each uses only earlier ones (no cycles)');
      }
      if (!allowed.has(b.kind)) {
        const what = b.kind === 'x' ? 'state' : b.kind === 'u' ? 'input' : b.kind;
        throw new UnsupportedExpression(`${role} cannot use the ${what} ${JSON.stringify(name)}`, `write ${role} in terms of parameters`);
      }
      return pool.sym(b.kind, b.index);
    };
    try {
      return fromMathjs(pool, expr.node, { resolve });
    } catch (err) {
      if (!(err instanceof UnsupportedExpression)) throw err;
      problems.add(expr.where, `${err.message} in ${JSON.stringify(expr.text)}`, err.fix);
      return pool.ZERO;
    }
  };
}

function lowerEquations(model: Model, lower: Lower, pool: ExprPool, problems: ProblemList): number[] {
  const equationOf = new Map(model.equations.map((e) => [e.state, e]));
  return model.states.map((s) => {
    const eq = equationOf.get(s.name);
    if (!eq) {
      problems.add(s.where, `state ${JSON.stringify(s.name)} has no equation`, `add "${s.name}: <expression>" under equations`);
      return pool.ZERO;
    }
    return lower(eq.expr, EVERYTHING, model.defines.length, `the equation for ${s.name}`);
  });
}

/** Per experiment: the states' own initial values, with the experiment's `initial` in their place. */
function lowerExperimentInitials(model: Model, initialBase: number[], lower: Lower, problems: ProblemList): number[][] {
  const stateIndex = new Map(model.states.map((s, i) => [s.name, i]));
  return model.experiments.map((exp) => {
    const values = [...initialBase];
    for (const [name, expr] of Object.entries(exp.initial)) {
      const i = stateIndex.get(name);
      if (i === undefined) {
        problems.add(exp.where, `initial value for ${JSON.stringify(name)}, which is not a state`, 'name a state under initial');
        continue;
      }
      values[i] = lower(expr, PARAMETERS_ONLY, model.defines.length, `the initial value of ${name}`);
    }
    return values;
  });
}

function delaySlots(model: Model, paramSlot: Map<string, number>, problems: ProblemList): number[] {
  return model.inputs.map((input) => {
    if (typeof input.delay !== 'string') return -1;
    const slot = paramSlot.get(input.delay);
    if (slot === undefined) {
      problems.add(input.where, `delay names ${JSON.stringify(input.delay)}, which is not a parameter`, 'give a number or the name of a parameter');
      return -1;
    }
    return slot;
  });
}

/**
 * Define values: each define's raw node with earlier defines substituted (one shared memo, so
 * every define is resolved once); the resolver substitutes them into any raw node.
 */
function defineResolver(pool: ExprPool, defines: number[], defineSym: number[]): (raw: number) => number {
  const memo = new Map<number, number>();
  const defineValue = new Map<number, number>();
  const lookup = (symId: number) => defineValue.get(symId);
  defines.forEach((raw, i) => defineValue.set(defineSym[i]!, pool.substitute(raw, lookup, memo)));
  return (raw: number) => pool.substitute(raw, lookup, memo);
}

/** Initial values may read defines, but only defines of parameters. */
function checkInitials(model: Model, pool: ExprPool, resolve: (raw: number) => number, initialBase: number[], initialByExperiment: number[][], problems: ProblemList): void {
  const checkInitial = (raw: number, expr: Expr, state: string) => {
    for (const s of pool.symbolsOf([resolve(raw)])) {
      const n = pool.node(s);
      if (n.op === 'sym' && n.kind !== 'p') {
        problems.add(expr.where, `the initial value of ${state} depends on a state, an input or time through a define`, 'write initial values in terms of parameters only');
        return;
      }
    }
  };
  const stateIndex = new Map(model.states.map((s, i) => [s.name, i]));
  model.states.forEach((s, i) => checkInitial(initialBase[i]!, s.initial, s.name));
  model.experiments.forEach((exp, e) => {
    for (const [name, expr] of Object.entries(exp.initial)) {
      const i = stateIndex.get(name);
      if (i !== undefined) checkInitial(initialByExperiment[e]![i]!, expr, name);
    }
  });
}
