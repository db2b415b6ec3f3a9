/**
 * Reading the model file's YAML into a tree whose every node knows its line and column, with the
 * guards a hostile file needs: size cap, node and alias caps, no tags, no duplicate keys.
 *
 * The loader reads the yaml library's own node tree (not `toJS`) so that every message can point at
 * the key or value it is about.
 */
import { createHash } from 'node:crypto';
import { readFileSync, statSync } from 'node:fs';
import {
  isAlias, isMap, isPair, isScalar, isSeq, LineCounter, parseAllDocuments, parseDocument, visit,
  type Document, type Node as YamlNode, type Scalar,
} from 'yaml';
import { ProblemList, UserError, type SourceLocation } from '../../errors.js';
import { LIMITS } from '../limits.js';
import { suggestion } from '../../presentation/nearest-names.js';
import { formatFileSize } from '../../presentation/numbers.js';

export interface SourceFile {
  /** The path as the user gave it (used in messages). */
  fileAsGiven: string;
  bytes: Buffer;
  text: string;
  sha256: string;
}

/** Read the file, refusing a missing, oversized or non-UTF-8 file with a clear message. */
export function readSourceFile(fileAsGiven: string, absolute: string): SourceFile {
  const where: SourceLocation = { file: fileAsGiven };
  let size: number;
  try {
    const st = statSync(absolute);
    if (!st.isFile()) throw new UserError({ where, what: 'the model path is not a file', fix: 'give the path of a .yaml model file' });
    size = st.size;
  } catch (err) {
    if (err instanceof UserError) throw err;
    throw new UserError({ where, what: 'cannot read the model file: it does not exist or is not readable', fix: 'check the path and the file permissions' });
  }
  const tooBig = (n: number) => new UserError({
    where,
    what: `the model file is ${formatFileSize(n)}; model files are limited to ${LIMITS.fileBytes / 1048576} MiB`,
    fix: 'a model file holds equations and parameters only; keep logged data in CSV files named under `experiments`',
  });
  if (size > LIMITS.fileBytes) throw tooBig(size);
  const bytes = readFileSync(absolute);
  // The file may have grown since it was measured (a log being written, a pipe).
  if (bytes.length > LIMITS.fileBytes) throw tooBig(bytes.length);
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new UserError({ where, what: 'the model file is not UTF-8 text', fix: 'save it as UTF-8 text (is it a binary file?)' });
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  return { fileAsGiven, bytes, text, sha256 };
}

/** What the section readers share: the document, positions, and the problem list. */
export interface LoadContext {
  file: string;
  text: string;
  doc: Document.Parsed;
  lineCounter: LineCounter;
  problems: ProblemList;
}

/**
 * Parse YAML. Syntax errors, duplicate keys, tags, too many nodes or aliases end the load here
 * (nothing after that point could be trusted), with every such problem listed.
 */
/**
 * What is wrong in a file of several YAML documents (the parser's own message names a library
 * call), with the line where the second document starts: a `---` line, or the line after a `...`.
 */
function multipleDocuments(text: string, line: number | undefined): { what: string; fix: string } {
  // Parsed again only on this error path; the file is already within LIMITS.fileBytes.
  const count = parseAllDocuments(text).length;
  const lineText = line === undefined ? '' : (text.split('\n', line)[line - 1] ?? '');
  const where = line === undefined ? '' : ` at line ${line}`;
  const what = `the file holds ${count} YAML documents; a model file is one document`;
  if (lineText.startsWith('---')) {
    return { what, fix: `remove the \`---\` line${where} (and merge what follows it into the first document, or remove that too)` };
  }
  return { what, fix: `the second document starts${where}: remove the \`...\` line before it and merge the two, or remove the second` };
}

