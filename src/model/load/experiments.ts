/**
 * The `experiments` section: one entry per logged test, with its CSV file (resolved relative to the
 * model file), time column and unit, window, start, role, and per-experiment settings.
 */
import { basename, dirname, extname, resolve } from 'node:path';
import type { ExperimentRole, ExperimentSpec, Expr } from '../types.js';
import { readExpression, type LoadState } from './load-state.js';
import { LIMITS } from '../limits.js';
import { labelProblem } from './names.js';
import { suggestion } from '../../presentation/nearest-names.js';
import {
  at, byKey, deref, isNullish, keyPath, mapEntries, readChoice, readNumber, readString, seqItems, type Entry, type YNode,
} from './yaml-source.js';

const EXPERIMENT_KEYS = ['name', 'file', 'time', 'time_unit', 'window', 'start', 'role', 'set', 'initial', 'columns'] as const;

/** Experiment-level settings that refer to declared names, checked once all names are known. */
export interface ExperimentDraft {
  spec: ExperimentSpec;
  /** False when the name or file is missing or invalid (problems already reported). */
  usable: boolean;
  setEntries: Entry[];
  initialEntries: { entry: Entry; expr: Expr | undefined }[];
  columnEntries: Entry[];
}

export function readExperiments(st: LoadState, node: YNode, modelFile: string, path = 'experiments'): ExperimentDraft[] {
  const { ctx } = st;
  const items = seqItems(ctx, node, path, 'experiments', 'a list of "- name: ..., file: ..." entries');
  if (!items) return [];
  if (items.length > LIMITS.experiments) {
    ctx.problems.add(at(ctx, deref(ctx, node), path), `more than ${LIMITS.experiments} experiments`, 'split the work into several model files');
    return [];
  }
  const out: ExperimentDraft[] = [];
  const seen = new Map<string, number | undefined>();
  items.forEach((item, index) => {
    const p = keyPath(path, index);
    const draft = readExperiment(st, item, p, index, modelFile);
    if (!draft) return;
    const name = draft.spec.name;
    if (draft.usable && seen.has(name)) {
      ctx.problems.add(draft.spec.where, `two experiments are named "${name}" (the other is on line ${seen.get(name) ?? '?'})`, 'give each experiment its own name');
      return;
    }
    seen.set(name, draft.spec.where.line);
    out.push(draft);
  });
  return out;
}

function readExperiment(st: LoadState, item: YNode, path: string, index: number, modelFile: string): ExperimentDraft | undefined {
  const { ctx } = st;
  const entries = mapEntries(ctx, item, path, `experiment ${index + 1}`, EXPERIMENT_KEYS);
  if (!entries) return undefined;
  const k = byKey(entries);
  const where = at(ctx, deref(ctx, item), path);
  const str = (key: string, what: string, max?: number): string | undefined => {
    const f = k.get(key);
    return f && !isNullish(ctx, f.value) ? readString(ctx, f.value, f.path, what, max) : undefined;
  };

  const fileE = k.get('file');
  const fileAsWritten = str('file', 'file');
  if (!fileE || isNullish(ctx, fileE.value)) {
    ctx.problems.add(where, `experiment ${index + 1} has no file`, 'add file: <path of the CSV log, relative to this model file>');
  }
  let name = str('name', 'the experiment name');
  const nameE = k.get('name');
  if (name !== undefined) {
    const bad = labelProblem(name);
    if (bad) {
      ctx.problems.add(at(ctx, deref(ctx, nameE!.value), nameE!.path), `experiment name: ${bad}`, 'rename it; the name is used in messages, in name@experiment and in output files');
      name = undefined;
    }
  } else if (!nameE && fileAsWritten) {
    // Default: the file's name without its extension, when that is a valid name.
    const stem = basename(fileAsWritten, extname(fileAsWritten));
    if (!labelProblem(stem)) name = stem;
    else ctx.problems.add(where, `experiment ${index + 1} needs a name (its file name "${stem}" cannot serve as one)`, 'add name: <letters, digits, _, - or .>');
  }
  const time = str('time', 'the time column');
  const timeUnitE = k.get('time_unit');
  const timeUnit = str('time_unit', 'time_unit', LIMITS.unitChars) ?? 's';
  if (timeUnitE) st.units.push({ text: timeUnit, where: at(ctx, deref(ctx, timeUnitE.value), timeUnitE.path), label: `the time unit of experiment ${name ?? index + 1}`, kind: 'time' });

  let window: [number, number] | undefined;
  const windowE = k.get('window');
  if (windowE && !isNullish(ctx, windowE.value)) {
    const w = seqItems(ctx, windowE.value, windowE.path, 'window', 'window: [from, to]');
    if (w && w.length !== 2) {
      ctx.problems.add(at(ctx, deref(ctx, windowE.value), windowE.path), `window must be [from, to], got ${w.length} values`, 'write window: [from, to] in the time column\'s unit');
    } else if (w) {
      // An open end (.inf / -.inf) means "to the end of the log" / "from its beginning".
      const a = readNumber(ctx, w[0], keyPath(windowE.path, 0), 'the start of the window', { infinite: true });
      const b = readNumber(ctx, w[1], keyPath(windowE.path, 1), 'the end of the window', { infinite: true });
      if (a !== undefined && b !== undefined) {
        if (a < b) window = [a, b];
        else ctx.problems.add(at(ctx, deref(ctx, windowE.value), windowE.path), `window must satisfy from < to, got [${a}, ${b}]`, 'write the earlier time first');
      }
    }
  }
  const startE = k.get('start');
  const start = startE && !isNullish(ctx, startE.value) ? readNumber(ctx, startE.value, startE.path, 'start') : undefined;
  const roleE = k.get('role');
  const role: ExperimentRole = roleE ? readChoice(ctx, roleE.value, roleE.path, 'role', ['fit', 'validation'] as const) ?? 'fit' : 'fit';

  const sub = (key: string, what: string): Entry[] => {
    const f = k.get(key);
    if (!f || isNullish(ctx, f.value)) return [];
    return mapEntries(ctx, f.value, f.path, what) ?? [];
  };
  const setEntries = sub('set', 'set');
  const initialEntries = sub('initial', 'initial').map((entry) => ({
    entry,
    expr: readExpression(st, entry.value, entry.path, `the initial value of ${entry.key}`),
  }));
  const columnEntries = sub('columns', 'columns');

  const usable = name !== undefined && fileAsWritten !== undefined;
  const spec: ExperimentSpec = {
    name: name ?? `#${index + 1}`,
    file: resolve(dirname(modelFile), fileAsWritten ?? ''),
    fileAsWritten: fileAsWritten ?? '',
    time,
    timeUnit,
    window,
    start,
    role,
    set: {},
    initial: {},
    columns: {},
    where: { ...where, key: path },
  };
  return { spec, usable, setEntries, initialEntries, columnEntries };
}

