/**
 * report.html: one self-contained page (inline CSS and SVG, no script, no external resource) that
 * renders a fit's results. A content security policy forbids the page any network fetch.
 */
import type { ResidualSeries } from '../../diagnostics/types.js';
import type { FitResult } from '../../estimation/fit/fit-result.js';
import { correlationSection } from './correlation-section.js';
import { html } from './escape-html.js';
import { experimentsSection } from './experiments-section.js';
import { headerSection } from './header-section.js';
import { identifiabilitySection } from './identifiability-section.js';
import { outputForDisplay } from './output-diagnostics.js';
import { pageHead } from './page-head.js';
import { parametersSection } from './parameters-section.js';
import { provenanceSection } from './provenance-section.js';
import { qualitySection } from './quality-section.js';

/** Renders the report. Asynchronous because vega renders its SVG asynchronously. */
export async function renderFitReport(fit: FitResult, series: readonly ResidualSeries[]): Promise<string> {
  const shown = series.map((s) => outputForDisplay(fit, s));
  const hasValidation = shown.some((s) => s.series.role === 'validation');
  const page = html`${pageHead(`${fit.model.name}: calibration report`, fit.version)}
<body>
${headerSection(fit, hasValidation)}
${parametersSection(fit)}
${qualitySection(fit, shown)}
${identifiabilitySection(fit)}
${await correlationSection(fit)}
${await experimentsSection(fit, shown, 'fit')}
${hasValidation ? await experimentsSection(fit, shown, 'validation') : ''}
${provenanceSection(fit)}
<footer>Written by rigcal ${fit.version}. Every figure is drawn from the results folder's fit.json and residuals.csv; long logs are reduced for display to the smallest and largest value per pixel column.</footer>
</body>
</html>
`;
  return page.text;
}
