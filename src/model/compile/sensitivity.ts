/**
 * The forward sensitivity system (numerics.md, Sensitivities) as generated code.
 *
 * Forward mode through the model's DAG: for each parameter column k, the tangent of every symbol
 * (states: S[j,k]; parameters: 1 for the column's own, else 0; a delayed input: -udot when its
 * delay is the column's parameter; time: 0) is pushed through the local partial derivatives of each
 * define and equation. Local partials are computed once and shared by all columns, a define's
 * tangent is computed once per column however often it is used, and entries that are structurally
 * zero are left out (S entries that can never become non-zero are found by a fixed point over the
 * dependency structure and written as 0).
 *
 *   dS/dt = (df/dx) S + df/dp (+ (df/du_j)(-udot_j) in the column of the delay of input j)
 *   dy    = (dg/dx) S + dg/dp (+ the same delay term)
 *   S(t0) = dx0/dp
 */
import type { SensitivitySystem, Vec } from '../compiled-types.js';
import { buildFunction, emitBody, initialFunctions, type Assignment, type InitialFunctions, type SymbolReader } from './emit.js';
import type { LoweredModel } from './lower.js';

export interface CompiledSensitivitySystem extends SensitivitySystem {
  /**
   * For each slot k: every input whose delay is that parameter (`delayOfInput[k]` is the first of
   * them). Usually at most one; several inputs may share one delay parameter.
   */
  inputsDelayedBy: readonly (readonly number[])[];
  /**
   * Structural pattern of S (row-major, nStates*q): false where S[i,k] is zero for all time, so
   * that the simulator may skip those entries in error control if it wishes.
   */
  nonZero: readonly boolean[];
  /** The generated function bodies, for inspection and tests. */
  source: { rhs: string; outputs: string; initial: string[] };
}

type RhsFn = (t: number, z: Vec, u: Vec, udot: Vec, p: Vec, dz: Vec) => void;
type OutFn = (t: number, z: Vec, u: Vec, udot: Vec, p: Vec, y: Vec, dy: Vec) => void;
type InitFn = (p: Vec, z0: Vec) => void;

export function buildSensitivitySystem(low: LoweredModel, slots: readonly number[]): CompiledSensitivitySystem {
  const { pool, nStates: n } = low;
  const q = slots.length;
  const columnOfParam = sensitivityColumns(low, slots);
  const inputsDelayedBy = slots.map((s) => low.delaySlot.flatMap((d, j) => (d === s ? [j] : [])));
  const delayOfInput = inputsDelayedBy.map((js) => (js.length ? js[0]! : -1));
  const nz = structuralNonZeros(low, slots, columnOfParam);
  const tangent = tangentBuilder(low, slots, nz);
  const reader = stateVectorReader(n);

  const rhsAssign: Assignment[] = [];
  low.equations.forEach((raw, i) => rhsAssign.push({ target: 'dz', index: i, node: low.resolve(raw) }));
  low.equations.forEach((raw, i) => {
    for (let k = 0; k < q; k++) {
      const node = nz[i * q + k] ? low.resolve(tangent(raw, k)) : pool.ZERO;
      rhsAssign.push({ target: 'dz', index: n + i * q + k, node });
    }
  });
  const rhsBody = emitBody(pool, rhsAssign, reader);

  const outAssign: Assignment[] = [];
  low.outputs.forEach((raw, o) => outAssign.push({ target: 'y', index: o, node: low.resolve(raw) }));
  low.outputs.forEach((raw, o) => {
    for (let k = 0; k < q; k++) outAssign.push({ target: 'dy', index: o * q + k, node: low.resolve(tangent(raw, k)) });
  });
  const outBody = emitBody(pool, outAssign, reader);
  const init = sensitivityInitials(low, q, tangent, reader);

  return {
    slots: [...slots],
    q,
    rhs: buildFunction<RhsFn>(['t', 'z', 'u', 'udot', 'p', 'dz'], rhsBody),
    outputs: buildFunction<OutFn>(['t', 'z', 'u', 'udot', 'p', 'y', 'dy'], outBody),
    initial(experiment: number, p: Vec, z0: Vec): void {
      (init.byExperiment[experiment] ?? init.base)(p, z0);
    },
    delayOfInput,
    inputsDelayedBy,
    nonZero: nz,
    source: { rhs: rhsBody, outputs: outBody, initial: init.bodies },
  };
}

/** Column k of the sensitivities belongs to parameter slot slots[k]. */
function sensitivityColumns(low: LoweredModel, slots: readonly number[]): Map<number, number> {
  const columnOfParam = new Map<number, number>();
  slots.forEach((s, k) => {
    if (!Number.isInteger(s) || s < 0 || s >= low.nParams) throw new RangeError(`sensitivity slot ${s} is not a parameter slot (0..${low.nParams - 1})`);
    if (columnOfParam.has(s)) throw new RangeError(`sensitivity slot ${s} is listed twice`);
    columnOfParam.set(s, k);
  });
  return columnOfParam;
}