/** Check `set`, `initial` and `columns` against the declared names and fill them in. */
export function finishExperiment(st: LoadState, d: ExperimentDraft, names: {
  fixed: ReadonlySet<string>; free: ReadonlySet<string>; states: readonly string[]; columnOwners: readonly string[]; isStatic: boolean;
  declared: ReadonlyMap<string, { kind: string }>;
}): ExperimentSpec {
  const { ctx } = st;
  const spec = d.spec;
  const set: Record<string, number> = Object.create(null);
  for (const e of d.setEntries) {
    const where = at(ctx, e.keyNode, e.path);
    if (names.free.has(e.key)) {
      ctx.problems.add(where, `set gives a value to ${e.key}, which is free (estimated)`,
        `set applies to fixed parameters only; for one copy per experiment use per_experiment: true on ${e.key}`);
      continue;
    }
    if (!names.fixed.has(e.key)) {
      const kind = names.declared.get(e.key)?.kind;
      if (kind === 'parameter') continue; // declared with a problem of its own, reported already
      ctx.problems.add(where, kind ? `set names ${e.key}, which is a ${kind}, not a parameter` : `set names "${e.key}", which is not a parameter`,
        suggestion(e.key, [...names.fixed], 'fixed parameters'));
      continue;
    }
    const v = readNumber(ctx, e.value, e.path, `the value of ${e.key} in experiment ${spec.name}`);
    if (v !== undefined) set[e.key] = v;
  }
  const initial: Record<string, Expr> = Object.create(null);
  for (const { entry: e, expr } of d.initialEntries) {
    if (names.isStatic) {
      ctx.problems.add(at(ctx, e.keyNode, e.path), 'a static model (no states) has no initial values', 'remove initial from this experiment');
      continue;
    }
    if (!names.states.includes(e.key)) {
      ctx.problems.add(at(ctx, e.keyNode, e.path), `initial names "${e.key}", which is not a state`, suggestion(e.key, names.states, 'states'));
      continue;
    }
    if (expr) initial[e.key] = expr;
  }
  const columns: Record<string, string> = Object.create(null);
  for (const e of d.columnEntries) {
    if (!names.columnOwners.includes(e.key)) {
      ctx.problems.add(at(ctx, e.keyNode, e.path), `columns renames "${e.key}", which is not an input or output`, suggestion(e.key, names.columnOwners, 'inputs and outputs'));
      continue;
    }
    const c = readString(ctx, e.value, e.path, `the column for ${e.key}`);
    if (c !== undefined) columns[e.key] = c;
  }
  if (names.isStatic && spec.start !== undefined) {
    ctx.problems.add({ ...spec.where, key: `${spec.where.key}.start` }, 'a static model (no states) is not integrated, so start does not apply', 'remove start from this experiment');
  }
  return { ...spec, set: { ...set }, initial: { ...initial }, columns: { ...columns } };
}