export function parseYaml(file: string, text: string): LoadContext {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, {
    lineCounter,
    prettyErrors: true,
    uniqueKeys: true,
    schema: 'core',
    strict: true,
  });
  const problems = new ProblemList();
  const ctx: LoadContext = { file, text, doc, lineCounter, problems };
  for (const e of [...doc.errors, ...doc.warnings]) {
    const pos = e.linePos?.[0];
    if (e.code === 'MULTIPLE_DOCS') {
      const told = multipleDocuments(text, pos?.line);
      problems.add({ file, line: pos?.line, column: pos?.col }, told.what, told.fix);
      continue;
    }
    const first = e.message.split('\n')[0].replace(/ at line \d+, column \d+:?$/, '');
    const tooDeep = /call stack/i.test(first);
    const what = e.code === 'DUPLICATE_KEY'
      ? 'this key appears twice in the same map'
      : tooDeep ? 'the YAML is nested too deeply to read' : `YAML: ${first}`;
    const fix = e.code === 'DUPLICATE_KEY'
      ? 'remove or rename one of the two entries'
      : tooDeep ? 'a model file needs only a few levels of nesting; remove the extra brackets or indentation'
      : e.code === 'TAG_RESOLVE_FAILED'
        ? 'remove the tag (words starting with !): a model file uses plain YAML values'
        : 'fix the YAML near there (indentation, a missing colon or quote, a tab used for indentation)';
    problems.add({ file, line: pos?.line, column: pos?.col }, what, fix);
  }
  if (problems.empty) guardNodes(ctx);
  problems.throwIfAny();
  return ctx;
}

/** Refuse explicit tags, and cap the number of nodes and aliases. */
function guardNodes(ctx: LoadContext): void {
  let nodes = 0;
  let aliases = 0;
  visit(ctx.doc, (_key, node) => {
    if (!node || isPair(node)) return undefined;
    nodes++;
    if (nodes > LIMITS.yamlNodes) {
      ctx.problems.add({ file: ctx.file }, `the model file has more than ${LIMITS.yamlNodes} YAML values`, 'a model file holds equations and parameters only; keep data in CSV files');
      return visit.BREAK;
    }
    if (isAlias(node)) {
      aliases++;
      if (aliases > LIMITS.aliases) {
        ctx.problems.add(at(ctx, node), `the model file uses more than ${LIMITS.aliases} YAML aliases (*name)`, 'write the values out instead of repeating them with aliases');
        return visit.BREAK;
      }
    }
    const tag = (node as { tag?: string }).tag;
    if (tag && (isScalar(node) || isMap(node) || isSeq(node))) {
      ctx.problems.add(at(ctx, node), `the YAML tag "${tag.replace('tag:yaml.org,2002:', '!!')}" is not allowed`, 'remove the tag: a model file uses plain YAML values');
    }
    return undefined;
  });
}

/** Location of a node (its first character), with the key path. */
export function at(ctx: LoadContext, node: unknown, key?: string): SourceLocation {
  const range = (node as { range?: [number, number, number] } | null | undefined)?.range;
  const where: SourceLocation = { file: ctx.file };
  if (range) {
    const pos = ctx.lineCounter.linePos(range[0]);
    where.line = pos.line;
    where.column = pos.col;
  }
  if (key) where.key = key;
  return where;
}

export type YNode = YamlNode | null | undefined;

/** Follow an alias to the node it names (aliases are capped in number by parseYaml). */
export function deref(ctx: LoadContext, node: YNode): YNode {
  let n = node;
  for (let hops = 0; n && isAlias(n) && hops < 10; hops++) n = n.resolve(ctx.doc) as YNode;
  return n;
}

export function keyPath(parent: string, key: string | number): string {
  if (typeof key === 'number') return `${parent}[${key}]`;
  return parent ? `${parent}.${key}` : key;
}

/** One key of a map with its nodes and full key path. */
export interface Entry {
  key: string;
  keyNode: YamlNode;
  value: YNode;
  path: string;
}

