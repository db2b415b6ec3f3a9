/**
 * The header of an experiment's log: repeated names, the time column, every input's column (all
 * required) and every output's (absent means "not logged", unless an unused column is nearly its
 * name: a typo). Sets each plan's field index; every problem of the header is reported together.
 */
import { UserError, type Problem } from '../errors.js';
import type { ExperimentSpec, Model } from '../model/types.js';
import { shownText } from '../util/printable.js';
import type { ColumnPlan, LogPlan } from './column-plan.js';
import { isLikelyTypo, nearestNames } from '../presentation/nearest-names.js';

export interface HeaderLayout {
  /** Field index of the time column, -1 for a static model's log without one. */
  timeIndex: number;
  timeColumn: string;
  fields: number;
  line: number;
}

export interface HeaderContext {
  model: Model;
  exp: ExperimentSpec;
  expKey: string;
  /** The file as the user recognises it, for messages. */
  shown: string;
  plan: LogPlan;
}

export function matchHeader(names: string[], line: number, ctx: HeaderContext): HeaderLayout {
  const where = new Map<string, number>();
  const problems: Problem[] = repeatedNames(names, where, ctx.shown, line);
  const available = names.filter((n) => n !== '');
  const at = (key?: string) => ({ file: ctx.shown, line, ...(key ? { key } : {}) });
  const nearest = (n: string) => nearestNames(n, available).map((s) => `"${shownText(s)}"`).join(', ');
  const time = timeColumn(ctx, where, available, at, nearest, problems);
  const { inputs, outputs } = ctx.plan;
  for (const plan of inputs) {
    plan.index = where.get(plan.column) ?? -1;
    if (plan.index < 0) problems.push({ where: at(plan.key), what: `the column "${plan.column}" of input ${plan.name} is not in the file; nearest columns: ${nearest(plan.column)}`, fix: `rename it with \`columns: { ${plan.name}: <column> }\` in the experiment, or set the input's \`column\`` });
  }
  const used = new Set<number>([time.timeIndex, ...inputs.map((p) => p.index)]);
  for (const plan of outputs) {
    plan.index = where.get(plan.column) ?? -1;
    if (plan.index >= 0) used.add(plan.index);
  }
  for (const plan of outputs) {
    if (plan.index < 0 && looksMistyped(plan, ctx.exp, available, where, used)) {
      problems.push({ where: at(plan.key), what: `the column "${plan.column}" of output ${plan.name} is not in the file; nearest columns: ${nearest(plan.column)}`, fix: `rename it with \`columns: { ${plan.name}: <column> }\` in the experiment, or set the output's \`column\`` });
    }
  }
  if (outputs.length > 0 && outputs.every((p) => p.index < 0) && !problems.length) {
    problems.push({ where: at(), what: `none of the outputs (${outputs.map((p) => `"${p.column}"`).join(', ')}) is a column of this file; columns: ${firstColumns(available)}`, fix: 'check the outputs\' `column` names or rename them with `columns:` in the experiment' });
  }
  if (problems.length) throw new UserError(problems);
  return { ...time, fields: names.length, line };
}

/** Fills `where` with each name's first field; one problem per repeated name (a hostile header may repeat one name 100 000 times). */
function repeatedNames(names: string[], where: Map<string, number>, shown: string, line: number): Problem[] {
  const repeats = new Map<string, number[]>();
  names.forEach((n, i) => {
    if (n === '') return;
    if (where.has(n)) {
      const fields = repeats.get(n) ?? [where.get(n)! + 1];
      fields.push(i + 1);
      repeats.set(n, fields);
    } else where.set(n, i);
  });
  return [...repeats].map(([n, fields]) => {
    const what = fields.length === 2
      ? `appears twice in the header (fields ${fields[0]} and ${fields[1]})`
      : `appears ${fields.length.toLocaleString('en-US')} times in the header (fields ${fields.slice(0, 5).join(', ')}${fields.length > 5 ? ', ...' : ''})`;
    return { where: { file: shown, line }, what: `column "${shownText(n)}" ${what}`, fix: 'give every column a distinct name' };
  });
}

/** The time column: the experiment's `time`, else "t", else "time" (static models need none). */
function timeColumn(
  ctx: HeaderContext,
  where: Map<string, number>,
  available: string[],
  at: (key?: string) => Problem['where'],
  nearest: (n: string) => string,
  problems: Problem[],
): Pick<HeaderLayout, 'timeIndex' | 'timeColumn'> {
  const { exp, expKey, model } = ctx;
  let timeIndex = -1;
  let column = '';
  if (exp.time !== undefined) {
    column = exp.time;
    timeIndex = where.get(exp.time) ?? -1;
    if (timeIndex < 0) problems.push({ where: at(`${expKey}.time`), what: `the time column "${exp.time}" is not in the file; nearest columns: ${nearest(exp.time)}`, fix: 'set `time:` of the experiment to the name of the time column' });
  } else {
    const found = ['t', 'time'].find((c) => where.has(c));
    if (found !== undefined) {
      column = found;
      timeIndex = where.get(found)!;
    }
    if (timeIndex < 0 && !model.isStatic) {
      problems.push({ where: at(`${expKey}.time`), what: `no time column: neither "t" nor "time" is in the file; columns: ${firstColumns(available)}`, fix: 'name the time column with `time:` in the experiment' });
    }
  }
  if (timeIndex < 0 && model.isStatic && exp.window) {
    problems.push({ where: { key: `${expKey}.window` }, what: 'a window needs a time column, and this file has none', fix: 'remove the window or name the time column with `time:`' });
  }
  return { timeIndex, timeColumn: column };
}

/** An output column absent from the file is a mistake when it was renamed, or an unused column is nearly its name. */
function looksMistyped(plan: ColumnPlan, exp: ExperimentSpec, available: string[], where: Map<string, number>, used: Set<number>): boolean {
  if (exp.columns[plan.name] !== undefined) return true;
  return available.some((n) => !used.has(where.get(n)!) && isLikelyTypo(plan.column, n));
}

function firstColumns(available: string[]): string {
  return available.slice(0, 12).map((s) => `"${shownText(s)}"`).join(', ');
}
