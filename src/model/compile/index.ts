/**
 * compileModel: a loaded Model -> CompiledModel (src/model/compiled-types.ts), i.e. plain
 * JavaScript functions over typed arrays, generated from the checked expression trees only
 * (numerics.md, "Expressions run as compiled code"), plus the forward sensitivity system built from
 * symbolic derivatives ("Sensitivities").
 *
 * Semantics of the generated code, where they could differ from mathjs's own evaluation:
 * - comparisons are exact IEEE comparisons giving 1 or 0 (mathjs compares with a relative
 *   tolerance of about 1e-12);
 * - `c ? a : b` takes `a` when c is non-zero and not NaN (as mathjs does);
 * - functions are those of JavaScript's Math (log is natural; a square root or logarithm of a
 *   negative number is NaN, where mathjs would return a complex number).
 */
import { UserError } from '../../errors.js';
import type { CompiledModel, Vec } from '../compiled-types.js';
import type { Model } from '../types.js';
import { buildFunction, emitBody, initialFunctions, type Assignment, type SymbolReader } from './emit.js';
import { ExpressionTooLarge } from './ir.js';
import { lowerModel, type LoweredModel } from './lower.js';
import { buildSensitivitySystem, type CompiledSensitivitySystem } from './sensitivity.js';

export type { CompiledSensitivitySystem } from './sensitivity.js';
export { numberLiteral } from './emit.js';

/** What the simulator may want to know without looking at code. Indices are slots. */
export interface ModelStructure {
  /** Inputs the right-hand side reads (through defines too), ascending. */
  rhsInputs: number[];
  /** Inputs the outputs read, ascending. */
  outputInputs: number[];
  /** States the outputs read, ascending. */
  outputStates: number[];
  /** Parameters the right-hand side, the outputs and any initial value read, ascending. */
  rhsParams: number[];
  outputParams: number[];
  initialParams: number[];
  /** Whether time appears explicitly. */
  rhsReadsTime: boolean;
  outputsReadTime: boolean;
  /** Per input: the slot of its delay parameter, or -1. */
  delayParamSlot: number[];
  /** Per input: its delay when a number (0 when none), NaN when a parameter gives it. */
  delayValue: number[];
}

export interface CompiledModelDetails extends CompiledModel {
  structure: ModelStructure;
  /** The generated function bodies, for inspection and tests. */
  source: { rhs: string; outputs: string; initial: string[] };
  sensitivity(slots: readonly number[]): CompiledSensitivitySystem;
}

type RhsFn = (t: number, x: Vec, u: Vec, p: Vec, dx: Vec) => void;
type OutFn = (t: number, x: Vec, u: Vec, p: Vec, y: Vec) => void;
type InitFn = (p: Vec, x0: Vec) => void;

const plainReader: SymbolReader = (node) => {
  switch (node.kind) {
    case 'x':
    case 'u':
    case 'p':
      return `${node.kind}[${node.index}]`;
    case 't':
      return 't';
    default:
      throw new Error(`internal: symbol ${node.kind} reached code`);
  }
};

/**
 * Compiles a loaded model. Throws UserError when an expression is outside the model language
 * (the loader should have refused it already) or when the model is too large to compile.
 */
export interface CompileOptions {
  /**
   * Most distinct operations the model's expressions and derivatives may take (default 500 000,
   * about 100 MB); past it, a UserError says the model is too large instead of exhausting memory.
   */
  maxNodes?: number;
}

export function compileModel(model: Model, options: CompileOptions = {}): CompiledModelDetails {
  try {
    return compile(model, options);
  } catch (err) {
    throw asUserError(model, err);
  }
}

