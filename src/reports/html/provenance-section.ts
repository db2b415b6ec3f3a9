/** Where the results came from: files with their SHA-256, tool version, date, overrides. */
import type { FitResult } from '../../estimation/fit/fit-result.js';
import { html, type Html } from './escape-html.js';
import { formatHtmlNumber } from '../../presentation/index.js';

export function provenanceSection(fit: FitResult): Html {
  const p = fit.provenance;
  const overrides = Object.entries(p.overrides ?? {});
  return html`<section id="provenance"><h2>Provenance</h2>
<dl class="provenance">
<dt>model file</dt><dd><code>${p.modelFile}</code></dd>
<dt>model SHA-256</dt><dd class="hash">${p.modelSha256}</dd>
<dt>tool</dt><dd>rigcal ${p.toolVersion}</dd>
<dt>date</dt><dd>${p.date}</dd>
${overrides.length ? html`<dt>values set on the command line</dt><dd>${overrides.map(([k, v]) => `${k} = ${formatHtmlNumber(v)}`).join(', ')}</dd>` : ''}
</dl>
<table><thead><tr><th>experiment</th><th>data file</th><th>SHA-256</th></tr></thead><tbody>
${p.dataFiles.map((d) => html`<tr><td>${d.experiment}</td><td><code>${d.file}</code></td><td class="hash">${d.sha256}</td></tr>`)}
</tbody></table></section>`;
}
