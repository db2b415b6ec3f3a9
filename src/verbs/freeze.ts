/**
 * `rigcal freeze` as a library verb: a copy of the model file with the calibrated values fixed, for a simulation team, or the
 * parameter table alone (JSON or CSV).
 *
 * Safety rules: the estimates must belong to this very model file (same SHA-256) unless the user
 * forces it; the output is never the model file, the estimates file or a data file; an existing
 * output is replaced only when asked; the file is written through a temporary sibling and a rename.
 */
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { UserError } from '../errors.js';
import { loadModel } from '../model/load/index.js';
import type { Model } from '../model/types.js';
import { writeFileAtomic } from '../files/atomic-file.js';
import { checkDataVersions, checkModelVersion, readEstimates, type DataVersionMismatch } from '../files/estimates-file.js';
import { inputsOfRun, outputFileProblem } from '../files/input-guard.js';
import { TOOL, VERSION } from '../version.js';
import { freezeModelText, type FreezeSummary } from '../handoff/freeze-document.js';
import { PARAMETER_TABLE_COLUMNS, parameterTable, parameterTableCsv, parameterTableJson } from '../handoff/parameter-table.js';
import { assertReplaceableFile, firstLine } from '../files/own-output.js';
import { sha256Hex } from '../files/sha256.js';

export type FreezeFormat = 'yaml' | 'json' | 'csv';

export interface FreezeOptions {
  /** Model file and estimates file (paths as the user gave them; relative to `cwd`). */
  modelFile: string;
  estimatesFile: string;
  /**
   * Output file. Omitted by prepareFreeze's callers that print the text instead (`-o -`): relative
   * data paths are then rewritten for `cwd`, and no file is checked.
   */
  output?: string;
  format?: FreezeFormat;
  /** Freeze even when the estimates were made for a model file, or from data files, with another SHA-256. */
  force?: boolean;
  /** Replace an existing output file. */
  overwrite?: boolean;
  cwd?: string;
  /** Date written into the comments (default: now). */
  date?: string;
}

export interface FreezeOutcome {
  /** Absolute path of the output (absent when the text was only prepared, for standard output). */
  output?: string;
  format: FreezeFormat;
  /** What the YAML rewrite did (yaml format only). */
  summary?: FreezeSummary;
  /** Rows of the parameter table (json/csv formats). */
  rows?: number;
  /** Present when `force` let a hash mismatch through. */
  hashMismatch?: { model: string; estimates: string };
  /** Present when `force` let changed data files through: both hashes of each. */
  dataChanges?: { experiment: string; file: string; recordedSha256: string; currentSha256: string }[];
  warnings: string[];
}

/** Builds the output text without writing anything (the CLI and tests share it). */
export function prepareFreeze(options: FreezeOptions): { text: string; outcome: FreezeOutcome } {
  const cwd = options.cwd ?? process.cwd();
  const format = options.format ?? 'yaml';
  const modelPath = path.resolve(cwd, options.modelFile);
  const estimatesPath = path.resolve(cwd, options.estimatesFile);
  const output = options.output === undefined ? undefined : path.resolve(cwd, options.output);
  const model = loadModel(modelPath);
  const estimates = readEstimates(estimatesPath);
  const estimatesBytes = readFileSync(estimatesPath);
  if (output) checkOutputPath(output, options.output!, options.overwrite, model, estimatesPath);

  const warnings: string[] = [];
  const mismatch = checkModelVersion(estimates, model, { estimatesLabel: options.estimatesFile, modelLabel: options.modelFile, force: options.force });
  const hashMismatch = mismatch && { model: mismatch.model, estimates: mismatch.estimates };
  if (mismatch) warnings.push(`${mismatch.warning}; frozen anyway because of --force`);
  const dataChanges = checkDataVersions(estimates, model, { estimatesLabel: options.estimatesFile, force: options.force });
  for (const c of dataChanges) warnings.push(`${c.warning}; frozen anyway because of --force`);
  if (estimates.fit.status && estimates.fit.status !== 'converged') {
    warnings.push(`the fit behind these estimates ended with status "${estimates.fit.status}"${estimates.fit.message ? ` (${estimates.fit.message})` : ''}`);
  }

  if (format !== 'yaml') {
    const rows = parameterTable(estimates);
    const text = format === 'json' ? parameterTableJson(rows) : parameterTableCsv(rows);
    return { text, outcome: { output, format, rows: rows.length, hashMismatch, ...changes(dataChanges), warnings } };
  }

  const date = options.date ?? new Date().toISOString();
  const { text, summary } = freezeModelText(readFileSync(modelPath, 'utf8'), model, estimates, {
    outputDir: output ? path.dirname(output) : cwd,
    estimatesLabel: options.estimatesFile,
    estimatesSha256: sha256Hex(estimatesBytes),
    date,
    toolVersion: `${VERSION}`,
    changedData: Object.fromEntries(dataChanges.map((c) => [c.experiment, c.current])),
  });
  const withWarning = hashMismatch
    ? `# WARNING (${TOOL} freeze --force): the estimates were made for a model file with sha256\n# ${hashMismatch.estimates}; the model frozen here had sha256 ${hashMismatch.model}.\n${text}`
    : text;
  return { text: withWarning, outcome: { output, format, summary, hashMismatch, ...changes(dataChanges), warnings } };
}

/** The accepted data changes for the outcome, both hashes each; nothing when there are none. */
function changes(mismatches: readonly DataVersionMismatch[]): Pick<FreezeOutcome, 'dataChanges'> {
  if (!mismatches.length) return {};
  return { dataChanges: mismatches.map((m) => ({ experiment: m.experiment, file: m.file, recordedSha256: m.recorded, currentSha256: m.current })) };
}

/** `rigcal freeze` as a library verb: prepare, then write the output atomically. */
export function runFreeze(options: FreezeOptions & { output: string }): FreezeOutcome & { output: string } {
  const { text, outcome } = prepareFreeze(options);
  const output = outcome.output!; // given, so resolved
  mkdirSync(path.dirname(output), { recursive: true });
  writeFileAtomic(output, text);
  return { ...outcome, output };
}

/** The output must not clobber any input, nor an existing file unless asked. */
function checkOutputPath(output: string, asGiven: string, overwrite: boolean | undefined, model: Model, estimatesPath: string): void {
  const problem = outputFileProblem({ file: output, where: { file: asGiven }, example: 'calibrated.yaml' }, inputsOfRun(model, estimatesPath));
  if (problem) throw new UserError(problem);
  assertReplaceableFile(output, asGiven, overwrite, isFreezeOutput, 'an output of rigcal freeze');
}

/** A file freeze wrote: a frozen model (its header line), or the parameter table as CSV or JSON. */
function isFreezeOutput(head: string): boolean {
  const line = firstLine(head);
  if (/^# Calibrated copy of .+, written by rigcal \S+ \(freeze\) on \S+$/.test(line) || line.startsWith('# WARNING (rigcal freeze --force):')) return true;
  if (line === PARAMETER_TABLE_COLUMNS.join(',')) return true;
  try {
    const rows = JSON.parse(head) as unknown;
    return Array.isArray(rows) && rows.length > 0 && rows.every((r) => typeof r === 'object' && r !== null && 'name' in r && Object.keys(r).every((k) => (PARAMETER_TABLE_COLUMNS as readonly string[]).includes(k)));
  } catch {
    return false;
  }
}