/** Size and depth failures are the model's (a user error with a fix); anything else is ours. */
function asUserError(model: Model, err: unknown): unknown {
  if (err instanceof ExpressionTooLarge) {
    return new UserError({
      where: { file: model.fileAsGiven },
      what: `the model is too large to compile: ${err.message}`,
      fix: 'split very long expressions into defines, estimate fewer parameters at once, or simplify the model',
    });
  }
  if (err instanceof RangeError && /call stack/i.test(err.message)) {
    return new UserError({
      where: { file: model.fileAsGiven },
      what: 'an expression is nested too deeply to compile',
      fix: 'split it into defines',
    });
  }
  return err;
}

function compile(model: Model, options: CompileOptions): CompiledModelDetails {
  const low = lowerModel(model, options.maxNodes);
  const { pool, nStates, nInputs, nParams } = low;

  const rhsAssign: Assignment[] = low.equations.map((raw, i) => ({ target: 'dx', index: i, node: low.resolve(raw) }));
  const outAssign: Assignment[] = low.outputs.map((raw, o) => ({ target: 'y', index: o, node: low.resolve(raw) }));
  const rhsBody = emitBody(pool, rhsAssign, plainReader);
  const outBody = emitBody(pool, outAssign, plainReader);

  const init = initialFunctions<InitFn>([low.initialBase, ...low.initialByExperiment], ['p', 'x0'], (list) =>
    emitBody(pool, list.map((raw, i) => ({ target: 'x0', index: i, node: low.resolve(raw) })), plainReader),
  );

  const defaults = model.parameters.map((p) => (p.kind === 'fixed' ? p.value : p.start));
  const sensitivityCache = new Map<string, CompiledSensitivitySystem>();

  return {
    model,
    nStates,
    nInputs,
    nParams,
    nOutputs: model.outputs.length,
    paramSlot: low.paramSlot,
    defaultParams: () => Float64Array.from(defaults),
    rhs: buildFunction<RhsFn>(['t', 'x', 'u', 'p', 'dx'], rhsBody),
    outputs: buildFunction<OutFn>(['t', 'x', 'u', 'p', 'y'], outBody),
    /** An experiment index outside the model's list (e.g. -1) gives the states' own initial values. */
    initial(experiment: number, p: Vec, x0: Vec): void {
      (init.byExperiment[experiment] ?? init.base)(p, x0);
    },
    sensitivity(slots: readonly number[]): CompiledSensitivitySystem {
      const key = slots.join(',');
      let system = sensitivityCache.get(key);
      if (!system) {
        try {
          system = buildSensitivitySystem(low, slots);
        } catch (err) {
          throw asUserError(model, err);
        }
        sensitivityCache.set(key, system);
      }
      return system;
    },
    structure: describeStructure(model, low),
    source: { rhs: rhsBody, outputs: outBody, initial: init.bodies },
  };
}

function describeStructure(model: Model, low: LoweredModel): ModelStructure {
  const reads = (raws: number[]) => {
    const sets = { x: new Set<number>(), u: new Set<number>(), p: new Set<number>(), t: false };
    for (const s of low.pool.symbolsOf(raws.map(low.resolve))) {
      const node = low.pool.node(s);
      if (node.op !== 'sym') continue;
      if (node.kind === 't') sets.t = true;
      else if (node.kind === 'x' || node.kind === 'u' || node.kind === 'p') sets[node.kind].add(node.index);
    }
    const sorted = (s: Set<number>) => [...s].sort((a, b) => a - b);
    return { x: sorted(sets.x), u: sorted(sets.u), p: sorted(sets.p), t: sets.t };
  };
  const rhs = reads(low.equations);
  const out = reads(low.outputs);
  const init = reads([...low.initialBase, ...low.initialByExperiment.flat()]);
  return {
    rhsInputs: rhs.u,
    outputInputs: out.u,
    outputStates: out.x,
    rhsParams: rhs.p,
    outputParams: out.p,
    initialParams: init.p,
    rhsReadsTime: rhs.t,
    outputsReadTime: out.t,
    delayParamSlot: low.delaySlot,
    delayValue: model.inputs.map((i) => (typeof i.delay === 'number' ? i.delay : typeof i.delay === 'string' ? NaN : 0)),
  };
}
