/**
 * Reads estimates.yaml (written by `fit`) for `simulate --params`, `validate` and `freeze`, and
 * decides whether it belongs to the model file at hand (the one policy, `checkModelVersion`).
 * The file is input from the user's disk: it is checked key by key and every problem names the file,
 * the line and the key.
 */
import { readFileSync, statSync } from 'node:fs';
import { LineCounter, isMap, isPair, isScalar, parseDocument, type Document, type Node } from 'yaml';
import { ProblemList, UserError, type SourceLocation } from '../errors.js';
import type { Model } from '../model/types.js';
import { sha256OfFile } from './sha256.js';

/** Larger than any real estimates file by far; refuses a wrong file before parsing it. */
const MAX_BYTES = 4 * 1024 * 1024;

export interface EstimateEntry {
  value: number;
  unit: string;
  status: 'estimated' | 'fixed';
  experiment?: string;
  stdError?: number | null;
  ci95?: [number, number] | null;
  atBound?: false | 'lower' | 'upper';
  scale?: 'log' | 'linear';
}

export interface EstimatesFile {
  file: string;
  version: string;
  model: { name: string; file: string; sha256: string };
  fit: { status: string; message: string; date: string; weightedSSE?: number; observations?: number };
  data: { experiment: string; role: string; file: string; sha256: string }[];
  /** Every parameter value by name (`name` or `name@experiment`), in the parameter's unit. */
  values: Record<string, number>;
  parameters: Record<string, EstimateEntry>;
  noise: Record<string, { sigma: number; unit: string; estimated: boolean }>;
}

function isNumber(v: unknown): v is number {
  return typeof v === 'number' && !Number.isNaN(v);
}

function readEstimatesText(file: string): string {
  try {
    const size = statSync(file).size;
    if (size > MAX_BYTES) {
      throw new UserError({ where: { file }, what: `the estimates file is ${size} bytes, more than an estimates file can be (${MAX_BYTES} bytes)`, fix: 'pass the estimates.yaml written by `rigcal fit`' });
    }
    return readFileSync(file, 'utf8');
  } catch (err) {
    if (err instanceof UserError) throw err;
    throw new UserError({ where: { file }, what: `cannot read the estimates file (${(err as NodeJS.ErrnoException).code ?? (err as Error).message})`, fix: 'give the path of an estimates.yaml written by `rigcal fit`' });
  }
}

/** The YAML problems of the file, each located; a second document is named as such. */
function syntaxProblems(file: string, doc: Document, lineCounter: LineCounter): ProblemList {
  const problems = new ProblemList();
  for (const e of doc.errors) {
    const pos = e.linePos?.[0] ?? lineCounter.linePos(e.pos[0]);
    const what =
      e.code === 'MULTIPLE_DOCS'
        ? 'holds more than one YAML document (a `---` line after the first one); an estimates file is a single document'
        : `not valid YAML: ${e.message.split('\n')[0]}`;
    problems.add({ file, line: pos?.line, column: pos?.col }, what, 'pass the estimates.yaml written by `rigcal fit`, unedited');
  }
  return problems;
}

/**
 * The file as plain data. rigcal writes no aliases; a file whose aliases expand past the library's
 * limit (an "alias bomb", which would take memory and time without bound) is refused as input.
 */
function plainData(file: string, doc: Document): Record<string, any> | null {
  try {
    return doc.toJS({ maxAliasCount: 10 }) as Record<string, any> | null;
  } catch (err) {
    if (!(err instanceof ReferenceError)) throw err;
    throw new UserError({
      where: { file },
      what: 'its YAML aliases (*name) expand to far more data than an estimates file holds: it is not an estimates file of rigcal',
      fix: 'pass the estimates.yaml written by `rigcal fit`, unedited (it contains no anchors or aliases)',
    });
  }
}

