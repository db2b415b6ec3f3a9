/**
 * The one rule for an output file: it is never an input of the run (the model file, a data file, the
 * estimates file), compared by real path so that `./sub/../m.yaml` or a link is caught, and never a
 * folder. Whether an existing file may be replaced is the command's own rule (freeze: --overwrite).
 */
import { existsSync, realpathSync, statSync } from 'node:fs';
import path from 'node:path';
import { UserError, type Problem, type SourceLocation } from '../errors.js';
import type { Model } from '../model/types.js';

/** An input of a run, as the message names it. */
export interface RunInput {
  file: string;
  what: string;
}

/** The model file, every experiment's data file and the estimates file (when given) of a run. */
export function inputsOfRun(model: Model, estimatesFile?: string): RunInput[] {
  return [
    { file: model.file, what: 'the model file itself' },
    ...(estimatesFile ? [{ file: estimatesFile, what: 'the estimates file' }] : []),
    ...model.experiments.map((e) => ({ file: e.file, what: `the data file of experiment ${e.name}` })),
  ];
}

export interface OutputFile {
  /** Absolute path. */
  file: string;
  /** Where the path came from: `{ file: asGiven }`, or `{ key: '-o' }` with a `subject` naming the path. */
  where: SourceLocation;
  subject?: string;
  /** What to write instead, e.g. `-o simulation.csv`. */
  example: string;
}

/** The problem with writing `output` in a run with these inputs, if any (an input, or a folder). */
export function outputFileProblem(output: OutputFile, inputs: readonly RunInput[]): Problem | undefined {
  const target = canonicalPath(output.file);
  const subject = output.subject ? `${output.subject} ` : '';
  const input = inputs.find((i) => canonicalPath(i.file) === target);
  if (input) {
    return { where: output.where, what: `${subject}is ${input.what}; rigcal never overwrites a model, data or estimates file`, fix: `write to a new file, e.g. ${output.example}` };
  }
  if (existsSync(output.file) && statSync(output.file).isDirectory()) {
    return { where: output.where, what: `${subject}is a folder`, fix: `give a file name, e.g. ${output.example}` };
  }
  return undefined;
}

/** Throws the problem of outputFileProblem, if any. */
export function refuseOverwritingInputs(output: OutputFile, inputs: readonly RunInput[]): void {
  const problem = outputFileProblem(output, inputs);
  if (problem) throw new UserError(problem);
}

/** The real path of a file (links followed), or of its folder plus its name when it does not exist yet. */
function canonicalPath(file: string): string {
  try {
    return realpathSync(file);
  } catch {
    try {
      return path.join(realpathSync(path.dirname(file)), path.basename(file));
    } catch {
      return path.resolve(file);
    }
  }
}