/** Is the value missing (absent key, `~`, `null` or an empty value)? */
export function isNullish(ctx: LoadContext, node: YNode): boolean {
  const n = deref(ctx, node);
  return !n || (isScalar(n) && n.value === null);
}

/**
 * The entries of a map in file order, or undefined (with a problem) when `node` is not a map.
 * With `allowed`, unknown keys are problems naming the nearest known key.
 */
export function mapEntries(ctx: LoadContext, node: YNode, path: string, what: string, allowed?: readonly string[]): Entry[] | undefined {
  const n = deref(ctx, node);
  if (!isMap(n)) {
    ctx.problems.add(at(ctx, n ?? undefined, path), `${what} must be a map of "key: value" entries, got ${describeNode(ctx, n)}`,
      allowed ? `write the keys on their own lines, e.g. ${allowed[0]}: ...` : 'write one "name: value" entry per line');
    return undefined;
  }
  const out: Entry[] = [];
  for (const pair of n.items) {
    const k = deref(ctx, pair.key as YNode);
    if (!isScalar(k) || k.value === null || typeof k.value === 'object') {
      ctx.problems.add(at(ctx, k ?? n, path), `${what} has a key that is not a plain word`, 'use plain words as keys');
      continue;
    }
    const key = String(k.value);
    const entry: Entry = { key, keyNode: k, value: pair.value as YNode, path: keyPath(path, key) };
    if (allowed && !allowed.includes(key)) {
      ctx.problems.add(at(ctx, k, entry.path), `unknown key "${key}" in ${what}`, `${suggestion(key, allowed, 'keys')}`);
      continue;
    }
    out.push(entry);
  }
  return out;
}

/**
 * The entries of a model section that may hold at most `limit` of them (LIMITS), or undefined after
 * a problem: not a map, or more entries than a model of ours may declare.
 */
export function sectionEntries(ctx: LoadContext, node: YNode, path: string, what: string, limit: number, plural: string): Entry[] | undefined {
  const entries = mapEntries(ctx, node, path, what);
  if (!entries) return undefined;
  if (entries.length > limit) {
    ctx.problems.add(at(ctx, deref(ctx, node), path), `more than ${limit} ${plural}`, 'a model this large is not supported');
    return undefined;
  }
  return entries;
}

export function byKey(entries: readonly Entry[]): Map<string, Entry> {
  return new Map(entries.map((e) => [e.key, e]));
}

/** The items of a list, or undefined (with a problem) when `node` is not a list. */
export function seqItems(ctx: LoadContext, node: YNode, path: string, what: string, example: string): YNode[] | undefined {
  const n = deref(ctx, node);
  if (!isSeq(n)) {
    ctx.problems.add(at(ctx, n ?? undefined, path), `${what} must be a list, got ${describeNode(ctx, n)}`, `write it as ${example}`);
    return undefined;
  }
  return n.items as YNode[];
}

/** The scalar behind a node, or undefined when it is a map, list or nothing. */
export function scalarOf(ctx: LoadContext, node: YNode): Scalar | undefined {
  const n = deref(ctx, node);
  return isScalar(n) ? n : undefined;
}

/** Words for what a node is, for "expected X, got Y" messages. */
export function describeNode(ctx: LoadContext, node: YNode): string {
  const n = deref(ctx, node);
  if (!n) return 'nothing';
  if (isMap(n)) return 'a map';
  if (isSeq(n)) return 'a list';
  if (isScalar(n)) {
    const v = n.value;
    if (v === null) return 'nothing';
    if (typeof v === 'string') return `the text "${v.length > 40 ? v.slice(0, 37) + '...' : v}"`;
    if (typeof v === 'number') return `the number ${v}`;
    if (typeof v === 'boolean') return `${v}`;
    return 'a value of another kind';
  }
  return 'a value of another kind';
}

