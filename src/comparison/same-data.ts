/**
 * Candidate models can be ranked only when they were fitted to the same data and describe the same
 * measured outputs: otherwise their likelihoods measure different things. Experiments are matched by
 * the bytes of their data files (SHA-256), their role and window, not by name or path, so that
 * models in different folders pointing at the same log compare as equal.
 */
import { readFileSync } from 'node:fs';
import { UserError, type Problem } from '../errors.js';
import type { ExperimentSpec, Model } from '../model/types.js';
import { sha256Hex } from '../files/sha256.js';

interface ExperimentKey {
  key: string;
  label: string;
}

export function checkSameData(models: readonly Model[]): void {
  if (models.length < 2) {
    throw new UserError({ where: {}, what: 'rank needs at least two candidate model files', fix: 'give two or more models of the same rig, e.g. rigcal rank a.yaml b.yaml' });
  }
  const hashes = new Map<string, string>();
  const hashOf = (file: string): string => {
    let h = hashes.get(file);
    if (h === undefined) {
      try {
        h = sha256Hex(readFileSync(file));
      } catch (err) {
        throw new UserError({ where: { file }, what: `cannot read this data file (${(err as NodeJS.ErrnoException).code ?? String(err)})`, fix: 'run `rigcal check` on each model' });
      }
      hashes.set(file, h);
    }
    return h;
  };
  const keysOf = (m: Model): ExperimentKey[] =>
    m.experiments.map((e) => ({ key: experimentKey(e, hashOf(e.file)), label: `${e.name} (${e.role}, ${e.fileAsWritten}${e.window ? `, window [${e.window[0]}, ${e.window[1]}]` : ''})` }));

  const reference = models[0];
  const refKeys = keysOf(reference);
  const refOutputs = outputSignature(reference);
  const problems: Problem[] = [];
  for (const m of models.slice(1)) {
    const keys = keysOf(m);
    const missing = refKeys.filter((r) => !keys.some((k) => k.key === r.key));
    const extra = keys.filter((k) => !refKeys.some((r) => r.key === k.key));
    if (missing.length || extra.length) {
      const parts: string[] = [];
      if (missing.length) parts.push(`it lacks the data of ${reference.fileAsGiven}'s ${missing.map((x) => x.label).join('; ')}`);
      if (extra.length) parts.push(`it has data that ${reference.fileAsGiven} does not use: ${extra.map((x) => x.label).join('; ')}`);
      problems.push({
        where: { file: m.fileAsGiven, key: 'experiments' },
        what: `uses other data than ${reference.fileAsGiven}: ${parts.join('; ')}`,
        fix: 'rank only models fitted to the same logs: give every candidate the same experiments (same files, roles and windows)',
      });
    }
    const outs = outputSignature(m);
    const lacking = refOutputs.filter((o) => !outs.includes(o));
    const more = outs.filter((o) => !refOutputs.includes(o));
    if (lacking.length || more.length) {
      problems.push({
        where: { file: m.fileAsGiven, key: 'outputs' },
        what: `describes other outputs than ${reference.fileAsGiven}: ${[
          lacking.length ? `missing ${lacking.join(', ')}` : '',
          more.length ? `extra ${more.join(', ')}` : '',
        ].filter(Boolean).join('; ')}`,
        fix: 'give every candidate the same outputs (name, unit and logged column), so that their likelihoods measure the same data',
      });
    }
  }
  if (problems.length) throw new UserError(problems);
}

function experimentKey(e: ExperimentSpec, sha256: string): string {
  return JSON.stringify([e.role, sha256, e.window ?? null, e.timeUnit, e.start ?? null]);
}

/** Output name, unit and the column it is read from (after per-model defaults). */
function outputSignature(m: Model): string[] {
  return m.outputs.map((o) => `${o.name} [${o.unit || '1'}] from column ${o.column}${o.columnUnit ? ` (${o.columnUnit})` : ''}`);
}
