import { describe, expect, it } from 'vitest';
import { formatEstimate, formatHtmlNumber, withHtmlUnit } from '../../src/presentation/numbers.js';

describe('number formatting', () => {
  it('rounds an estimate at the second significant digit of its standard error', () => {
    // Common practice, no source: quote an estimate to the resolution its uncertainty supports.
    expect(formatEstimate(0.0799999, 3.28e-6)).toBe('0.0799999');
    expect(formatEstimate(0.00189981, 6.467e-6)).toBe('0.0018998');
    expect(formatEstimate(1234.5678, 12)).toBe('1235');
    expect(formatEstimate(8.2, 0.004)).toBe('8.2000');
    expect(formatEstimate(2.00064e-4, 3.547e-7)).toBe('2.0006e-4');
    expect(formatEstimate(2e-4, 3.547e-7)).toBe('2.0000e-4');
    expect(formatEstimate(5, null)).toBe('5');
  });

  it('shows missing and non-finite values in words, not as numbers', () => {
    expect(formatHtmlNumber(1e-4)).toBe('1e-4');
    expect(formatHtmlNumber(6.4671e-6, 3)).toBe('6.47e-6');
    expect(formatHtmlNumber(null)).toBe('—');
    expect(formatHtmlNumber(NaN)).toBe('n/a');
    expect(formatHtmlNumber(Infinity)).toBe('∞');
    expect(withHtmlUnit(0.5, 'rad/s')).toBe('0.5 rad/s');
    expect(withHtmlUnit(0.5, '1')).toBe('0.5');
  });
});
