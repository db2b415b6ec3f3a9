/** The `rank` result rendered for people (a table and sentences) and for programs (JSON). */
import { fmt, fmtP, type RankedModel } from './rank-fits.js';
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
    fmt(m.objective),
    fmt(m.aicc),
    fmt(m.deltaAicc, 3),
    fmt(m.bic),
    fmt(m.weight, 3),
    whitenessCell(m),
    ...validationKeys.map((k) => {
      const v = m.validation.find((x) => `${x.experiment}/${x.output}` === k);
      return v ? fmt(v.nrmse, 3) : '-';
    }),
  ]);
  const lines = [table(header, rows), ''];
  lines.push(`objective: ${r.objective}; k = free parameters + estimated noise levels.`);
  if (validationKeys.length) lines.push('NRMSE: RMSE over the standard deviation of the measurement, on validation experiments (never fitted); lower is better.');
  lines.push('', `preferred: ${r.preferred}: ${r.reason}.`);
  for (const m of r.models) {
    if (m.status !== 'converged') lines.push(`  ${m.name}: the fit ended with status "${m.status}": its place in the ranking is not reliable`);
    const notWhite = m.whiteness.filter((w) => w.white === false);
    if (notWhite.length) lines.push(`  ${m.name}: ${notWhite.map((w) => `${w.experiment}/${w.output}: ${w.verdict}`).join('; ')}`);
  }
  if (r.nested) {
    lines.push('', 'likelihood-ratio tests (only meaningful when each smaller model is a special case of the larger):');
    if (!r.nested.length) lines.push('  none: no two candidates differ in their number of free parameters');
    for (const t of r.nested) {
      const p = fmtP(t.pValue);
      lines.push(`  ${t.smaller} vs ${t.larger}: statistic ${fmt(t.statistic, 5)}, ${t.dof} degree${t.dof === 1 ? '' : 's'} of freedom, p ${p.startsWith('<') ? p : `= ${p}`}: ${t.verdict}`);
    }
  }
  for (const f of r.failures) lines.push(`not ranked: ${f.name} (${f.file}): the fit failed: ${f.message}`);
  return `${lines.join('\n')}\n`;
}

function whitenessCell(m: RankedModel): string {
  const judged = m.whiteness.filter((w) => w.white !== null);
  if (!judged.length) return 'not judged';
  const white = judged.filter((w) => w.white).length;
  return white === judged.length ? 'white' : `${judged.length - white}/${judged.length} not white`;
}

function uniqueKeys(keys: string[]): string[] {
  return [...new Set(keys)];
}

function table(header: string[], rows: string[][]): string {
  const widths = header.map((h, j) => Math.max(h.length, ...rows.map((r) => r[j].length)));
  const line = (cells: string[]) => cells.map((c, j) => (j === 0 ? c.padEnd(widths[j]) : c.padStart(widths[j]))).join('  ').trimEnd();
  return [line(header), widths.map((w) => '-'.repeat(w)).join('  '), ...rows.map(line)].join('\n');
}