/** Which symbols a resolved expression reads (defines expanded): x_j, u_j, p_m. */
function readsOf(low: LoweredModel, raw: number): { x: number[]; u: number[]; p: number[] } {
  const x: number[] = [];
  const u: number[] = [];
  const p: number[] = [];
  for (const s of low.pool.symbolsOf([low.resolve(raw)])) {
    const node = low.pool.node(s);
    if (node.op !== 'sym') continue;
    if (node.kind === 'x') x.push(node.index);
    else if (node.kind === 'u') u.push(node.index);
    else if (node.kind === 'p') p.push(node.index);
  }
  return { x, u, p };
}

/**
 * Structural non-zeros of S (n x q, row-major): seeded by the initial values of every experiment,
 * grown by the equations until nothing changes.
 */
function structuralNonZeros(low: LoweredModel, slots: readonly number[], columnOfParam: Map<number, number>): boolean[] {
  const n = low.nStates;
  const q = slots.length;
  const nz: boolean[] = new Array(n * q).fill(false);
  for (const list of [low.initialBase, ...low.initialByExperiment]) {
    list.forEach((raw, i) => {
      for (const m of readsOf(low, raw).p) {
        const k = columnOfParam.get(m);
        if (k !== undefined) nz[i * q + k] = true;
      }
    });
  }
  const eqReads = low.equations.map((raw) => readsOf(low, raw));
  // Rows that read state m, so that a non-zero S[m,k] can switch them on (a worklist per column:
  // linear in the size of the dependency graph).
  const readers: number[][] = Array.from({ length: n }, () => []);
  eqReads.forEach((r, i) => r.x.forEach((m) => readers[m]!.push(i)));
  for (let k = 0; k < q; k++) {
    const work: number[] = [];
    for (let i = 0; i < n; i++) {
      const r = eqReads[i]!;
      if (r.p.includes(slots[k]!) || r.u.some((j) => low.delaySlot[j] === slots[k])) nz[i * q + k] = true;
      if (nz[i * q + k]) work.push(i);
    }
    while (work.length) {
      const m = work.pop()!;
      for (const i of readers[m]!) {
        if (!nz[i * q + k]) {
          nz[i * q + k] = true;
          work.push(i);
        }
      }
    }
  }
  return nz;
}

/** Tangents d(raw)/d(p_slots[k]), column by column, on raw nodes (defines as intermediates, each differentiated once). */
function tangentBuilder(low: LoweredModel, slots: readonly number[], nz: readonly boolean[]): (raw: number, k: number) => number {
  const { pool, diff } = low;
  const q = slots.length;
  const defineTangent = new Map<string, number>();
  const symbolTangent = (s: number, k: number): number => {
    const node = pool.node(s);
    if (node.op !== 'sym') throw new Error('internal: tangent of a non-symbol');
    switch (node.kind) {
      case 'x':
        return nz[node.index * q + k] ? pool.sym('S', node.index * q + k) : pool.ZERO;
      case 'u':
        return low.delaySlot[node.index] === slots[k] ? pool.neg(pool.sym('udot', node.index)) : pool.ZERO;
      case 'p':
        return node.index === slots[k] ? pool.ONE : pool.ZERO;
      case 'd': {
        const m = low.defineOfSym.get(s)!;
        const key = `${m},${k}`;
        let tan = defineTangent.get(key);
        if (tan === undefined) {
          tan = tangent(low.defines[m]!, k);
          defineTangent.set(key, tan);
        }
        return tan;
      }
      default:
        return pool.ZERO; // time does not depend on parameters
    }
  };
  const sortedDeps = new Map<number, number[]>();
  const tangent = (raw: number, k: number): number => {
    let sum = pool.ZERO;
    let symbols = sortedDeps.get(raw);
    if (!symbols) {
      symbols = [...diff.deps(raw)].sort((a, b) => a - b);
      sortedDeps.set(raw, symbols);
    }
    for (const s of symbols) {
      const ts = symbolTangent(s, k);
      if (ts === pool.ZERO) continue;
      sum = pool.add(sum, pool.mul(diff.partial(raw, s), ts));
    }
    return sum;
  };
  return tangent;
}

/** Generated code reads states and sensitivities from z = [x, S], and inputs, their rates and parameters by slot. */
function stateVectorReader(n: number): SymbolReader {
  return (node) => {
    switch (node.kind) {
      case 'x':
        return `z[${node.index}]`;
      case 'S':
        return `z[${n + node.index}]`;
      case 'u':
        return `u[${node.index}]`;
      case 'udot':
        return `udot[${node.index}]`;
      case 'p':
        return `p[${node.index}]`;
      case 't':
        return 't';
      default:
        throw new Error(`internal: symbol ${node.kind} reached code`);
    }
  };
}

/** Initial values and their sensitivities, z0 = [x0, dx0/dp]. */
function sensitivityInitials(low: LoweredModel, q: number, tangent: (raw: number, k: number) => number, reader: SymbolReader): InitialFunctions<InitFn> {
  const n = low.nStates;
  return initialFunctions<InitFn>([low.initialBase, ...low.initialByExperiment], ['p', 'z0'], (list) => {
    const assign: Assignment[] = [];
    list.forEach((raw, i) => assign.push({ target: 'z0', index: i, node: low.resolve(raw) }));
    list.forEach((raw, i) => {
      for (let k = 0; k < q; k++) assign.push({ target: 'z0', index: n + i * q + k, node: low.resolve(tangent(raw, k)) });
    });
    return emitBody(low.pool, assign, reader);
  });
}