export function readEstimates(file: string): EstimatesFile {
  const text = readEstimatesText(file);
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, prettyErrors: false, uniqueKeys: true });
  syntaxProblems(file, doc, lineCounter).throwIfAny();
  const problems = new ProblemList();
  const at = (node: Node | null | undefined, key: string): SourceLocation => {
    const where: SourceLocation = { file, key };
    if (node?.range) {
      const pos = lineCounter.linePos(node.range[0]);
      where.line = pos.line;
      where.column = pos.col;
    }
    return where;
  };
  const root = doc.contents;
  const plain = plainData(file, doc);
  if (!isMap(root) || plain === null || typeof plain !== 'object' || plain.tool !== 'rigcal') {
    throw new UserError({ where: { file, key: 'tool' }, what: 'this is not an estimates file of rigcal (no `tool: rigcal` at the top)', fix: 'pass the estimates.yaml written by `rigcal fit`' });
  }
  const paramsNode = root.get('parameters', true) as Node | undefined;
  if (!isMap(paramsNode)) {
    throw new UserError({ where: at(paramsNode, 'parameters'), what: 'the estimates file has no `parameters` map', fix: 'pass the estimates.yaml written by `rigcal fit`' });
  }
  const values: Record<string, number> = {};
  const parameters: Record<string, EstimateEntry> = {};
  for (const item of paramsNode.items) {
    if (!isPair(item)) continue;
    const keyNode = item.key as Node;
    const name = isScalar(keyNode) ? String(keyNode.value) : '';
    const key = `parameters.${name}`;
    const entry = (plain.parameters as Record<string, any>)[name];
    if (!/^[A-Za-z][A-Za-z0-9_]*(@[^\s@]+)?$/.test(name)) {
      problems.add(at(keyNode, key), `\`${name}\` is not a parameter name (letters, digits, _; per-experiment copies as name@experiment)`);
      continue;
    }
    if (entry === null || typeof entry !== 'object' || Array.isArray(entry)) {
      problems.add(at(item.value as Node, key), `parameter ${name} must be a map with at least \`value\``, 'e.g. `K: { value: 0.0521, unit: N*m/A, status: estimated }`');
      continue;
    }
    if (!isNumber(entry.value) || !Number.isFinite(entry.value)) {
      problems.add(at(item.value as Node, `${key}.value`), `parameter ${name} has no finite numeric \`value\` (found ${JSON.stringify(entry.value) ?? 'nothing'})`, 'write the value as a plain number');
      continue;
    }
    const status = entry.status === 'fixed' ? 'fixed' : 'estimated';
    if (entry.status !== undefined && entry.status !== 'fixed' && entry.status !== 'estimated') {
      problems.add(at(item.value as Node, `${key}.status`), `parameter ${name} has status ${JSON.stringify(entry.status)}`, 'use `estimated` or `fixed`');
    }
    values[name] = entry.value;
    const e: EstimateEntry = { value: entry.value, unit: typeof entry.unit === 'string' ? entry.unit : '', status };
    if (typeof entry.experiment === 'string') e.experiment = entry.experiment;
    if (isNumber(entry.stdError) || entry.stdError === null) e.stdError = entry.stdError;
    if (entry.ci95 === null || (Array.isArray(entry.ci95) && entry.ci95.length === 2 && entry.ci95.every(isNumber))) e.ci95 = entry.ci95;
    if (entry.atBound === false || entry.atBound === 'lower' || entry.atBound === 'upper') e.atBound = entry.atBound;
    if (entry.scale === 'log' || entry.scale === 'linear') e.scale = entry.scale;
    parameters[name] = e;
  }
  problems.throwIfAny();
  const str = (v: unknown): string => (typeof v === 'string' ? v : v === undefined || v === null ? '' : String(v));
  const model = plain.model ?? {};
  const fit = plain.fit ?? {};
  const noise: EstimatesFile['noise'] = {};
  for (const [k, v] of Object.entries((plain.noise ?? {}) as Record<string, any>)) {
    if (v && isNumber(v.sigma)) noise[k] = { sigma: v.sigma, unit: str(v.unit), estimated: v.estimated === true };
  }
  return {
    file,
    version: str(plain.version),
    model: { name: str(model.name), file: str(model.file), sha256: str(model.sha256) },
    fit: { status: str(fit.status), message: str(fit.message), date: str(fit.date), weightedSSE: isNumber(fit.weightedSSE) ? fit.weightedSSE : undefined, observations: isNumber(fit.observations) ? fit.observations : undefined },
    data: Array.isArray(plain.data) ? plain.data.filter((d: any) => d && typeof d === 'object').map((d: any) => ({ experiment: str(d.experiment), role: str(d.role), file: str(d.file), sha256: str(d.sha256) })) : [],
    values,
    parameters,
    noise,
  };
}

