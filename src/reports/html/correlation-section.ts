/** The correlation matrix of the estimates as a heat map. */
import type { FitResult } from '../../estimation/fit/fit-result.js';
import { html, raw, type Html } from './escape-html.js';
import { correlationSpec } from './plots.js';
import { renderVegaLiteSvg } from './vega-svg.js';

export async function correlationSection(fit: FitResult): Promise<Html> {
  const { names, matrix } = fit.correlation;
  if (names.length < 2) {
    return html`<section id="correlation"><h2>Correlation</h2><p>${names.length ? 'Only one parameter is free: no correlation to show.' : 'No correlation available (no free parameter, or the fit stopped before computing it).'}</p></section>`;
  }
  const svg = await renderVegaLiteSvg(correlationSpec(names, matrix));
  return html`<section id="correlation"><h2>Correlation</h2>
<figure class="heatmap">${raw(svg)}</figure>
<p class="note">Values near ±1 mean two estimates move together: the data fix a combination of them better than each alone.</p></section>`;
}
