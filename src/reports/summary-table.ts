/**
 * The text summary `fit` prints: the parameter table, fit quality per output, warnings in words and
 * the results folder. Plain text, fixed-width columns, every number with its unit.
 */
import type { FitResult, ParameterResult } from '../estimation/fit/fit-result.js';

/**
 * Rounded for reading (the full values are in the results folder): estimates and intervals with six
 * significant digits so that a narrow interval stays distinguishable from its estimate, the rest
 * with four.
 */
export function formatNumber(x: number | null | undefined, digits = 4): string {
  if (x === null || x === undefined || Number.isNaN(x)) return '-';
  if (!Number.isFinite(x)) return x > 0 ? 'inf' : '-inf';
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a >= 1e-3 && a < 1e6) return String(Number(x.toPrecision(digits)));
  return x.toExponential(digits - 1).replace(/\.?0+e/, 'e').replace('e+', 'e');
}

function criterion(x: number): string {
  return Number.isFinite(x) ? x.toFixed(2) : 'n/a (too few observations)';
}

function table(header: string[], rows: string[][]): string {
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) => cells.map((c, i) => c.padEnd(widths[i])).join('  ').trimEnd();
  return [line(header), line(widths.map((w) => '-'.repeat(w))), ...rows.map(line)].join('\n');
}

function flags(p: ParameterResult): string {
  if (p.status === 'fixed') return 'fixed';
  const f: string[] = [];
  if (p.atBound) f.push(`at ${p.atBound} bound`);
  if (p.stdError === null) f.push('not determined');
  else if (p.atBound) f.push('interval unreliable');
  return f.join(', ');
}

export function renderParameterTable(fit: FitResult): string {
  const rows = fit.parameters.map((p) => [
    p.name,
    formatNumber(p.estimate, 6),
    p.unit || '-',
    p.status === 'fixed' ? '' : formatNumber(p.stdError),
    p.status === 'fixed' ? '' : p.ci95 ? `[${formatNumber(p.ci95[0], 6)}, ${formatNumber(p.ci95[1], 6)}]` : '-',
    flags(p),
  ]);
  return table(['parameter', 'estimate', 'unit', 'std. error', '95 % interval', 'flags'], rows);
}

export function renderOutputTable(fit: FitResult): string {
  const rows = fit.outputs.map((o) => [
    o.experiment,
    o.role,
    o.output,
    String(o.samples) + (o.missing ? ` (${o.missing} missing)` : ''),
    `${formatNumber(o.sigma)} ${o.unit}`.trim() + (o.sigmaEstimated ? ' (estimated)' : ' (given)'),
    `${formatNumber(o.rmse)} ${o.unit}`.trim(),
    formatNumber(o.r2),
    o.verdict ?? '',
  ]);
  return table(['experiment', 'role', 'output', 'samples', 'noise sigma', 'RMSE', 'R^2', 'residuals'], rows);
}

export function renderFitSummary(fit: FitResult, resultsFolder?: string): string {
  const s = fit.statistics;
  const parts: string[] = [];
  parts.push(
    `fit of ${fit.model.name}: ${fit.status} (${fit.message}); ${fit.iterations} iterations, ${fit.simulations} simulations` +
      (fit.sensitivitySimulations !== undefined ? ` + ${fit.sensitivitySimulations} with sensitivities` : '') +
      `, ${formatNumber(fit.wallSeconds, 3)} s`,
  );
  if (fit.starts) parts.push(`${fit.starts.requested} starts (seed ${fit.starts.seed}): ${fit.starts.distinctOptima} distinct optim${fit.starts.distinctOptima === 1 ? 'um' : 'a'} found; the best is kept`);
  parts.push('');
  parts.push(renderParameterTable(fit));
  parts.push('');
  parts.push(
    `observations ${s.observations}, free parameters ${s.freeParameters}, weighted SSE ${formatNumber(s.weightedSSE, 6)}` +
      (s.reducedChiSquare !== undefined ? `, reduced chi-square ${formatNumber(s.reducedChiSquare)}` : '') +
      // Criteria are compared by differences of a few units: print them to 0.01 whatever their size.
      `, AICc ${criterion(s.aicc)}, BIC ${criterion(s.bic)}`,
  );
  parts.push('');
  parts.push('fit quality per output:');
  parts.push(renderOutputTable(fit));
  parts.push('');
  if (fit.warnings.length) {
    parts.push('warnings:');
    for (const w of fit.warnings) parts.push(`  - ${w}`);
  } else parts.push('warnings: none');
  if (resultsFolder) {
    parts.push('');
    parts.push(`results: ${resultsFolder}`);
  }
  return parts.join('\n') + '\n';
}
