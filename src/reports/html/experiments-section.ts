/**
 * Per experiment and output: measured and simulated against time, residuals against time, residual
 * autocorrelation with its 95 % band, the scores and the verdict. Fit and validation experiments
 * are rendered into separate sections.
 */
import type { FitResult } from '../../estimation/fit/fit-result.js';
import { html, raw, type Html } from './escape-html.js';
import { formatCorrelation, formatHtmlNumber, formatPValueClause, RESIDUAL_VERDICTS, withHtmlUnit } from '../../presentation/index.js';
import type { ShownOutput } from './output-diagnostics.js';
import { autocorrelationSpec, measuredSimulatedSpec, residualSpec } from './plots.js';
import { renderVegaLiteSvg } from './vega-svg.js';

async function outputBlock(fit: FitResult, shown: ShownOutput): Promise<Html> {
  const { series, residual, result: o } = shown;
  const base = { time: series.time, timeUnit: fit.timeUnit, output: series.output, unit: series.unit, measured: series.measured, simulated: series.simulated };
  if (o.samples === 0) {
    return html`<div class="output-block"><h4>${series.output}</h4><p class="note">No measured sample of this output in this experiment.</p></div>`;
  }
  const figures = [await renderVegaLiteSvg(measuredSimulatedSpec({ ...base, title: `${series.output}: measured and simulated` }))];
  figures.push(await renderVegaLiteSvg(residualSpec({ ...base, residual, title: `${series.output}: residual (measured − simulated)` })));
  if (o.autocorrelation && o.autocorrelation.values.length > 1) {
    figures.push(
      await renderVegaLiteSvg(
        autocorrelationSpec({ title: `${series.output}: residual autocorrelation, 95 % band`, ...o.autocorrelation, timeUnit: fit.timeUnit }),
      ),
    );
  }
  const w = o.whiteness;
  const verdictClass = w ? (w.white ? 'white' : 'correlated') : 'unknown';
  return html`<div class="output-block">
<h4>${series.output}${series.unit && series.unit !== '1' ? html` <span class="note">(${series.unit})</span>` : ''}</h4>
<p class="verdict ${verdictClass}">${o.verdict ?? RESIDUAL_VERDICTS.none}</p>
<p class="scores">samples ${o.samples}${o.missing ? ` (${o.missing} missing)` : ''} · RMSE ${withHtmlUnit(o.rmse, o.unit)} · NRMSE ${formatHtmlNumber(o.nrmse, 3)} · R² ${formatHtmlNumber(o.r2, 4)} · noise σ ${withHtmlUnit(o.sigma, o.unit)} ${o.sigmaEstimated ? '(estimated)' : '(given)'}${w ? ` · Ljung-Box Q ${formatHtmlNumber(w.ljungBox)} over ${w.lags} lags, ${formatPValueClause(w.pValue, 2)}` : ''}</p>
${o.inputCorrelation?.length ? html`<p class="scores">largest cross-correlation of the residuals with each input: ${o.inputCorrelation.map((c) => `${c.input} ${formatCorrelation(c.maxAbs)} at lag ${withHtmlUnit(c.lag, fit.timeUnit)} (95 % band of one lag ±${formatCorrelation(c.band)})`).join('; ')}. The verdict judges all lags together, since one lag in twenty crosses its band by chance.</p>` : ''}
${figures.map((svg) => html`<figure>${raw(svg)}</figure>`)}
</div>`;
}

/** Groups outputs by experiment, keeping the order of fit.experiments (then first appearance). */
function groupByExperiment(fit: FitResult, shown: ShownOutput[]): { name: string; role: 'fit' | 'validation'; outputs: ShownOutput[] }[] {
  const order = (fit.experiments ?? []).map((e) => e.name);
  const groups = new Map<string, ShownOutput[]>();
  for (const s of shown) {
    const list = groups.get(s.series.experiment) ?? [];
    list.push(s);
    groups.set(s.series.experiment, list);
  }
  const names = [...groups.keys()].sort((a, b) => rank(order, a) - rank(order, b));
  return names.map((name) => ({ name, role: groups.get(name)![0].series.role, outputs: groups.get(name)! }));
}

function rank(order: string[], name: string): number {
  const i = order.indexOf(name);
  return i < 0 ? order.length : i;
}

export async function experimentsSection(fit: FitResult, shown: ShownOutput[], role: 'fit' | 'validation'): Promise<Html> {
  const groups = groupByExperiment(fit, shown).filter((g) => g.role === role);
  const blocks: Html[] = [];
  for (const g of groups) {
    const info = fit.experiments?.find((e) => e.name === g.name);
    const outputs: Html[] = [];
    for (const o of g.outputs) outputs.push(await outputBlock(fit, o));
    blocks.push(html`<section class="experiment"><h3>Experiment ${g.name}</h3>
${info ? html`<p class="note">data file <code>${info.file}</code>, ${info.rows} rows</p>` : ''}
${outputs}</section>`);
  }
  if (role === 'fit') {
    return html`<section id="fit-experiments"><h2>Fit experiments</h2>${blocks.length ? blocks : html`<p>No residual series to show.</p>`}</section>`;
  }
  return html`<section id="validation-experiments" class="validation"><h2>Validation experiments</h2>
<p class="validation-intro">These logs were not used to estimate the parameters: they show how the calibrated model predicts data it has not seen.</p>
${blocks}</section>`;
}
