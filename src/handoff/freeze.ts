/**
 * `freeze`: a copy of the model file with the calibrated values fixed, for a simulation team, or the
 * parameter table alone (JSON or CSV).
 *
 * Safety rules: the estimates must belong to this very model file (same SHA-256) unless the user
 * forces it; the output is never the model file, the estimates file or a data file; an existing
 * output is replaced only when asked; the file is written through a temporary sibling and a rename.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, realpathSync, statSync } from 'node:fs';
import path from 'node:path';
import { UserError, type Problem } from '../errors.js';
import { loadModel } from '../model/load/index.js';
import type { Model } from '../model/types.js';
import { readEstimates, type EstimatesFile } from '../reports/read-estimates.js';
import { writeFileAtomic } from '../util/atomic-write.js';
import { TOOL, VERSION } from '../version.js';
import { freezeModelText, type FreezeSummary } from './freeze-document.js';
import { parameterTable, parameterTableCsv, parameterTableJson } from './parameter-table.js';

export type FreezeFormat = 'yaml' | 'json' | 'csv';

export interface FreezeOptions {
  /** Model file and estimates file (paths as the user gave them; relative to `cwd`). */
  modelFile: string;
  estimatesFile: string;
  /** Output file. */
  output: string;
  format?: FreezeFormat;
  /** Freeze even when the estimates were made for a model file with another SHA-256. */
  force?: boolean;
  /** Replace an existing output file. */
  overwrite?: boolean;
  cwd?: string;
  /** Date written into the comments (default: now). */
  date?: string;
}

export interface FreezeOutcome {
  output: string;
  format: FreezeFormat;
  /** What the YAML rewrite did (yaml format only). */
  summary?: FreezeSummary;
  /** Rows of the parameter table (json/csv formats). */
  rows?: number;
  /** Present when `force` let a hash mismatch through. */
  hashMismatch?: { model: string; estimates: string };
  warnings: string[];
}

/** Builds the output text without writing anything (the CLI and tests share it). */
export function prepareFreeze(options: FreezeOptions): { text: string; outcome: FreezeOutcome } {
  const cwd = options.cwd ?? process.cwd();
  const format = options.format ?? 'yaml';
  const modelPath = path.resolve(cwd, options.modelFile);
  const estimatesPath = path.resolve(cwd, options.estimatesFile);
  const output = path.resolve(cwd, options.output);
  const model = loadModel(modelPath);
  const estimates = readEstimates(estimatesPath);
  const estimatesBytes = readFileSync(estimatesPath);
  checkOutputPath(output, options, model, estimatesPath);

  const warnings: string[] = [];
  let hashMismatch: FreezeOutcome['hashMismatch'];
  if (estimates.model.sha256 !== model.sha256) {
    if (!options.force) throw hashMismatchError(options, model, estimates);
    // Written into a comment below: only a well-formed hash goes through verbatim.
    const recorded = /^[0-9a-f]{64}$/i.test(estimates.model.sha256) ? estimates.model.sha256 : '(not a SHA-256)';
    hashMismatch = { model: model.sha256, estimates: recorded };
    warnings.push(
      `the estimates were made for a model file with sha256 ${recorded}, not this one (${model.sha256}); frozen anyway because of --force`,
    );
  }
  if (estimates.fit.status && estimates.fit.status !== 'converged') {
    warnings.push(`the fit behind these estimates ended with status "${estimates.fit.status}"${estimates.fit.message ? ` (${estimates.fit.message})` : ''}`);
  }

  if (format !== 'yaml') {
    const rows = parameterTable(estimates);
    const text = format === 'json' ? parameterTableJson(rows) : parameterTableCsv(rows);
    return { text, outcome: { output, format, rows: rows.length, hashMismatch, warnings } };
  }

  const date = options.date ?? new Date().toISOString();
  const { text, summary } = freezeModelText(readFileSync(modelPath, 'utf8'), model, estimates, {
    outputDir: path.dirname(output),
    estimatesLabel: options.estimatesFile,
    estimatesSha256: createHash('sha256').update(estimatesBytes).digest('hex'),
    date,
    toolVersion: `${VERSION}`,
  });
  const withWarning = hashMismatch
    ? `# WARNING (${TOOL} freeze --force): the estimates were made for a model file with sha256\n# ${hashMismatch.estimates}; the model frozen here had sha256 ${hashMismatch.model}.\n${text}`
    : text;
  return { text: withWarning, outcome: { output, format, summary, hashMismatch, warnings } };
}

/** Prepare and write atomically. */
export function freezeModel(options: FreezeOptions): FreezeOutcome {
  const { text, outcome } = prepareFreeze(options);
  mkdirSync(path.dirname(outcome.output), { recursive: true });
  writeFileAtomic(outcome.output, text);
  return outcome;
}

function hashMismatchError(options: FreezeOptions, model: Model, estimates: EstimatesFile): UserError {
  return new UserError({
    where: { file: options.estimatesFile, key: 'model.sha256' },
    what:
      `these estimates belong to another version of the model: they were made for ${estimates.model.file || 'a model file'} with sha256 ` +
      `${estimates.model.sha256 || '(none recorded)'}, but ${options.modelFile} has sha256 ${model.sha256}`,
    fix: 'fit this model file again and freeze with the new estimates.yaml; if you changed only comments or layout, add --force',
  });
}

/** The output must not clobber any input, nor an existing file unless asked. */
function checkOutputPath(output: string, options: FreezeOptions, model: Model, estimatesPath: string): void {
  const target = canonical(output);
  const inputs: { file: string; what: string }[] = [
    { file: model.file, what: 'the model file itself' },
    { file: estimatesPath, what: 'the estimates file' },
    ...model.experiments.map((e) => ({ file: e.file, what: `the data file of experiment ${e.name}` })),
  ];
  const problems: Problem[] = [];
  for (const input of inputs) {
    if (canonical(input.file) === target) {
      problems.push({
        where: { file: options.output },
        what: `is ${input.what}; freeze never overwrites its inputs`,
        fix: 'choose another output file, e.g. calibrated.yaml',
      });
      break;
    }
  }
  if (!problems.length && existsSync(output)) {
    if (statSync(output).isDirectory()) {
      problems.push({ where: { file: options.output }, what: 'is a folder', fix: 'give a file name, e.g. calibrated.yaml' });
    } else if (!options.overwrite) {
      problems.push({ where: { file: options.output }, what: 'exists already', fix: 'choose another output file, or add --overwrite to replace it' });
    }
  }
  if (problems.length) throw new UserError(problems);
}

/** The real path of a file, or of its folder plus its name when the file does not exist yet. */
function canonical(file: string): string {
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