/** A mismatch let through: the model file's SHA-256 and the one the estimates record (shown safely). */
export interface ModelVersionMismatch {
  model: string;
  estimates: string;
  /** The same in words, for the run's warnings. */
  warning: string;
}

/**
 * The recorded hash as it may be shown: the estimates file may come from anywhere, and this text
 * goes into messages and comments.
 */
function shownHash(recorded: string): string {
  if (!recorded) return '(none recorded)';
  return /^[0-9a-f]{64}$/i.test(recorded) ? recorded : '(not a SHA-256)';
}

/**
 * Whether the estimates belong to this version of the model file: only when the SHA-256 they record
 * is the model file's own (a missing or malformed record is a mismatch). A mismatch is refused
 * (UserError, exit 2) unless the run accepts it (`force`); an accepted one is returned, to be
 * reported as a warning.
 *
 * `estimatesLabel` and `modelLabel` name the files as the user gave them.
 */
export function checkModelVersion(
  estimates: EstimatesFile,
  model: Model,
  options: { estimatesLabel: string; modelLabel: string; force?: boolean },
): ModelVersionMismatch | undefined {
  if (estimates.model.sha256 === model.sha256) return undefined;
  const recorded = shownHash(estimates.model.sha256);
  if (!options.force) {
    throw new UserError({
      where: { file: options.estimatesLabel, key: 'model.sha256' },
      what:
        `these estimates belong to another version of the model: they were made for ${estimates.model.file || 'a model file'} with sha256 ` +
        `${recorded}, but ${options.modelLabel} has sha256 ${model.sha256}`,
      fix: 'fit this model file again and use the new estimates.yaml; if you changed only comments or layout, add --force',
    });
  }
  return {
    model: model.sha256,
    estimates: recorded,
    warning: `${options.estimatesLabel} was fitted to a different version of ${options.modelLabel}: the estimates were made for a model file with sha256 ${recorded}, not this one (${model.sha256})`,
  };
}

/** A data file that is no longer the one the estimates were made from (both hashes shown safely). */
export interface DataVersionMismatch {
  experiment: string;
  /** The data file as the model file names it. */
  file: string;
  /** The SHA-256 estimates.yaml records for it. */
  recorded: string;
  /** The SHA-256 of the file now, or why it cannot be read. */
  current: string;
  /** The same in words, for the run's warnings. */
  warning: string;
}

/**
 * Whether the data files the estimates record are still the ones the fit read: for each experiment
 * recorded in estimates.yaml that the model still has, the recorded SHA-256 against the file's now.
 * An edited, replaced or missing log is refused (UserError, exit 2, one problem per file) unless the
 * run accepts it (`force`); accepted ones are returned, for the run to record both hashes.
 */
export function checkDataVersions(estimates: EstimatesFile, model: Model, options: { estimatesLabel: string; force?: boolean }): DataVersionMismatch[] {
  const mismatches: DataVersionMismatch[] = [];
  for (const d of estimates.data) {
    const experiment = model.experiments.find((e) => e.name === d.experiment);
    if (!experiment) continue;
    const now = sha256OfFile(experiment.file);
    const current = now.ok ? now.sha256 : `(cannot read the file: ${now.code})`;
    if (now.ok && now.sha256 === d.sha256) continue;
    const recorded = shownHash(d.sha256);
    mismatches.push({
      experiment: experiment.name,
      file: experiment.fileAsWritten,
      recorded,
      current,
      warning: `the data file ${experiment.fileAsWritten} of experiment ${experiment.name} is not the one the estimates were made from: ${options.estimatesLabel} records sha256 ${recorded}, the file now has sha256 ${current}`,
    });
  }
  if (mismatches.length && !options.force) {
    throw new UserError(
      mismatches.map((m) => ({
        where: { file: m.file },
        what:
          `the data of experiment ${m.experiment} changed since the fit: ${options.estimatesLabel} records sha256 ${m.recorded} ` +
          `for this file, but it now has sha256 ${m.current}`,
        fix: 'fit the model again on the data as they are now; or, to use these estimates with the changed data anyway, add --force (the output then records both hashes)',
      })),
    );
  }
  return mismatches;
}
