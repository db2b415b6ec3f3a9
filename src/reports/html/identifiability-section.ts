/** Identifiability problems and warnings, in words. */
import type { FitResult } from '../../estimation/fit/fit-result.js';
import { html, type Html } from './escape-html.js';
import { formatHtmlNumber } from '../../presentation/index.js';

export function identifiabilitySection(fit: FitResult): Html {
  const id = fit.identifiability;
  const problems = id.problems.map((p) => html`<li>${p.message}${p.parameters.length ? html` <span class="note">(${p.parameters.join(', ')})</span>` : ''}</li>`);
  const warnings = fit.warnings.map((w) => html`<li>${w}</li>`);
  return html`<section id="identifiability"><h2>Identifiability and warnings</h2>
<p>Condition number of the scaled sensitivity matrix: <strong>${id.conditionNumber === null ? 'not available (singular)' : formatHtmlNumber(id.conditionNumber)}</strong>.</p>
${problems.length ? html`<h4>What these data do not determine</h4><ul class="problems">${problems}</ul>` : html`<p>Every free parameter is determined by these data.</p>`}
${warnings.length ? html`<h4>Warnings</h4><ul class="problems">${warnings}</ul>` : html`<p>No warnings.</p>`}
</section>`;
}
