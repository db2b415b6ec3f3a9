/** What `rigcal check` does (its options and help: check.ts). */
import { UserError, type Problem } from '../../errors.js';
import type { ExperimentData } from '../../data/types.js';
import { loadExperimentData } from '../../data/load-experiment.js';
import { compileModel } from '../../model/compile/index.js';
import { loadModel } from '../../model/load/index.js';
import { fitReadinessNotes, renderCheckSummary } from '../../reports/check-summary.js';
import type { CommandContext } from '../io.js';
import { pathFromCwd } from '../paths.js';

export function runCheck(modelArg: string, ctx: CommandContext): number {
  const { io } = ctx;
  // Loading the model throws one UserError listing every problem of the model file; the data
  // files can only be read against a loaded model, so they are checked once it loads.
  const model = loadModel(pathFromCwd(modelArg, io.cwd));
  const problems: Problem[] = [];
  const collect = (err: unknown) => {
    if (err instanceof UserError) problems.push(...err.problems);
    else throw err;
  };
  try {
    compileModel(model);
  } catch (err) {
    collect(err);
  }
  const data: (ExperimentData | undefined)[] = model.experiments.map((_, k) => {
    try {
      return loadExperimentData(model, k);
    } catch (err) {
      collect(err);
      return undefined;
    }
  });
  io.stdout(renderCheckSummary({ model, data }));
  const notes = fitReadinessNotes(model, data);
  if (notes.length) io.stdout(`\nnotes\n${notes.map((n) => `  - ${n}`).join('\n')}\n`);
  if (problems.length) throw new UserError(problems);
  io.stdout('\nno problems found\n');
  return 0;
}

