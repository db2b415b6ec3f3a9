/**
 * The text summary `fit` prints: the parameter table, fit quality per output, warnings in words and
 * the results folder. Plain text, fixed-width columns, every number with its unit.
 */
import type { FitResult, ParameterResult } from '../estimation/fit/fit-result.js';
import { fitStatusPhrase, formatCriterionFixed, formatDuration, formatNumber, printableLines, RESIDUAL_VERDICTS, textTable, withUnit } from '../presentation/index.js';

// Rounded for reading (the full values are in the results folder): estimates and intervals with six
// significant digits so that a narrow interval stays distinguishable from its estimate, the rest
// with four.
const ESTIMATE_DIGITS = 6;

function flags(p: ParameterResult): string {
  if (p.status === 'fixed') return 'fixed';
  const f: string[] = [];
  if (p.atBound) f.push(`at ${p.atBound} bound`);
  if (p.stdError === null) f.push('not determined');
  else if (p.atBound) f.push('interval unreliable');
  return f.join(', ');
}

function renderParameterTable(fit: FitResult): string {
  const rows = fit.parameters.map((p) => [
    p.name,
    formatNumber(p.estimate, ESTIMATE_DIGITS),
    p.unit || '-',
    p.status === 'fixed' ? '' : formatNumber(p.stdError),
    p.status === 'fixed' ? '' : p.ci95 ? `[${formatNumber(p.ci95[0], ESTIMATE_DIGITS)}, ${formatNumber(p.ci95[1], ESTIMATE_DIGITS)}]` : '-',
    flags(p),
  ]);
  return textTable(['parameter', 'estimate', 'unit', 'std. error', '95 % interval', 'flags'], rows);
}

function renderOutputTable(fit: FitResult): string {
  const rows = fit.outputs.map((o) => [
    o.experiment,
    o.role,
    o.output,
    String(o.samples) + (o.missing ? ` (${o.missing} missing)` : ''),
    withUnit(o.sigma, o.unit) + (o.sigmaEstimated ? ' (estimated)' : ' (given)'),
    withUnit(o.rmse, o.unit),
    formatNumber(o.r2),
    o.verdict ?? RESIDUAL_VERDICTS.none,
  ]);
  return textTable(['experiment', 'role', 'output', 'samples', 'noise sigma', 'RMSE', 'R^2', 'residuals'], rows);
}

export function renderFitSummary(fit: FitResult, resultsFolder?: string): string {
  const s = fit.statistics;
  const parts: string[] = [];
  parts.push(
    `fit of ${fit.model.name}: ${fitStatusPhrase(fit.status, fit.message)}; ${fit.iterations} iterations, ${fit.simulations} simulations` +
      (fit.sensitivitySimulations !== undefined ? ` + ${fit.sensitivitySimulations} with sensitivities` : '') +
      `, ${formatDuration(fit.wallSeconds)}`,
  );
  if (fit.starts) parts.push(`${fit.starts.requested} starts (seed ${fit.starts.seed}): ${fit.starts.distinctOptima} distinct optim${fit.starts.distinctOptima === 1 ? 'um' : 'a'} found; the best is kept`);
  parts.push('');
  parts.push(renderParameterTable(fit));
  parts.push('');
  parts.push(
    `observations ${s.observations}, free parameters ${s.freeParameters}, weighted SSE ${formatNumber(s.weightedSSE, 6)}` +
      (s.reducedChiSquare !== undefined ? `, reduced chi-square ${formatNumber(s.reducedChiSquare)}` : '') +
      // Criteria are compared by differences of a few units: print them to 0.01 whatever their size.
      `, AICc ${formatCriterionFixed(s.aicc)}, BIC ${formatCriterionFixed(s.bic)}`,
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
  // Names, units, messages and the folder come from the input: made printable (presentation/printable.ts).
  return printableLines(parts.join('\n') + '\n');
}
