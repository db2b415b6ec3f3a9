/** The parameter table and the overall statistics. */
import type { FitResult, ParameterResult } from '../../estimation/fit/fit-result.js';
import { html, type Html } from './escape-html.js';
import { formatCriterion, formatCriterionFixed, formatEstimate, formatHtmlNumber } from '../../presentation/index.js';

/** Pairwise |correlation| above this is flagged (shared spec numerics.md, Identifiability). */
const HIGH_CORRELATION = 0.95;

function parameterFlags(p: ParameterResult, fit: FitResult): string[] {
  const flags: string[] = [];
  if (p.atBound === 'lower') flags.push('at lower bound: interval not reliable');
  if (p.atBound === 'upper') flags.push('at upper bound: interval not reliable');
  if (p.status === 'free' && p.stdError === null) flags.push('not determined by the data');
  const i = fit.correlation.names.indexOf(p.name);
  if (i >= 0) {
    const partners = fit.correlation.names.filter((_, j) => j !== i && Math.abs(fit.correlation.matrix[i]?.[j] ?? 0) > HIGH_CORRELATION);
    if (partners.length) flags.push(`correlated with ${partners.join(', ')} (|r| > ${HIGH_CORRELATION})`);
  }
  return flags;
}

export function parametersSection(fit: FitResult): Html {
  const rows = fit.parameters.map((p) => {
    const flags = parameterFlags(p, fit);
    const interval = p.ci95 ? `${formatEstimate(p.ci95[0], p.stdError)} … ${formatEstimate(p.ci95[1], p.stdError)}` : p.status === 'free' ? '—' : '';
    const bounds = p.min !== undefined || p.max !== undefined ? `${formatHtmlNumber(p.min)} … ${formatHtmlNumber(p.max)}${p.scale === 'log' ? ' (log)' : ''}` : '';
    return html`<tr class="${p.status}">
<td>${p.name}</td><td>${p.status}</td><td class="num">${formatEstimate(p.estimate, p.stdError)}</td><td>${p.unit}</td>
<td class="num">${p.status === 'free' ? formatHtmlNumber(p.stdError) : ''}</td><td class="num">${interval}</td><td class="num">${bounds}</td>
<td>${flags.length ? html`<span class="flag">${flags.join('; ')}</span>` : ''}</td></tr>`;
  });
  const s = fit.statistics;
  return html`<section id="parameters"><h2>Parameters</h2>
<table><thead><tr><th>parameter</th><th>status</th><th>estimate</th><th>unit</th><th>std. error</th><th>95 % interval</th><th>bounds</th><th>flags</th></tr></thead>
<tbody>${rows}</tbody></table>
<p class="note">Fixed parameters are measured values taken as given. Standard errors and intervals are in the parameter's unit; 95 % intervals from the Student t distribution with ${s.dof} degrees of freedom.</p>
<table class="stats"><tbody>
<tr><th>observations</th><td class="num">${s.observations}</td><th>free parameters</th><td class="num">${s.freeParameters}</td><th>degrees of freedom</th><td class="num">${s.dof}</td></tr>
<tr><th>weighted SSE</th><td class="num">${formatHtmlNumber(s.weightedSSE, 6)}</td><th>reduced chi-square</th><td class="num">${s.reducedChiSquare === undefined ? 'n/a (noise estimated)' : formatHtmlNumber(s.reducedChiSquare)}</td><th>log-likelihood</th><td class="num">${formatCriterion(s.logLikelihood)}</td></tr>
<tr><th>AICc</th><td class="num">${formatCriterionFixed(s.aicc)}</td><th>BIC</th><td class="num">${formatCriterionFixed(s.bic)}</td><th></th><td></td></tr>
</tbody></table></section>`;
}
