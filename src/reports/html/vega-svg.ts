/**
 * Plots are vega-lite specifications compiled by vega-lite and rendered to SVG text by vega in Node
 * (no browser, no canvas): the report then carries its figures inline and opens offline.
 * Vega escapes the text it writes into the SVG (titles, axis labels), so user names are safe there.
 */
import * as vega from 'vega';
import { compile, type TopLevelSpec } from 'vega-lite';

/** Shared look of every plot: our own palette and type sizes, print-friendly (white ground). */
const PLOT_CONFIG = {
  font: 'Helvetica, Arial, sans-serif',
  background: 'white',
  view: { stroke: '#c9ccd1' },
  axis: { labelFontSize: 10, titleFontSize: 11, titleFontWeight: 'normal', gridColor: '#eceef1', domainColor: '#8c9099', tickColor: '#8c9099', labelColor: '#30343b', titleColor: '#30343b' },
  legend: { labelFontSize: 10, titleFontSize: 10, orient: 'top', direction: 'horizontal', symbolStrokeWidth: 2, offset: 4 },
  title: { fontSize: 12, fontWeight: 'bold', anchor: 'start', color: '#1d2330' },
} as const;

/** The library never prints: vega-lite's warnings are dropped (our specs are fixed and tested). */
const SILENT = {
  level(): any {
    return SILENT;
  },
  error(): any {
    return SILENT;
  },
  warn(): any {
    return SILENT;
  },
  info(): any {
    return SILENT;
  },
  debug(): any {
    return SILENT;
  },
};

export async function renderVegaLiteSvg(spec: TopLevelSpec): Promise<string> {
  const full = { ...spec, config: { ...PLOT_CONFIG, ...(spec.config ?? {}) } } as TopLevelSpec;
  const compiled = compile(full, { logger: SILENT }).spec;
  const view = new vega.View(vega.parse(compiled), { renderer: 'none', logLevel: vega.Error });
  try {
    const svg = await view.toSVG();
    // The stylesheet lets the drawing shrink with the page (max-width: 100 %, height: auto).
    return svg.replace(/^<svg /, '<svg role="img" ');
  } finally {
    view.finalize();
  }
}
