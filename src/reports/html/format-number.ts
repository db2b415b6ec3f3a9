/** Numbers in tables: four significant digits, exponent form only where it helps. */
export function formatNumber(x: number | null | undefined, digits = 4): string {
  if (x === null || x === undefined) return '—';
  if (Number.isNaN(x)) return 'n/a';
  if (!Number.isFinite(x)) return x > 0 ? '∞' : '−∞';
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a >= 1e-3 && a < 1e6) return String(Number(x.toPrecision(digits)));
  // Shortest exponent form of the rounded value: 1e-4, not 1.000e-4.
  return Number(x.toPrecision(digits)).toExponential().replace('e+', 'e');
}

/** A value with its unit, e.g. "0.0521 N*m/A"; dimensionless values get no unit. */
export function withUnit(x: number | null | undefined, unit: string | undefined): string {
  const v = formatNumber(x);
  return unit && unit !== '1' && v !== '—' && v !== 'n/a' ? `${v} ${unit}` : v;
}

/**
 * An estimate (or interval bound) with as many significant digits as its standard error supports,
 * plus one: rounded at the second significant digit of the standard error (at least 3, at most 10
 * significant digits), so that the estimate and its interval read at the same resolution.
 */
export function formatEstimate(x: number | null | undefined, stdError: number | null | undefined): string {
  if (x === null || x === undefined || !Number.isFinite(x) || x === 0 || !stdError || !Number.isFinite(stdError) || stdError <= 0) return formatNumber(x);
  const digits = Math.floor(Math.log10(Math.abs(x))) - Math.floor(Math.log10(stdError)) + 2;
  const d = Math.max(3, Math.min(10, digits));
  const a = Math.abs(x);
  // Trailing zeros are kept here: they tell the resolution.
  const fixed = x.toPrecision(d);
  return a >= 1e-3 && a < 1e6 && !fixed.includes('e') ? fixed : x.toExponential(d - 1).replace('e+', 'e');
}
