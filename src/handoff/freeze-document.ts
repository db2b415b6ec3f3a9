/**
 * The YAML rewrite behind `freeze`: the user's model file (never re-serialised from our Model), with
 * every free parameter fixed at its estimate and a comment saying where each value came from.
 *
 * Two ways to apply the same plan: through the `yaml` Document API (comments and key order survive;
 * spacing is the printer's), and by splicing the user's bytes at the node positions the parser
 * reports (freeze-splice.ts: everything outside the changed spans survives byte for byte). The
 * splice is used when it reads back exactly as the Document edit; the Document edit is the fallback.
 *
 * Per-experiment parameters: `set` takes fixed parameters only (model-format.md), so a free
 * per-experiment parameter becomes a fixed parameter whose own value is its start value (what
 * `simulate --params` uses for an experiment without an estimate of its own), and each fitted
 * experiment's `set` carries that experiment's estimate.
 */
import path from 'node:path';
import { isDeepStrictEqual } from 'node:util';
import { Pair, Scalar, YAMLMap, YAMLSeq, isMap, isScalar, isSeq, parseDocument, type Document } from 'yaml';
import { UserError, type Problem } from '../errors.js';
import { formatSignificant } from '../presentation/numbers.js';
import type { FreeParameterSpec, Model } from '../model/types.js';
import type { EstimateEntry, EstimatesFile } from '../files/estimates-file.js';
import type { FreezePlan } from './freeze-plan.js';
import { spliceFreeze } from './freeze-splice.js';

export interface FreezeDocumentOptions {
  /** Folder the frozen file will be written to (absolute): relative data paths are rewritten for it. */
  outputDir: string;
  /** The estimates file as the user named it (for comments), and the SHA-256 of its bytes. */
  estimatesLabel: string;
  estimatesSha256: string;
  /** Date of the freeze (ISO-8601), and the tool's name and version. */
  date: string;
  toolVersion: string;
  /** Data files accepted with --force although changed since the fit: their hash now, by experiment. */
  changedData?: Record<string, string>;
}

export interface FreezeSummary {
  /** Parameters fixed at a single estimate. */
  frozen: string[];
  /** Per-experiment parameters moved into the experiments' `set`. */
  perExperiment: string[];
  /** Fixed parameters whose value in the estimates differs from the model file (a `--set` at fit time). */
  changedFixed: string[];
  /** Experiments whose data path was rewritten, with the new path. */
  movedPaths: { experiment: string; file: string }[];
}

/** Keys of a free parameter that a fixed one must not carry. */
const FREE_ONLY_KEYS = ['free', 'start', 'scale', 'per_experiment'];

export function freezeModelText(
  sourceText: string,
  model: Model,
  estimates: EstimatesFile,
  options: FreezeDocumentOptions,
): { text: string; summary: FreezeSummary; edited: 'source' | 'document' } {
  const { plan, summary } = planFreeze(model, estimates, options);
  const doc = parseDocument(sourceText);
  if (doc.errors.length) {
    // The model loaded, so this cannot happen unless the file changed in between.
    throw new UserError({ where: { file: model.fileAsGiven }, what: `changed while rigcal read it: ${doc.errors[0].message}`, fix: 'run freeze again' });
  }
  const documentText = applyToDocument(doc, model, plan, sourceText);
  // Preferred: the user's bytes with only the planned spans changed (alignment, wrapping and quoting
  // all kept). Taken only when it reads back exactly as the Document edit does; otherwise (a layout
  // the splicer does not handle, e.g. a one-line flow mapping of parameters) the Document edit stands.
  const spliced = spliceFreeze(sourceText, plan);
  if (spliced !== undefined && sameContent(spliced, documentText)) return { text: spliced, summary, edited: 'source' };
  return { text: documentText, summary, edited: 'document' };
}

function sameContent(a: string, b: string): boolean {
  const da = parseDocument(a);
  const db = parseDocument(b);
  if (da.errors.length || db.errors.length) return false;
  return isDeepStrictEqual(da.toJS(), db.toJS());
}

