/**
 * The one rule for a decimal number written as text (a log's cell, a `--set` value): an optional
 * sign, digits with an optional point (or a point and digits), an optional exponent. No hex, no
 * `Infinity`, no thousands separators.
 *
 * A hand scan, not a regular expression: the pattern /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/
 * backtracks quadratically on a long run of digits that does not end well (measured on V8: 40,000
 * digits and an `x` took 1.6 s, 200,000 digits 40 s). This scan reads every character once.
 */
const isDigit = (code: number) => code >= 48 && code <= 57;

/** Index just past the run of digits starting at `i`. */
function digitsFrom(text: string, i: number): number {
  while (i < text.length && isDigit(text.charCodeAt(i))) i++;
  return i;
}

export function isDecimalText(text: string): boolean {
  let i = 0;
  const sign = text.charCodeAt(0);
  if (sign === 43 || sign === 45) i++; // + or -
  const intEnd = digitsFrom(text, i);
  let end = intEnd;
  if (text.charCodeAt(end) === 46) end = digitsFrom(text, end + 1); // a point and the fraction
  // At least one digit before or after the point.
  if (end - i === 0 || (end - i === 1 && intEnd === i)) return false;
  const e = text.charCodeAt(end);
  if (e === 101 || e === 69) { // e or E
    let j = end + 1;
    const s = text.charCodeAt(j);
    if (s === 43 || s === 45) j++;
    const expEnd = digitsFrom(text, j);
    if (expEnd === j) return false;
    end = expEnd;
  }
  return end === text.length;
}
