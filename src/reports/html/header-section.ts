/** Top of the report: model, status, message, date; the cautions; a table of contents. */
import type { FitResult } from '../../estimation/fit/fit-result.js';
import { formatDuration } from '../../presentation/index.js';
import { html, type Html } from './escape-html.js';

export function headerSection(fit: FitResult, hasValidation: boolean): Html {
  const date = fit.provenance?.date ?? '';
  return html`<header class="top">
<h1>${fit.model.name}</h1>
<div class="meta">Calibration report · model file <code>${fit.model.file}</code> · ${date ? html`fitted ${date} · ` : ''}rigcal ${fit.version}</div>
<p class="message"><span class="status ${statusClass(fit.status)}">${fit.status}</span> ${fit.message}</p>
${fit.model.description ? html`<p class="description">${fit.model.description}</p>` : ''}
<p class="meta">${fit.iterations} iterations · ${fit.simulations} simulations · ${formatDuration(fit.wallSeconds)}</p>
</header>
<aside class="cautions" aria-label="cautions">
<strong>Before you use these numbers</strong>
<ul>
<li>The estimates hold only inside the operating range the tests covered (the inputs, speeds, loads and temperatures in these logs). Outside it the model is an extrapolation.</li>
<li>Check the calibrated model against independent data before any safety-relevant use.</li>
<li>Follow the codes, standards and licensed engineering practice that apply where the results are used; this report does not replace them.</li>
</ul>
</aside>
<nav class="toc"><a href="#parameters">Parameters</a><a href="#quality">Fit quality</a><a href="#identifiability">Identifiability and warnings</a><a href="#correlation">Correlation</a><a href="#fit-experiments">Fit experiments</a>${hasValidation ? html`<a href="#validation-experiments">Validation</a>` : ''}<a href="#provenance">Provenance</a></nav>`;
}

function statusClass(status: string): string {
  return status === 'converged' || status === 'stopped' || status === 'failed' ? status : 'failed';
}