function planFreeze(model: Model, estimates: EstimatesFile, options: FreezeDocumentOptions): { plan: FreezePlan; summary: FreezeSummary } {
  const byName = new Map(Object.entries(estimates.parameters));
  const problems: Problem[] = [];
  const summary: FreezeSummary = { frozen: [], perExperiment: [], changedFixed: [], movedPaths: [] };
  const plan: FreezePlan = { params: [], sets: [], paths: [], header: [] };
  const source = sourceLine(estimates, options);
  const fitExperiments = model.experiments.filter((e) => e.role === 'fit');
  const addSet = (experiment: string, name: string, value: number) => {
    let s = plan.sets.find((x) => x.experiment === experiment);
    if (!s) plan.sets.push((s = { experiment, entries: [] }));
    s.entries.push([name, value]);
  };

  for (const spec of model.parameters) {
    if (spec.kind === 'fixed') {
      const row = byName.get(spec.name);
      if (row && row.value !== spec.value) {
        plan.params.push({
          name: spec.name,
          value: row.value,
          unit: spec.unit,
          comment: [` ${spec.name} = ${show(row.value)}${unitSuffix(spec.unit)} as used by the fit (the model file said ${show(spec.value)}); ${source}`],
        });
        summary.changedFixed.push(spec.name);
      }
      continue;
    }
    if (!spec.perExperiment) {
      const row = byName.get(spec.name);
      if (!row) {
        problems.push(missingRow(estimates, spec.name));
        continue;
      }
      plan.params.push({
        name: spec.name,
        value: row.value,
        unit: spec.unit,
        comment: [` frozen: ${spec.name} = ${show(row.value)}${unitSuffix(spec.unit)}, ${describeEstimate(row, spec)}`, ` ${source}`],
      });
      summary.frozen.push(spec.name);
      continue;
    }
    // Per-experiment: one estimate per fit experiment, each into that experiment's `set`.
    const rows: { experiment: string; row: EstimateEntry }[] = [];
    for (const e of fitExperiments) {
      const row = byName.get(`${spec.name}@${e.name}`);
      if (!row) problems.push(missingRow(estimates, `${spec.name}@${e.name}`));
      else rows.push({ experiment: e.name, row });
    }
    if (rows.length !== fitExperiments.length) continue;
    for (const { experiment, row } of rows) addSet(experiment, spec.name, row.value);
    plan.params.push({
      name: spec.name,
      value: spec.start,
      unit: spec.unit,
      comment: [
        ` frozen: ${spec.name} was estimated per experiment; each experiment's \`set\` holds its estimate:`,
        ...rows.map(({ experiment, row }) => `   ${experiment}: ${show(row.value)}${unitSuffix(spec.unit)}, ${describeEstimate(row, spec)}`),
        ` experiments without an estimate of their own (validation runs, new logs) use the start value`,
        ` ${show(spec.start)}${unitSuffix(spec.unit)} written here; set their own value where it is known.`,
        ` ${source}`,
      ],
    });
    summary.perExperiment.push(spec.name);
  }
  if (problems.length) throw new UserError(problems);
  for (const e of model.experiments) {
    if (path.isAbsolute(e.fileAsWritten)) continue;
    const newPath = pathFrom(options.outputDir, e.file);
    if (newPath !== e.fileAsWritten) plan.paths.push({ experiment: e.name, file: newPath });
  }
  summary.movedPaths = plan.paths.map((p) => ({ ...p }));
  plan.header = headerLines(model, estimates, options);
  for (const p of plan.params) p.comment = p.comment.map(clean);
  plan.header = plan.header.map(clean);
  return { plan, summary };
}

