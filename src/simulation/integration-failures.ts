/**
 * The words of a simulation that cannot finish: where (experiment, time), what, and with which
 * parameter values, as failure values (numerics.md, Integration).
 */
import { formatSignificant } from '../presentation/numbers.js';
import type { CompiledModel } from '../model/compiled-types.js';
import { simulationFailed } from './outcome.js';
import type { StepLimitDiagnosis } from './stiffness.js';
import type { SimulationOutcome } from './types.js';

function formatParameters(compiled: CompiledModel, p: Float64Array): string {
  const names = [...compiled.paramSlot.entries()].sort((a, b) => a[1] - b[1]);
  const parts = names.map(([name, slot]) => `${name}=${formatSignificant(p[slot], 6)}`);
  return parts.length > 12 ? parts.slice(0, 12).join(', ') + `, ... (${parts.length} in all)` : parts.join(', ');
}

function parameterRecord(compiled: CompiledModel, p: Float64Array): Record<string, number> {
  const out: Record<string, number> = {};
  for (const [name, slot] of compiled.paramSlot) out[name] = p[slot];
  return out;
}

/** Entry i of the initial z = [x, S] is not finite. */
export function nonFiniteInitial(compiled: CompiledModel, experiment: string, start: number, p: Float64Array, i: number): SimulationOutcome {
  const n = compiled.nStates;
  return simulationFailed(
    `cannot simulate experiment ${experiment}: the initial value of ${i < n ? `state ${compiled.model.states[i].name}` : 'a sensitivity'} is not finite (parameters ${formatParameters(compiled, p)})`,
    { experiment, time: start, parameters: parameterRecord(compiled, p) },
  );
}

/** The step limit of a segment was reached at time `t`. */
export function stepLimitReached(compiled: CompiledModel, experiment: string, t: number, p: Float64Array, d: StepLimitDiagnosis): SimulationOutcome {
  return simulationFailed(`cannot simulate experiment ${experiment}: ${d.text} (parameters ${formatParameters(compiled, p)})`, {
    experiment,
    time: t,
    stiff: d.stiff,
    fastestTimeConstant: d.fastest,
    slowestTimeConstant: d.slowest,
    parameters: parameterRecord(compiled, p),
  });
}

/** The right-hand side turned non-finite at time t (NaN when the step size itself did: then after `lastX`). */
export function nonFiniteState(compiled: CompiledModel, experiment: string, p: Float64Array, at: { t: number; z: Float64Array; dz: Float64Array }, lastX: number): SimulationOutcome {
  const model = compiled.model;
  const n = compiled.nStates;
  const bad = Array.from(at.z.subarray(0, n)).findIndex((v) => !Number.isFinite(v));
  const badRate = Array.from(at.dz.subarray(0, n)).findIndex((v) => !Number.isFinite(v));
  const what =
    bad >= 0 ? `state ${model.states[bad].name} became ${at.z[bad]}`
    : badRate >= 0 ? `the derivative of state ${model.states[badRate].name} became ${at.dz[badRate]}`
    : 'a sensitivity became non-finite';
  // The step size itself may have turned NaN first: then name the last time reached.
  const known = Number.isFinite(at.t);
  const time = known ? at.t : lastX;
  return simulationFailed(
    `cannot simulate experiment ${experiment}: ${what} ${known ? 'at' : 'after'} t=${formatSignificant(time, 6)} ${model.timeUnit} (parameters ${formatParameters(compiled, p)}); check the equations for division by zero or overflow at these values`,
    { experiment, time, parameters: parameterRecord(compiled, p) },
  );
}
