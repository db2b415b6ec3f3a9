/** Numbers in tables: four significant digits, exponent form only where it helps. */
export function formatNumber(x: number | null | undefined, digits = 4): string {
  if (x === null || x === undefined) return '—';
  if (Number.isNaN(x)) return 'n/a';
  if (!Number.isFinite(x)) return x > 0 ? '∞' : '−∞';
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a >= 1e-3 && a < 1e6) return String(Number(x.toPrecision(digits)));
  return x.toExponential(digits - 1).replace('e+', 'e');
}

/** A value with its unit, e.g. "0.0521 N*m/A"; dimensionless values get no unit. */
export function withUnit(x: number | null | undefined, unit: string | undefined): string {
  const v = formatNumber(x);
  return unit && unit !== '1' && v !== '—' && v !== 'n/a' ? `${v} ${unit}` : v;
}
