/**
 * The range of values whose square is a normal double (IEEE 754 binary64): from the square root of
 * the smallest normal number, 2^-1022, to that of the largest, (2 - 2^-52) * 2^1023. A fit sums
 * squares of residuals and divides by sigma squared: a sigma whose square is subnormal or 0, or a
 * logged value whose square is infinite, makes the sums meaningless (0, infinite or NaN) and the
 * solver's matrices singular, so such values are refused where they are read.
 */
export const SMALLEST_SQUARABLE = Math.sqrt(2 ** -1022); // about 1.49e-154
export const LARGEST_SQUARABLE = Math.sqrt(Number.MAX_VALUE); // about 1.34e154

/** True when |x|^2 is a normal double (0 is not: callers that accept 0 test it first). */
export function squareIsNormal(x: number): boolean {
  const a = Math.abs(x);
  return a >= SMALLEST_SQUARABLE && a <= LARGEST_SQUARABLE;
}

/** The range for a message: "1.5e-154 to 1.3e+154". */
export const SQUARABLE_RANGE = `${SMALLEST_SQUARABLE.toPrecision(2)} to ${LARGEST_SQUARABLE.toPrecision(2)}`;