function applyToDocument(doc: Document, model: Model, plan: FreezePlan, sourceText: string): string {
  const params = doc.get('parameters', true);
  if (!isMap(params)) throw new UserError({ where: { file: model.fileAsGiven, key: 'parameters' }, what: 'is not a mapping', fix: 'run `rigcal check` on the model' });
  for (const p of plan.params) {
    const pair = findPair(params, p.name);
    if (!pair) continue; // cannot happen for a loaded model
    setFixed(doc, pair, p.value, p.unit);
    appendCommentBefore(pair, p.comment);
  }
  for (const s of plan.sets) for (const [name, value] of s.entries) setExperimentValue(doc, model, s.experiment, name, value);
  for (const m of plan.paths) {
    const node = experimentNode(doc, m.experiment)?.get('file', true);
    if (isScalar(node)) node.value = m.file;
  }
  prependHeader(doc, plan.header);
  // Folded text (descriptions) is re-wrapped by the printer: at the width of the user's longest line
  // it keeps their wrapping as far as the Document API allows (alignment spaces are not kept).
  const longest = sourceText.split(/\r?\n/).reduce((w, line) => Math.max(w, line.length), 0);
  return doc.toString({ lineWidth: Math.max(80, longest), minContentWidth: 0 });
}

function missingRow(estimates: EstimatesFile, name: string): Problem {
  return {
    where: { file: estimates.file, key: `parameters.${name}` },
    what: `has no estimate of ${name}, which the model declares free`,
    fix: 'fit this model again and freeze with the estimates.yaml of that fit',
  };
}

function findPair(map: YAMLMap, key: string): Pair | undefined {
  return map.items.find((p) => (isScalar(p.key) ? p.key.value : p.key) === key) as Pair | undefined;
}

/**
 * Turn a parameter entry into `fixed: value` in place: the free-only keys go, `unit` and the user's
 * comments stay, and `fixed` takes the place where `free` stood.
 */
function setFixed(doc: Document, pair: Pair, value: number, unit: string): void {
  const node = pair.value;
  if (isMap(node)) {
    let at = node.items.findIndex((p) => keyOf(p) === 'free' || keyOf(p) === 'fixed');
    for (const k of FREE_ONLY_KEYS) node.delete(k);
    node.delete('fixed');
    if (at < 0 || at > node.items.length) at = 0;
    node.items.splice(at, 0, new Pair(new Scalar('fixed'), new Scalar(value)));
    return;
  }
  // Shorthand (`m: 2.5` or `m: "2.5 kg"`): a small flow mapping keeps the unit explicit.
  const replacement = doc.createNode(unit ? { fixed: value, unit } : { fixed: value }, { flow: true }) as YAMLMap;
  if (isScalar(node)) replacement.comment = node.comment;
  pair.value = replacement;
}

function keyOf(p: Pair): unknown {
  return isScalar(p.key) ? p.key.value : p.key;
}

function setExperimentValue(doc: Document, model: Model, experiment: string, name: string, value: number): void {
  const item = experimentNode(doc, experiment);
  if (!item) throw new UserError({ where: { file: model.fileAsGiven, key: 'experiments' }, what: `has no experiment ${experiment}`, fix: 'run `rigcal check` on the model' });
  const set = item.get('set', true);
  if (isMap(set)) {
    set.set(name, new Scalar(value));
  } else {
    item.set('set', doc.createNode({ [name]: value }, { flow: true }));
  }
}

function experimentNode(doc: Document, name: string): YAMLMap | undefined {
  const list = doc.get('experiments', true);
  if (!isSeq(list)) return undefined;
  for (const item of (list as YAMLSeq).items) {
    if (isMap(item) && item.get('name') === name) return item;
  }
  return undefined;
}

/**
 * The data file's path as seen from `outputDir`: relative when the two share a folder below the
 * file system's root, absolute otherwise (a chain of `../` up to the root helps nobody).
 */
function pathFrom(outputDir: string, file: string): string {
  const rel = path.relative(outputDir, file);
  const shared = commonAncestor(path.resolve(outputDir), path.resolve(file));
  if (path.isAbsolute(rel) || shared === path.parse(shared).root) return file.split(path.sep).join('/');
  return rel.split(path.sep).join('/');
}

