import { describe, expect, it } from 'vitest';
import {
  formatCriterion, formatEstimate, formatFileSize, formatHtmlNumber, formatNumber, formatPValue, formatQuantity, withHtmlUnit, withUnit,
} from '../../src/presentation/numbers.js';

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

  it('uses one policy in plain text, with ASCII marks for what is not a finite number', () => {
    // Common practice, no source: four significant digits, shortest exponent form outside [1e-3, 1e6).
    expect(formatNumber(6.4671e-6)).toBe('6.467e-6');
    expect(formatNumber(2.5e7)).toBe('2.5e7');
    expect(formatNumber(null)).toBe('-');
    expect(formatNumber(NaN)).toBe('n/a');
    expect(formatNumber(-Infinity)).toBe('-inf');
    expect(withUnit(0.21, 'rad/s')).toBe('0.21 rad/s');
    expect(withUnit(NaN, 'A')).toBe('n/a');
    expect(formatQuantity(0.0200001, 's')).toBe('0.02 s');
    expect(formatQuantity(12, undefined)).toBe('12 samples');
  });

  it('keeps criteria plain up to 1e9 and p-values down to the resolution of double precision', () => {
    expect(formatCriterion(-63309.57)).toBe('-63309.6');
    expect(formatCriterion(169732412)).toBe('169732000');
    expect(formatPValue(0.01725, 2)).toBe('0.017');
    expect(formatPValue(3.04e-5)).toBe('3e-5');
    expect(formatPValue(1e-17)).toBe('< 1e-15');
  });

  it('gives file sizes in bytes, KiB or MiB', () => {
    expect(formatFileSize(16)).toBe('16 bytes');
    expect(formatFileSize(300 * 1024)).toBe('300 KiB');
    expect(formatFileSize(3 * 1024 * 1024)).toBe('3.0 MiB');
  });
});
