/**
 * Every number rigcal shows to a person: one policy for digits, exponent form and values that are
 * not numbers, for the terminal and the HTML report alike. Pure functions returning strings; the
 * files meant for programs (fit.json, estimates.yaml, CSV) keep full precision and never come here.
 *
 * The policy: four significant digits unless a variant below needs other; plain form for
 * 1e-3 <= |x| < 1e6 (information criteria: up to 1e9), else the shortest exponent form of the
 * rounded value (1e-4, not 1.000e-4; 2.5e7, not 2.5e+7). A missing value, a value that is not a
 * number and an infinity each have their own mark. Plain text keeps to ASCII (terminals, logs,
 * copy and paste into a spreadsheet); the report writes the typographic marks.
 */

/** The marks of the values that are not finite numbers, in one medium. */
export interface NonFiniteMarks {
  missing: string;
  notANumber: string;
  infinity: string;
  minusInfinity: string;
}

export const TEXT_MARKS: NonFiniteMarks = { missing: '-', notANumber: 'n/a', infinity: 'inf', minusInfinity: '-inf' };
export const HTML_MARKS: NonFiniteMarks = { missing: '—', notANumber: 'n/a', infinity: '∞', minusInfinity: '−∞' };

/** Plain form below this magnitude (and from 1e-3 up); exponent form outside. */
const PLAIN_BELOW = 1e6;
/** Criteria (AICc, BIC, -2 log L) of long logs reach millions; their differences matter in units. */
const CRITERION_PLAIN_BELOW = 1e9;

function nonFinite(x: number | null | undefined, marks: NonFiniteMarks): string | undefined {
  if (x === null || x === undefined) return marks.missing;
  if (Number.isNaN(x)) return marks.notANumber;
  if (!Number.isFinite(x)) return x > 0 ? marks.infinity : marks.minusInfinity;
  return undefined;
}

function rounded(x: number, digits: number, plainBelow: number): string {
  if (x === 0) return '0';
  const a = Math.abs(x);
  const r = Number(x.toPrecision(digits));
  if (a >= 1e-3 && a < plainBelow) return String(r);
  return r.toExponential().replace('e+', 'e');
}

/** A number for plain text (terminal tables and sentences), `digits` significant digits. */
export function formatNumber(x: number | null | undefined, digits = 4): string {
  return nonFinite(x, TEXT_MARKS) ?? rounded(x as number, digits, PLAIN_BELOW);
}

/** The same number for the HTML report. */
export function formatHtmlNumber(x: number | null | undefined, digits = 4): string {
  return nonFinite(x, HTML_MARKS) ?? rounded(x as number, digits, PLAIN_BELOW);
}

/**
 * An information criterion or likelihood (AICc, BIC, -2 log L, their differences): six significant
 * digits and plain form up to 1e9, since differences of a few units matter on values of thousands.
 */
export function formatCriterion(x: number | null | undefined, digits = 6): string {
  return nonFinite(x, TEXT_MARKS) ?? rounded(x as number, digits, CRITERION_PLAIN_BELOW);
}

/**
 * A criterion to two decimals whatever its size (the fit summary, where it is read on its own), or
 * the reason there is none.
 */
export function formatCriterionFixed(x: number): string {
  return Number.isFinite(x) ? x.toFixed(2) : 'n/a (too few observations)';
}

/**
 * A p-value, `digits` significant digits (two below 1e-4, where only the order matters). 1 - F(x)
 * in double precision cannot resolve tails below about 1e-15: those read "< 1e-15".
 */
export function formatPValue(p: number, digits = 3): string {
  if (p < 1e-15) return '< 1e-15';
  return formatNumber(p, p < 1e-4 ? 2 : digits);
}

/** The p-value as a clause: "p = 0.017", or "p < 1e-15" where double precision cannot tell. */
export function formatPValueClause(p: number, digits = 3): string {
  const shown = formatPValue(p, digits);
  return shown.startsWith('<') ? `p ${shown}` : `p = ${shown}`;
}

/** A fixed number of decimals, for values read on a fixed scale (coefficients of a direction, correlations). */
export function formatDecimals(x: number, decimals: number): string {
  return x.toFixed(decimals);
}

/** A correlation coefficient (or a band of one): two decimals, as correlations are read. */
export function formatCorrelation(r: number): string {
  return formatDecimals(r, 2);
}

/**
 * A value quoted in a message or comment (parameter values at a failure, log-likelihoods compared,
 * a frozen value): `digits` significant digits in JavaScript's shortest form (0.000123, 1.23e-7,
 * 1234567), so that it can be copied back into a model file as it stands.
 */
export function formatSignificant(x: number, digits: number): string {
  return String(Number(x.toPrecision(digits)));
}

/** A tolerance or relative noise level: one significant digit in exponent form, e.g. 1e-14, 6e-8. */
export function formatTolerance(x: number): string {
  return x.toExponential(0).replace('e+', 'e');
}

/** A wall-clock time of our own work, e.g. "1.4 s": three significant digits. */
export function formatDuration(seconds: number): string {
  return `${formatNumber(seconds, 3)} s`;
}

const KIB = 1024;
const MIB = 1024 * 1024;

/** A file size: bytes below one KiB, whole KiB below one MiB, else MiB to one decimal. */
export function formatFileSize(bytes: number): string {
  if (bytes < KIB) return `${bytes} bytes`;
  return bytes < MIB ? `${Math.round(bytes / KIB)} KiB` : `${(bytes / MIB).toFixed(1)} MiB`;
}

/** A value with its unit, e.g. "0.0521 N*m/A"; no unit after a dimensionless value ("1") or a mark. */
function joinUnit(shown: string, x: number | null | undefined, unit: string | undefined): string {
  const isNumber = typeof x === 'number' && !Number.isNaN(x);
  return unit && unit.trim() && unit !== '1' && isNumber ? `${shown} ${unit}` : shown;
}

/** A value with its unit for plain text. */
export function withUnit(x: number | null | undefined, unit: string | undefined, digits = 4): string {
  return joinUnit(formatNumber(x, digits), x, unit);
}

/** A value with its unit for the HTML report. */
export function withHtmlUnit(x: number | null | undefined, unit: string | undefined, digits = 4): string {
  return joinUnit(formatHtmlNumber(x, digits), x, unit);
}

/**
 * A quantity inside a sentence (verdicts, warnings): three significant digits and the unit, e.g.
 * "0.8 s", "12.5 ms"; a count of samples when there is no unit.
 */
export function formatQuantity(value: number, unit: string | undefined): string {
  const text = formatNumber(value, 3);
  return unit ? `${text} ${unit}` : `${text} samples`;
}

/**
 * An estimate (or interval bound) with as many significant digits as its standard error supports,
 * plus one: rounded at the second significant digit of the standard error (at least 3, at most 10
 * significant digits), so that the estimate and its interval read at the same resolution. Without
 * a standard error, as formatHtmlNumber.
 */
export function formatEstimate(x: number | null | undefined, stdError: number | null | undefined): string {
  if (x === null || x === undefined || !Number.isFinite(x) || x === 0 || !stdError || !Number.isFinite(stdError) || stdError <= 0) return formatHtmlNumber(x);
  const digits = Math.floor(Math.log10(Math.abs(x))) - Math.floor(Math.log10(stdError)) + 2;
  const d = Math.max(3, Math.min(10, digits));
  const a = Math.abs(x);
  // Trailing zeros are kept here: they tell the resolution.
  const fixed = x.toPrecision(d);
  return a >= 1e-3 && a < PLAIN_BELOW && !fixed.includes('e') ? fixed : x.toExponential(d - 1).replace('e+', 'e');
}
