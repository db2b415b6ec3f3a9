/**
 * Static models (no states): each output is a function of the inputs and parameters at the same
 * row. No time, no interpolation, no integration.
 */
import type { CompiledModel } from '../model/compiled-types.js';
import { simulationFailed } from './outcome.js';
import type { SimulationInputs, SimulationOptions, SimulationOutcome } from './types.js';

/** Evaluate the outputs row by row; a non-finite output answers a failure value naming the row. */
export function evaluateStatic(compiled: CompiledModel, drive: SimulationInputs, p: Float64Array, options: SimulationOptions = {}): SimulationOutcome {
  const M = drive.time.length;
  const nIn = compiled.nInputs;
  const nOut = compiled.nOutputs;
  const slots = options.sensitivitySlots;
  const q = slots ? slots.length : 0;
  const sens = slots && q > 0 ? compiled.sensitivity(slots) : undefined;
  const outputs = Array.from({ length: nOut }, () => new Float64Array(M));
  const sensOut = slots ? Array.from({ length: nOut }, () => new Float64Array(M * q)) : undefined;
  const u = new Float64Array(nIn);
  const udot = new Float64Array(nIn);
  const empty = new Float64Array(0);
  const y = new Float64Array(nOut);
  const dy = new Float64Array(nOut * q);
  for (let m = 0; m < M; m++) {
    for (let j = 0; j < nIn; j++) u[j] = drive.inputs[j][m];
    const t = drive.time[m];
    if (sens) sens.outputs(t, empty, u, udot, p, y, dy);
    else compiled.outputs(t, empty, u, p, y);
    for (let j = 0; j < nOut; j++) {
      if (!Number.isFinite(y[j])) {
        return simulationFailed(
          `cannot evaluate experiment ${drive.name}: output ${compiled.model.outputs[j].name} is ${y[j]} at row ${m + 1} (inputs ${compiled.model.inputs.map((inp, i) => `${inp.name}=${u[i]}`).join(', ')})`,
          { experiment: drive.name, row: m, time: t },
        );
      }
      outputs[j][m] = y[j];
      if (sensOut) for (let k = 0; k < q; k++) sensOut[j][m * q + k] = dy[j * q + k];
    }
  }
  return {
    ok: true,
    result: {
      experiment: drive.name,
      time: drive.time,
      states: [],
      outputs,
      sensitivities: slots ? { slots: [...slots], outputs: sensOut! } : undefined,
      stats: { rhsEvaluations: 0, steps: 0, rejectedSteps: 0, segments: 0 },
    },
  };
}
