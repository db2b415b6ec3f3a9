/** The `outputs` section: what was measured, as expressions of the model's symbols. */
import type { Expr, OutputSpec } from '../types.js';
import { readExpression, type LoadState } from './load-state.js';
import { NAME_PATTERN } from '../expression-scan.js';
import type { SourceLocation } from '../../errors.js';
import { LIMITS } from '../limits.js';
import { SQUARABLE_RANGE, squareIsNormal } from '../../util/squares.js';
import { parseExpression } from '../expression-check.js';
import { at, byKey, deref, isNullish, mapEntries, readNumber, readString, sectionEntries, type YNode } from './yaml-source.js';

const OUTPUT_KEYS = ['expr', 'unit', 'column', 'column_unit', 'sigma'] as const;

/** An output read from the file, with whether its expr and unit were written (defaults come later). */
export interface OutputDraft {
  spec: Omit<OutputSpec, 'expr'> & { expr?: Expr };
  unitGiven: boolean;
  columnUnitWhere?: SourceLocation;
}

export function readOutputs(st: LoadState, node: YNode, path = 'outputs'): OutputDraft[] {
  const { ctx } = st;
  const entries = sectionEntries(ctx, node, path, 'outputs', LIMITS.outputs, 'outputs');
  if (!entries) return [];
  const out: OutputDraft[] = [];
  for (const e of entries) {
    const where = at(ctx, e.keyNode, e.path);
    // Output names are column defaults and CSV headers; they may share a state's name.
    if (!NAME_PATTERN.test(e.key) || e.key.length > LIMITS.nameChars || e.key in Object.prototype) {
      ctx.problems.add(where, `output name "${e.key}" is not valid`, `rename it: letters, digits and _, starting with a letter, at most ${LIMITS.nameChars} characters`);
    }
    const fields = isNullish(ctx, e.value) ? [] : mapEntries(ctx, e.value, e.path, `output ${e.key}`, OUTPUT_KEYS);
    if (!fields) continue;
    const k = byKey(fields);
    const exprE = k.get('expr');
    const expr = exprE ? readExpression(st, exprE.value, exprE.path, `the expression of output ${e.key}`) : undefined;
    const unitE = k.get('unit');
    const unit = unitE ? readString(ctx, unitE.value, unitE.path, `the unit of ${e.key}`, LIMITS.unitChars) ?? '' : '';
    const columnE = k.get('column');
    const column = columnE ? readString(ctx, columnE.value, columnE.path, `the column of ${e.key}`) ?? e.key : e.key;
    const cuE = k.get('column_unit');
    const columnUnit = cuE ? readString(ctx, cuE.value, cuE.path, `the column unit of ${e.key}`, LIMITS.unitChars) : undefined;
    const sigmaE = k.get('sigma');
    let sigma: number | undefined;
    if (sigmaE && !isNullish(ctx, sigmaE.value)) {
      sigma = readNumber(ctx, sigmaE.value, sigmaE.path, `sigma of ${e.key}`);
      if (sigma !== undefined && !(sigma > 0)) {
        ctx.problems.add(at(ctx, deref(ctx, sigmaE.value), sigmaE.path), `sigma of ${e.key} must be above 0, got ${sigma}`,
          'give the measurement noise standard deviation in the output\'s unit, or leave sigma out to estimate it');
        sigma = undefined;
      } else if (sigma !== undefined && !squareIsNormal(sigma)) {
        ctx.problems.add(at(ctx, deref(ctx, sigmaE.value), sigmaE.path),
          `sigma of ${e.key} is ${sigma}: a fit divides by its square, which is not a normal double (sigma must be from ${SQUARABLE_RANGE})`,
          'give the measurement noise standard deviation in the output\'s unit, or pick a unit for the output in which its values are nearer 1');
        sigma = undefined;
      }
    }
    if (exprE && !expr) continue;
    if (unit) st.units.push({ text: unit, where: at(ctx, deref(ctx, unitE!.value), unitE!.path), label: `the unit of output ${e.key}`, kind: 'symbol' });
    out.push({
      spec: { name: e.key, expr, unit, column, columnUnit: columnUnit || undefined, sigma, where },
      unitGiven: unitE !== undefined,
      columnUnitWhere: columnUnit ? at(ctx, deref(ctx, cuE!.value), cuE!.path) : undefined,
    });
  }
  return out;
}

/**
 * Fill the defaults that need the declared names: `expr` defaults to the output's name when that
 * is a state or define; `unit` defaults to the unit of the state or input the expression names.
 */
export function finishOutputs(st: LoadState, drafts: OutputDraft[], symbolUnits: ReadonlyMap<string, string>): OutputSpec[] {
  const out: OutputSpec[] = [];
  for (const d of drafts) {
    const o = d.spec;
    let expr = o.expr;
    if (!expr) {
      const decl = st.declared.get(o.name);
      if (!decl || (decl.kind !== 'state' && decl.kind !== 'define')) {
        st.ctx.problems.add(o.where, `output ${o.name} has no expr, and "${o.name}" is not a state or define`,
          `add expr: <expression of states, inputs and parameters> to output ${o.name}`);
        continue;
      }
      expr = parseExpression(o.name, { ...o.where, key: `${o.where.key}.expr` }, st.ctx.problems);
      if (!expr) continue;
    }
    let unit = o.unit;
    if (!d.unitGiven && expr.node.type === 'SymbolNode') unit = symbolUnits.get((expr.node as { name?: string }).name ?? '') ?? '';
    if (o.columnUnit && d.columnUnitWhere) {
      st.units.push({ text: o.columnUnit, where: d.columnUnitWhere, label: `the column unit of output ${o.name}`, kind: 'column', into: unit });
    }
    out.push({ ...o, expr, unit });
  }
  return out;
}
