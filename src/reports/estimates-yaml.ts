/**
 * estimates.yaml: the calibrated parameters for the simulation team, with where they came from.
 * Numbers are written with JavaScript's shortest round-trip form, so reading the file back gives the
 * very same doubles (a frozen model reproduces the fit exactly).
 */
import { Document, isMap, isPair, isSeq } from 'yaml';
import type { FitResult, ParameterResult } from '../estimation/fit/fit-result.js';

const CAUTIONS = [
  ' Calibrated parameters written by rigcal.',
  ' Cautions:',
  ' - These estimates hold only inside the operating range the experiments covered;',
  '   outside it the model may be wrong even where the fit looked good.',
  ' - Verify them against independent measurements before any safety-relevant use.',
  ' - Follow local codes and licensed engineering practice; this file is not a certification.',
];

function parameterEntry(p: ParameterResult): Record<string, unknown> {
  const e: Record<string, unknown> = { value: p.estimate, unit: p.unit, status: p.status === 'free' ? 'estimated' : 'fixed' };
  if (p.experiment !== undefined) e.experiment = p.experiment;
  if (p.status === 'free') {
    e.stdError = p.stdError ?? null;
    e.ci95 = p.ci95 ?? null;
    e.atBound = p.atBound ?? false;
    if (p.scale) e.scale = p.scale;
  }
  return e;
}

/** One noise level per output (the same sigma serves every fit experiment). */
function noiseEntries(fit: FitResult): Record<string, { sigma: number; unit: string; estimated: boolean }> {
  const noise: Record<string, { sigma: number; unit: string; estimated: boolean }> = {};
  for (const o of fit.outputs) {
    if (o.role !== 'fit' || noise[o.output]) continue;
    noise[o.output] = { sigma: o.sigma, unit: o.unit, estimated: o.sigmaEstimated };
  }
  return noise;
}

export function renderEstimatesYaml(fit: FitResult): string {
  const parameters: Record<string, Record<string, unknown>> = {};
  for (const p of fit.parameters) parameters[p.name] = parameterEntry(p);
  const data = (fit.experiments ?? fit.provenance.dataFiles.map((d) => ({ name: d.experiment, role: 'fit' as const, file: d.file, sha256: d.sha256 }))).map((e) => ({
    experiment: e.name,
    role: e.role,
    file: e.file,
    sha256: e.sha256,
  }));
  const body = {
    tool: fit.tool,
    version: fit.version,
    model: { name: fit.model.name, file: fit.model.file, sha256: fit.model.sha256 },
    fit: {
      status: fit.status,
      message: fit.message,
      date: fit.provenance.date,
      weightedSSE: fit.statistics.weightedSSE,
      observations: fit.statistics.observations,
    },
    data,
    ...(Object.keys(fit.provenance.overrides).length ? { overrides: fit.provenance.overrides } : {}),
    parameters,
    noise: noiseEntries(fit),
  };
  const doc = new Document(body);
  doc.commentBefore = CAUTIONS.join('\n');
  // One line per parameter / noise level / data file: easy to read and to diff.
  const root = doc.contents;
  if (isMap(root)) {
    for (const pair of root.items) {
      if (!isPair(pair)) continue;
      const key = String((pair.key as { value?: unknown })?.value ?? pair.key);
      if (key === 'model' || key === 'fit') (pair.value as { flow?: boolean }).flow = true;
      if ((key === 'parameters' || key === 'noise') && isMap(pair.value)) {
        for (const item of pair.value.items) if (isPair(item)) (item.value as { flow?: boolean }).flow = true;
      }
      if (key === 'data' && isSeq(pair.value)) {
        for (const item of pair.value.items) (item as { flow?: boolean }).flow = true;
      }
    }
  }
  return doc.toString({ lineWidth: 0 });
}
