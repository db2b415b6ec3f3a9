/** One table: fit quality and whiteness of every output in every experiment. */
import type { FitResult } from '../../estimation/fit/fit-result.js';
import { html, type Html } from './escape-html.js';
import { formatHtmlNumber, whitenessLabel, withHtmlUnit } from '../../presentation/index.js';
import type { ShownOutput } from './output-diagnostics.js';

export function qualitySection(fit: FitResult, shown: ShownOutput[]): Html {
  const rows = shown.map(({ result: o }) => html`<tr>
<td>${o.experiment}</td><td>${o.output}</td><td>${o.role}</td><td class="num">${o.samples}</td><td class="num">${o.missing}</td>
<td class="num">${withHtmlUnit(o.sigma, o.unit)}${o.sigmaEstimated ? ' (est.)' : ''}</td><td class="num">${withHtmlUnit(o.rmse, o.unit)}</td>
<td class="num">${formatHtmlNumber(o.nrmse, 3)}</td><td class="num">${formatHtmlNumber(o.r2, 4)}</td>
<td>${o.whiteness && !o.whiteness.white ? html`<span class="flag">${whitenessLabel(o.whiteness)}</span>` : whitenessLabel(o.whiteness)}</td></tr>`);
  return html`<section id="quality"><h2>Fit quality</h2>
<table><thead><tr><th>experiment</th><th>output</th><th>role</th><th>samples</th><th>missing</th><th>noise σ</th><th>RMSE</th><th>NRMSE</th><th>R²</th><th>residuals</th></tr></thead>
<tbody>${rows}</tbody></table>
<p class="note">NRMSE is the RMSE over the standard deviation of the measurement (0 is perfect, 1 is no better than the mean). "White" means the Ljung-Box test at the 5 % level finds no correlation left in the residuals.${fit.timeUnit ? ` Times are in ${fit.timeUnit}.` : ''}</p>
</section>`;
}
