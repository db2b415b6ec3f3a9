/**
 * `rigcal rank` as a library verb: load the candidate model files, make sure they describe the same
 * rig data, fit each one with the same options, and rank the fits.
 */
import path from 'node:path';
import { rankFits, type CandidateFit, type RankResult } from '../comparison/rank-fits.js';
import { checkSameData } from '../comparison/same-data.js';
import { RunFailure } from '../errors.js';
import type { FitOptions } from '../estimation/fit/fit-options.js';
import type { CompletedFit } from '../estimation/fit/fit-result.js';
import { fitModel } from '../estimation/fit/fit-model.js';
import { loadModel } from '../model/load/index.js';
import type { Model } from '../model/types.js';

export interface RankOptions {
  /** Two or more candidate model files of one rig (paths as the user gave them, relative to `cwd`). */
  modelFiles: readonly string[];
  nested?: boolean;
  starts?: number;
  seed?: number;
  maxIterations?: number;
  cwd?: string;
  /** Called before each fit, for progress on a terminal. */
  onModel?: (name: string, index: number, count: number) => void;
  onProgress?: FitOptions['onProgress'];
}

export interface RankOutcome extends RankResult {
  /** Candidates whose fit could not run at all (RunFailure), with the reason. */
  failures: { name: string; file: string; message: string }[];
}

export function runRank(options: RankOptions): RankOutcome {
  const files = options.modelFiles;
  const cwd = options.cwd ?? process.cwd();
  // Messages name each file as the user typed it.
  const models = files.map((f) => ({ ...loadModel(path.resolve(cwd, f)), fileAsGiven: f }));
  checkSameData(models);
  const names = uniqueNames(models, files);
  const candidates: CandidateFit[] = [];
  const failures: RankOutcome['failures'] = [];
  models.forEach((model, i) => {
    options.onModel?.(names[i], i, models.length);
    let outcome: CompletedFit;
    try {
      outcome = fitModel(model, { starts: options.starts, seed: options.seed, maxIterations: options.maxIterations, onProgress: options.onProgress });
    } catch (err) {
      if (!(err instanceof RunFailure)) throw err;
      failures.push({ name: names[i], file: files[i], message: err.message });
      return;
    }
    candidates.push({ name: names[i], file: files[i], model, outcome });
  });
  if (candidates.length === 0) {
    throw new RunFailure(`no candidate model could be fitted: ${failures.map((f) => `${f.name}: ${f.message}`).join('; ')}`);
  }
  return { ...rankFits(candidates, { nested: options.nested }), failures };
}

/** Candidates of one rig often share a model name: then the file name tells them apart. */
function uniqueNames(models: readonly Model[], files: readonly string[]): string[] {
  const counts = new Map<string, number>();
  for (const m of models) counts.set(m.name, (counts.get(m.name) ?? 0) + 1);
  const names = models.map((m, i) => ((counts.get(m.name) ?? 0) > 1 ? `${m.name} (${path.basename(files[i])})` : m.name));
  // Same name and same file name in different folders: fall back to the path as given.
  return names.map((n, i) => (names.indexOf(n) !== names.lastIndexOf(n) ? `${models[i].name} (${files[i]})` : n));
}
