/**
 * report.html of `validate`: a validation-only view built from the fit report's own sections
 * (src/reports/html), so that both pages look and read alike: a header with the cautions, the score
 * table, and per experiment and output the measured/simulated, residual and autocorrelation figures
 * with the verdict.
 */
import { residualDiagnostics, residualOf } from '../diagnostics/index.js';
import type { ResidualSeries } from '../diagnostics/types.js';
import type { FitResult, OutputResult } from '../estimation/fit/fit-result.js';
import { html } from '../reports/html/escape-html.js';
import { experimentsSection } from '../reports/html/experiments-section.js';
import { formatHtmlNumber, whitenessLabel, withHtmlUnit } from '../presentation/index.js';
import type { ShownOutput } from '../reports/html/output-diagnostics.js';
import { pageHead } from '../reports/html/page-head.js';
import type { ValidationResult } from './validation-result.js';
import { sampleClause } from './validation-report.js';

/** Noise levels from the estimates, to show beside the RMSE (output -> sigma, estimated?). */
export type NoiseLevels = Record<string, { sigma: number; estimated: boolean }>;

export async function renderValidationReport(result: ValidationResult, series: readonly ResidualSeries[], noise: NoiseLevels = {}): Promise<string> {
  const shown: ShownOutput[] = series.map((s) => {
    const score = result.outputs.find((o) => o.experiment === s.experiment && o.output === s.output);
    const d = residualDiagnostics(s, [], { timeUnit: result.isStatic ? undefined : result.timeUnit });
    const out: OutputResult = {
      experiment: s.experiment,
      output: s.output,
      unit: s.unit,
      role: s.role,
      samples: score?.samples ?? d.samples,
      missing: score?.missing ?? 0,
      sigma: noise[s.output]?.sigma ?? NaN,
      sigmaEstimated: noise[s.output]?.estimated ?? false,
      rmse: score?.rmse ?? NaN,
      nrmse: score?.nrmse ?? NaN,
      r2: score?.r2 ?? NaN,
      whiteness: score?.whiteness ?? d.whiteness,
      verdict: score?.verdict ?? d.verdict,
      autocorrelation: d.autocorrelation,
      correlatedUpTo: score?.correlatedUpTo,
    };
    return { series: s, residual: residualOf(s.measured, s.simulated), result: out };
  });
  // The experiments section reads only these fields of a fit result.
  const view = {
    version: result.version,
    timeUnit: result.timeUnit,
    outputs: shown.map((s) => s.result),
    experiments: result.data.map((d) => ({ name: d.experiment, role: d.inSample ? ('fit' as const) : ('validation' as const), file: d.file, sha256: d.sha256, rows: d.rows })),
  } as unknown as FitResult;

  const rows = result.outputs.map(
    (o) => html`<tr><td>${o.experiment}</td><td>${o.output}</td><td class="num">${o.samples}${o.missing ? ` (${o.missing} missing)` : ''}</td><td class="num">${withHtmlUnit(o.rmse, o.unit)}</td><td class="num">${formatHtmlNumber(o.nrmse, 3)}</td><td class="num">${formatHtmlNumber(o.r2, 4)}</td><td>${whitenessLabel(o.whiteness)}</td></tr>`,
  );
  const anyInSample = result.data.some((d) => d.inSample);
  const page = html`${pageHead(`${result.model.name}: validation report`, result.version)}
<body>
<header class="top">
<h1>${result.model.name}</h1>
<div class="meta">Validation report · model file <code>${result.model.file}</code> · estimates <code>${result.estimates.file}</code> (fit ${result.estimates.fitDate}, ${result.estimates.fitStatus}) · validated ${result.date} · rigcal ${result.version}</div>
</header>
<aside class="cautions" aria-label="cautions">
<strong>Before you use these numbers</strong>
<ul>
<li>A good score here holds for the operating range of these logs only; outside it the model is an extrapolation.</li>
<li>Check the calibrated model against independent data before any safety-relevant use.</li>
<li>Follow the codes, standards and licensed engineering practice that apply where the results are used; this report does not replace them.</li>
</ul>
</aside>
<section id="quality"><h2>${anyInSample ? 'Scores, in-sample where the model was fitted to the data' : 'Scores on data the model was not fitted to'}</h2>
${anyInSample ? html`<p class="note">Validation of ${result.model.name} ${sampleClause(result)}.</p>` : ''}
<table><thead><tr><th>experiment</th><th>output</th><th>samples</th><th>RMSE</th><th>NRMSE</th><th>R²</th><th>residuals</th></tr></thead><tbody>${rows}</tbody></table>
<p class="note">NRMSE: RMSE over the standard deviation of the measurement (0 is perfect, 1 is no better than the mean of the log).</p>
${result.warnings.length ? html`<ul class="warnings">${result.warnings.map((w) => html`<li>${w}</li>`)}</ul>` : ''}
</section>
${anyInSample ? html`<p class="note">The experiments below under “Fit experiments” are the data the estimates were fitted to (in-sample).</p>${await experimentsSection(view, shown, 'fit')}` : ''}
${result.data.some((d) => !d.inSample) ? await experimentsSection(view, shown, 'validation') : ''}
<section id="provenance"><h2>Provenance</h2>
<p>model sha256 <code>${result.model.sha256}</code>; the estimates were made for sha256 <code>${result.estimates.modelSha256}</code>.</p>
<ul>${result.data.map((d) => html`<li>${d.experiment} (${d.source}): <code>${d.file}</code>, ${d.rows} rows, sha256 <code>${d.sha256}</code></li>`)}</ul>
</section>
<footer>Written by rigcal ${result.version}. Long logs are reduced for display to the smallest and largest value per pixel column.</footer>
</body>
</html>
`;
  return page.text;
}
