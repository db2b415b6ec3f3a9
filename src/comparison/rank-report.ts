/** The `rank` result rendered for people (a table and sentences) and for programs (JSON). */
import { formatCriterion, formatNumber, formatPValueClause, printableLines, TEXT_MARKS, textTable, whitenessTally } from '../presentation/index.js';
import type { RankedModel } from './rank-fits.js';
import type { RankOutcome } from '../verbs/rank.js';

export function rankJson(r: RankOutcome): object {
  return {
    objective: r.objective,
    models: r.models.map((m) => ({
      name: m.name,
      file: m.file,
      status: m.status,
      freeParameters: m.freeParameters,
      k: m.k,
      observations: m.observations,
      objective: finiteOrNull(m.objective),
      logLikelihood: finiteOrNull(m.logLikelihood),
      aicc: finiteOrNull(m.aicc),
      deltaAicc: finiteOrNull(m.deltaAicc),
      bic: finiteOrNull(m.bic),
      weight: m.weight,
      validation: m.validation.map((v) => ({ ...v, rmse: finiteOrNull(v.rmse), nrmse: finiteOrNull(v.nrmse), r2: finiteOrNull(v.r2) })),
      whiteness: m.whiteness,
    })),
    preferred: r.preferred,
    reason: r.reason,
    ...(r.nested ? { nested: r.nested } : {}),
    ...(r.failures.length ? { failures: r.failures } : {}),
  };
}

function finiteOrNull(v: number): number | null {
  return Number.isFinite(v) ? v : null;
}

export function rankText(r: RankOutcome): string {
  const validationKeys = uniqueKeys(r.models.flatMap((m) => m.validation.map((v) => `${v.experiment}/${v.output}`)));
  const header = ['model', 'free', 'k', '-2 log L', 'AICc', 'dAICc', 'BIC', 'weight', 'fit residuals', ...validationKeys.map((k) => `NRMSE ${k}`)];
  const rows = r.models.map((m) => [
    m.name,
    String(m.freeParameters),
    String(m.k),
    formatCriterion(m.objective),
    formatCriterion(m.aicc),
    formatCriterion(m.deltaAicc, 3),
    formatCriterion(m.bic),
    formatNumber(m.weight, 3),
    whitenessCell(m),
    ...validationKeys.map((k) => {
      const v = m.validation.find((x) => `${x.experiment}/${x.output}` === k);
      return v ? formatNumber(v.nrmse, 3) : TEXT_MARKS.missing;
    }),
  ]);
  const lines = [textTable(header, rows, { rightAligned: header.map((_, j) => j).slice(1) }), ''];
  lines.push(`objective: ${r.objective}; k = free parameters + estimated noise levels.`);
  if (validationKeys.length) lines.push('NRMSE: RMSE over the standard deviation of the measurement, on validation experiments (never fitted); lower is better.');
  lines.push('', `preferred: ${r.preferred}: ${r.reason}.`);
  for (const m of r.models) {
    if (m.status === 'stopped') lines.push(`  ${m.name}: the fit stopped on its iteration limit before converging: its place in the ranking is not reliable (exit code 3; raise --max-iterations)`);
    else if (m.status !== 'converged') lines.push(`  ${m.name}: the fit ended with status "${m.status}": its place in the ranking is not reliable`);
    const notWhite = m.whiteness.filter((w) => w.white === false);
    if (notWhite.length) lines.push(`  ${m.name}: ${notWhite.map((w) => `${w.experiment}/${w.output}: ${w.verdict}`).join('; ')}`);
  }
  if (r.nested) {
    lines.push('', 'likelihood-ratio tests (only meaningful when each smaller model is a special case of the larger):');
    if (!r.nested.length) lines.push('  none: no two candidates differ in their number of free parameters');
    for (const t of r.nested) {
      lines.push(`  ${t.smaller} vs ${t.larger}: statistic ${formatCriterion(t.statistic, 5)}, ${t.dof} degree${t.dof === 1 ? '' : 's'} of freedom, ${formatPValueClause(t.pValue)}: ${t.verdict}`);
    }
  }
  for (const f of r.failures) lines.push(`not ranked: ${f.name} (${f.file}): the fit failed: ${f.message}`);
  // Names, files and messages come from the input: made printable (presentation/printable.ts).
  return printableLines(`${lines.join('\n')}\n`);
}

function whitenessCell(m: RankedModel): string {
  return whitenessTally(m.whiteness.map((w) => w.white));
}

function uniqueKeys(keys: string[]): string[] {
  return [...new Set(keys)];
}