function commonAncestor(a: string, b: string): string {
  const pa = a.split(path.sep);
  const pb = b.split(path.sep);
  let i = 0;
  while (i < pa.length && i < pb.length && pa[i] === pb[i]) i++;
  return pa.slice(0, i).join(path.sep) || path.sep;
}

/**
 * Comment text partly comes from the estimates file, which may come from anywhere: no control
 * character (line breaks above all) may reach the output, where it could end the comment and start
 * YAML content.
 */
function clean(line: string): string {
  return line.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/g, ' ');
}

function appendCommentBefore(pair: Pair, lines: string[]): void {
  const key = pair.key as Scalar;
  const text = lines.join('\n');
  key.commentBefore = key.commentBefore ? `${key.commentBefore}\n${text}` : text;
}

function prependHeader(doc: Document, lines: string[]): void {
  const header = lines.join('\n');
  doc.commentBefore = doc.commentBefore ? `${header}\n\n${doc.commentBefore}` : header;
}

function headerLines(model: Model, estimates: EstimatesFile, options: FreezeDocumentOptions): string[] {
  const lines = [
    ` Calibrated copy of ${path.basename(model.file)}, written by rigcal ${options.toolVersion} (freeze) on ${options.date}.`,
    ` Every free parameter is fixed at its estimate from ${options.estimatesLabel}; the bounds and start`,
    ` values live on in the original model file. Comments beside each parameter give its standard error`,
    ` and 95 % interval.`,
    ` Source of the estimates: model sha256 ${estimates.model.sha256}, fit of ${estimates.fit.date || 'unknown date'}`,
    ` (status ${estimates.fit.status || 'unknown'}), rigcal ${estimates.version || 'unknown version'}; estimates file sha256 ${options.estimatesSha256}.`,
  ];
  if (estimates.data.length) {
    lines.push(' Data of that fit:');
    for (const d of estimates.data) {
      const now = options.changedData?.[d.experiment];
      lines.push(`   ${d.experiment} (${d.role}): ${d.file}, sha256 ${d.sha256}${now ? ` when fitted; CHANGED since: the file now has sha256 ${now} (frozen anyway with --force)` : ''}`);
    }
  }
  lines.push(
    ' Cautions: these values hold only inside the operating range the data above covered (amplitudes,',
    ' speeds, temperatures, frequencies); extrapolation is at your own risk. Verify the model against',
    ' fresh measurements before any safety-relevant use, and follow local codes and licensed engineering',
    ' practice.',
  );
  return lines;
}

function sourceLine(estimates: EstimatesFile, options: FreezeDocumentOptions): string {
  return `source: ${options.estimatesLabel} (fit ${estimates.fit.date || 'of unknown date'}, rigcal ${estimates.version || '?'}, model sha256 ${estimates.model.sha256.slice(0, 12)}..., data hashes in the header)`;
}

function describeEstimate(row: EstimateEntry, spec: FreeParameterSpec): string {
  const u = unitSuffix(spec.unit);
  const parts = [`estimated within [${show(spec.min)}, ${show(spec.max)}]`];
  const se = row.stdError === null || row.stdError === undefined ? undefined : `standard error ${show(row.stdError)}${u}`;
  const ci = row.ci95 ? `95 % interval [${show(row.ci95[0])}, ${show(row.ci95[1])}]${u}` : undefined;
  if (se) parts.push(se);
  if (ci) parts.push(ci);
  if (!se && !ci) parts.push('standard error and 95 % interval not determined by the data');
  else if (!se) parts.push('standard error not determined by the data');
  else if (!ci) parts.push('no 95 % interval');
  if (row.atBound) parts.push(`at its ${row.atBound} bound: the interval is not reliable`);
  return parts.join(', ');
}

function unitSuffix(unit: string): string {
  return unit ? ` ${unit}` : '';
}

/** Six significant digits for comments (the values themselves are written in full precision). */
function show(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  return formatSignificant(v, 6);
}
