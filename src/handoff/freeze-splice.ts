/**
 * The freeze plan applied to the user's bytes: each change replaces or inserts text at the source
 * positions the `yaml` parser reports for the nodes involved, and everything else (alignment,
 * wrapping, quoting, blank lines, comments) is kept byte for byte, so a diff against the original
 * shows only what freeze changed.
 *
 * Returns undefined for layouts it does not handle (flow-style `parameters` or `experiments`, aliases,
 * tabs before keys); the caller then keeps the Document-API edit. The caller also checks that the
 * spliced text reads back exactly as the Document edit does before using it.
 */
import { isMap, isScalar, isSeq, parseDocument, type Pair, type YAMLMap } from 'yaml';
import type { FreezePlan } from './freeze-plan.js';

interface Edit {
  start: number;
  end: number;
  text: string;
}

const FREE_ONLY_KEYS = new Set(['free', 'start', 'scale', 'per_experiment', 'fixed']);

export function spliceFreeze(source: string, plan: FreezePlan): string | undefined {
  const doc = parseDocument(source);
  if (doc.errors.length) return undefined;
  const eol = source.includes('\r\n') ? '\r\n' : '\n';
  const edits: Edit[] = [];

  const params = doc.get('parameters', true);
  if (!isMap(params) || params.flow) return undefined;
  for (const p of plan.params) {
    const pair = findPair(params, p.name);
    if (!pair || !isScalar(pair.key) || !pair.key.range) return undefined;
    const keyStart = pair.key.range[0];
    const ls = lineStart(source, keyStart);
    const indent = source.slice(ls, keyStart);
    if (!/^ *$/.test(indent)) return undefined;
    const fix = fixedEdits(source, pair, p.value, p.unit, eol);
    if (!fix) return undefined;
    edits.push({ start: ls, end: ls, text: p.comment.map((c) => `${indent}#${c}${eol}`).join('') }, ...fix);
  }

  if (plan.sets.length || plan.paths.length) {
    const list = doc.get('experiments', true);
    if (!isSeq(list) || list.flow) return undefined;
    const itemOf = (name: string): YAMLMap | undefined => list.items.find((i): i is YAMLMap => isMap(i) && i.get('name') === name);
    for (const m of plan.paths) {
      const node = itemOf(m.experiment)?.get('file', true);
      if (!isScalar(node) || !node.range) return undefined;
      edits.push({ start: node.range[0], end: node.range[1], text: scalarText(m.file, node.type === 'PLAIN') });
    }
    for (const s of plan.sets) {
      const item = itemOf(s.experiment);
      if (!item) return undefined;
      const e = setEdit(source, item, s.entries, eol);
      if (!e) return undefined;
      edits.push(e);
    }
  }

  const bom = source.startsWith('\uFEFF') ? 1 : 0;
  edits.push({ start: bom, end: bom, text: `${plan.header.map((h) => `#${h}${eol}`).join('')}${eol}` });
  return applyEdits(source, edits);
}

function findPair(map: YAMLMap, key: string): Pair | undefined {
  return map.items.find((p) => (isScalar(p.key) ? p.key.value : p.key) === key) as Pair | undefined;
}

/** `fixed: value` in place of the parameter's entry, keeping its `unit` as the user wrote it. */
function fixedEdits(source: string, pair: Pair, value: number, unit: string, eol: string): Edit[] | undefined {
  const node = pair.value;
  if (isScalar(node) && node.range) {
    // Shorthand `m: 2.5` / `m: "2.5 kg"`.
    return [{ start: node.range[0], end: node.range[1], text: `{ fixed: ${numberText(value)}${unit ? `, unit: ${scalarText(unit, true)}` : ''} }` }];
  }
  if (!isMap(node) || !node.range) return undefined;
  if (node.flow) {
    const unitNode = node.get('unit', true);
    const unitText = isScalar(unitNode) && unitNode.range ? source.slice(unitNode.range[0], unitNode.range[1]) : unit ? scalarText(unit, true) : '';
    const pad = source[node.range[0] + 1] === ' ' ? ' ' : '';
    return [{ start: node.range[0], end: node.range[1], text: `{${pad}fixed: ${numberText(value)}${unitText ? `, unit: ${unitText}` : ''}${pad}}` }];
  }
  // Block mapping: the lines of the free-only keys go; `fixed` takes the place of the first of them.
  const edits: Edit[] = [];
  for (const item of node.items) {
    const key = isScalar(item.key) ? item.key : undefined;
    if (!key?.range || !FREE_ONLY_KEYS.has(String(key.value))) continue;
    const ls = lineStart(source, key.range[0]);
    const indent = source.slice(ls, key.range[0]);
    if (!/^ *$/.test(indent)) return undefined;
    const v = item.value as { range?: [number, number, number] } | null;
    const end = lineEnd(source, v?.range ? v.range[1] : key.range[1]);
    edits.push({ start: ls, end, text: edits.length ? '' : `${indent}fixed: ${numberText(value)}${eol}` });
  }
  return edits.length ? edits : undefined;
}

/** The experiment's `set` gains the entries: into an existing mapping, or as a new `set:` line. */
function setEdit(source: string, item: YAMLMap, entries: [string, number][], eol: string): Edit | undefined {
  const inline = entries.map(([k, v]) => `${k}: ${numberText(v)}`).join(', ');
  const set = item.get('set', true);
  if (set !== undefined) {
    if (!isMap(set) || !set.range) return undefined;
    if (set.flow) {
      const last = set.items[set.items.length - 1];
      const lastEnd = (last?.value as { range?: number[] } | null)?.range?.[1];
      if (last && lastEnd !== undefined) return { start: lastEnd, end: lastEnd, text: `, ${inline}` };
      return { start: set.range[0], end: set.range[1], text: `{ ${inline} }` };
    }
    const first = set.items[0];
    const last = set.items[set.items.length - 1];
    if (!first || !isScalar(first.key) || !first.key.range) return undefined;
    const indent = ' '.repeat(first.key.range[0] - lineStart(source, first.key.range[0]));
    const at = lineEnd(source, endOf(last));
    return { start: at, end: at, text: `${needsBreak(source, at, eol)}${entries.map(([k, v]) => `${indent}${k}: ${numberText(v)}${eol}`).join('')}` };
  }
  if (item.flow) {
    const last = item.items[item.items.length - 1];
    if (!last) return undefined;
    const at = endOf(last);
    return { start: at, end: at, text: `, set: { ${inline} }` };
  }
  const first = item.items[0];
  if (!first || !isScalar(first.key) || !first.key.range) return undefined;
  const column = first.key.range[0] - lineStart(source, first.key.range[0]);
  const at = lineEnd(source, endOf(item.items[item.items.length - 1]));
  return { start: at, end: at, text: `${needsBreak(source, at, eol)}${' '.repeat(column)}set: { ${inline} }${eol}` };
}

function endOf(pair: Pair): number {
  const v = pair.value as { range?: number[] } | null;
  const k = pair.key as { range?: number[] } | null;
  return v?.range?.[1] ?? k?.range?.[1] ?? 0;
}

/** Inserting after the file's last line when it has no line break: add one first. */
function needsBreak(source: string, at: number, eol: string): string {
  return at === source.length && source.length > 0 && !source.endsWith('\n') ? eol : '';
}

function lineStart(source: string, pos: number): number {
  return source.lastIndexOf('\n', pos - 1) + 1;
}

/** Position just after the line break that ends the line holding `pos` (or the end of the text). */
function lineEnd(source: string, pos: number): number {
  const i = source.indexOf('\n', pos);
  return i < 0 ? source.length : i + 1;
}

/** Shortest round-trip form: reading it back gives the same double. */
function numberText(v: number): string {
  return String(v);
}

/** Plain when safe (and the original was plain), else double-quoted (JSON strings are valid YAML). */
function scalarText(text: string, plainAllowed: boolean): string {
  return plainAllowed && /^[A-Za-z0-9_.\/][A-Za-z0-9_.\/*^()+-]*$/.test(text) ? text : JSON.stringify(text);
}

function applyEdits(source: string, edits: Edit[]): string | undefined {
  const sorted = edits.map((e, i) => ({ ...e, i })).sort((a, b) => a.start - b.start || a.i - b.i);
  for (let k = 1; k < sorted.length; k++) if (sorted[k].start < sorted[k - 1].end) return undefined;
  let out = '';
  let at = 0;
  for (const e of sorted) {
    out += source.slice(at, e.start) + e.text;
    at = e.end;
  }
  return out + source.slice(at);
}
