import { beforeAll, describe, expect, it } from 'vitest';
import { renderFitReport } from '../../../src/reports/html/index.js';
import { demoResults } from '../../helpers/demo-results.js';

const HOSTILE = '<script>alert(1)</script>&"\'';

describe('renderFitReport', () => {
  // The demo page, rendered once for the checks that only read it.
  const demo = demoResults({ samples: 600 });
  let page = '';
  beforeAll(async () => {
    page = await renderFitReport(demo.fit, demo.series);
  });

  it('is one self-contained page: no script, no external resource, a policy that forbids fetches', () => {
    expect(page.startsWith('<!doctype html>')).toBe(true);
    expect(page).not.toMatch(/<script/i);
    expect(page).not.toMatch(/<link\b/i);
    expect(page).not.toMatch(/\b(src|href)\s*=\s*["']?(https?:|\/\/)/i);
    // Only references inside the page (clip paths, gradients): url(#id).
    expect(page).not.toMatch(/url\((?!#)|@import/i);
    // Several inline SVGs share one document: their ids must not collide.
    const ids = [...page.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
    expect(new Set(ids).size).toBe(ids.length);
    for (const ref of page.matchAll(/url\(#([^)]+)\)/g)) expect(ids).toContain(ref[1]);
    expect(page).toContain(`<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">`);
    // xmlns attributes of the inline SVG are names, not fetches: they are the only http text allowed.
    const http = page.match(/https?:\/\/[^"' )]+/g) ?? [];
    expect(new Set(http)).toEqual(new Set(['http://www.w3.org/2000/svg', 'http://www.w3.org/1999/xlink']));
  });

  it('has every section, with validation experiments set apart', () => {
    const { fit } = demo;
    const at = (s: string) => {
      const i = page.indexOf(s);
      expect(i, s).toBeGreaterThanOrEqual(0);
      return i;
    };
    const order = [
      at('<h1>demo-motor-rig</h1>'),
      at('relative cost change below 1e-10'),
      at('only inside the operating range'),
      at('safety-relevant use'),
      at('licensed engineering practice'),
      at('<section id="parameters">'),
      at('<section id="quality">'),
      at('<section id="identifiability">'),
      at('<section id="correlation">'),
      at('<section id="fit-experiments">'),
      at('Experiment steps-12V'),
      at('<section id="validation-experiments"'),
      at('Experiment steps-validation'),
      at('<section id="provenance">'),
    ];
    expect([...order].sort((a, b) => a - b)).toEqual(order);
    // Parameter table: estimate, unit, standard error, interval, flags in words.
    // Estimate and interval rounded at the second significant digit of the standard error (0.004).
    expect(page).toMatch(/<td>K<\/td><td>free<\/td><td class="num">8\.2000<\/td><td>rad\/\(s\*V\)<\/td>\s*<td class="num">0\.004<\/td><td class="num">8\.1920 … 8\.2080<\/td>/);
    expect(page).toContain('at lower bound: interval not reliable; not determined by the data');
    expect(page).toContain(fit.identifiability.problems[0].message);
    expect(page).toContain(fit.warnings[0]);
    expect(page).toContain(fit.provenance.modelSha256);
    // Verdicts of both kinds, as computed by the diagnostics.
    expect(page).toContain('<p class="verdict white">residuals are white: the model explains this output within noise</p>');
    expect(page).toMatch(/<p class="verdict correlated">residuals are correlated up to [\d.]+ s: the model misses dynamics on that time scale<\/p>/);
    // One heat map plus three figures per output (2 experiments x 2 outputs).
    expect(page.match(/<svg /g)!.length).toBe(1 + 3 * 4);
  });

  it('escapes every user-provided string', async () => {
    const { fit, series } = demoResults({ samples: 300, modelName: HOSTILE, validation: false });
    fit.model.description = HOSTILE;
    fit.parameters[0].name = HOSTILE;
    fit.parameters[0].unit = HOSTILE;
    fit.correlation.names[0] = HOSTILE;
    fit.warnings.push(HOSTILE);
    fit.identifiability.problems[0].message = HOSTILE;
    fit.provenance.dataFiles[0].file = HOSTILE;
    for (const s of series) {
      s.output = `"'><img src=x onerror=alert(1)>${s.output}`;
      s.experiment = `<b>${s.experiment}</b>`;
      s.unit = '<i>u</i>';
    }
    const page = await renderFitReport(fit, series);
    expect(page).not.toMatch(/<script|<img|<b>|<i>|onerror=alert\(1\)>/i);
    expect(page).toContain('&lt;script&gt;alert(1)&lt;/script&gt;&amp;&quot;&#39;');
    expect(page).toContain('&quot;&#39;&gt;&lt;img src=x onerror=alert(1)&gt;speed');
    // Inside the figures (titles, axis labels, aria labels) vega escapes the same text its own way.
    expect(page).not.toMatch(/"'>/);
  });

  it('computes the diagnostics from the series when fit.json lacks them', async () => {
    const { fit, series } = demoResults({ samples: 600, validation: false });
    fit.outputs = [];
    const page = await renderFitReport(fit, series);
    expect(page).toContain('<p class="verdict white">residuals are white');
    expect(page).toMatch(/<p class="verdict correlated">residuals are correlated/);
    expect(page).not.toContain('id="validation-experiments"');
  });

  it('says so when an output has no measured sample', async () => {
    const { fit, series } = demoResults({ samples: 300, validation: false });
    fit.outputs = [];
    series[1].measured.fill(NaN);
    const page = await renderFitReport(fit, series);
    expect(page).toContain('No measured sample of this output in this experiment.');
  });

  it('renders a failed fit without residuals, saying what is missing', async () => {
    const { fit } = demoResults({ samples: 100, validation: false });
    fit.status = 'failed';
    fit.message = 'could not simulate at the start values';
    fit.outputs = [];
    fit.correlation = { names: [], matrix: [] };
    fit.parameters = fit.parameters.map((p) => (p.status === 'free' ? { ...p, estimate: NaN, stdError: null, ci95: null } : p));
    const page = await renderFitReport(fit, []);
    expect(page).toContain('<span class="status failed">failed</span> could not simulate at the start values');
    expect(page).toContain('<p>No correlation available (no free parameter, or the fit stopped before computing it).</p>');
    expect(page).toContain('<p>No residual series to show.</p>');
    expect(page).toMatch(/<td>K<\/td><td>free<\/td><td class="num">n\/a<\/td>/);
    expect(page).not.toContain('<svg');
  });
});