/** A string value (numbers are accepted as their text, e.g. a column named 3). */
export function readString(ctx: LoadContext, node: YNode, path: string, what: string, maxChars: number = LIMITS.stringChars): string | undefined {
  const s = scalarOf(ctx, node);
  if (!s || s.value === null || (typeof s.value !== 'string' && typeof s.value !== 'number')) {
    ctx.problems.add(at(ctx, deref(ctx, node) ?? undefined, path), `${what} must be text, got ${describeNode(ctx, node)}`, 'write it as a word or a quoted string');
    return undefined;
  }
  const text = typeof s.value === 'number' ? String(s.source ?? s.value) : s.value;
  if (text.length > maxChars) {
    ctx.problems.add(at(ctx, s, path), `${what} is longer than ${maxChars} characters`, 'shorten it');
    return undefined;
  }
  return text;
}

export interface NumberOptions {
  /** Allow `.inf` / `-.inf`. */
  infinite?: boolean;
  integer?: boolean;
}

/** A finite number (or ±infinity when allowed). */
export function readNumber(ctx: LoadContext, node: YNode, path: string, what: string, opts: NumberOptions = {}): number | undefined {
  const s = scalarOf(ctx, node);
  const where = at(ctx, deref(ctx, node) ?? undefined, path);
  if (!s || typeof s.value !== 'number') {
    const got = describeNode(ctx, node);
    const quoted = s && typeof s.value === 'string' && /^\s*[-+]?(\d|\.\d)/.test(s.value);
    ctx.problems.add(where, `${what} must be a number, got ${got}`,
      quoted ? 'write the number without quotes or units (the unit goes under `unit`)' : 'write a number such as 0.5 or 1e-3');
    return undefined;
  }
  const v = s.value;
  if (Number.isNaN(v)) {
    ctx.problems.add(where, `${what} must be a number, got .nan`, 'write a number');
    return undefined;
  }
  if (!Number.isFinite(v) && !opts.infinite) {
    ctx.problems.add(where, `${what} must be finite, got ${v}`, 'write a finite number');
    return undefined;
  }
  if (opts.integer && (!Number.isInteger(v) || !/^[-+]?\d+$/.test(String(s.source ?? v)))) {
    ctx.problems.add(where, `${what} must be a whole number, got ${s.source ?? v}`, 'write an integer');
    return undefined;
  }
  return v;
}

export function readBoolean(ctx: LoadContext, node: YNode, path: string, what: string): boolean | undefined {
  const s = scalarOf(ctx, node);
  if (!s || typeof s.value !== 'boolean') {
    ctx.problems.add(at(ctx, deref(ctx, node) ?? undefined, path), `${what} must be true or false, got ${describeNode(ctx, node)}`, 'write true or false');
    return undefined;
  }
  return s.value;
}

/** One of a fixed set of words; an unknown word names the nearest allowed one. */
export function readChoice<T extends string>(ctx: LoadContext, node: YNode, path: string, what: string, choices: readonly T[]): T | undefined {
  const text = readString(ctx, node, path, what);
  if (text === undefined) return undefined;
  if ((choices as readonly string[]).includes(text)) return text as T;
  ctx.problems.add(at(ctx, deref(ctx, node) ?? undefined, path), `${what} must be ${choices.map((c) => `"${c}"`).join(' or ')}, got "${text}"`,
    suggestion(text, choices, 'values'));
  return undefined;
}

/**
 * File column (1-based) where an expression's text starts, when the scalar stands in the file
 * exactly as its value on one line (plain or quoted without escapes); undefined otherwise.
 */
export function textColumnOf(ctx: LoadContext, node: YNode, text: string): number | undefined {
  const s = scalarOf(ctx, node);
  if (!s?.range || /[\r\n]/.test(text)) return undefined;
  const q = s.type === 'QUOTE_DOUBLE' || s.type === 'QUOTE_SINGLE' ? 1 : 0;
  const start = s.range[0] + q;
  if (ctx.text.slice(start, start + text.length) !== text) return undefined;
  return ctx.lineCounter.linePos(start).col;
}
